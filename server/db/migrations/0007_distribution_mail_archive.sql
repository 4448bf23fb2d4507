CREATE TYPE "public"."mail_kind" AS ENUM('issue', 'amended', 'withdrawn', 'test', 'invitation');--> statement-breakpoint
CREATE TYPE "public"."mail_status" AS ENUM('queued', 'sent', 'failed', 'uncertain');--> statement-breakpoint
CREATE TABLE "briefing_lists" (
	"briefing_id" integer NOT NULL,
	"list_id" integer NOT NULL,
	"list_name" text NOT NULL,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "briefing_lists_briefing_id_list_id_pk" PRIMARY KEY("briefing_id","list_id")
);
--> statement-breakpoint
CREATE TABLE "contacts" (
	"id" serial PRIMARY KEY NOT NULL,
	"organisation_id" integer NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"user_id" integer,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "distribution_list_members" (
	"list_id" integer NOT NULL,
	"contact_id" integer NOT NULL,
	"added_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "distribution_list_members_list_id_contact_id_pk" PRIMARY KEY("list_id","contact_id")
);
--> statement-breakpoint
CREATE TABLE "distribution_lists" (
	"id" serial PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"organisation_id" integer,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "distribution_lists_key_unique" UNIQUE("key")
);
--> statement-breakpoint
CREATE TABLE "organisations" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"is_demo" boolean DEFAULT false NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "mail_attempts" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"outbox_id" bigint NOT NULL,
	"attempt" integer NOT NULL,
	"worker" text NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"handed_over_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"outcome" text,
	"detail" text
);
--> statement-breakpoint
CREATE TABLE "mail_outbox" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"idempotency_key" text NOT NULL,
	"kind" "mail_kind" NOT NULL,
	"status" "mail_status" DEFAULT 'queued' NOT NULL,
	"briefing_id" integer,
	"briefing_version" integer,
	"contact_id" integer,
	"user_id" integer,
	"list_names" text[] NOT NULL,
	"organisation_name" text,
	"to_address" text NOT NULL,
	"to_name" text,
	"subject" text NOT NULL,
	"text_body" text NOT NULL,
	"html_body" text NOT NULL,
	"attachment_name" text,
	"attachment_sha256" text,
	"message_id" text NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"max_attempts" integer DEFAULT 8 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_error" text,
	"relay_response" text,
	"sent_at" timestamp with time zone,
	"created_by_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_outbox_idempotency_key_unique" UNIQUE("idempotency_key"),
	CONSTRAINT "mail_outbox_message_id_unique" UNIQUE("message_id")
);
--> statement-breakpoint
CREATE TABLE "received_mail" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"listener" text NOT NULL,
	"envelope_from" text,
	"envelope_to" text[] NOT NULL,
	"message_id" text,
	"subject" text,
	"from_header" text,
	"to_header" text,
	"text_body" text,
	"html_body" text,
	"attachments" jsonb NOT NULL,
	"size" integer NOT NULL,
	"raw" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "received_mail_attachments" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"mail_id" bigint NOT NULL,
	"index" integer NOT NULL,
	"filename" text,
	"content_type" text NOT NULL,
	"sha256" text NOT NULL,
	"content" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "briefing_search" (
	"briefing_id" integer PRIMARY KEY NOT NULL,
	"status" "briefing_status" NOT NULL,
	"issued_at" timestamp with time zone,
	"document" "tsvector" NOT NULL,
	"hazards" text[] DEFAULT '{}'::text[] NOT NULL,
	"area_names" text[] DEFAULT '{}'::text[] NOT NULL,
	"footprint" geometry(MultiPolygon,4326),
	"refreshed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "briefing_lists" ADD CONSTRAINT "briefing_lists_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_lists" ADD CONSTRAINT "briefing_lists_list_id_distribution_lists_id_fk" FOREIGN KEY ("list_id") REFERENCES "public"."distribution_lists"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "contacts" ADD CONSTRAINT "contacts_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "contacts" ADD CONSTRAINT "contacts_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "distribution_list_members" ADD CONSTRAINT "distribution_list_members_list_id_distribution_lists_id_fk" FOREIGN KEY ("list_id") REFERENCES "public"."distribution_lists"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "distribution_list_members" ADD CONSTRAINT "distribution_list_members_contact_id_contacts_id_fk" FOREIGN KEY ("contact_id") REFERENCES "public"."contacts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "distribution_lists" ADD CONSTRAINT "distribution_lists_organisation_id_organisations_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisations"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_attempts" ADD CONSTRAINT "mail_attempts_outbox_id_mail_outbox_id_fk" FOREIGN KEY ("outbox_id") REFERENCES "public"."mail_outbox"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_contact_id_contacts_id_fk" FOREIGN KEY ("contact_id") REFERENCES "public"."contacts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_outbox" ADD CONSTRAINT "mail_outbox_created_by_id_users_id_fk" FOREIGN KEY ("created_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "received_mail_attachments" ADD CONSTRAINT "received_mail_attachments_mail_id_received_mail_id_fk" FOREIGN KEY ("mail_id") REFERENCES "public"."received_mail"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_search" ADD CONSTRAINT "briefing_search_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "briefing_lists_list_idx" ON "briefing_lists" USING btree ("list_id");--> statement-breakpoint
CREATE UNIQUE INDEX "contacts_org_email_unique" ON "contacts" USING btree ("organisation_id",lower("email"));--> statement-breakpoint
CREATE INDEX "contacts_user_idx" ON "contacts" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "distribution_list_members_contact_idx" ON "distribution_list_members" USING btree ("contact_id");--> statement-breakpoint
CREATE UNIQUE INDEX "organisations_name_unique" ON "organisations" USING btree (lower("name"));--> statement-breakpoint
CREATE INDEX "mail_attempts_outbox_idx" ON "mail_attempts" USING btree ("outbox_id","attempt");--> statement-breakpoint
CREATE INDEX "mail_outbox_due_idx" ON "mail_outbox" USING btree ("status","next_attempt_at");--> statement-breakpoint
CREATE INDEX "mail_outbox_briefing_idx" ON "mail_outbox" USING btree ("briefing_id");--> statement-breakpoint
CREATE INDEX "received_mail_message_id_idx" ON "received_mail" USING btree ("message_id");--> statement-breakpoint
CREATE INDEX "received_mail_received_idx" ON "received_mail" USING btree ("received_at");--> statement-breakpoint
CREATE INDEX "received_mail_attachments_mail_idx" ON "received_mail_attachments" USING btree ("mail_id","index");--> statement-breakpoint
CREATE INDEX "briefing_search_issued_idx" ON "briefing_search" USING btree ("issued_at");--> statement-breakpoint
CREATE INDEX "briefing_search_document_idx" ON "briefing_search" USING gin ("document");--> statement-breakpoint
CREATE INDEX "briefing_search_hazards_idx" ON "briefing_search" USING gin ("hazards");--> statement-breakpoint
CREATE INDEX "briefing_search_footprint_idx" ON "briefing_search" USING gist ("footprint");
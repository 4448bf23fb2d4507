CREATE TYPE "public"."method_check_status" AS ENUM('queued', 'running', 'completed', 'failed');--> statement-breakpoint
CREATE TABLE "method_check_batches" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"settings" jsonb NOT NULL,
	"author_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "method_check_truths" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"description" text,
	"is_demo" boolean DEFAULT false NOT NULL,
	"demo_key" text,
	"variable" text NOT NULL,
	"standard_name" text,
	"canonical_units" text NOT NULL,
	"display_units" text NOT NULL,
	"nx" integer NOT NULL,
	"ny" integer NOT NULL,
	"spacing_km" double precision NOT NULL,
	"valid_time" text,
	"member_index" integer DEFAULT 0 NOT NULL,
	"lead_index" integer DEFAULT 0 NOT NULL,
	"source_file_name" text,
	"source_sha256" text,
	"stats" jsonb NOT NULL,
	"data" "bytea" NOT NULL,
	"uploaded_by_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "method_checks" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"status" "method_check_status" DEFAULT 'queued' NOT NULL,
	"settings" jsonb NOT NULL,
	"truth_source" jsonb NOT NULL,
	"truth_nx" integer NOT NULL,
	"truth_ny" integer NOT NULL,
	"truth_spacing_km" double precision NOT NULL,
	"truth_units" text NOT NULL,
	"truth_field" "bytea" NOT NULL,
	"report" jsonb,
	"progress" real DEFAULT 0 NOT NULL,
	"stage" text,
	"error" text,
	"attempts" integer DEFAULT 0 NOT NULL,
	"worker_id" text,
	"heartbeat_at" timestamp with time zone,
	"batch_id" integer,
	"author_id" integer,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"elapsed_ms" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "method_check_batches" ADD CONSTRAINT "method_check_batches_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "method_check_truths" ADD CONSTRAINT "method_check_truths_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "method_checks" ADD CONSTRAINT "method_checks_batch_id_method_check_batches_id_fk" FOREIGN KEY ("batch_id") REFERENCES "public"."method_check_batches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "method_checks" ADD CONSTRAINT "method_checks_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "method_check_truths_demo_key" ON "method_check_truths" USING btree ("demo_key");--> statement-breakpoint
CREATE INDEX "method_checks_status_idx" ON "method_checks" USING btree ("status","heartbeat_at");--> statement-breakpoint
CREATE INDEX "method_checks_batch_idx" ON "method_checks" USING btree ("batch_id");
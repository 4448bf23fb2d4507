CREATE TYPE "public"."briefing_event_action" AS ENUM('created', 'edited', 'submitted', 'returned', 'approved', 'issued', 'amended', 'withdrawn', 'superseded');--> statement-breakpoint
CREATE TYPE "public"."briefing_status" AS ENUM('draft', 'awaiting_approval', 'approved', 'issued', 'withdrawn', 'superseded');--> statement-breakpoint
CREATE TABLE "briefing_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"briefing_id" integer NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" integer,
	"actor_name" text,
	"action" "briefing_event_action" NOT NULL,
	"comment" text,
	"from_status" "briefing_status",
	"to_status" "briefing_status",
	"pdf_sha256" text
);
--> statement-breakpoint
CREATE TABLE "briefings" (
	"id" serial PRIMARY KEY NOT NULL,
	"series_id" integer NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"supersedes_id" integer,
	"status" "briefing_status" DEFAULT 'draft' NOT NULL,
	"title" text NOT NULL,
	"run_id" integer,
	"window_start" timestamp with time zone,
	"window_end" timestamp with time zone,
	"likelihood_scale" text NOT NULL,
	"selection" jsonb NOT NULL,
	"narrative" jsonb NOT NULL,
	"confidence_note" text DEFAULT '' NOT NULL,
	"next_update_at" timestamp with time zone,
	"contact" text DEFAULT '' NOT NULL,
	"caveats" jsonb NOT NULL,
	"statements" jsonb NOT NULL,
	"figures" jsonb NOT NULL,
	"recipients" jsonb NOT NULL,
	"method" jsonb,
	"local_time_name" text DEFAULT 'UTC' NOT NULL,
	"utc_offset_minutes" integer DEFAULT 0 NOT NULL,
	"author_id" integer,
	"editor_ids" integer[] NOT NULL,
	"submitted_at" timestamp with time zone,
	"submitted_by_id" integer,
	"approved_at" timestamp with time zone,
	"approved_by_id" integer,
	"approved_pdf_sha256" text,
	"issued_at" timestamp with time zone,
	"issued_by_id" integer,
	"withdrawn_at" timestamp with time zone,
	"withdrawn_by_id" integer,
	"withdrawn_reason" text,
	"pdf" "bytea",
	"pdf_sha256" text,
	"pdf_rendered_at" timestamp with time zone,
	"pdf_lock_version" integer,
	"lock_version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "caveat_library" (
	"id" serial PRIMARY KEY NOT NULL,
	"title" text NOT NULL,
	"text" text NOT NULL,
	"standing" boolean DEFAULT false NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"sort" integer DEFAULT 100 NOT NULL,
	"updated_by_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "briefing_events" ADD CONSTRAINT "briefing_events_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_events" ADD CONSTRAINT "briefing_events_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_supersedes_id_briefings_id_fk" FOREIGN KEY ("supersedes_id") REFERENCES "public"."briefings"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_submitted_by_id_users_id_fk" FOREIGN KEY ("submitted_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_approved_by_id_users_id_fk" FOREIGN KEY ("approved_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_issued_by_id_users_id_fk" FOREIGN KEY ("issued_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_withdrawn_by_id_users_id_fk" FOREIGN KEY ("withdrawn_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "caveat_library" ADD CONSTRAINT "caveat_library_updated_by_id_users_id_fk" FOREIGN KEY ("updated_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "briefing_events_briefing_idx" ON "briefing_events" USING btree ("briefing_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "briefings_series_version_unique" ON "briefings" USING btree ("series_id","version");--> statement-breakpoint
CREATE INDEX "briefings_status_idx" ON "briefings" USING btree ("status","updated_at");--> statement-breakpoint
CREATE INDEX "briefings_run_idx" ON "briefings" USING btree ("run_id");--> statement-breakpoint
-- Issued briefings are immutable: only the move to withdrawn or superseded (and the run link being
-- cleared when a run is deleted) may touch an issued row; withdrawn and superseded rows never change.
-- Only drafts can be deleted.
CREATE OR REPLACE FUNCTION briefings_keep_issued() RETURNS trigger AS $$
DECLARE
  free_columns text[] := ARRAY['status', 'withdrawn_at', 'withdrawn_by_id', 'withdrawn_reason', 'lock_version', 'updated_at', 'run_id'];
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status <> 'draft' THEN
      RAISE EXCEPTION 'briefing % is % and cannot be deleted', OLD.id, OLD.status USING ERRCODE = 'check_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status IN ('withdrawn', 'superseded') AND (to_jsonb(NEW) - 'run_id') IS DISTINCT FROM (to_jsonb(OLD) - 'run_id') THEN
    RAISE EXCEPTION 'briefing % is % and cannot be changed', OLD.id, OLD.status USING ERRCODE = 'check_violation';
  END IF;
  IF OLD.status = 'issued' AND (
    NEW.status NOT IN ('issued', 'withdrawn', 'superseded')
    OR (to_jsonb(NEW) - free_columns) IS DISTINCT FROM (to_jsonb(OLD) - free_columns)
  ) THEN
    RAISE EXCEPTION 'briefing % has been issued and cannot be changed', OLD.id USING ERRCODE = 'check_violation';
  END IF;
  RETURN NEW;
END
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER briefings_keep_issued BEFORE UPDATE OR DELETE ON "briefings" FOR EACH ROW EXECUTE FUNCTION briefings_keep_issued();
--> statement-breakpoint
-- The standard caveats (Tessera's own wording); duty leads and administrators edit them in the app.
INSERT INTO "caveat_library" ("title", "text", "standing", "active", "sort") VALUES
	('Standing caution', 'The probabilities in this briefing are statistical detail added to a coarse ensemble forecast. They say how often an outcome appeared among the forecast scenarios; they are not a physical forecast of what the weather will do at a particular place, and they are not a warning.', true, true, 0),
	('Near 0 % is not impossible', 'A value near 0 % means that none, or almost none, of the forecast scenarios showed the outcome. It does not mean the outcome cannot happen: the scenarios cover only part of what the weather could do.', false, true, 10),
	('Surface and air temperature', 'Temperatures here are for the air about 2 m above the ground. Roads, runways, rails and other surfaces can be several degrees colder on clear, calm nights, so ice can form on surfaces while the air stays above 0 °C.', false, true, 20),
	('Official warnings come first', 'Where the national weather service or a civil protection authority has issued a warning for this area, that warning is the authoritative statement. This briefing supports planning and does not replace it.', false, true, 30),
	('Your procedures decide', 'Decisions to close, restrict or continue operations stay with the people responsible under your organisation''s procedures, local regulations and licensed practice. This briefing is one input to those decisions.', false, true, 40);

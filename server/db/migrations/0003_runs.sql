CREATE TYPE "public"."run_status" AS ENUM('staged', 'ready', 'queued', 'running', 'completed', 'failed', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."task_status" AS ENUM('pending', 'running', 'done', 'failed', 'cancelled');--> statement-breakpoint
CREATE TABLE "run_fields" (
	"run_id" integer NOT NULL,
	"lead_index" integer NOT NULL,
	"member_index" integer NOT NULL,
	"data" "bytea" NOT NULL,
	CONSTRAINT "run_fields_run_id_lead_index_member_index_pk" PRIMARY KEY("run_id","lead_index","member_index")
);
--> statement-breakpoint
CREATE TABLE "run_tasks" (
	"id" serial PRIMARY KEY NOT NULL,
	"run_id" integer NOT NULL,
	"lead_index" integer NOT NULL,
	"member_index" integer NOT NULL,
	"status" "task_status" DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"worker_id" text,
	"heartbeat_at" timestamp with time zone,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"elapsed_ms" integer,
	"error" text,
	"fit" jsonb,
	"samples" "bytea",
	"sample_offset" double precision,
	"sample_scale" double precision,
	"sample_count" integer,
	"fine_nx" integer,
	"fine_ny" integer
);
--> statement-breakpoint
CREATE TABLE "runs" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"status" "run_status" DEFAULT 'staged' NOT NULL,
	"format" text NOT NULL,
	"source_file_name" text NOT NULL,
	"source_sha256" text NOT NULL,
	"source_bytes" integer NOT NULL,
	"variable" text NOT NULL,
	"standard_name" text,
	"units" text NOT NULL,
	"canonical_units" text NOT NULL,
	"display_units" text NOT NULL,
	"members" integer NOT NULL,
	"lead_times" jsonb NOT NULL,
	"forecast_periods_hours" jsonb NOT NULL,
	"reference_time" timestamp with time zone,
	"height_m" real,
	"cell_methods" text,
	"grid" jsonb NOT NULL,
	"extent" jsonb NOT NULL,
	"corners" jsonb NOT NULL,
	"footprint" geometry(Polygon,4326),
	"notes" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"settings" jsonb,
	"is_demo" boolean DEFAULT false NOT NULL,
	"uploaded_by_id" integer,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "run_fields" ADD CONSTRAINT "run_fields_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_tasks" ADD CONSTRAINT "run_tasks_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_uploaded_by_id_users_id_fk" FOREIGN KEY ("uploaded_by_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "run_tasks_member_unique" ON "run_tasks" USING btree ("run_id","lead_index","member_index");--> statement-breakpoint
CREATE INDEX "run_tasks_status_idx" ON "run_tasks" USING btree ("status","heartbeat_at");--> statement-breakpoint
CREATE INDEX "runs_status_idx" ON "runs" USING btree ("status");--> statement-breakpoint
CREATE INDEX "runs_footprint_idx" ON "runs" USING gist ("footprint");--> statement-breakpoint
CREATE UNIQUE INDEX "runs_source_unique" ON "runs" USING btree ("source_sha256") WHERE status <> 'staged';
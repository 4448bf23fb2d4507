CREATE TYPE "public"."area_kind" AS ENUM('polygon', 'rectangle', 'circle');--> statement-breakpoint
CREATE TYPE "public"."hazard" AS ENUM('gust', 'low_temperature', 'heavy_precipitation', 'heat');--> statement-breakpoint
CREATE TYPE "public"."threshold_direction" AS ENUM('above', 'below');--> statement-breakpoint
CREATE TABLE "areas" (
	"id" serial PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"tags" text[] DEFAULT '{}'::text[] NOT NULL,
	"kind" "area_kind" DEFAULT 'polygon' NOT NULL,
	"circle_centre" jsonb,
	"circle_radius_km" double precision,
	"geometry" geometry(MultiPolygon,4326) NOT NULL,
	"owner_id" integer,
	"is_demo" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "hazard_thresholds" (
	"id" serial PRIMARY KEY NOT NULL,
	"hazard" "hazard" NOT NULL,
	"label" text NOT NULL,
	"value" double precision NOT NULL,
	"units" text NOT NULL,
	"direction" "threshold_direction" NOT NULL,
	"is_default" boolean DEFAULT false NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"updated_by_id" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "areas" ADD CONSTRAINT "areas_owner_id_users_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "hazard_thresholds" ADD CONSTRAINT "hazard_thresholds_updated_by_id_users_id_fk" FOREIGN KEY ("updated_by_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "areas_geometry_idx" ON "areas" USING gist ("geometry");--> statement-breakpoint
CREATE INDEX "areas_owner_idx" ON "areas" USING btree ("owner_id");--> statement-breakpoint
CREATE UNIQUE INDEX "hazard_thresholds_unique" ON "hazard_thresholds" USING btree ("hazard","direction","value");--> statement-breakpoint
-- Common-practice default thresholds (not official warning levels); offices edit them in the map workspace.
INSERT INTO "hazard_thresholds" ("hazard", "label", "value", "units", "direction", "is_default", "position") VALUES
	('gust', 'Strong gusts', 20, 'm s-1', 'above', true, 0),
	('gust', 'Damaging gusts', 25, 'm s-1', 'above', true, 1),
	('gust', 'Severe gusts', 30, 'm s-1', 'above', true, 2),
	('low_temperature', 'Frost', 0, 'degC', 'below', true, 0),
	('low_temperature', 'Moderate frost', -3, 'degC', 'below', true, 1),
	('low_temperature', 'Hard frost', -5, 'degC', 'below', true, 2),
	('heavy_precipitation', 'Heavy', 10, 'mm', 'above', true, 0),
	('heavy_precipitation', 'Very heavy', 20, 'mm', 'above', true, 1),
	('heavy_precipitation', 'Extreme', 30, 'mm', 'above', true, 2),
	('heat', 'Warm', 25, 'degC', 'above', true, 0),
	('heat', 'Hot', 30, 'degC', 'above', true, 1);

CREATE TYPE "public"."orbit_ingest_status" AS ENUM('parsing', 'previewed', 'importing', 'imported', 'cancelled', 'failed');--> statement-breakpoint
CREATE TYPE "public"."sail_mode" AS ENUM('raising', 'edge-on', 'tumbling', 'unknown');--> statement-breakpoint
CREATE TABLE "element_set_files" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"spacecraft_id" uuid NOT NULL,
	"content_sha256" text NOT NULL,
	"filename" text NOT NULL,
	"format" text NOT NULL,
	"byte_size" integer NOT NULL,
	"content" text NOT NULL,
	"record_count" integer NOT NULL,
	"imported_count" integer NOT NULL,
	"duplicate_count" integer NOT NULL,
	"invalid_count" integer NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "element_sets" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"spacecraft_id" uuid NOT NULL,
	"file_id" uuid NOT NULL,
	"source_line" integer NOT NULL,
	"catalog_number_int" integer NOT NULL,
	"epoch" timestamp (6) with time zone NOT NULL,
	"epoch_ms" double precision NOT NULL,
	"element_set_no" integer NOT NULL,
	"classification" text NOT NULL,
	"international_designator" text NOT NULL,
	"mean_motion_rev_per_day" double precision NOT NULL,
	"mean_motion_dot_rev_per_day2" double precision NOT NULL,
	"mean_motion_ddot_rev_per_day3" double precision NOT NULL,
	"bstar" double precision NOT NULL,
	"inclination_deg" double precision NOT NULL,
	"raan_deg" double precision NOT NULL,
	"eccentricity" double precision NOT NULL,
	"arg_perigee_deg" double precision NOT NULL,
	"mean_anomaly_deg" double precision NOT NULL,
	"rev_at_epoch" integer NOT NULL,
	"line1" text NOT NULL,
	"line2" text NOT NULL,
	"semi_major_axis_km" double precision NOT NULL,
	"apogee_altitude_km" double precision NOT NULL,
	"perigee_altitude_km" double precision NOT NULL,
	"mean_altitude_km" double precision NOT NULL,
	"period_min" double precision NOT NULL,
	"specific_energy_j_per_kg" double precision NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "orbit_ingest_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"spacecraft_id" uuid NOT NULL,
	"created_by" uuid,
	"status" "orbit_ingest_status" NOT NULL,
	"filename" text NOT NULL,
	"byte_size" integer NOT NULL,
	"content_sha256" text NOT NULL,
	"content" text,
	"format" text,
	"processed" integer DEFAULT 0 NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"record_count" integer DEFAULT 0 NOT NULL,
	"new_count" integer DEFAULT 0 NOT NULL,
	"duplicate_count" integer DEFAULT 0 NOT NULL,
	"invalid_count" integer DEFAULT 0 NOT NULL,
	"imported_count" integer,
	"errors" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"existing_file_id" uuid,
	"file_id" uuid,
	"message" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sailing_periods" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"spacecraft_id" uuid NOT NULL,
	"start_at" timestamp with time zone NOT NULL,
	"end_at" timestamp with time zone NOT NULL,
	"mode" "sail_mode" NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sailing_periods_order" CHECK ("sailing_periods"."end_at" > "sailing_periods"."start_at")
);
--> statement-breakpoint
CREATE TABLE "snapshots" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"slug" text NOT NULL,
	"spacecraft_id" uuid NOT NULL,
	"owner_id" uuid,
	"title" text NOT NULL,
	"caption" text DEFAULT '' NOT NULL,
	"is_public" boolean DEFAULT false NOT NULL,
	"data" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "spacecraft" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"slug" text NOT NULL,
	"name" text NOT NULL,
	"catalog_number" text NOT NULL,
	"catalog_number_int" integer NOT NULL,
	"international_designator" text DEFAULT '' NOT NULL,
	"mass_kg" double precision NOT NULL,
	"sail_area_m2" double precision NOT NULL,
	"sail_reflectivity" double precision NOT NULL,
	"drag_coefficient" double precision NOT NULL,
	"drag_area_edge_on_m2" double precision NOT NULL,
	"launch_date" date,
	"sail_deployed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "element_set_files" ADD CONSTRAINT "element_set_files_spacecraft_id_spacecraft_id_fk" FOREIGN KEY ("spacecraft_id") REFERENCES "public"."spacecraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_set_files" ADD CONSTRAINT "element_set_files_uploaded_by_accounts_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_sets" ADD CONSTRAINT "element_sets_spacecraft_id_spacecraft_id_fk" FOREIGN KEY ("spacecraft_id") REFERENCES "public"."spacecraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "element_sets" ADD CONSTRAINT "element_sets_file_id_element_set_files_id_fk" FOREIGN KEY ("file_id") REFERENCES "public"."element_set_files"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "orbit_ingest_jobs" ADD CONSTRAINT "orbit_ingest_jobs_spacecraft_id_spacecraft_id_fk" FOREIGN KEY ("spacecraft_id") REFERENCES "public"."spacecraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "orbit_ingest_jobs" ADD CONSTRAINT "orbit_ingest_jobs_created_by_accounts_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "orbit_ingest_jobs" ADD CONSTRAINT "orbit_ingest_jobs_existing_file_id_element_set_files_id_fk" FOREIGN KEY ("existing_file_id") REFERENCES "public"."element_set_files"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "orbit_ingest_jobs" ADD CONSTRAINT "orbit_ingest_jobs_file_id_element_set_files_id_fk" FOREIGN KEY ("file_id") REFERENCES "public"."element_set_files"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sailing_periods" ADD CONSTRAINT "sailing_periods_spacecraft_id_spacecraft_id_fk" FOREIGN KEY ("spacecraft_id") REFERENCES "public"."spacecraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sailing_periods" ADD CONSTRAINT "sailing_periods_created_by_accounts_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "snapshots" ADD CONSTRAINT "snapshots_spacecraft_id_spacecraft_id_fk" FOREIGN KEY ("spacecraft_id") REFERENCES "public"."spacecraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "snapshots" ADD CONSTRAINT "snapshots_owner_id_accounts_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "element_set_files_hash_key" ON "element_set_files" USING btree ("spacecraft_id","content_sha256");--> statement-breakpoint
CREATE UNIQUE INDEX "element_sets_object_epoch_no_key" ON "element_sets" USING btree ("spacecraft_id","catalog_number_int","epoch","element_set_no");--> statement-breakpoint
CREATE INDEX "element_sets_spacecraft_epoch_idx" ON "element_sets" USING btree ("spacecraft_id","epoch");--> statement-breakpoint
CREATE INDEX "element_sets_file_idx" ON "element_sets" USING btree ("file_id");--> statement-breakpoint
CREATE INDEX "orbit_ingest_jobs_spacecraft_idx" ON "orbit_ingest_jobs" USING btree ("spacecraft_id","created_at");--> statement-breakpoint
CREATE INDEX "sailing_periods_spacecraft_idx" ON "sailing_periods" USING btree ("spacecraft_id","start_at");--> statement-breakpoint
CREATE UNIQUE INDEX "snapshots_slug_key" ON "snapshots" USING btree ("slug");--> statement-breakpoint
CREATE INDEX "snapshots_owner_idx" ON "snapshots" USING btree ("owner_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "spacecraft_slug_key" ON "spacecraft" USING btree ("slug");--> statement-breakpoint
CREATE UNIQUE INDEX "spacecraft_catalog_key" ON "spacecraft" USING btree ("catalog_number_int");
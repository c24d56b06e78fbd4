CREATE TABLE "pass_reminders" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"place_id" uuid NOT NULL,
	"pass_key" text NOT NULL,
	"highest_at" timestamp with time zone NOT NULL,
	"max_elevation_deg" double precision NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "saved_places" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"account_id" uuid NOT NULL,
	"name" text NOT NULL,
	"latitude_deg" double precision NOT NULL,
	"longitude_deg" double precision NOT NULL,
	"time_zone" text DEFAULT 'UTC' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "saved_places_latitude_range" CHECK ("saved_places"."latitude_deg" between -90 and 90),
	CONSTRAINT "saved_places_longitude_range" CHECK ("saved_places"."longitude_deg" between -180 and 180)
);
--> statement-breakpoint
ALTER TABLE "email_preferences" ADD COLUMN "pass_reminders" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "pass_reminders" ADD CONSTRAINT "pass_reminders_place_id_saved_places_id_fk" FOREIGN KEY ("place_id") REFERENCES "public"."saved_places"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "saved_places" ADD CONSTRAINT "saved_places_account_id_accounts_id_fk" FOREIGN KEY ("account_id") REFERENCES "public"."accounts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "pass_reminders_pass_key_key" ON "pass_reminders" USING btree ("pass_key");--> statement-breakpoint
CREATE INDEX "pass_reminders_place_idx" ON "pass_reminders" USING btree ("place_id","highest_at");--> statement-breakpoint
CREATE UNIQUE INDEX "saved_places_account_name_key" ON "saved_places" USING btree ("account_id",lower("name"));
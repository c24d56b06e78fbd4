ALTER TABLE "spacecraft" ADD COLUMN "is_mission_craft" boolean DEFAULT false NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX "spacecraft_one_mission_craft" ON "spacecraft" USING btree ("is_mission_craft") WHERE "spacecraft"."is_mission_craft";--> statement-breakpoint
ALTER TABLE "spacecraft" ADD CONSTRAINT "spacecraft_sail_area_not_negative" CHECK ("spacecraft"."sail_area_m2" >= 0);
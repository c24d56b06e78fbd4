-- The trend chart reduces a view to min/max per pixel column inside PostgreSQL (orbit.service.ts, getTrendView).
-- Covering index: the view's columns and the rate window's rows are read by an index-only scan, in epoch order,
-- without touching the wide heap rows (the TLE lines). drizzle-kit cannot express INCLUDE, hence by hand.
CREATE INDEX IF NOT EXISTS "element_sets_trend_idx" ON "element_sets" USING btree ("spacecraft_id", "epoch_ms")
  INCLUDE ("element_set_no", "outlier", "apogee_altitude_km", "perigee_altitude_km", "mean_altitude_km", "semi_major_axis_km", "specific_energy_j_per_kg");
--> statement-breakpoint
-- The outliers in a view: few, found without walking the view's good sets.
CREATE INDEX IF NOT EXISTS "element_sets_outlier_idx" ON "element_sets" USING btree ("spacecraft_id", "epoch_ms") WHERE "outlier";

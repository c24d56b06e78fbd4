-- Only one reconciliation run at a time over the same days: two queued or running runs may not overlap.
-- (A gist exclusion on the range; range types carry their own gist operator class, no extension needed.)
ALTER TABLE "recon_runs" ADD CONSTRAINT "recon_runs_one_active_per_range"
  EXCLUDE USING gist (tstzrange("from_at", "to_at", '[)') WITH &&) WHERE ("status" IN ('queued', 'running'));

-- Sailing periods of one craft may touch but never overlap: half-open ranges, checked by the database so two
-- concurrent saves cannot both slip past a check in the code. btree_gist gives GiST an equality operator for uuid.
CREATE EXTENSION IF NOT EXISTS btree_gist;--> statement-breakpoint
ALTER TABLE "sailing_periods" ADD CONSTRAINT "sailing_periods_no_overlap"
  EXCLUDE USING gist ("spacecraft_id" WITH =, tstzrange("start_at", "end_at", '[)') WITH &&);

-- Every change of an upload (status, progress, counts) is announced on the channel `orbit_upload_changed` with the
-- upload's id, so a status request can wait for the next change instead of the client asking over and over
-- (server/modules/orbit/upload-watch.ts). NOTIFY is sent on commit: a listener sees only committed changes.
CREATE OR REPLACE FUNCTION "orbit_ingest_jobs_announce_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('orbit_upload_changed', NEW.id::text);
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "orbit_ingest_jobs_announce_change" AFTER UPDATE ON "orbit_ingest_jobs"
  FOR EACH ROW EXECUTE FUNCTION "orbit_ingest_jobs_announce_change"();

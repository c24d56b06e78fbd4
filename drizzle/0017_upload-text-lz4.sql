-- Uploaded element-set files are held whole (on the upload job, then on the file row): up to tens of megabytes of
-- text per upload. lz4 compresses them several times faster than PostgreSQL's default (pglz) at a slightly larger
-- size, and a value moved from the job row to the file row stays compressed as it is. Only on a server built with
-- lz4 (PostgreSQL 14+ as commonly packaged); elsewhere the columns keep the default.
DO $$
BEGIN
  IF 'lz4' = ANY (SELECT unnest(enumvals) FROM pg_settings WHERE name = 'default_toast_compression') THEN
    ALTER TABLE "orbit_ingest_jobs" ALTER COLUMN "content" SET COMPRESSION lz4;
    ALTER TABLE "element_set_files" ALTER COLUMN "content" SET COMPRESSION lz4;
  END IF;
END $$;

-- The data many copies of one mail share (a dispatch's title, body, charts …) is stored once per dispatch instead of
-- on each outbox row; a row names it by shared_key and keeps only its own fields (its unsubscribe link). No foreign
-- key and no index on shared_key: each would cost every one of the 10,000 row writes of a dispatch, and the only
-- reader by that column is housekeeping's occasional sweep for shared rows nothing names any more.
CREATE TABLE IF NOT EXISTS "mail_shared" (
	"key" text PRIMARY KEY NOT NULL,
	"template" text NOT NULL,
	"data" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "mail_queue" ADD COLUMN IF NOT EXISTS "shared_key" text;
--> statement-breakpoint
-- A batch (the rows under one batch key, sent in one call under that key) is claimed by one row of its own here,
-- with the lease and attempt count, instead of by a write to each of its messages: a message row is written when
-- it is queued and once more when its answer comes.
CREATE TABLE IF NOT EXISTS "mail_batches" (
	"key" text PRIMARY KEY NOT NULL,
	"state" "mail_state" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"lease_until" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "mail_batches_due_idx" ON "mail_batches" USING btree ("next_attempt_at") WHERE "mail_batches"."state" = 'queued';
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS "mail_batches_lease_idx" ON "mail_batches" USING btree ("lease_until") WHERE "mail_batches"."state" = 'sending';
--> statement-breakpoint
-- Batches still to send (or claimed by a worker of the old code) get their row; their messages wait as `queued`.
INSERT INTO "mail_batches" ("key", "attempts", "next_attempt_at")
SELECT "batch_key", max("attempts"), min("next_attempt_at") FROM "mail_queue"
 WHERE "batch_key" IS NOT NULL AND "state" IN ('queued', 'sending') GROUP BY "batch_key"
ON CONFLICT ("key") DO NOTHING;
--> statement-breakpoint
UPDATE "mail_queue" SET "state" = 'queued', "lease_until" = NULL WHERE "batch_key" IS NOT NULL AND "state" = 'sending';
--> statement-breakpoint
-- Batch messages are found through their batch row now, so the partial index for claiming them goes.
DROP INDEX IF EXISTS "mail_queue_batch_due_idx";

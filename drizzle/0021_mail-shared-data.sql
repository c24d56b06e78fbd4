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

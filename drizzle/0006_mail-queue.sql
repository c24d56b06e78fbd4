CREATE TYPE "public"."mail_category" AS ENUM('transactional', 'dispatch');--> statement-breakpoint
CREATE TYPE "public"."mail_state" AS ENUM('queued', 'sending', 'sent', 'failed');--> statement-breakpoint
CREATE TABLE "mail_queue" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"idempotency_key" text NOT NULL,
	"template" text NOT NULL,
	"to_address" text NOT NULL,
	"data" jsonb NOT NULL,
	"category" "mail_category" NOT NULL,
	"headers" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"batch_key" text,
	"account_id" uuid,
	"state" "mail_state" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"lease_until" timestamp with time zone,
	"provider_id" text,
	"last_answer" jsonb,
	"sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_queue_idempotency_key_unique" UNIQUE("idempotency_key")
);
--> statement-breakpoint
ALTER TABLE "mail_queue" ADD CONSTRAINT "mail_queue_account_id_accounts_id_fk" FOREIGN KEY ("account_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "mail_queue_due_idx" ON "mail_queue" USING btree ("state","next_attempt_at");--> statement-breakpoint
CREATE INDEX "mail_queue_batch_idx" ON "mail_queue" USING btree ("batch_key");--> statement-breakpoint
CREATE INDEX "mail_queue_created_idx" ON "mail_queue" USING btree ("created_at");
ALTER TABLE "recon_runs" ADD COLUMN "steps_done" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "recon_runs" ADD COLUMN "steps_total" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "recon_runs" ADD COLUMN "fetched_count" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "recon_runs" ADD COLUMN "attempts" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "mail_queue" ADD COLUMN "attachments" jsonb DEFAULT '[]'::jsonb NOT NULL;
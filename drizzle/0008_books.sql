CREATE TYPE "public"."receipt_kind" AS ENUM('payment', 'correction', 'yearly');--> statement-breakpoint
CREATE TYPE "public"."recon_run_status" AS ENUM('queued', 'running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."refund_request_status" AS ENUM('requested', 'sent', 'failed');--> statement-breakpoint
ALTER TYPE "public"."ledger_kind" ADD VALUE 'dispute_reversal';--> statement-breakpoint
CREATE TABLE "books_settings" (
	"id" integer PRIMARY KEY DEFAULT 1 NOT NULL,
	"organisation_name" text DEFAULT '' NOT NULL,
	"address" text DEFAULT '' NOT NULL,
	"registration_number" text DEFAULT '' NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid,
	CONSTRAINT "books_settings_single_row" CHECK ("books_settings"."id" = 1)
);
--> statement-breakpoint
CREATE TABLE "month_closes" (
	"month" date PRIMARY KEY NOT NULL,
	"closed_at" timestamp with time zone DEFAULT now() NOT NULL,
	"closed_by" uuid,
	"run_id" uuid,
	"report" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "monthly_accounts" (
	"campaign_id" uuid NOT NULL,
	"month" date NOT NULL,
	"currency" text NOT NULL,
	"raised_minor" bigint NOT NULL,
	"fees_minor" bigint NOT NULL,
	"refunds_minor" bigint NOT NULL,
	"disputes_minor" bigint NOT NULL,
	"net_minor" bigint NOT NULL,
	"backer_count" integer NOT NULL,
	"published_at" timestamp with time zone DEFAULT now() NOT NULL,
	"published_by" uuid,
	CONSTRAINT "monthly_accounts_campaign_id_month_pk" PRIMARY KEY("campaign_id","month")
);
--> statement-breakpoint
CREATE TABLE "number_counters" (
	"name" text PRIMARY KEY NOT NULL,
	"last_value" bigint DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "receipts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" bigint NOT NULL,
	"kind" "receipt_kind" NOT NULL,
	"ledger_entry_id" bigint,
	"pledge_id" uuid,
	"backer_id" uuid,
	"year" integer,
	"amount_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"replaces_receipt_id" uuid,
	"voided_at" timestamp with time zone,
	"issued_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "recon_findings" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"run_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"subject_key" text NOT NULL,
	"processor_object_id" text,
	"ledger_entry_id" bigint,
	"pledge_id" uuid,
	"processor_amount_minor" bigint,
	"ledger_amount_minor" bigint,
	"currency" text,
	"details" jsonb
);
--> statement-breakpoint
CREATE TABLE "recon_processor_items" (
	"run_id" uuid NOT NULL,
	"balance_transaction_id" text NOT NULL,
	"source_id" text NOT NULL,
	"kind" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"fee_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"created_at" timestamp with time zone NOT NULL,
	CONSTRAINT "recon_processor_items_run_id_balance_transaction_id_pk" PRIMARY KEY("run_id","balance_transaction_id")
);
--> statement-breakpoint
CREATE TABLE "recon_resolutions" (
	"kind" text NOT NULL,
	"subject_key" text NOT NULL,
	"action" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"resolved_by" uuid,
	"resolved_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "recon_resolutions_kind_subject_key_pk" PRIMARY KEY("kind","subject_key")
);
--> statement-breakpoint
CREATE TABLE "recon_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"status" "recon_run_status" DEFAULT 'queued' NOT NULL,
	"from_at" timestamp with time zone NOT NULL,
	"to_at" timestamp with time zone NOT NULL,
	"progress" integer DEFAULT 0 NOT NULL,
	"progress_label" text DEFAULT '' NOT NULL,
	"summary" jsonb,
	"error" text,
	"started_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "refund_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"pledge_id" uuid NOT NULL,
	"processor_charge_id" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"reason" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"status" "refund_request_status" DEFAULT 'requested' NOT NULL,
	"processor_refund_id" text,
	"failure_message" text,
	"requested_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "refund_requests_amount_positive" CHECK ("refund_requests"."amount_minor" > 0)
);
--> statement-breakpoint
ALTER TABLE "ledger_entries" DROP CONSTRAINT "ledger_entries_sign";--> statement-breakpoint
ALTER TABLE "ledger_entries" ADD COLUMN "booked_month" date;--> statement-breakpoint
ALTER TABLE "books_settings" ADD CONSTRAINT "books_settings_updated_by_accounts_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "month_closes" ADD CONSTRAINT "month_closes_closed_by_accounts_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "month_closes" ADD CONSTRAINT "month_closes_run_id_recon_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."recon_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "monthly_accounts" ADD CONSTRAINT "monthly_accounts_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "monthly_accounts" ADD CONSTRAINT "monthly_accounts_month_month_closes_month_fk" FOREIGN KEY ("month") REFERENCES "public"."month_closes"("month") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "monthly_accounts" ADD CONSTRAINT "monthly_accounts_published_by_accounts_id_fk" FOREIGN KEY ("published_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "receipts" ADD CONSTRAINT "receipts_ledger_entry_id_ledger_entries_id_fk" FOREIGN KEY ("ledger_entry_id") REFERENCES "public"."ledger_entries"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "receipts" ADD CONSTRAINT "receipts_pledge_id_pledges_id_fk" FOREIGN KEY ("pledge_id") REFERENCES "public"."pledges"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "receipts" ADD CONSTRAINT "receipts_backer_id_accounts_id_fk" FOREIGN KEY ("backer_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recon_findings" ADD CONSTRAINT "recon_findings_run_id_recon_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."recon_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recon_processor_items" ADD CONSTRAINT "recon_processor_items_run_id_recon_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."recon_runs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recon_resolutions" ADD CONSTRAINT "recon_resolutions_resolved_by_accounts_id_fk" FOREIGN KEY ("resolved_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recon_runs" ADD CONSTRAINT "recon_runs_started_by_accounts_id_fk" FOREIGN KEY ("started_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "refund_requests" ADD CONSTRAINT "refund_requests_pledge_id_pledges_id_fk" FOREIGN KEY ("pledge_id") REFERENCES "public"."pledges"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "refund_requests" ADD CONSTRAINT "refund_requests_requested_by_accounts_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "receipts_number_key" ON "receipts" USING btree ("number");--> statement-breakpoint
CREATE INDEX "receipts_backer_idx" ON "receipts" USING btree ("backer_id");--> statement-breakpoint
CREATE INDEX "receipts_entry_idx" ON "receipts" USING btree ("ledger_entry_id");--> statement-breakpoint
CREATE UNIQUE INDEX "recon_findings_run_subject_key" ON "recon_findings" USING btree ("run_id","kind","subject_key");--> statement-breakpoint
CREATE INDEX "refund_requests_pledge_idx" ON "refund_requests" USING btree ("pledge_id");--> statement-breakpoint
CREATE UNIQUE INDEX "refund_requests_processor_key" ON "refund_requests" USING btree ("processor_refund_id");--> statement-breakpoint
ALTER TABLE "ledger_entries" ADD CONSTRAINT "ledger_entries_sign" CHECK (("ledger_entries"."kind"::text IN ('charge', 'dispute_reversal') AND "ledger_entries"."amount_minor" > 0) OR ("ledger_entries"."kind"::text NOT IN ('charge', 'dispute_reversal') AND "ledger_entries"."amount_minor" < 0));
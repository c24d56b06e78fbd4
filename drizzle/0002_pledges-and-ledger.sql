CREATE TYPE "public"."tier_kind" AS ENUM('one-time', 'monthly');--> statement-breakpoint
CREATE TYPE "public"."pledge_state" AS ENUM('started', 'paid', 'partly_refunded', 'refunded', 'disputed', 'failed', 'abandoned');--> statement-breakpoint
CREATE TYPE "public"."pledge_slot_state" AS ENUM('none', 'held', 'released');--> statement-breakpoint
CREATE TYPE "public"."ledger_kind" AS ENUM('charge', 'refund', 'dispute', 'fee', 'payout');--> statement-breakpoint
CREATE TABLE "campaigns" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"slug" text NOT NULL,
	"title" text NOT NULL,
	"summary" text DEFAULT '' NOT NULL,
	"story" text DEFAULT '' NOT NULL,
	"goal_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"starts_at" timestamp with time zone NOT NULL,
	"ends_at" timestamp with time zone NOT NULL,
	"processor_product_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "campaigns_goal_positive" CHECK ("campaigns"."goal_minor" > 0),
	CONSTRAINT "campaigns_currency_iso" CHECK ("campaigns"."currency" ~ '^[A-Z]{3}$'),
	CONSTRAINT "campaigns_ends_after_start" CHECK ("campaigns"."ends_at" > "campaigns"."starts_at")
);
--> statement-breakpoint
CREATE TABLE "stretch_targets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"amount_minor" bigint NOT NULL,
	"title" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stretch_targets_amount_positive" CHECK ("stretch_targets"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE TABLE "tiers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"title" text NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"min_amount_minor" bigint NOT NULL,
	"kind" "tier_kind" NOT NULL,
	"quantity_limit" integer,
	"sold_count" integer DEFAULT 0 NOT NULL,
	"estimated_delivery" date,
	"processor_price_id" text,
	"position" integer DEFAULT 0 NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "tiers_min_amount_positive" CHECK ("tiers"."min_amount_minor" > 0),
	CONSTRAINT "tiers_sold_nonnegative" CHECK ("tiers"."sold_count" >= 0),
	CONSTRAINT "tiers_quantity_positive" CHECK ("tiers"."quantity_limit" IS NULL OR "tiers"."quantity_limit" > 0)
);
--> statement-breakpoint
CREATE TABLE "memberships" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"pledge_id" uuid NOT NULL,
	"backer_id" uuid,
	"tier_id" uuid,
	"subscription_id" text NOT NULL,
	"customer_id" text NOT NULL,
	"status" text NOT NULL,
	"current_period_end" timestamp with time zone,
	"cancel_at_period_end" boolean DEFAULT false NOT NULL,
	"ended_at" timestamp with time zone,
	"is_demo" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pledges" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"campaign_id" uuid NOT NULL,
	"tier_id" uuid,
	"backer_id" uuid,
	"public_name" text,
	"message" text,
	"kind" "tier_kind" NOT NULL,
	"amount_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"state" "pledge_state" DEFAULT 'started' NOT NULL,
	"failure_code" text,
	"failure_reason" text,
	"slot_state" "pledge_slot_state" DEFAULT 'none' NOT NULL,
	"idempotency_key" text NOT NULL,
	"processor_customer_id" text,
	"checkout_session_id" text,
	"checkout_url" text,
	"payment_intent_id" text,
	"subscription_id" text,
	"paid_at" timestamp with time zone,
	"confirmation_sent_at" timestamp with time zone,
	"anonymised_at" timestamp with time zone,
	"is_demo" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "pledges_amount_positive" CHECK ("pledges"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE TABLE "ledger_entries" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"kind" "ledger_kind" NOT NULL,
	"amount_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"campaign_id" uuid,
	"pledge_id" uuid,
	"processor_object_id" text NOT NULL,
	"processor_charge_id" text,
	"processor_payment_intent_id" text,
	"processor_balance_transaction_id" text,
	"processor_invoice_id" text,
	"description" text DEFAULT '' NOT NULL,
	"occurred_at" timestamp with time zone NOT NULL,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"is_demo" boolean DEFAULT false NOT NULL,
	CONSTRAINT "ledger_entries_currency_iso" CHECK ("ledger_entries"."currency" ~ '^[A-Z]{3}$'),
	CONSTRAINT "ledger_entries_sign" CHECK (("ledger_entries"."kind" = 'charge' AND "ledger_entries"."amount_minor" > 0) OR ("ledger_entries"."kind" <> 'charge' AND "ledger_entries"."amount_minor" < 0))
);
--> statement-breakpoint
CREATE TABLE "payment_customers" (
	"account_id" uuid PRIMARY KEY NOT NULL,
	"customer_id" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_customers_customer_id_unique" UNIQUE("customer_id")
);
--> statement-breakpoint
CREATE TABLE "processed_events" (
	"event_id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"processed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "stretch_targets" ADD CONSTRAINT "stretch_targets_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tiers" ADD CONSTRAINT "tiers_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_pledge_id_pledges_id_fk" FOREIGN KEY ("pledge_id") REFERENCES "public"."pledges"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_backer_id_accounts_id_fk" FOREIGN KEY ("backer_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "memberships" ADD CONSTRAINT "memberships_tier_id_tiers_id_fk" FOREIGN KEY ("tier_id") REFERENCES "public"."tiers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pledges" ADD CONSTRAINT "pledges_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pledges" ADD CONSTRAINT "pledges_tier_id_tiers_id_fk" FOREIGN KEY ("tier_id") REFERENCES "public"."tiers"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pledges" ADD CONSTRAINT "pledges_backer_id_accounts_id_fk" FOREIGN KEY ("backer_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ledger_entries" ADD CONSTRAINT "ledger_entries_campaign_id_campaigns_id_fk" FOREIGN KEY ("campaign_id") REFERENCES "public"."campaigns"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ledger_entries" ADD CONSTRAINT "ledger_entries_pledge_id_pledges_id_fk" FOREIGN KEY ("pledge_id") REFERENCES "public"."pledges"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_customers" ADD CONSTRAINT "payment_customers_account_id_accounts_id_fk" FOREIGN KEY ("account_id") REFERENCES "public"."accounts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "campaigns_slug_key" ON "campaigns" USING btree ("slug");--> statement-breakpoint
CREATE INDEX "stretch_targets_campaign_idx" ON "stretch_targets" USING btree ("campaign_id","amount_minor");--> statement-breakpoint
CREATE INDEX "tiers_campaign_idx" ON "tiers" USING btree ("campaign_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "memberships_subscription_key" ON "memberships" USING btree ("subscription_id");--> statement-breakpoint
CREATE UNIQUE INDEX "memberships_pledge_key" ON "memberships" USING btree ("pledge_id");--> statement-breakpoint
CREATE INDEX "memberships_backer_idx" ON "memberships" USING btree ("backer_id");--> statement-breakpoint
CREATE UNIQUE INDEX "pledges_idempotency_key" ON "pledges" USING btree ("idempotency_key");--> statement-breakpoint
CREATE UNIQUE INDEX "pledges_checkout_session_key" ON "pledges" USING btree ("checkout_session_id");--> statement-breakpoint
CREATE UNIQUE INDEX "pledges_payment_intent_key" ON "pledges" USING btree ("payment_intent_id");--> statement-breakpoint
CREATE UNIQUE INDEX "pledges_subscription_key" ON "pledges" USING btree ("subscription_id");--> statement-breakpoint
CREATE INDEX "pledges_backer_idx" ON "pledges" USING btree ("backer_id","created_at");--> statement-breakpoint
CREATE INDEX "pledges_campaign_idx" ON "pledges" USING btree ("campaign_id","state");--> statement-breakpoint
CREATE UNIQUE INDEX "ledger_entries_object_kind_key" ON "ledger_entries" USING btree ("processor_object_id","kind");--> statement-breakpoint
CREATE INDEX "ledger_entries_campaign_idx" ON "ledger_entries" USING btree ("campaign_id","kind");--> statement-breakpoint
CREATE INDEX "ledger_entries_pledge_idx" ON "ledger_entries" USING btree ("pledge_id");
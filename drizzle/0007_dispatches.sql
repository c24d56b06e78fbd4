CREATE TYPE "public"."dispatch_audience" AS ENUM('everyone', 'backers', 'tiers', 'crew');--> statement-breakpoint
CREATE TYPE "public"."dispatch_state" AS ENUM('draft', 'scheduled', 'published', 'withdrawn');--> statement-breakpoint
CREATE TABLE "dispatch_sends" (
	"dispatch_id" uuid PRIMARY KEY NOT NULL,
	"status" text DEFAULT 'pending' NOT NULL,
	"recipient_count" integer,
	"batch_count" integer,
	"requested_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	CONSTRAINT "dispatch_sends_status" CHECK ("dispatch_sends"."status" IN ('pending', 'sending', 'done'))
);
--> statement-breakpoint
CREATE TABLE "dispatch_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"dispatch_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"title" text NOT NULL,
	"body_markdown" text NOT NULL,
	"hero_image_key" text,
	"charts" jsonb NOT NULL,
	"edited_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "dispatches" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"slug" text NOT NULL,
	"title" text NOT NULL,
	"body_markdown" text DEFAULT '' NOT NULL,
	"hero_image_key" text,
	"hero_alt" text DEFAULT '' NOT NULL,
	"charts" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"audience_kind" "dispatch_audience" DEFAULT 'everyone' NOT NULL,
	"audience_tier_ids" uuid[] DEFAULT '{}'::uuid[] NOT NULL,
	"state" "dispatch_state" DEFAULT 'draft' NOT NULL,
	"publish_at" timestamp with time zone,
	"published_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	"email_on_publish" boolean DEFAULT false NOT NULL,
	"version" integer DEFAULT 0 NOT NULL,
	"author_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dispatches_scheduled_has_time" CHECK ("dispatches"."state" <> 'scheduled' OR "dispatches"."publish_at" IS NOT NULL),
	CONSTRAINT "dispatches_tiers_listed" CHECK ("dispatches"."audience_kind" <> 'tiers' OR cardinality("dispatches"."audience_tier_ids") > 0)
);
--> statement-breakpoint
CREATE TABLE "stored_files" (
	"key" text PRIMARY KEY NOT NULL,
	"content_type" text NOT NULL,
	"byte_size" integer NOT NULL,
	"width" integer,
	"height" integer,
	"purpose" text NOT NULL,
	"owner_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "dispatch_sends" ADD CONSTRAINT "dispatch_sends_dispatch_id_dispatches_id_fk" FOREIGN KEY ("dispatch_id") REFERENCES "public"."dispatches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispatch_sends" ADD CONSTRAINT "dispatch_sends_requested_by_accounts_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispatch_versions" ADD CONSTRAINT "dispatch_versions_dispatch_id_dispatches_id_fk" FOREIGN KEY ("dispatch_id") REFERENCES "public"."dispatches"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispatch_versions" ADD CONSTRAINT "dispatch_versions_edited_by_accounts_id_fk" FOREIGN KEY ("edited_by") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispatches" ADD CONSTRAINT "dispatches_author_id_accounts_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stored_files" ADD CONSTRAINT "stored_files_owner_id_accounts_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."accounts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "dispatch_versions_key" ON "dispatch_versions" USING btree ("dispatch_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "dispatches_slug_key" ON "dispatches" USING btree ("slug");--> statement-breakpoint
CREATE INDEX "dispatches_feed_idx" ON "dispatches" USING btree ("state","published_at");--> statement-breakpoint
CREATE INDEX "stored_files_purpose_idx" ON "stored_files" USING btree ("purpose","created_at");
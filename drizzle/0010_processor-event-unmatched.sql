CREATE TABLE "processor_event_unmatched" (
	"event_id" text PRIMARY KEY NOT NULL,
	"event_type" text NOT NULL,
	"object_type" text NOT NULL,
	"object_id" text NOT NULL,
	"charge_id" text,
	"payment_intent_id" text,
	"customer_id" text,
	"amount_minor" bigint,
	"currency" text,
	"occurred_at" timestamp with time zone NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE INDEX "processor_event_unmatched_received_idx" ON "processor_event_unmatched" USING btree ("received_at");
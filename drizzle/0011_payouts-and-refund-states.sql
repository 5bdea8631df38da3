CREATE TABLE "payout_accounts" (
	"user_id" text PRIMARY KEY NOT NULL,
	"stripe_account_id" text NOT NULL,
	"details_submitted" boolean DEFAULT false NOT NULL,
	"transfers_capability" text DEFAULT 'inactive' NOT NULL,
	"payouts_enabled" boolean DEFAULT false NOT NULL,
	"requirements_due" text[] DEFAULT '{}'::text[] NOT NULL,
	"disabled_reason" text,
	"state_as_of" timestamp with time zone DEFAULT now() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payout_accounts_stripe_account_id_unique" UNIQUE("stripe_account_id")
);
--> statement-breakpoint
CREATE TABLE "payout_reversals" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"payout_id" text NOT NULL,
	"refund_id" text NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"stripe_reversal_id" text,
	"status" text DEFAULT 'due' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payout_reversals_refund_id_unique" UNIQUE("refund_id"),
	CONSTRAINT "payout_reversals_stripe_reversal_id_unique" UNIQUE("stripe_reversal_id")
);
--> statement-breakpoint
ALTER TABLE "booking_refunds" ALTER COLUMN "stripe_refund_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "payouts" ALTER COLUMN "stripe_transfer_id" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "booking_refunds" ADD COLUMN "status" text DEFAULT 'requested' NOT NULL;--> statement-breakpoint
ALTER TABLE "booking_refunds" ADD COLUMN "failure_reason" text;--> statement-breakpoint
ALTER TABLE "booking_refunds" ADD COLUMN "updated_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "bookings" ADD COLUMN "charge_id" text;--> statement-breakpoint
ALTER TABLE "bookings" ADD COLUMN "payment_processing_since" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "reversed_minor" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "status" text DEFAULT 'transferred' NOT NULL;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "destination" text;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "transferred_minor" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "last_error" text;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "held_since" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "transferred_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "payouts" ADD COLUMN "updated_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "payout_accounts" ADD CONSTRAINT "payout_accounts_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payout_reversals" ADD CONSTRAINT "payout_reversals_payout_id_payouts_id_fk" FOREIGN KEY ("payout_id") REFERENCES "public"."payouts"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payout_reversals" ADD CONSTRAINT "payout_reversals_refund_id_booking_refunds_id_fk" FOREIGN KEY ("refund_id") REFERENCES "public"."booking_refunds"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "payout_reversals_payout_idx" ON "payout_reversals" USING btree ("payout_id");--> statement-breakpoint
CREATE INDEX "payouts_inspector_idx" ON "payouts" USING btree ("inspector_id","created_at");--> statement-breakpoint
ALTER TABLE "payouts" ADD CONSTRAINT "payouts_stripe_transfer_id_unique" UNIQUE("stripe_transfer_id");--> statement-breakpoint
-- Refunds and transfers recorded before these columns existed were made at once.
UPDATE "booking_refunds" SET "status" = 'succeeded';--> statement-breakpoint
UPDATE "payouts" SET "transferred_minor" = "amount_minor", "transferred_at" = "created_at";

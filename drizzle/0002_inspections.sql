CREATE TYPE "public"."booking_status" AS ENUM('awaiting_payment', 'paid', 'accepted', 'report_filed', 'closed', 'declined', 'cancelled', 'refunded', 'expired');--> statement-breakpoint
CREATE TABLE "booking_events" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"booking_id" text NOT NULL,
	"kind" text NOT NULL,
	"from_status" "booking_status",
	"to_status" "booking_status",
	"actor_id" text,
	"stripe_event_id" text,
	"note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "booking_refunds" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"booking_id" text NOT NULL,
	"stripe_refund_id" text NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"reason" text NOT NULL,
	"rule" text NOT NULL,
	"issued_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "booking_refunds_stripe_refund_id_unique" UNIQUE("stripe_refund_id")
);
--> statement-breakpoint
CREATE TABLE "bookings" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"reference" text NOT NULL,
	"listing_id" uuid NOT NULL,
	"buyer_id" text NOT NULL,
	"inspector_id" text NOT NULL,
	"slot_id" text,
	"category" text NOT NULL,
	"starts_at" timestamp with time zone NOT NULL,
	"ends_at" timestamp with time zone NOT NULL,
	"period" "tstzrange" GENERATED ALWAYS AS (tstzrange(starts_at, ends_at, '[)')) STORED,
	"status" "booking_status" DEFAULT 'awaiting_payment' NOT NULL,
	"fee_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"platform_fee_minor" integer NOT NULL,
	"inspector_share_minor" integer NOT NULL,
	"refunded_minor" integer DEFAULT 0 NOT NULL,
	"refund_due_minor" integer,
	"checkout_session_id" text,
	"checkout_url" text,
	"checkout_expires_at" timestamp with time zone,
	"payment_intent_id" text,
	"decline_reason" text,
	"cancel_reason" text,
	"report_id" text,
	"paid_at" timestamp with time zone,
	"accepted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bookings_reference_unique" UNIQUE("reference"),
	CONSTRAINT "bookings_checkout_session_id_unique" UNIQUE("checkout_session_id")
);
--> statement-breakpoint
CREATE TABLE "inspector_fees" (
	"inspector_id" text NOT NULL,
	"category" text NOT NULL,
	"amount_minor" integer NOT NULL,
	CONSTRAINT "inspector_fees_inspector_id_category_pk" PRIMARY KEY("inspector_id","category")
);
--> statement-breakpoint
CREATE TABLE "inspector_profiles" (
	"user_id" text PRIMARY KEY NOT NULL,
	"headline" text DEFAULT '' NOT NULL,
	"bio" text DEFAULT '' NOT NULL,
	"qualifications" text DEFAULT '' NOT NULL,
	"base_city" text DEFAULT '' NOT NULL,
	"regions" text[] DEFAULT '{}'::text[] NOT NULL,
	"categories" text[] DEFAULT '{}'::text[] NOT NULL,
	"currency" text DEFAULT 'EUR' NOT NULL,
	"certificate_file_key" text,
	"certificate_file_name" text,
	"certificate_uploaded_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inspector_slots" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"inspector_id" text NOT NULL,
	"starts_at" timestamp with time zone NOT NULL,
	"ends_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payouts" (
	"id" text PRIMARY KEY DEFAULT gen_random_uuid()::text NOT NULL,
	"booking_id" text NOT NULL,
	"inspector_id" text NOT NULL,
	"amount_minor" integer NOT NULL,
	"currency" text NOT NULL,
	"stripe_transfer_id" text NOT NULL,
	"details" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "processed_webhook_events" (
	"event_id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"booking_id" text,
	"outcome" text NOT NULL,
	"processed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "booking_events" ADD CONSTRAINT "booking_events_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_events" ADD CONSTRAINT "booking_events_actor_id_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_refunds" ADD CONSTRAINT "booking_refunds_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_refunds" ADD CONSTRAINT "booking_refunds_issued_by_user_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_buyer_id_user_id_fk" FOREIGN KEY ("buyer_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_inspector_id_inspector_profiles_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."inspector_profiles"("user_id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_slot_id_inspector_slots_id_fk" FOREIGN KEY ("slot_id") REFERENCES "public"."inspector_slots"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspector_fees" ADD CONSTRAINT "inspector_fees_inspector_id_inspector_profiles_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."inspector_profiles"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspector_profiles" ADD CONSTRAINT "inspector_profiles_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspector_slots" ADD CONSTRAINT "inspector_slots_inspector_id_inspector_profiles_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."inspector_profiles"("user_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payouts" ADD CONSTRAINT "payouts_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payouts" ADD CONSTRAINT "payouts_inspector_id_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "booking_events_booking_idx" ON "booking_events" USING btree ("booking_id","created_at");--> statement-breakpoint
CREATE INDEX "booking_refunds_booking_idx" ON "booking_refunds" USING btree ("booking_id");--> statement-breakpoint
CREATE INDEX "bookings_buyer_idx" ON "bookings" USING btree ("buyer_id","starts_at");--> statement-breakpoint
CREATE INDEX "bookings_inspector_idx" ON "bookings" USING btree ("inspector_id","starts_at");--> statement-breakpoint
CREATE INDEX "bookings_listing_idx" ON "bookings" USING btree ("listing_id");--> statement-breakpoint
CREATE INDEX "inspector_slots_inspector_starts_idx" ON "inspector_slots" USING btree ("inspector_id","starts_at");--> statement-breakpoint
CREATE UNIQUE INDEX "payouts_booking_unique" ON "payouts" USING btree ("booking_id");
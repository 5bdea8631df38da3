CREATE TABLE "watch_digests" (
	"user_id" text PRIMARY KEY NOT NULL,
	"last_sent_at" timestamp with time zone,
	"digests_off" boolean DEFAULT false NOT NULL
);
--> statement-breakpoint
CREATE TABLE "inspector_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text NOT NULL,
	"country" text NOT NULL,
	"region" text NOT NULL,
	"listing_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"served_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "listing_watches" ADD COLUMN "seen_price_minor" bigint;--> statement-breakpoint
ALTER TABLE "listing_watches" ADD COLUMN "seen_status" "listing_status";--> statement-breakpoint
ALTER TABLE "listing_watches" ADD COLUMN "told_through" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "watch_digests" ADD CONSTRAINT "watch_digests_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspector_requests" ADD CONSTRAINT "inspector_requests_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "inspector_requests" ADD CONSTRAINT "inspector_requests_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "inspector_requests_person_region_idx" ON "inspector_requests" USING btree ("user_id","country",lower("region"));--> statement-breakpoint
CREATE INDEX "inspector_requests_open_idx" ON "inspector_requests" USING btree ("country") WHERE "inspector_requests"."served_at" is null;--> statement-breakpoint
-- Watches made before the digest: what they were told is the listing as it stands now.
UPDATE "listing_watches" AS "w" SET "seen_price_minor" = "l"."price_minor", "seen_status" = "l"."status" FROM "listings" AS "l" WHERE "l"."id" = "w"."listing_id";

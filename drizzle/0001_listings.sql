CREATE TYPE "public"."listing_status" AS ENUM('draft', 'published', 'sold', 'withdrawn');--> statement-breakpoint
CREATE TYPE "public"."machine_category" AS ENUM('centre_lathe', 'toolroom_lathe', 'cnc_lathe', 'milling_machine', 'surface_grinder', 'other');--> statement-breakpoint
CREATE TYPE "public"."machine_condition" AS ENUM('reconditioned', 'used', 'as_is');--> statement-breakpoint
CREATE TABLE "listing_documents" (
	"id" uuid PRIMARY KEY NOT NULL,
	"listing_id" uuid NOT NULL,
	"title" text NOT NULL,
	"storage_key" text NOT NULL,
	"bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "listing_inquiries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"listing_id" uuid NOT NULL,
	"sender_id" text NOT NULL,
	"message" text NOT NULL,
	"phone" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "listing_photos" (
	"id" uuid PRIMARY KEY NOT NULL,
	"listing_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"thumbnail_key" text NOT NULL,
	"large_key" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"original_name" text NOT NULL,
	"original_bytes" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "listing_watches" (
	"listing_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "listing_watches_listing_id_user_id_pk" PRIMARY KEY("listing_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "listings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seller_id" text NOT NULL,
	"slug" text NOT NULL,
	"status" "listing_status" DEFAULT 'draft' NOT NULL,
	"category" "machine_category" NOT NULL,
	"make" text NOT NULL,
	"model" text NOT NULL,
	"year" integer,
	"serial_number" text,
	"swing_over_bed_mm" double precision,
	"distance_between_centres_mm" double precision,
	"spindle_bore_mm" double precision,
	"spindle_nose" text,
	"motor_power_kw" double precision,
	"weight_kg" integer,
	"city" text NOT NULL,
	"region" text,
	"country" text NOT NULL,
	"price_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"condition" "machine_condition" NOT NULL,
	"tooling_included" text,
	"description" text NOT NULL,
	"published_at" timestamp with time zone,
	"sold_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "listings_price_positive" CHECK ("listings"."price_minor" > 0),
	CONSTRAINT "listings_currency_code" CHECK ("listings"."currency" ~ '^[A-Z]{3}$')
);
--> statement-breakpoint
ALTER TABLE "listing_documents" ADD CONSTRAINT "listing_documents_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listing_inquiries" ADD CONSTRAINT "listing_inquiries_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listing_inquiries" ADD CONSTRAINT "listing_inquiries_sender_id_user_id_fk" FOREIGN KEY ("sender_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listing_photos" ADD CONSTRAINT "listing_photos_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listing_watches" ADD CONSTRAINT "listing_watches_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listing_watches" ADD CONSTRAINT "listing_watches_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "listings" ADD CONSTRAINT "listings_seller_id_user_id_fk" FOREIGN KEY ("seller_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "listing_documents_listing_idx" ON "listing_documents" USING btree ("listing_id");--> statement-breakpoint
CREATE INDEX "listing_inquiries_listing_idx" ON "listing_inquiries" USING btree ("listing_id","created_at");--> statement-breakpoint
CREATE INDEX "listing_photos_listing_idx" ON "listing_photos" USING btree ("listing_id","position");--> statement-breakpoint
CREATE INDEX "listing_watches_user_idx" ON "listing_watches" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "listings_slug_idx" ON "listings" USING btree ("slug");--> statement-breakpoint
CREATE INDEX "listings_seller_idx" ON "listings" USING btree ("seller_id");--> statement-breakpoint
CREATE INDEX "listings_published_idx" ON "listings" USING btree ("status","published_at");
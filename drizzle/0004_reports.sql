CREATE TYPE "public"."report_status" AS ENUM('draft', 'signed', 'superseded');--> statement-breakpoint
CREATE TABLE "report_drafts" (
	"booking_id" text PRIMARY KEY NOT NULL,
	"inspector_id" text NOT NULL,
	"corrects_report_id" uuid,
	"form" jsonb NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "report_photos" (
	"id" uuid PRIMARY KEY NOT NULL,
	"booking_id" text NOT NULL,
	"test_code" text NOT NULL,
	"thumbnail_key" text NOT NULL,
	"large_key" text NOT NULL,
	"width" integer NOT NULL,
	"height" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"booking_id" text NOT NULL,
	"listing_id" uuid NOT NULL,
	"inspector_id" text NOT NULL,
	"supersedes_id" uuid,
	"revision" integer DEFAULT 1 NOT NULL,
	"status" "report_status" DEFAULT 'draft' NOT NULL,
	"profile_key" text NOT NULL,
	"profile_version" integer NOT NULL,
	"grade" text NOT NULL,
	"key_figures" jsonb NOT NULL,
	"measured_on" date NOT NULL,
	"draft_version" integer NOT NULL,
	"content" jsonb NOT NULL,
	"canonical_json" text,
	"content_hash" text,
	"signed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "report_drafts" ADD CONSTRAINT "report_drafts_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_drafts" ADD CONSTRAINT "report_drafts_inspector_id_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_drafts" ADD CONSTRAINT "report_drafts_corrects_report_id_reports_id_fk" FOREIGN KEY ("corrects_report_id") REFERENCES "public"."reports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "report_photos" ADD CONSTRAINT "report_photos_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_booking_id_bookings_id_fk" FOREIGN KEY ("booking_id") REFERENCES "public"."bookings"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_inspector_id_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_supersedes_id_reports_id_fk" FOREIGN KEY ("supersedes_id") REFERENCES "public"."reports"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "report_photos_booking_idx" ON "report_photos" USING btree ("booking_id","test_code");--> statement-breakpoint
CREATE UNIQUE INDEX "reports_content_hash_idx" ON "reports" USING btree ("content_hash");--> statement-breakpoint
CREATE UNIQUE INDEX "reports_supersedes_idx" ON "reports" USING btree ("supersedes_id");--> statement-breakpoint
CREATE UNIQUE INDEX "reports_one_draft_per_booking_idx" ON "reports" USING btree ("booking_id") WHERE "reports"."status" = 'draft';--> statement-breakpoint
CREATE INDEX "reports_listing_idx" ON "reports" USING btree ("listing_id","status","signed_at");--> statement-breakpoint
CREATE INDEX "reports_booking_idx" ON "reports" USING btree ("booking_id");
CREATE TABLE "rebuild_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"listing_id" uuid NOT NULL,
	"author_id" text NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"profile_key" text NOT NULL,
	"profile_version" integer NOT NULL,
	"units" text NOT NULL,
	"forms" jsonb NOT NULL,
	"results" jsonb NOT NULL,
	"as_found_on" date,
	"as_rebuilt_on" date,
	"work_done" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"published_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "rebuild_records_status" CHECK ("rebuild_records"."status" in ('draft', 'published')),
	CONSTRAINT "rebuild_records_units" CHECK ("rebuild_records"."units" in ('mm', 'inch'))
);
--> statement-breakpoint
ALTER TABLE "rebuild_records" ADD CONSTRAINT "rebuild_records_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "rebuild_records" ADD CONSTRAINT "rebuild_records_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "rebuild_records_listing_idx" ON "rebuild_records" USING btree ("listing_id");--> statement-breakpoint
CREATE INDEX "rebuild_records_author_idx" ON "rebuild_records" USING btree ("author_id");
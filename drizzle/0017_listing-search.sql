CREATE TABLE "listing_search" (
	"listing_id" uuid PRIMARY KEY NOT NULL,
	"status" "listing_status" NOT NULL,
	"category" "machine_category" NOT NULL,
	"published_at" timestamp with time zone,
	"price_minor" bigint NOT NULL,
	"currency" text NOT NULL,
	"country" text NOT NULL,
	"region_key" text,
	"swing_mm" double precision,
	"between_centres_mm" double precision,
	"search_text" text NOT NULL,
	"report_id" uuid,
	"grade" text,
	"grade_rank" smallint,
	"verified" boolean NOT NULL,
	"measured_on" date,
	"key_figures" jsonb,
	"spindle_runout_um" double precision,
	"axial_slip_um" double precision,
	"parallelism_vertical_um" double precision,
	"parallelism_horizontal_um" double precision,
	"centre_height_um" double precision,
	"bed_straightness_um" double precision
);
--> statement-breakpoint
ALTER TABLE "listing_search" ADD CONSTRAINT "listing_search_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "listing_search_newest_idx" ON "listing_search" USING btree ("status","published_at" DESC NULLS LAST,"listing_id" DESC NULLS LAST);--> statement-breakpoint
CREATE INDEX "listing_search_category_idx" ON "listing_search" USING btree ("category","status","published_at" DESC NULLS LAST,"listing_id" DESC NULLS LAST);--> statement-breakpoint
CREATE INDEX "listing_search_price_idx" ON "listing_search" USING btree ("status","price_minor","published_at" DESC NULLS LAST,"listing_id" DESC NULLS LAST);--> statement-breakpoint
CREATE INDEX "listing_search_best_accuracy_idx" ON "listing_search" USING btree ("grade_rank","spindle_runout_um","published_at" DESC NULLS LAST,"listing_id" DESC NULLS LAST) WHERE "listing_search"."status" = 'published' and "listing_search"."report_id" is not null;--> statement-breakpoint
CREATE INDEX "listing_search_runout_idx" ON "listing_search" USING btree ("spindle_runout_um") WHERE "listing_search"."spindle_runout_um" is not null;--> statement-breakpoint
CREATE INDEX "listing_search_axial_slip_idx" ON "listing_search" USING btree ("axial_slip_um") WHERE "listing_search"."axial_slip_um" is not null;--> statement-breakpoint
CREATE INDEX "listing_search_parallelism_idx" ON "listing_search" USING btree ("parallelism_vertical_um") WHERE "listing_search"."parallelism_vertical_um" is not null;--> statement-breakpoint
CREATE INDEX "listing_search_centre_height_idx" ON "listing_search" USING btree ("centre_height_um") WHERE "listing_search"."centre_height_um" is not null;--> statement-breakpoint
CREATE INDEX "listing_search_country_idx" ON "listing_search" USING btree ("country","status");--> statement-breakpoint
CREATE INDEX "listing_search_facets_idx" ON "listing_search" USING btree ("status","category","grade","verified","country");
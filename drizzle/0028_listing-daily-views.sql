CREATE TABLE "listing_daily_views" (
	"listing_id" uuid NOT NULL,
	"day" text NOT NULL,
	"views" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "listing_daily_views_listing_id_day_pk" PRIMARY KEY("listing_id","day")
);
--> statement-breakpoint
ALTER TABLE "listing_daily_views" ADD CONSTRAINT "listing_daily_views_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;
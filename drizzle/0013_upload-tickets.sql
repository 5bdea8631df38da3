CREATE TABLE "upload_tickets" (
	"upload_key" text PRIMARY KEY NOT NULL,
	"listing_id" uuid NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "upload_tickets" ADD CONSTRAINT "upload_tickets_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "upload_tickets_listing_idx" ON "upload_tickets" USING btree ("listing_id");
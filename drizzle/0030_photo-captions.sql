ALTER TABLE "listing_photos" ADD COLUMN "caption" text;--> statement-breakpoint
-- Sellers who listed before seller pages existed get theirs (new sellers get one with their first listing).
INSERT INTO "seller_pages" ("user_id") SELECT DISTINCT "seller_id" FROM "listings" ON CONFLICT DO NOTHING;

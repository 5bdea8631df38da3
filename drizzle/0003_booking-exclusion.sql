-- Two active bookings of one inspector can never overlap in time, and neither can two of their slots:
-- PostgreSQL enforces it (btree_gist lets the text id take part in a GiST exclusion with the range).
CREATE EXTENSION IF NOT EXISTS btree_gist;
--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_no_overlap_per_inspector"
  EXCLUDE USING gist ("inspector_id" WITH =, "period" WITH &&)
  WHERE ("status" IN ('awaiting_payment', 'paid', 'accepted', 'report_filed'));
--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_period_positive" CHECK ("ends_at" > "starts_at");
--> statement-breakpoint
ALTER TABLE "inspector_slots" ADD CONSTRAINT "inspector_slots_no_overlap"
  EXCLUDE USING gist ("inspector_id" WITH =, tstzrange("starts_at", "ends_at", '[)') WITH &&);
--> statement-breakpoint
ALTER TABLE "inspector_slots" ADD CONSTRAINT "inspector_slots_period_positive" CHECK ("ends_at" > "starts_at");
--> statement-breakpoint
ALTER TABLE "inspector_fees" ADD CONSTRAINT "inspector_fees_positive" CHECK ("amount_minor" > 0);

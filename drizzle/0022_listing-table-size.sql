ALTER TABLE "listings" ADD COLUMN "table_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "table_width_mm" double precision;
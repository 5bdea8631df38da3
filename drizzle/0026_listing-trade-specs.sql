ALTER TABLE "listings" ADD COLUMN "supply_voltage" integer;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "supply_phases" smallint;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "supply_frequency_hz" smallint;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "spindle_speed_min_rpm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "spindle_speed_max_rpm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "tailstock_taper" text;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "thread_pitch_min_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "thread_pitch_max_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "thread_tpi_min" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "thread_tpi_max" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "swing_over_cross_slide_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "footprint_length_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD COLUMN "footprint_width_mm" double precision;--> statement-breakpoint
ALTER TABLE "listings" ADD CONSTRAINT "listings_supply_phases" CHECK ("listings"."supply_phases" in (1, 3));--> statement-breakpoint
ALTER TABLE "listings" ADD CONSTRAINT "listings_supply_frequency" CHECK ("listings"."supply_frequency_hz" in (50, 60));
CREATE TABLE "machine_listings" (
	"listing_id" uuid PRIMARY KEY NOT NULL,
	"machine_id" uuid NOT NULL,
	"confirmed_by" text,
	"confirmed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "machine_match_refusals" (
	"listing_id" uuid NOT NULL,
	"other_listing_id" uuid NOT NULL,
	"refused_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "machine_match_refusals_listing_id_other_listing_id_pk" PRIMARY KEY("listing_id","other_listing_id")
);
--> statement-breakpoint
CREATE TABLE "machines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "machine_listings" ADD CONSTRAINT "machine_listings_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_listings" ADD CONSTRAINT "machine_listings_machine_id_machines_id_fk" FOREIGN KEY ("machine_id") REFERENCES "public"."machines"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_listings" ADD CONSTRAINT "machine_listings_confirmed_by_user_id_fk" FOREIGN KEY ("confirmed_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_match_refusals" ADD CONSTRAINT "machine_match_refusals_listing_id_listings_id_fk" FOREIGN KEY ("listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_match_refusals" ADD CONSTRAINT "machine_match_refusals_other_listing_id_listings_id_fk" FOREIGN KEY ("other_listing_id") REFERENCES "public"."listings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "machine_match_refusals" ADD CONSTRAINT "machine_match_refusals_refused_by_user_id_fk" FOREIGN KEY ("refused_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "machine_listings_machine_idx" ON "machine_listings" USING btree ("machine_id");
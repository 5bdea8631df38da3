CREATE TABLE "report_signing_keys" (
	"id" text PRIMARY KEY NOT NULL,
	"public_key_multibase" text NOT NULL,
	"valid_from" timestamp with time zone NOT NULL,
	"valid_until" timestamp with time zone,
	CONSTRAINT "report_signing_keys_public_key_multibase_unique" UNIQUE("public_key_multibase")
);
--> statement-breakpoint
ALTER TABLE "reports" ADD COLUMN "credential" text;--> statement-breakpoint
CREATE UNIQUE INDEX "report_signing_keys_one_current_idx" ON "report_signing_keys" USING btree ((true)) WHERE "report_signing_keys"."valid_until" is null;
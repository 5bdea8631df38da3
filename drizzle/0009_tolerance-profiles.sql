CREATE TYPE "public"."tolerance_profile_status" AS ENUM('draft', 'published', 'retired');--> statement-breakpoint
CREATE TABLE "tolerance_profiles" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"key" text NOT NULL,
	"version" integer NOT NULL,
	"status" "tolerance_profile_status" DEFAULT 'draft' NOT NULL,
	"definition" jsonb NOT NULL,
	"based_on_key" text,
	"based_on_version" integer,
	"built_in" boolean DEFAULT false NOT NULL,
	"author_id" text,
	"approver_id" text,
	"retired_by_id" text,
	"retire_reason" text,
	"revision" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"published_at" timestamp with time zone,
	"retired_at" timestamp with time zone,
	CONSTRAINT "tolerance_profiles_definition_matches" CHECK ("tolerance_profiles"."definition" ->> 'key' = "tolerance_profiles"."key" AND ("tolerance_profiles"."definition" ->> 'version')::int = "tolerance_profiles"."version"),
	CONSTRAINT "tolerance_profiles_four_eyes" CHECK ("tolerance_profiles"."status" = 'draft' OR "tolerance_profiles"."built_in" OR ("tolerance_profiles"."author_id" IS NOT NULL AND "tolerance_profiles"."approver_id" IS NOT NULL AND "tolerance_profiles"."approver_id" <> "tolerance_profiles"."author_id")),
	CONSTRAINT "tolerance_profiles_published_at" CHECK ("tolerance_profiles"."status" = 'draft' OR "tolerance_profiles"."published_at" IS NOT NULL),
	CONSTRAINT "tolerance_profiles_retired_at" CHECK ("tolerance_profiles"."status" <> 'retired' OR "tolerance_profiles"."retired_at" IS NOT NULL)
);
--> statement-breakpoint
ALTER TABLE "tolerance_profiles" ADD CONSTRAINT "tolerance_profiles_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tolerance_profiles" ADD CONSTRAINT "tolerance_profiles_approver_id_user_id_fk" FOREIGN KEY ("approver_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tolerance_profiles" ADD CONSTRAINT "tolerance_profiles_retired_by_id_user_id_fk" FOREIGN KEY ("retired_by_id") REFERENCES "public"."user"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "tolerance_profiles_key_version_idx" ON "tolerance_profiles" USING btree ("key","version");--> statement-breakpoint
CREATE UNIQUE INDEX "tolerance_profiles_one_draft_per_key_idx" ON "tolerance_profiles" USING btree ("key") WHERE "tolerance_profiles"."status" = 'draft';
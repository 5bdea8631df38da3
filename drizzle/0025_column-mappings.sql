CREATE TABLE "deviation_column_mappings" (
	"inspector_id" text PRIMARY KEY NOT NULL,
	"mapping" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "deviation_column_mappings" ADD CONSTRAINT "deviation_column_mappings_inspector_id_user_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;
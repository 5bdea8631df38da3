CREATE TABLE "seller_pages" (
	"user_id" text PRIMARY KEY NOT NULL,
	"public_id" uuid DEFAULT gen_random_uuid() NOT NULL,
	CONSTRAINT "seller_pages_public_id_unique" UNIQUE("public_id")
);
--> statement-breakpoint
ALTER TABLE "seller_pages" ADD CONSTRAINT "seller_pages_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;
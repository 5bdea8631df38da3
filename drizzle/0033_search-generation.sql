CREATE TABLE "search_generation" (
	"id" smallint PRIMARY KEY DEFAULT 1 NOT NULL,
	"generation" bigint NOT NULL,
	CONSTRAINT "search_generation_one_row" CHECK ("search_generation"."id" = 1)
);
--> statement-breakpoint
INSERT INTO "search_generation" ("id", "generation") VALUES (1, 1);
--> statement-breakpoint
-- Moved by every statement that writes a table a PostgreSQL search reads (its rows, its cover photo, the report
-- and its credential, the keys that verify it), in that statement's transaction: a reader that reads the number
-- before its search statements sees at least that state. A statement that changed nothing moves it too, which
-- only costs a kept answer.
CREATE FUNCTION search_generation_bump() RETURNS trigger AS $$
BEGIN
  UPDATE search_generation SET generation = generation + 1 WHERE id = 1;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER search_generation_listings AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON listings
  FOR EACH STATEMENT EXECUTE FUNCTION search_generation_bump();
--> statement-breakpoint
CREATE TRIGGER search_generation_listing_photos AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON listing_photos
  FOR EACH STATEMENT EXECUTE FUNCTION search_generation_bump();
--> statement-breakpoint
CREATE TRIGGER search_generation_listing_search AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON listing_search
  FOR EACH STATEMENT EXECUTE FUNCTION search_generation_bump();
--> statement-breakpoint
CREATE TRIGGER search_generation_reports AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON reports
  FOR EACH STATEMENT EXECUTE FUNCTION search_generation_bump();
--> statement-breakpoint
CREATE TRIGGER search_generation_report_signing_keys AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON report_signing_keys
  FOR EACH STATEMENT EXECUTE FUNCTION search_generation_bump();

CREATE TABLE "listing_search_counts" (
	"status" "listing_status" NOT NULL,
	"category" "machine_category" NOT NULL,
	"grade" text,
	"verified" boolean NOT NULL,
	"country" text NOT NULL,
	"listings" bigint NOT NULL,
	CONSTRAINT "listing_search_counts_facets_key" UNIQUE NULLS NOT DISTINCT("status","category","grade","verified","country")
);
--> statement-breakpoint
-- Kept in step by statement triggers on listing_search itself, so that every path that changes it (the listings',
-- reports' and sellers' triggers, a listing's deletion by cascade) moves the counts in the same transaction.
-- Each statement adds its rows' combinations (+1 a new row, −1 an old one), in the key's order so that two
-- writers take the rows' locks in the same order; an update that moves no facet writes nothing.
CREATE FUNCTION listing_search_counts_after_insert() RETURNS trigger AS $$
BEGIN
  INSERT INTO listing_search_counts AS c (status, category, grade, verified, country, listings)
  SELECT status, category, grade, verified, country, count(*) FROM new_rows
  GROUP BY status, category, grade, verified, country
  ORDER BY status, category, grade, verified, country
  ON CONFLICT ON CONSTRAINT listing_search_counts_facets_key DO UPDATE SET listings = c.listings + excluded.listings;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE FUNCTION listing_search_counts_after_update() RETURNS trigger AS $$
BEGIN
  INSERT INTO listing_search_counts AS c (status, category, grade, verified, country, listings)
  SELECT status, category, grade, verified, country, sum(delta) FROM (
    SELECT status, category, grade, verified, country, 1 AS delta FROM new_rows
    UNION ALL
    SELECT status, category, grade, verified, country, -1 AS delta FROM old_rows
  ) changes
  GROUP BY status, category, grade, verified, country
  HAVING sum(delta) <> 0
  ORDER BY status, category, grade, verified, country
  ON CONFLICT ON CONSTRAINT listing_search_counts_facets_key DO UPDATE SET listings = c.listings + excluded.listings;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE FUNCTION listing_search_counts_after_delete() RETURNS trigger AS $$
BEGIN
  INSERT INTO listing_search_counts AS c (status, category, grade, verified, country, listings)
  SELECT status, category, grade, verified, country, -count(*) FROM old_rows
  GROUP BY status, category, grade, verified, country
  ORDER BY status, category, grade, verified, country
  ON CONFLICT ON CONSTRAINT listing_search_counts_facets_key DO UPDATE SET listings = c.listings + excluded.listings;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER listing_search_counts_inserted AFTER INSERT ON listing_search REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_counts_after_insert();
--> statement-breakpoint
CREATE TRIGGER listing_search_counts_updated AFTER UPDATE ON listing_search REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_counts_after_update();
--> statement-breakpoint
CREATE TRIGGER listing_search_counts_deleted AFTER DELETE ON listing_search REFERENCING OLD TABLE AS old_rows
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_counts_after_delete();
--> statement-breakpoint
INSERT INTO listing_search_counts (status, category, grade, verified, country, listings)
SELECT status, category, grade, verified, country, count(*) FROM listing_search GROUP BY status, category, grade, verified, country;

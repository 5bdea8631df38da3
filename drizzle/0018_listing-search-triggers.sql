-- The PostgreSQL search's table (listing_search) kept in step with listings, their reports and their sellers'
-- names by statement triggers: every write that changes what a search filters, counts, sorts or matches on
-- refreshes the rows of the listings it touched, in the same transaction. Set-based (transition tables), so
-- a bulk insert refreshes its listings in one statement.
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
-- Text folded as the index folds it for word matching: compatibility-decomposed, lower case, without the
-- combining marks of Latin, Greek and Cyrillic text (the same blocks as the search module's fallback).
CREATE FUNCTION listing_search_fold(value text) RETURNS text AS $$
  SELECT regexp_replace(lower(normalize(coalesce(value, ''), NFKD)), U&'[\0300-\036F\1AB0-\1AFF\1DC0-\1DFF\20D0-\20FF\FE20-\FE2F]', '', 'g')
$$ LANGUAGE sql IMMUTABLE PARALLEL SAFE;
--> statement-breakpoint
-- Recomputes the rows of these listings (a listing that no longer exists is removed by the foreign key's cascade).
-- Grade ranks as search/document.ts's gradeRanks; figures as magnitudes, as listingToSearchDocument.
CREATE FUNCTION listing_search_refresh(ids uuid[]) RETURNS void AS $$
  INSERT INTO listing_search AS s (
    listing_id, status, category, published_at, price_minor, currency, country, region_key, swing_mm, between_centres_mm,
    search_text, report_id, grade, grade_rank, verified, measured_on, key_figures,
    spindle_runout_um, axial_slip_um, parallelism_vertical_um, parallelism_horizontal_um, centre_height_um, bed_straightness_um
  )
  SELECT l.id, l.status, l.category, l.published_at, l.price_minor, l.currency, l.country,
    lower(normalize(btrim(l.region), NFKD)), l.swing_over_bed_mm, l.distance_between_centres_mm,
    concat_ws(E'\n', listing_search_fold(l.make), listing_search_fold(l.model), listing_search_fold(l.description),
      listing_search_fold(l.city), listing_search_fold(l.region), listing_search_fold(l.country), listing_search_fold(u.name)),
    r.id, r.grade,
    CASE r.grade WHEN 'A' THEN 1 WHEN 'B' THEN 2 WHEN 'C' THEN 3 WHEN 'D' THEN 4 WHEN 'incomplete' THEN 5 END,
    r.id IS NOT NULL AND r.grade <> 'incomplete', r.measured_on, r.key_figures,
    abs((r.key_figures ->> 'spindleRunOut')::double precision),
    abs((r.key_figures ->> 'axialSlip')::double precision),
    abs((r.key_figures ->> 'spindleParallelismVertical')::double precision),
    abs((r.key_figures ->> 'spindleParallelismHorizontal')::double precision),
    abs((r.key_figures ->> 'centreHeight')::double precision),
    abs((r.key_figures ->> 'bedStraightness')::double precision)
  FROM listings l
  JOIN "user" u ON u.id = l.seller_id
  LEFT JOIN LATERAL (
    SELECT id, grade, measured_on, key_figures FROM reports
    WHERE reports.listing_id = l.id AND reports.status = 'signed'
    ORDER BY signed_at DESC LIMIT 1
  ) r ON true
  WHERE l.id = ANY (ids)
  ON CONFLICT (listing_id) DO UPDATE SET
    status = excluded.status, category = excluded.category, published_at = excluded.published_at,
    price_minor = excluded.price_minor, currency = excluded.currency, country = excluded.country,
    region_key = excluded.region_key, swing_mm = excluded.swing_mm, between_centres_mm = excluded.between_centres_mm,
    search_text = excluded.search_text, report_id = excluded.report_id, grade = excluded.grade,
    grade_rank = excluded.grade_rank, verified = excluded.verified, measured_on = excluded.measured_on,
    key_figures = excluded.key_figures, spindle_runout_um = excluded.spindle_runout_um,
    axial_slip_um = excluded.axial_slip_um, parallelism_vertical_um = excluded.parallelism_vertical_um,
    parallelism_horizontal_um = excluded.parallelism_horizontal_um, centre_height_um = excluded.centre_height_um,
    bed_straightness_um = excluded.bed_straightness_um
$$ LANGUAGE sql;
--> statement-breakpoint
CREATE FUNCTION listing_search_after_listings() RETURNS trigger AS $$
BEGIN
  PERFORM listing_search_refresh(ARRAY(SELECT id FROM changed));
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE FUNCTION listing_search_after_reports() RETURNS trigger AS $$
BEGIN
  PERFORM listing_search_refresh(ARRAY(SELECT DISTINCT listing_id FROM changed));
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE FUNCTION listing_search_after_sellers() RETURNS trigger AS $$
BEGIN
  -- Only a seller's name is searched; other changes of an account (sessions, units) refresh nothing.
  PERFORM listing_search_refresh(ARRAY(
    SELECT l.id FROM changed JOIN before ON before.id = changed.id AND before.name IS DISTINCT FROM changed.name
    JOIN listings l ON l.seller_id = changed.id));
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
-- A trigger with transition tables takes one event, hence one trigger per event.
CREATE TRIGGER listing_search_listings_inserted AFTER INSERT ON listings REFERENCING NEW TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_listings();
--> statement-breakpoint
CREATE TRIGGER listing_search_listings_updated AFTER UPDATE ON listings REFERENCING NEW TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_listings();
--> statement-breakpoint
CREATE TRIGGER listing_search_reports_inserted AFTER INSERT ON reports REFERENCING NEW TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_reports();
--> statement-breakpoint
CREATE TRIGGER listing_search_reports_updated AFTER UPDATE ON reports REFERENCING NEW TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_reports();
--> statement-breakpoint
CREATE TRIGGER listing_search_reports_deleted AFTER DELETE ON reports REFERENCING OLD TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_reports();
--> statement-breakpoint
CREATE TRIGGER listing_search_sellers_renamed AFTER UPDATE ON "user" REFERENCING OLD TABLE AS before NEW TABLE AS changed
  FOR EACH STATEMENT EXECUTE FUNCTION listing_search_after_sellers();
--> statement-breakpoint
CREATE INDEX listing_search_text_idx ON listing_search USING gin (search_text gin_trgm_ops);
--> statement-breakpoint
SELECT listing_search_refresh(ARRAY(SELECT id FROM listings));

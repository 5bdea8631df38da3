-- The PostgreSQL search's indexes for listings with a report carry the facets' columns (INCLUDE, which Drizzle's
-- index builder does not declare: app/modules/search/schema.ts names the same indexes without them). A search
-- by an accuracy limit then counts its facets from the figure's index alone (an index-only scan, no heap page
-- read), and the best-accuracy order filters on category, grade, verified and country inside its index and
-- stops after the page's rows instead of reading and sorting every match.
DROP INDEX IF EXISTS listing_search_best_accuracy_idx;
--> statement-breakpoint
CREATE INDEX listing_search_best_accuracy_idx ON listing_search (grade_rank, spindle_runout_um, published_at DESC NULLS LAST, listing_id DESC NULLS LAST)
  INCLUDE (category, grade, verified, country) WHERE status = 'published' AND report_id IS NOT NULL;
--> statement-breakpoint
DROP INDEX IF EXISTS listing_search_runout_idx;
--> statement-breakpoint
CREATE INDEX listing_search_runout_idx ON listing_search (spindle_runout_um) INCLUDE (status, category, grade, verified, country)
  WHERE spindle_runout_um IS NOT NULL;
--> statement-breakpoint
DROP INDEX IF EXISTS listing_search_axial_slip_idx;
--> statement-breakpoint
CREATE INDEX listing_search_axial_slip_idx ON listing_search (axial_slip_um) INCLUDE (status, category, grade, verified, country)
  WHERE axial_slip_um IS NOT NULL;
--> statement-breakpoint
DROP INDEX IF EXISTS listing_search_parallelism_idx;
--> statement-breakpoint
CREATE INDEX listing_search_parallelism_idx ON listing_search (parallelism_vertical_um) INCLUDE (status, category, grade, verified, country)
  WHERE parallelism_vertical_um IS NOT NULL;
--> statement-breakpoint
DROP INDEX IF EXISTS listing_search_centre_height_idx;
--> statement-breakpoint
CREATE INDEX listing_search_centre_height_idx ON listing_search (centre_height_um) INCLUDE (status, category, grade, verified, country)
  WHERE centre_height_um IS NOT NULL;

-- A signed report is immutable, its credential included. Signing (draft → signed) must store the credential.
-- A signed report becomes superseded only once its successor is signed, and the successor is signed only
-- together with superseding it: both in one transaction (checked at commit).
CREATE OR REPLACE FUNCTION reports_refuse_change_after_signing() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status <> 'draft' THEN
      RAISE EXCEPTION 'report % is signed and cannot be deleted', OLD.id USING ERRCODE = 'check_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status = 'draft' THEN
    IF NEW.status <> 'draft' AND NEW.credential IS NULL THEN
      RAISE EXCEPTION 'report % cannot be signed without its signed credential', OLD.id USING ERRCODE = 'check_violation';
    END IF;
    RETURN NEW;
  END IF;
  IF NEW.status = 'superseded' AND OLD.status IN ('signed', 'superseded')
     AND NEW.id = OLD.id AND NEW.booking_id = OLD.booking_id AND NEW.listing_id = OLD.listing_id
     AND NEW.inspector_id = OLD.inspector_id AND NEW.supersedes_id IS NOT DISTINCT FROM OLD.supersedes_id
     AND NEW.revision = OLD.revision AND NEW.profile_key = OLD.profile_key AND NEW.profile_version = OLD.profile_version
     AND NEW.grade = OLD.grade AND NEW.key_figures = OLD.key_figures AND NEW.measured_on = OLD.measured_on
     AND NEW.draft_version = OLD.draft_version AND NEW.content = OLD.content
     AND NEW.canonical_json IS NOT DISTINCT FROM OLD.canonical_json
     AND NEW.content_hash IS NOT DISTINCT FROM OLD.content_hash
     AND NEW.credential IS NOT DISTINCT FROM OLD.credential
     AND NEW.signed_at IS NOT DISTINCT FROM OLD.signed_at AND NEW.created_at = OLD.created_at THEN
    IF NOT EXISTS (SELECT 1 FROM reports successor WHERE successor.supersedes_id = OLD.id AND successor.status IN ('signed', 'superseded')) THEN
      RAISE EXCEPTION 'report % can only be superseded by a signed correction', OLD.id USING ERRCODE = 'check_violation';
    END IF;
    RETURN NEW;
  END IF;
  RAISE EXCEPTION 'report % is signed and cannot be changed; sign a correction instead', OLD.id USING ERRCODE = 'check_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE FUNCTION reports_correction_supersedes() RETURNS trigger AS $$
BEGIN
  IF NEW.status = 'signed' AND NEW.supersedes_id IS NOT NULL
     AND EXISTS (SELECT 1 FROM reports predecessor WHERE predecessor.id = NEW.supersedes_id AND predecessor.status <> 'superseded') THEN
    RAISE EXCEPTION 'correction % was signed without superseding report %', NEW.id, NEW.supersedes_id USING ERRCODE = 'check_violation';
  END IF;
  RETURN NULL;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE CONSTRAINT TRIGGER reports_correction_supersedes_at_commit
  AFTER INSERT OR UPDATE ON "reports"
  DEFERRABLE INITIALLY DEFERRED
  FOR EACH ROW EXECUTE FUNCTION reports_correction_supersedes();
--> statement-breakpoint
-- A signed row written directly (not signed from a draft) must carry its credential too.
ALTER TABLE "reports" ADD CONSTRAINT "reports_signed_has_credential" CHECK ("status" = 'draft' OR "credential" IS NOT NULL) NOT VALID;

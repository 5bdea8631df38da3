-- A signed report is immutable: its content, hash, signature time and identity never change and it is
-- never deleted. The only change allowed after signing is signed → superseded (a correction was signed).
CREATE FUNCTION reports_refuse_change_after_signing() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status <> 'draft' THEN
      RAISE EXCEPTION 'report % is signed and cannot be deleted', OLD.id USING ERRCODE = 'check_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status = 'draft' THEN
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
     AND NEW.signed_at IS NOT DISTINCT FROM OLD.signed_at AND NEW.created_at = OLD.created_at THEN
    RETURN NEW;
  END IF;
  RAISE EXCEPTION 'report % is signed and cannot be changed; sign a correction instead', OLD.id USING ERRCODE = 'check_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER reports_immutable_after_signing
  BEFORE UPDATE OR DELETE ON "reports"
  FOR EACH ROW EXECUTE FUNCTION reports_refuse_change_after_signing();
--> statement-breakpoint
ALTER TABLE "reports" ADD CONSTRAINT "reports_signed_has_hash" CHECK (
  "status" = 'draft' OR ("canonical_json" IS NOT NULL AND "content_hash" ~ '^[0-9a-f]{64}$' AND "signed_at" IS NOT NULL)
);

-- A report signed before signed credentials existed may receive its credential once, later (the re-issue of
-- `npm run reports:reissue`): only the credential column changes, from NULL to a value, the status stays,
-- and every other column is as it was. Everything else stays as 0014 made it.
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
  IF OLD.credential IS NULL AND NEW.credential IS NOT NULL AND NEW.status = OLD.status
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

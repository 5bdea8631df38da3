-- A published tolerance profile version is immutable: its definition, identity, author, approver and
-- publication never change and it is never deleted. The only change allowed is published → retired (no new
-- reports), recording who retired it, when and why. Reports scored with it re-score the same forever.
CREATE FUNCTION tolerance_profiles_refuse_change_after_publishing() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status <> 'draft' THEN
      RAISE EXCEPTION 'tolerance profile % v% is published and cannot be deleted', OLD.key, OLD.version USING ERRCODE = 'check_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status = 'draft' THEN
    RETURN NEW;
  END IF;
  IF NEW.status = 'retired'
     AND NEW.id = OLD.id AND NEW.key = OLD.key AND NEW.version = OLD.version
     AND NEW.definition = OLD.definition
     AND NEW.based_on_key IS NOT DISTINCT FROM OLD.based_on_key
     AND NEW.based_on_version IS NOT DISTINCT FROM OLD.based_on_version
     AND NEW.built_in = OLD.built_in
     AND NEW.author_id IS NOT DISTINCT FROM OLD.author_id
     AND NEW.approver_id IS NOT DISTINCT FROM OLD.approver_id
     AND NEW.revision = OLD.revision
     AND NEW.created_at = OLD.created_at
     AND NEW.published_at IS NOT DISTINCT FROM OLD.published_at
     AND (OLD.status = 'published' OR (NEW.retired_at IS NOT DISTINCT FROM OLD.retired_at
          AND NEW.retired_by_id IS NOT DISTINCT FROM OLD.retired_by_id
          AND NEW.retire_reason IS NOT DISTINCT FROM OLD.retire_reason)) THEN
    RETURN NEW;
  END IF;
  RAISE EXCEPTION 'tolerance profile % v% is published and cannot be changed; draft a new version instead', OLD.key, OLD.version USING ERRCODE = 'check_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER tolerance_profiles_immutable_after_publishing
  BEFORE UPDATE OR DELETE ON "tolerance_profiles"
  FOR EACH ROW EXECUTE FUNCTION tolerance_profiles_refuse_change_after_publishing();

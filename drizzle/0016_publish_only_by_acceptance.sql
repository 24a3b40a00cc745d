-- A version becomes published only by a curator's acceptance: from submitted or in review (the
-- states acceptance starts from, lib/curation/lifecycle.ts), with its version
-- identifier, payload checksum and publication time set, and the accept decision already on
-- record (acceptance writes its decision first, in the same transaction, then the version row).
-- Any other move into published (a draft set published by hand, an accept without a decision, a
-- decision by someone who is not a curator) raises.
CREATE OR REPLACE FUNCTION arrhenia_guard_publication() RETURNS trigger AS $$
BEGIN
  IF NEW.state = 'published' AND OLD.state IS DISTINCT FROM 'published' THEN
    IF OLD.state NOT IN ('submitted', 'in_review') THEN
      RAISE EXCEPTION 'version % is published only by acceptance from review, not from %', OLD.id, OLD.state USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    IF NEW.version_identifier IS NULL OR NEW.payload_sha256 IS NULL OR NEW.published_at IS NULL THEN
      RAISE EXCEPTION 'version % cannot be published without its identifier, payload checksum and publication time', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    -- The decision must be this transaction's (now() is the transaction's start) and a curator's.
    IF NOT EXISTS (
      SELECT 1 FROM decisions d JOIN users u ON u.id = d.curator_id
        WHERE d.version_id = NEW.id AND d.decision = 'accept' AND d.created_at = now()
          AND u.role IN ('curator', 'admin') AND u.deactivated_at IS NULL
    ) THEN
      RAISE EXCEPTION 'version % cannot be published without a curator''s accept decision on record', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_published_by_acceptance
  BEFORE UPDATE ON dataset_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_publication();

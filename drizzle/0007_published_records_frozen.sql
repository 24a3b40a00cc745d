-- Everything a published version resolves to is frozen, not only its own row: rows cannot be moved
-- into it (NEW is checked as well as OLD), its dataset keeps the series identifier and owner it was
-- published under, decisions and identifier registrations are append-only, and the reaction and
-- species rows it points at cannot be rewritten. Retraction stays the one allowed change.

-- Points, files and analyses: a row may neither leave nor enter a published version. Re-fits may
-- still add analyses.
CREATE OR REPLACE FUNCTION arrhenia_guard_published_children() RETURNS trigger AS $$
DECLARE
  old_state version_state;
  new_state version_state;
BEGIN
  IF TG_OP <> 'INSERT' THEN SELECT state INTO old_state FROM dataset_versions WHERE id = OLD.version_id; END IF;
  IF TG_OP <> 'DELETE' THEN SELECT state INTO new_state FROM dataset_versions WHERE id = NEW.version_id; END IF;
  IF old_state IN ('published', 'retracted') THEN
    RAISE EXCEPTION 'version % is published: its % cannot be changed', OLD.version_id, TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF new_state IN ('published', 'retracted') AND NOT (TG_OP = 'INSERT' AND TG_TABLE_NAME = 'version_analyses') THEN
    RAISE EXCEPTION 'version % is published: its % cannot be changed', NEW.version_id, TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint

-- A version is published only by a transition (never inserted as published), never changes
-- dataset or number, and once decided upon it is part of the record and cannot be deleted.
CREATE OR REPLACE FUNCTION arrhenia_guard_version_identity() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    IF NEW.state IN ('published', 'retracted') THEN
      RAISE EXCEPTION 'a version is published by review, not inserted as published' USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN NEW;
  END IF;
  IF TG_OP = 'DELETE' THEN
    IF EXISTS (SELECT 1 FROM decisions WHERE version_id = OLD.id) THEN
      RAISE EXCEPTION 'version % has decisions on record and cannot be deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF NEW.id IS DISTINCT FROM OLD.id OR NEW.dataset_id IS DISTINCT FROM OLD.dataset_id OR NEW.number IS DISTINCT FROM OLD.number THEN
    RAISE EXCEPTION 'version % cannot change its dataset or number', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_identity_fixed
  BEFORE INSERT OR UPDATE OR DELETE ON dataset_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_version_identity();
--> statement-breakpoint

CREATE OR REPLACE FUNCTION arrhenia_dataset_has_public_version(did integer) RETURNS boolean AS $$
  SELECT EXISTS (SELECT 1 FROM dataset_versions WHERE dataset_id = did AND state IN ('published', 'retracted'));
$$ LANGUAGE sql STABLE;
--> statement-breakpoint

-- The series identifier, once minted, never changes; a dataset with a public version keeps its owner.
CREATE OR REPLACE FUNCTION arrhenia_guard_published_dataset() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.series_identifier IS NOT NULL OR arrhenia_dataset_has_public_version(OLD.id) THEN
      RAISE EXCEPTION 'dataset % has published versions and cannot be deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.series_identifier IS NOT NULL AND NEW.series_identifier IS DISTINCT FROM OLD.series_identifier THEN
    RAISE EXCEPTION 'dataset % is published: its series identifier % cannot be changed', OLD.id, OLD.series_identifier USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF (NEW.id IS DISTINCT FROM OLD.id OR NEW.owner_id IS DISTINCT FROM OLD.owner_id OR NEW.created_at IS DISTINCT FROM OLD.created_at)
     AND (OLD.series_identifier IS NOT NULL OR arrhenia_dataset_has_public_version(OLD.id)) THEN
    RAISE EXCEPTION 'dataset % has published versions: its owner cannot be changed', OLD.id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER datasets_frozen_when_published
  BEFORE UPDATE OR DELETE ON datasets
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_dataset();
--> statement-breakpoint

-- The owner link of a published dataset: no owner row added, removed, re-pointed or demoted.
-- Editors and viewers may still come and go (they are not part of the published record).
CREATE OR REPLACE FUNCTION arrhenia_guard_published_owner() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'UPDATE' AND NEW IS NOT DISTINCT FROM OLD THEN RETURN NEW; END IF;
  IF TG_OP <> 'INSERT' AND OLD.role = 'owner' AND arrhenia_dataset_has_public_version(OLD.dataset_id) THEN
    RAISE EXCEPTION 'dataset % has published versions: its owner cannot be changed', OLD.dataset_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP <> 'DELETE' AND NEW.role = 'owner' AND arrhenia_dataset_has_public_version(NEW.dataset_id) THEN
    RAISE EXCEPTION 'dataset % has published versions: its owner cannot be changed', NEW.dataset_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER dataset_members_owner_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON dataset_members
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_owner();
--> statement-breakpoint

-- Decisions are append-only.
CREATE OR REPLACE FUNCTION arrhenia_guard_append_only() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'TRUNCATE' THEN
    RAISE EXCEPTION '% holds published records and cannot be truncated', TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RAISE EXCEPTION '% rows are append-only: % refused', TG_TABLE_NAME, lower(TG_OP) USING ERRCODE = 'integrity_constraint_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER decisions_append_only
  BEFORE UPDATE OR DELETE ON decisions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER decisions_no_truncate
  BEFORE TRUNCATE ON decisions
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint

-- Identifier registrations: what was registered (identifier, kind, version, dataset) never changes
-- and is never deleted. The registration job may only move it forward: count attempts, note the
-- last error, and mark it registered once (never back).
CREATE OR REPLACE FUNCTION arrhenia_guard_registration() RETURNS trigger AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION 'identifier % is minted: its registration cannot be deleted', OLD.identifier USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.identifier IS DISTINCT FROM OLD.identifier OR NEW.kind IS DISTINCT FROM OLD.kind
     OR NEW.version_id IS DISTINCT FROM OLD.version_id OR NEW.dataset_id IS DISTINCT FROM OLD.dataset_id
     OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR (OLD.registered AND NOT NEW.registered)
     OR (OLD.registered_at IS NOT NULL AND NEW.registered_at IS DISTINCT FROM OLD.registered_at)
     OR NEW.attempts < OLD.attempts THEN
    RAISE EXCEPTION 'identifier % is minted: its registration can only move forward', OLD.identifier USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER identifier_registrations_forward_only
  BEFORE UPDATE OR DELETE ON identifier_registrations
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_registration();
--> statement-breakpoint
CREATE TRIGGER identifier_registrations_no_truncate
  BEFORE TRUNCATE ON identifier_registrations
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint

-- The reaction and species a public version points at are part of what it shows: frozen. New
-- names (aliases) may be added; none removed or rewritten.
CREATE OR REPLACE FUNCTION arrhenia_reaction_is_published(rid integer) RETURNS boolean AS $$
  SELECT EXISTS (SELECT 1 FROM dataset_versions WHERE reaction_id = rid AND state IN ('published', 'retracted'));
$$ LANGUAGE sql STABLE;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_species_is_published(sid integer) RETURNS boolean AS $$
  SELECT EXISTS (
    SELECT 1 FROM reaction_participants p JOIN dataset_versions v ON v.reaction_id = p.reaction_id
    WHERE p.species_id = sid AND v.state IN ('published', 'retracted'));
$$ LANGUAGE sql STABLE;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_guard_published_chemistry() RETURNS trigger AS $$
DECLARE
  frozen boolean := false;
BEGIN
  IF TG_OP = 'UPDATE' AND NEW IS NOT DISTINCT FROM OLD THEN RETURN NEW; END IF;
  IF TG_TABLE_NAME = 'reactions' THEN
    frozen := arrhenia_reaction_is_published(OLD.id);
  ELSIF TG_TABLE_NAME = 'reaction_participants' THEN
    frozen := (TG_OP <> 'INSERT' AND arrhenia_reaction_is_published(OLD.reaction_id))
           OR (TG_OP <> 'DELETE' AND arrhenia_reaction_is_published(NEW.reaction_id));
  ELSIF TG_TABLE_NAME = 'species' THEN
    frozen := arrhenia_species_is_published(OLD.id);
  ELSIF TG_TABLE_NAME = 'species_names' THEN
    frozen := TG_OP <> 'INSERT' AND arrhenia_species_is_published(OLD.species_id);
  END IF;
  IF frozen THEN
    RAISE EXCEPTION '% row shown by a published version: it cannot be changed', TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER reactions_frozen_when_published
  BEFORE UPDATE OR DELETE ON reactions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_chemistry();
--> statement-breakpoint
CREATE TRIGGER reaction_participants_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON reaction_participants
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_chemistry();
--> statement-breakpoint
CREATE TRIGGER species_frozen_when_published
  BEFORE UPDATE OR DELETE ON species
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_chemistry();
--> statement-breakpoint
CREATE TRIGGER species_names_frozen_when_published
  BEFORE UPDATE OR DELETE ON species_names
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_chemistry();
--> statement-breakpoint

-- TRUNCATE skips row triggers: refuse it outright on every table that holds published data.
CREATE TRIGGER dataset_versions_no_truncate BEFORE TRUNCATE ON dataset_versions FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER version_points_no_truncate BEFORE TRUNCATE ON version_points FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER version_analyses_no_truncate BEFORE TRUNCATE ON version_analyses FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER version_files_no_truncate BEFORE TRUNCATE ON version_files FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER datasets_no_truncate BEFORE TRUNCATE ON datasets FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER species_no_truncate BEFORE TRUNCATE ON species FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER reactions_no_truncate BEFORE TRUNCATE ON reactions FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();

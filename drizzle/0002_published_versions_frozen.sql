-- A published version never changes: its row, points and analyses are frozen. The one change
-- allowed is retraction (state, retraction time and notice), which keeps everything else as it was.
CREATE OR REPLACE FUNCTION arrhenia_guard_published_version() RETURNS trigger AS $$
DECLARE
  allowed constant text[] := ARRAY['state', 'retracted_at', 'retraction_notice', 'updated_at'];
BEGIN
  IF OLD.state IN ('published', 'retracted') THEN
    IF TG_OP = 'DELETE' THEN
      RAISE EXCEPTION 'version % is published and cannot be deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    IF OLD.state = 'retracted'
       OR NEW.state <> 'retracted'
       OR (to_jsonb(NEW) - allowed) IS DISTINCT FROM (to_jsonb(OLD) - allowed) THEN
      RAISE EXCEPTION 'version % is published and cannot be changed (only retracted)', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_frozen_when_published
  BEFORE UPDATE OR DELETE ON dataset_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_version();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_guard_published_children() RETURNS trigger AS $$
DECLARE
  vid integer;
  vstate version_state;
BEGIN
  IF TG_OP = 'INSERT' THEN vid := NEW.version_id; ELSE vid := OLD.version_id; END IF;
  SELECT state INTO vstate FROM dataset_versions WHERE id = vid;
  -- Analyses may still be added to a published version (a re-fit with a newer engine); nothing
  -- stored may be edited or removed.
  IF vstate IN ('published', 'retracted') AND (TG_OP <> 'INSERT' OR TG_TABLE_NAME <> 'version_analyses') THEN
    RAISE EXCEPTION 'version % is published: its % cannot be changed', vid, TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER version_points_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON version_points
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_children();
--> statement-breakpoint
CREATE TRIGGER version_analyses_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON version_analyses
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_children();
--> statement-breakpoint
CREATE TRIGGER version_files_frozen_when_published
  BEFORE INSERT OR UPDATE OR DELETE ON version_files
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_published_children();

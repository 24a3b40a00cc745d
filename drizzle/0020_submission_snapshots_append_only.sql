-- Submission snapshots are the record curators compare submissions with: append-only like
-- decisions (no UPDATE, DELETE or TRUNCATE; the runtime role lacks UPDATE and DELETE too), and a
-- snapshot is written only as its version is submitted, holding exactly what was submitted: the
-- version must be in 'submitted', the payload must be the version's, the points as many as the
-- version's, and the sequence the next one.
CREATE TRIGGER submission_snapshots_append_only
  BEFORE UPDATE OR DELETE ON submission_snapshots
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE TRIGGER submission_snapshots_no_truncate
  BEFORE TRUNCATE ON submission_snapshots
  FOR EACH STATEMENT EXECUTE FUNCTION arrhenia_guard_append_only();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_guard_snapshot_insert() RETURNS trigger AS $$
DECLARE
  v record;
  n integer;
BEGIN
  SELECT state, payload INTO v FROM dataset_versions WHERE id = NEW.version_id;
  IF v.state IS DISTINCT FROM 'submitted' THEN
    RAISE EXCEPTION 'a snapshot of version % is taken only as it is submitted (it is %)', NEW.version_id, v.state USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.payload IS DISTINCT FROM v.payload THEN
    RAISE EXCEPTION 'a snapshot of version % must hold the submitted document', NEW.version_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  SELECT count(*) INTO n FROM version_points WHERE version_id = NEW.version_id;
  IF jsonb_typeof(NEW.points) IS DISTINCT FROM 'array' OR jsonb_array_length(NEW.points) <> n THEN
    RAISE EXCEPTION 'a snapshot of version % must hold its % points', NEW.version_id, n USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NEW.sequence <> 1 + (SELECT count(*) FROM submission_snapshots WHERE version_id = NEW.version_id) THEN
    RAISE EXCEPTION 'snapshots of version % are numbered in order', NEW.version_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  NEW.created_at := now();
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER submission_snapshots_taken_at_submission
  BEFORE INSERT ON submission_snapshots
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_snapshot_insert();

-- The time a lifecycle row is recorded at: now(), except in a session of the schema owner that set
-- `arrhenia.recorded_at` (SET or set_config), where it is that time. The demo seed uses it to give
-- its queued submissions an invented history (hours to days old) through the ordinary lifecycle,
-- with every guard in place; no trigger is ever switched off. The runtime role's setting is
-- ignored (it is not a member of the owner: npm run db:privileges), so what it records is always
-- at now(). Used by the defaults of the lifecycle's time stamps, the snapshot trigger (drizzle/0020)
-- and the snapshot function (drizzle/0021), which compare with it instead of now().
CREATE OR REPLACE FUNCTION arrhenia_recorded_at() RETURNS timestamptz AS $$
DECLARE
  setting constant text := current_setting('arrhenia.recorded_at', true);
BEGIN
  IF setting IS NULL OR setting = '' THEN
    RETURN now();
  END IF;
  IF pg_has_role(session_user, (SELECT c.relowner FROM pg_class c WHERE c.oid = 'public.dataset_versions'::regclass), 'MEMBER') THEN
    RETURN setting::timestamptz;
  END IF;
  RETURN now();
END;
$$ LANGUAGE plpgsql STABLE SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint

-- As in drizzle/0020, with the snapshot's time from arrhenia_recorded_at().
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
  NEW.created_at := arrhenia_recorded_at();
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint

-- As in drizzle/0021, with "in the same transaction" judged by arrhenia_recorded_at().
CREATE OR REPLACE FUNCTION arrhenia_take_submission_snapshot(p_version_id integer, p_submitted_by integer, p_reply text)
RETURNS integer AS $$
DECLARE
  v record;
  n integer;
BEGIN
  SELECT dv.id, dv.dataset_id, dv.state, dv.submitted_at, dv.payload, d.owner_id
    INTO v FROM dataset_versions dv JOIN datasets d ON d.id = dv.dataset_id
    WHERE dv.id = p_version_id FOR UPDATE OF dv;
  IF NOT FOUND THEN
    RAISE EXCEPTION 'no dataset version %', p_version_id USING ERRCODE = 'no_data_found';
  END IF;
  IF v.state IS DISTINCT FROM 'submitted' OR v.submitted_at IS DISTINCT FROM arrhenia_recorded_at() THEN
    RAISE EXCEPTION 'a snapshot of version % is taken only as it is submitted, in the same transaction', p_version_id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF EXISTS (SELECT 1 FROM submission_snapshots s WHERE s.version_id = p_version_id AND s.created_at = arrhenia_recorded_at()) THEN
    RAISE EXCEPTION 'version % already has the snapshot of this submission', p_version_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NOT EXISTS (
    SELECT 1 FROM users u WHERE u.id = p_submitted_by AND u.deactivated_at IS NULL
      AND (u.id = v.owner_id OR EXISTS (SELECT 1 FROM dataset_members m WHERE m.dataset_id = v.dataset_id AND m.user_id = u.id AND m.role = 'owner'))
  ) THEN
    RAISE EXCEPTION 'version % is submitted only by the owner of its dataset', p_version_id USING ERRCODE = 'insufficient_privilege';
  END IF;
  SELECT count(*) + 1 INTO n FROM submission_snapshots s WHERE s.version_id = p_version_id;
  INSERT INTO submission_snapshots (version_id, sequence, submitted_by, reply, payload, points)
    SELECT p_version_id, n, p_submitted_by, nullif(btrim(p_reply), ''), v.payload,
      coalesce((SELECT jsonb_agg(jsonb_build_object(
          'T', p.temperature_k, 'k', p.rate_constant, 'sigmaLnK', p.sigma_ln_k, 'pressurePa', p.pressure_pa,
          'bathGas', p.bath_gas, 'note', p.note, 'original', p.original) ORDER BY p.idx)
        FROM version_points p WHERE p.version_id = p_version_id), '[]'::jsonb);
  RETURN n;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
ALTER TABLE "audit_events" ALTER COLUMN "at" SET DEFAULT arrhenia_recorded_at();--> statement-breakpoint
ALTER TABLE "dataset_versions" ALTER COLUMN "created_at" SET DEFAULT arrhenia_recorded_at();--> statement-breakpoint
ALTER TABLE "dataset_versions" ALTER COLUMN "updated_at" SET DEFAULT arrhenia_recorded_at();--> statement-breakpoint
ALTER TABLE "datasets" ALTER COLUMN "created_at" SET DEFAULT arrhenia_recorded_at();--> statement-breakpoint
ALTER TABLE "decisions" ALTER COLUMN "created_at" SET DEFAULT arrhenia_recorded_at();
-- The current engine version, in one row owned by the schema owner. scripts/migrate.ts (run as the
-- owner at every start-up and by npm test) writes it from the code's ENGINE_VERSION; the runtime role
-- may only read it (db/privileges.ts withholds INSERT/UPDATE/DELETE and `npm run db:privileges`
-- checks it). Without it, anyone holding the runtime role's credentials could append an analysis to
-- a published version under any engine name they chose.
CREATE TABLE IF NOT EXISTS arrhenia_engine (
  only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
  engine_version text NOT NULL CHECK (engine_version ~ '\S'),
  recorded_at timestamp with time zone NOT NULL DEFAULT now()
);
--> statement-breakpoint
-- A re-fit appends one analysis by the current engine, once per (version, engine version); any other
-- engine name, or a second row by the same engine, is refused. p_engine_version stays an argument
-- so that a job running older code than the database (mid-deploy) fails loudly instead of mislabelling.
CREATE OR REPLACE FUNCTION arrhenia_append_refit_analysis(
  p_version_id integer, p_engine_version text, p_result jsonb, p_checks jsonb, p_error text
) RETURNS integer AS $$
DECLARE
  current_engine text;
  added integer;
BEGIN
  SELECT engine_version INTO current_engine FROM arrhenia_engine WHERE only_row;
  IF current_engine IS NULL THEN
    RAISE EXCEPTION 'no current engine version is recorded (run the migrations)' USING ERRCODE = 'object_not_in_prerequisite_state';
  END IF;
  IF p_engine_version IS DISTINCT FROM current_engine THEN
    RAISE EXCEPTION 'engine % is not the current engine (%): a re-fit appends only the current engine''s analysis', p_engine_version, current_engine
      USING ERRCODE = 'invalid_parameter_value';
  END IF;
  -- One re-fit of a version at a time.
  PERFORM 1 FROM dataset_versions WHERE id = p_version_id FOR UPDATE;
  IF NOT FOUND THEN
    RAISE EXCEPTION 'no dataset version %', p_version_id USING ERRCODE = 'foreign_key_violation';
  END IF;
  IF EXISTS (SELECT 1 FROM version_analyses WHERE version_id = p_version_id AND engine_version = current_engine) THEN
    RAISE EXCEPTION 'version % is already fitted by engine %', p_version_id, current_engine USING ERRCODE = 'unique_violation';
  END IF;
  INSERT INTO version_analyses (version_id, engine_version, result, checks, error)
    VALUES (p_version_id, current_engine, p_result, coalesce(p_checks, '[]'::jsonb), p_error)
    RETURNING id INTO added;
  RETURN added;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
REVOKE ALL ON FUNCTION arrhenia_append_refit_analysis(integer, text, jsonb, jsonb, text) FROM PUBLIC;
--> statement-breakpoint
REVOKE INSERT, UPDATE, DELETE, TRUNCATE ON TABLE arrhenia_engine FROM PUBLIC;

-- A published version's analyses: a re-fit by a newer engine is part of the record's life (the
-- page shows the current engine's fit beside the frozen points), so a row may still be added, but
-- only through arrhenia_append_refit_analysis, the re-fit job's path, and never changed or removed.
-- The function runs as the schema owner and adds one row only when the version's newest analysis
-- came from another engine version; a plain INSERT by the runtime role is refused by the trigger.
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
  -- Inside arrhenia_append_refit_analysis current_user is the table's owner; nobody else qualifies.
  IF new_state IN ('published', 'retracted')
     AND NOT (TG_OP = 'INSERT' AND TG_TABLE_NAME = 'version_analyses'
              AND pg_has_role(current_user, (SELECT relowner FROM pg_class WHERE oid = TG_RELID), 'MEMBER')) THEN
    RAISE EXCEPTION 'version % is published: its % cannot be changed (a re-fit adds analyses through arrhenia_append_refit_analysis only)',
      NEW.version_id, TG_TABLE_NAME USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION arrhenia_append_refit_analysis(
  p_version_id integer, p_engine_version text, p_result jsonb, p_checks jsonb, p_error text
) RETURNS integer AS $$
DECLARE
  newest text;
  added integer;
BEGIN
  -- One re-fit of a version at a time.
  PERFORM 1 FROM dataset_versions WHERE id = p_version_id FOR UPDATE;
  IF NOT FOUND THEN
    RAISE EXCEPTION 'no dataset version %', p_version_id USING ERRCODE = 'foreign_key_violation';
  END IF;
  SELECT engine_version INTO newest FROM version_analyses WHERE version_id = p_version_id ORDER BY id DESC LIMIT 1;
  IF newest IS NOT DISTINCT FROM p_engine_version THEN
    RAISE EXCEPTION 'version % is already fitted by engine %', p_version_id, p_engine_version USING ERRCODE = 'unique_violation';
  END IF;
  INSERT INTO version_analyses (version_id, engine_version, result, checks, error)
    VALUES (p_version_id, p_engine_version, p_result, coalesce(p_checks, '[]'::jsonb), p_error)
    RETURNING id INTO added;
  RETURN added;
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
-- Executable by the runtime role only (granted by scripts/migrate.ts, db/privileges.ts).
REVOKE ALL ON FUNCTION arrhenia_append_refit_analysis(integer, text, jsonb, jsonb, text) FROM PUBLIC;

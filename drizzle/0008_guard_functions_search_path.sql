-- The freeze functions name their tables without a schema. Resolved through the caller's
-- search_path, a temporary table of the same name (pg_temp is searched first by default) could
-- stand in for dataset_versions and tell a trigger that a published version is a draft. Every
-- guard function therefore runs with a fixed search_path that puts pg_temp last, and nobody may
-- create temporary tables in this database any more.
DO $$
DECLARE f record;
BEGIN
  FOR f IN SELECT p.oid::regprocedure AS sig FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
           WHERE n.nspname = 'public' AND p.proname LIKE 'arrhenia\_%' LOOP
    EXECUTE format('ALTER FUNCTION %s SET search_path = pg_catalog, public, pg_temp', f.sig);
  END LOOP;
  EXECUTE format('REVOKE TEMPORARY ON DATABASE %I FROM PUBLIC', current_database());
END;
$$;

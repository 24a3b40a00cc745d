-- Three rules the runtime role could get around before this migration.
--
-- 1. A submission snapshot is written only by arrhenia_take_submission_snapshot, run as the schema
--    owner, which builds it from the version's own stored payload and points inside the transaction
--    that submitted the version. The runtime role loses INSERT on submission_snapshots (withheld by
--    scripts/migrate.ts through db/privileges.ts) and the insert trigger refuses anyone but the owner.
-- 2. A series identifier is ours or nothing: `<DOI prefix>/ARH-XXXX-XXXC` (Crockford base32, C its
--    check symbol; lib/identifiers/series-code.ts) or a legacy `<DOI prefix>/arrhenia.N`. A CHECK
--    constraint holds every new or changed row to that; arrhenia_publish_version checks it again
--    (rows older than the constraint are not re-validated here) before minting from it.
-- 3. A version under review (submitted or in_review) keeps the document the curators review: its row
--    may change only its state (withdraw, start of review, return, decline) or be published by
--    arrhenia_publish_version; its points and files cannot be added, changed or removed.

-- True for a series code's eight symbols ("4F7K9QXM") whose last is the check symbol of the other seven.
CREATE OR REPLACE FUNCTION arrhenia_series_code_checks(symbols text) RETURNS boolean AS $$
DECLARE
  digits constant text := '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
  checks constant text := '0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U';
  value bigint := 0;
  i integer;
  d integer;
BEGIN
  IF length(symbols) <> 8 THEN RETURN false; END IF;
  FOR i IN 1..7 LOOP
    d := strpos(digits, substr(symbols, i, 1));
    IF d = 0 THEN RETURN false; END IF;
    value := value * 32 + (d - 1);
  END LOOP;
  RETURN substr(checks, (value % 37)::integer + 1, 1) = substr(symbols, 8, 1);
END;
$$ LANGUAGE plpgsql IMMUTABLE STRICT SET search_path = pg_catalog, pg_temp;
--> statement-breakpoint

-- A series identifier as minted: a DOI prefix (10.<4–9 digits>), then a series code with a right
-- check symbol, or a legacy `arrhenia.N`.
CREATE OR REPLACE FUNCTION arrhenia_series_identifier_valid(series text) RETURNS boolean AS $$
  SELECT series ~ '^10\.[0-9]{4,9}/arrhenia\.[1-9][0-9]*$'
    OR (series ~ '^10\.[0-9]{4,9}/ARH-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{3}[0-9A-HJKMNP-TV-Z*~$=U]$'
        AND public.arrhenia_series_code_checks(replace(substr(series, strpos(series, '/ARH-') + 5), '-', '')))
$$ LANGUAGE sql IMMUTABLE STRICT SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_series_identifier_format"
  CHECK (series_identifier IS NULL OR arrhenia_series_identifier_valid(series_identifier)) NOT VALID;
--> statement-breakpoint

-- As in drizzle/0017, plus the check of the series identifier before it is minted from.
CREATE OR REPLACE FUNCTION arrhenia_publish_version(p_version_id integer, p_curator_id integer, p_reason text)
RETURNS TABLE (version_identifier text, payload_sha256 text, published_at timestamptz) AS $$
DECLARE
  v record;
  series text;
  ident text;
  checksum text;
BEGIN
  SELECT dv.id, dv.dataset_id, dv.number, dv.state, dv.payload, d.owner_id, d.series_identifier
    INTO v FROM dataset_versions dv JOIN datasets d ON d.id = dv.dataset_id
    WHERE dv.id = p_version_id FOR UPDATE OF dv;
  IF NOT FOUND THEN
    RAISE EXCEPTION 'no dataset version %', p_version_id USING ERRCODE = 'no_data_found';
  END IF;
  IF NOT EXISTS (SELECT 1 FROM users u WHERE u.id = p_curator_id AND u.role IN ('curator', 'admin') AND u.deactivated_at IS NULL) THEN
    RAISE EXCEPTION 'version % is published only by an active curator', p_version_id USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF v.owner_id = p_curator_id OR EXISTS (SELECT 1 FROM dataset_members m WHERE m.dataset_id = v.dataset_id AND m.user_id = p_curator_id) THEN
    RAISE EXCEPTION 'version % cannot be accepted by one of its own co-editors', p_version_id USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF v.state NOT IN ('submitted', 'in_review') THEN
    RAISE EXCEPTION 'version % is published only by acceptance from review, not from %', p_version_id, v.state USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF p_reason IS NULL OR btrim(p_reason) = '' THEN
    RAISE EXCEPTION 'an acceptance needs its reason' USING ERRCODE = 'not_null_violation';
  END IF;
  series := v.series_identifier;
  IF series IS NULL THEN
    RAISE EXCEPTION 'the dataset of version % has no series identifier yet', p_version_id USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF NOT arrhenia_series_identifier_valid(series) THEN
    RAISE EXCEPTION 'the series identifier of the dataset of version % is not one this repository mints (expected <DOI prefix>/ARH-XXXX-XXXX with a right check symbol)', p_version_id
      USING ERRCODE = 'check_violation';
  END IF;
  -- lib/identifiers/series-code.ts versionIdentifierOf: legacy series take ".vN", code series "/N".
  ident := CASE WHEN series ~ '^10\.[0-9]{4,9}/arrhenia\.[1-9][0-9]*$' THEN series || '.v' || v.number ELSE series || '/' || v.number END;
  checksum := encode(sha256(convert_to(arrhenia_canonical_json(v.payload), 'UTF8')), 'hex');
  INSERT INTO decisions (version_id, curator_id, decision, reason) VALUES (p_version_id, p_curator_id, 'accept', btrim(p_reason));
  UPDATE dataset_versions dv
    SET state = 'published', published_at = now(), updated_at = now(), payload_sha256 = checksum, version_identifier = ident
    WHERE dv.id = p_version_id;
  RETURN QUERY SELECT ident, checksum, now();
END;
$$ LANGUAGE plpgsql SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
REVOKE ALL ON FUNCTION arrhenia_publish_version(integer, integer, text) FROM PUBLIC;
--> statement-breakpoint

-- The next snapshot of a version, taken in the transaction that submitted it (state 'submitted' and
-- submitted_at = now(), which the freeze below keeps from being set again under review), once per
-- submission, by the dataset's owner, from the stored payload and points. Returns its sequence.
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
  IF v.state IS DISTINCT FROM 'submitted' OR v.submitted_at IS DISTINCT FROM now() THEN
    RAISE EXCEPTION 'a snapshot of version % is taken only as it is submitted, in the same transaction', p_version_id
      USING ERRCODE = 'integrity_constraint_violation';
  END IF;
  IF EXISTS (SELECT 1 FROM submission_snapshots s WHERE s.version_id = p_version_id AND s.created_at = now()) THEN
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
REVOKE ALL ON FUNCTION arrhenia_take_submission_snapshot(integer, integer, text) FROM PUBLIC;
--> statement-breakpoint

-- Only the owner (so only arrhenia_take_submission_snapshot) inserts; drizzle/0020's trigger checks the rest.
CREATE OR REPLACE FUNCTION arrhenia_guard_snapshot_by_function() RETURNS trigger AS $$
BEGIN
  IF NOT arrhenia_current_user_owns(TG_RELID) THEN
    RAISE EXCEPTION 'a snapshot of version % is taken only by arrhenia_take_submission_snapshot', NEW.version_id USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER submission_snapshots_written_by_function
  BEFORE INSERT ON submission_snapshots
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_snapshot_by_function();
--> statement-breakpoint
REVOKE INSERT ON TABLE submission_snapshots FROM PUBLIC;
--> statement-breakpoint

-- A version under review: only its state changes (with updated_at), or acceptance publishes it
-- (arrhenia_publish_version also sets the identifier, checksum and publication time). It is not
-- deleted. Entering 'submitted' is not covered here: OLD is then a draft or returned version.
CREATE OR REPLACE FUNCTION arrhenia_guard_version_under_review() RETURNS trigger AS $$
DECLARE
  allowed constant text[] := ARRAY['state', 'updated_at', 'published_at', 'payload_sha256', 'version_identifier'];
BEGIN
  IF OLD.state IN ('submitted', 'in_review') THEN
    IF TG_OP = 'DELETE' THEN
      RAISE EXCEPTION 'version % is under review and cannot be deleted', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    IF (to_jsonb(NEW) - allowed) IS DISTINCT FROM (to_jsonb(OLD) - allowed) THEN
      RAISE EXCEPTION 'version % is under review: its document cannot be changed (withdraw it or have it returned first)', OLD.id
        USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END IF;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER dataset_versions_frozen_under_review
  BEFORE UPDATE OR DELETE ON dataset_versions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_version_under_review();
--> statement-breakpoint

-- The points and files of a version under review: neither added, changed nor removed (nor moved to
-- or from such a version).
CREATE OR REPLACE FUNCTION arrhenia_guard_children_under_review() RETURNS trigger AS $$
DECLARE
  vid integer;
BEGIN
  FOR vid IN SELECT x FROM unnest(ARRAY[CASE WHEN TG_OP <> 'INSERT' THEN OLD.version_id END, CASE WHEN TG_OP <> 'DELETE' THEN NEW.version_id END]) x WHERE x IS NOT NULL LOOP
    IF EXISTS (SELECT 1 FROM dataset_versions WHERE id = vid AND state IN ('submitted', 'in_review')) THEN
      RAISE EXCEPTION 'version % is under review: its % cannot be changed (withdraw it or have it returned first)', vid, TG_TABLE_NAME
        USING ERRCODE = 'integrity_constraint_violation';
    END IF;
  END LOOP;
  IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER version_points_frozen_under_review
  BEFORE INSERT OR UPDATE OR DELETE ON version_points
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_children_under_review();
--> statement-breakpoint
CREATE TRIGGER version_files_frozen_under_review
  BEFORE INSERT OR UPDATE OR DELETE ON version_files
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_children_under_review();

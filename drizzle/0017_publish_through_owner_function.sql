-- Publication has one path: arrhenia_publish_version, run as the schema owner (SECURITY DEFINER,
-- fixed search_path), which the runtime role may only call. It checks that the caller is an active
-- curator who is not a co-editor of the dataset and that the version is in review, writes the accept
-- decision, and sets the version identifier, the payload checksum and the publication time itself.
-- The runtime role can no longer write an accept decision or move a version into published
-- (the triggers below refuse anyone but the owner), nor write the identifier, checksum or
-- publication time (column privileges, granted by scripts/migrate.ts through db/privileges.ts).
--
-- The checksum is computed here from the stored payload, never taken from the caller: a value
-- passed in could be any 64 hex digits, and checking it would need this same recomputation. It is
-- SHA-256 of the payload in RFC 8785 canonical JSON (the app's payloadSha256, the `canonicalize`
-- package, gives the same digest): keys sorted, strings escaped as JSON.stringify does (so does
-- jsonb's text output), numbers written as ECMAScript writes the nearest double. Keys are sorted by
-- code point (COLLATE "C" on UTF-8), which RFC 8785's UTF-16 order matches unless a key mixes
-- characters above U+FFFF with U+E000–U+FFFF (the schema's keys are ASCII).

-- A number as ECMAScript's Number.prototype.toString writes it (RFC 8785 §3.2.2.3), from the
-- shortest round-trip digits of the nearest double (float8 output with extra_float_digits = 1).
CREATE OR REPLACE FUNCTION arrhenia_es_number(n numeric) RETURNS text AS $$
DECLARE
  t text := (n::float8)::text;
  neg boolean;
  m text[];
  digits text;
  point integer;
  k integer;
  e integer;
  r text;
BEGIN
  IF t IN ('0', '-0') THEN RETURN '0'; END IF;
  neg := left(t, 1) = '-';
  IF neg THEN t := substr(t, 2); END IF;
  m := regexp_match(t, '^([0-9]+)(?:\.([0-9]+))?(?:e([+-]?[0-9]+))?$');
  IF m IS NULL THEN RAISE EXCEPTION 'number % has no JSON form', t; END IF;
  digits := m[1] || coalesce(m[2], '');
  point := length(m[1]) + coalesce(m[3]::integer, 0);
  point := point - (length(digits) - length(ltrim(digits, '0')));
  digits := rtrim(ltrim(digits, '0'), '0');
  -- value = digits × 10^(point − k), ECMAScript's s, k and n.
  k := length(digits);
  IF k <= point AND point <= 21 THEN r := digits || repeat('0', point - k);
  ELSIF 0 < point AND point <= 21 THEN r := left(digits, point) || '.' || substr(digits, point + 1);
  ELSIF -6 < point AND point <= 0 THEN r := '0.' || repeat('0', -point) || digits;
  ELSE
    e := point - 1;
    r := left(digits, 1) || CASE WHEN k > 1 THEN '.' || substr(digits, 2) ELSE '' END || 'e' || CASE WHEN e < 0 THEN '-' ELSE '+' END || abs(e);
  END IF;
  RETURN CASE WHEN neg THEN '-' ELSE '' END || r;
END;
$$ LANGUAGE plpgsql IMMUTABLE STRICT SET search_path = pg_catalog, pg_temp SET extra_float_digits = 1;
--> statement-breakpoint

-- RFC 8785 canonical JSON of a jsonb value.
CREATE OR REPLACE FUNCTION arrhenia_canonical_json(j jsonb) RETURNS text AS $$
  SELECT CASE jsonb_typeof(j)
    WHEN 'object' THEN '{' || coalesce((
      SELECT string_agg(to_jsonb(key)::text || ':' || public.arrhenia_canonical_json(value), ',' ORDER BY key COLLATE "C")
        FROM jsonb_each(j)), '') || '}'
    WHEN 'array' THEN '[' || coalesce((
      SELECT string_agg(public.arrhenia_canonical_json(value), ',' ORDER BY ord)
        FROM jsonb_array_elements(j) WITH ORDINALITY AS e(value, ord)), '') || ']'
    WHEN 'number' THEN public.arrhenia_es_number(j::numeric)
    ELSE j::text
  END
$$ LANGUAGE sql IMMUTABLE STRICT SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint

-- True when the current role owns the table the trigger fires on (inside an owner-run function it does).
CREATE OR REPLACE FUNCTION arrhenia_current_user_owns(rel oid) RETURNS boolean AS $$
  SELECT pg_has_role(current_user, c.relowner, 'USAGE') FROM pg_class c WHERE c.oid = rel
$$ LANGUAGE sql STABLE SET search_path = pg_catalog, pg_temp;
--> statement-breakpoint

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

-- Only the owner (so only arrhenia_publish_version) moves a version into published…
CREATE OR REPLACE FUNCTION arrhenia_guard_publication() RETURNS trigger AS $$
BEGIN
  IF NEW.state = 'published' AND OLD.state IS DISTINCT FROM 'published' THEN
    IF NOT arrhenia_current_user_owns(TG_RELID) THEN
      RAISE EXCEPTION 'version % is published only by acceptance (arrhenia_publish_version)', OLD.id USING ERRCODE = 'insufficient_privilege';
    END IF;
    IF OLD.state NOT IN ('submitted', 'in_review') THEN
      RAISE EXCEPTION 'version % is published only by acceptance from review, not from %', OLD.id, OLD.state USING ERRCODE = 'integrity_constraint_violation';
    END IF;
    IF NEW.version_identifier IS NULL OR NEW.payload_sha256 IS NULL OR NEW.published_at IS NULL THEN
      RAISE EXCEPTION 'version % cannot be published without its identifier, payload checksum and publication time', OLD.id USING ERRCODE = 'integrity_constraint_violation';
    END IF;
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

-- …and writes an accept decision.
CREATE OR REPLACE FUNCTION arrhenia_guard_accept_decision() RETURNS trigger AS $$
BEGIN
  IF NEW.decision = 'accept' AND NOT arrhenia_current_user_owns(TG_RELID) THEN
    RAISE EXCEPTION 'an accept decision is written only by acceptance (arrhenia_publish_version)' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$ LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp;
--> statement-breakpoint
CREATE TRIGGER decisions_accept_only_by_publication
  BEFORE INSERT ON decisions
  FOR EACH ROW EXECUTE FUNCTION arrhenia_guard_accept_decision();

import "server-only";
import type { Sql } from "postgres";

// What the runtime role may do, and the check that it can do nothing more. The freeze of published
// versions lives in triggers; a role that owns a table, is a superuser, may TRUNCATE, or may set
// session_replication_role could switch them off, so the app must connect as a role that cannot.

/** Schemas whose tables the app reads and writes (ours and pg-boss's). */
const ROW_SCHEMAS = ["public", "pgboss"] as const;

/** Append-only tables: the runtime role lacks these privileges (the triggers refuse them too). */
const WITHHELD: Record<string, string> = {
  decisions: "UPDATE, DELETE",
  audit_events: "UPDATE, DELETE",
  // Written only by arrhenia_take_submission_snapshot (drizzle/0021), from the stored document and points.
  submission_snapshots: "INSERT, UPDATE, DELETE",
  identifier_registrations: "DELETE",
  // The current engine version (drizzle/0013): written by the owner only, read by the re-fit function.
  arrhenia_engine: "INSERT, UPDATE, DELETE",
  // OAI-PMH datestamps (drizzle/0028): written only by the trigger on a version's change of state.
  oai_record_datestamps: "INSERT, UPDATE, DELETE",
  // Which account a creator entry is (drizzle/0030): written only by the triggers on versions and accounts.
  creator_people: "INSERT, UPDATE, DELETE",
};

/** Functions that run as the schema owner and that the runtime role may call (each checks its own rule). */
export const RUNTIME_FUNCTIONS = [
  "arrhenia_append_refit_analysis(integer, text, jsonb, jsonb, text)",
  // Acceptance (drizzle/0017): the one way a version is published.
  "arrhenia_publish_version(integer, integer, text)",
  // Submission (drizzle/0021): the one way a submission snapshot is written.
  "arrhenia_take_submission_snapshot(integer, integer, text)",
];

/** Columns only acceptance writes (drizzle/0017): the runtime role may UPDATE every other column of these tables. */
export const OWNER_WRITTEN_COLUMNS: Record<string, string[]> = {
  dataset_versions: ["published_at", "payload_sha256", "version_identifier"],
};

/** A draft of its own making set published by hand: refused by drizzle/0016 whatever the database holds. */
export const PUBLISH_BY_HAND = `DO $$ DECLARE u integer; d integer; v integer; BEGIN
        INSERT INTO public.users (email, name, password_hash) VALUES ('privileges-probe@example.invalid', 'probe', 'x') RETURNING id INTO u;
        INSERT INTO public.datasets (owner_id) VALUES (u) RETURNING id INTO d;
        INSERT INTO public.dataset_versions (dataset_id, number, title, payload) VALUES (d, 1, 'probe', '{}') RETURNING id INTO v;
        UPDATE public.dataset_versions SET state = 'published', published_at = now() WHERE id = v;
      END $$`;

/** A probe version in review, its dataset and a probe curator (PL/pgSQL, before the statement that needs them). */
const PROBE_IN_REVIEW = `DECLARE u integer; c integer; d integer; v integer; BEGIN
        INSERT INTO public.users (email, name, password_hash) VALUES ('privileges-probe@example.invalid', 'probe', 'x') RETURNING id INTO u;
        INSERT INTO public.users (email, name, password_hash, role) VALUES ('privileges-curator@example.invalid', 'probe', 'x', 'curator') RETURNING id INTO c;
        INSERT INTO public.datasets (owner_id, series_identifier) VALUES (u, '10.5072/ARH-PRBE-PR0R') RETURNING id INTO d;
        INSERT INTO public.dataset_versions (dataset_id, number, title, payload) VALUES (d, 1, 'probe', '{}') RETURNING id INTO v;
        UPDATE public.dataset_versions SET state = 'submitted', submitted_at = now() WHERE id = v;`;

/** A curator's accept decision written directly: refused by drizzle/0017 (only acceptance writes one). */
export const WRITE_ACCEPT_DECISION = `DO $$ ${PROBE_IN_REVIEW}
        INSERT INTO public.decisions (version_id, curator_id, decision, reason) VALUES (v, c, 'accept', 'forged');
      END $$`;

/** A version in review set published with everything the guard of drizzle/0016 asked for: refused by drizzle/0017. */
export const PUBLISH_FULL_ROW = `DO $$ ${PROBE_IN_REVIEW}
        UPDATE public.dataset_versions SET state = 'published', published_at = now(), version_identifier = '10.5072/ARH-PRBE-PRB0/1',
          payload_sha256 = repeat('0', 64) WHERE id = v;
      END $$`;

/** A version in review whose document is replaced: refused by drizzle/0021. */
export const CHANGE_UNDER_REVIEW = `DO $$ ${PROBE_IN_REVIEW}
        UPDATE public.dataset_versions SET payload = '{"forged": true}' WHERE id = v;
      END $$`;

/** A point added to a version in review: refused by drizzle/0021. */
export const ADD_POINT_UNDER_REVIEW = `DO $$ ${PROBE_IN_REVIEW}
        INSERT INTO public.version_points (version_id, idx, temperature_k, rate_constant, original) VALUES (v, 0, 1, 1, '{}');
      END $$`;

/** A snapshot written directly, as the version is submitted: refused by drizzle/0021 (no INSERT; only the owner-run function). */
export const WRITE_SNAPSHOT = `DO $$ ${PROBE_IN_REVIEW}
        INSERT INTO public.submission_snapshots (version_id, sequence, submitted_by, reply, payload, points) VALUES (v, 1, c, 'forged', '{}', '[]');
      END $$`;

/** A second snapshot through the function, with another person's name: refused by drizzle/0021 (only the dataset's owner, once per submission). */
export const SNAPSHOT_BY_ANOTHER = `DO $$ ${PROBE_IN_REVIEW}
        PERFORM public.arrhenia_take_submission_snapshot(v, c, 'forged');
      END $$`;

/**
 * A lifecycle time of the runtime role's own choosing (drizzle/0026): its `arrhenia.recorded_at`
 * is ignored. The block fails (is "refused") exactly when the clock still reads now().
 */
export const CHOOSE_RECORDED_TIME = `DO $$ BEGIN
        PERFORM set_config('arrhenia.recorded_at', '2000-01-01 00:00:00+00', true);
        IF public.arrhenia_recorded_at() = now() THEN RAISE EXCEPTION 'arrhenia.recorded_at ignored'; END IF;
      END $$`;

/** Acceptance minting from a series identifier that is not ours: refused by drizzle/0021. */
export const PUBLISH_FOREIGN_SERIES = `DO $$ ${PROBE_IN_REVIEW.replace("'10.5072/ARH-PRBE-PR0R'", "NULL")}
        UPDATE public.datasets SET series_identifier = 'javascript:alert(1)//' WHERE id = d;
        PERFORM public.arrhenia_publish_version(v, c, 'forged');
      END $$`;

/** Triggers that freeze published data (drizzle/0002, drizzle/0007, drizzle/0016); each must exist and fire. */
export const FREEZE_TRIGGERS = [
  "dataset_versions_frozen_when_published",
  "dataset_versions_identity_fixed",
  "dataset_versions_published_by_acceptance",
  "version_points_frozen_when_published",
  "version_analyses_frozen_when_published",
  "version_files_frozen_when_published",
  "datasets_frozen_when_published",
  "dataset_members_owner_frozen_when_published",
  "decisions_append_only",
  "decisions_accept_only_by_publication",
  "submission_snapshots_append_only",
  "submission_snapshots_taken_at_submission",
  "submission_snapshots_written_by_function",
  "dataset_versions_frozen_under_review",
  "version_points_frozen_under_review",
  "version_files_frozen_under_review",
  "identifier_registrations_forward_only",
  "reactions_frozen_when_published",
  "reaction_participants_frozen_when_published",
  "species_frozen_when_published",
  "species_names_frozen_when_published",
  // drizzle/0035: published collections.
  "collection_versions_frozen_when_published",
  "collection_members_frozen_when_published",
  "collections_frozen_when_published",
];

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * Grants `role` row access only (SELECT, INSERT, UPDATE, DELETE; sequences' USAGE) on every table,
 * now and in later migrations (default privileges), minus the append-only tables' UPDATE/DELETE.
 * Run by the schema owner after migrating; idempotent.
 */
export async function grantRuntimeRole(sql: Sql, role: string): Promise<void> {
  await sql.begin(async (tx) => {
    for (const schema of ROW_SCHEMAS) {
      const [exists] = await tx`select 1 from pg_namespace where nspname = ${schema}`;
      if (!exists) continue;
      await tx`grant usage on schema ${tx(schema)} to ${tx(role)}`;
      await tx`revoke all on all tables in schema ${tx(schema)} from ${tx(role)}`;
      await tx`grant select, insert, update, delete on all tables in schema ${tx(schema)} to ${tx(role)}`;
      await tx`grant usage, select on all sequences in schema ${tx(schema)} to ${tx(role)}`;
      await tx`alter default privileges in schema ${tx(schema)} grant select, insert, update, delete on tables to ${tx(role)}`;
      await tx`alter default privileges in schema ${tx(schema)} grant usage, select on sequences to ${tx(role)}`;
    }
    for (const [table, privileges] of Object.entries(WITHHELD)) {
      await tx.unsafe(`revoke ${privileges} on table public.${quoteIdent(table)} from ${quoteIdent(role)}`);
    }
    // Column privileges: UPDATE on every column but those only acceptance writes (columns added
    // later are included when this runs again after their migration).
    for (const [table, withheld] of Object.entries(OWNER_WRITTEN_COLUMNS)) {
      const columns = await tx<{ name: string }[]>`
        select column_name as name from information_schema.columns
          where table_schema = 'public' and table_name = ${table} and column_name <> all(${withheld}) order by ordinal_position`;
      await tx.unsafe(`revoke update on table public.${quoteIdent(table)} from ${quoteIdent(role)}`);
      await tx.unsafe(
        `grant update (${columns.map((c) => quoteIdent(c.name)).join(", ")}) on table public.${quoteIdent(table)} to ${quoteIdent(role)}`,
      );
    }
    for (const signature of RUNTIME_FUNCTIONS) {
      const [exists] = await tx`select to_regprocedure(${"public." + signature}) is not null as found`;
      if (exists.found) await tx.unsafe(`grant execute on function public.${signature} to ${quoteIdent(role)}`);
    }
  });
}

export interface PrivilegeCheck {
  check: string;
  found: string;
  ok: boolean;
}

export interface TablePrivileges {
  table: string;
  owner: string;
  select: boolean;
  insert: boolean;
  update: boolean;
  delete: boolean;
  truncate: boolean;
  references: boolean;
  trigger: boolean;
}

class Rollback extends Error {}

/** True when the database refuses `statement` (anything it did is rolled back either way). */
async function isRefused(sql: Sql, statement: string): Promise<boolean> {
  try {
    await sql.begin(async (tx) => {
      await tx.unsafe(statement);
      throw new Rollback();
    });
    return false;
  } catch (err) {
    return !(err instanceof Rollback);
  }
}

const none = (xs: string[]) => (xs.length ? xs.join(", ") : "none");

/** Inspects the connected role: every way it could alter a frozen row, and its table privileges. */
export async function inspectRuntimePrivileges(sql: Sql): Promise<{ role: string; checks: PrivilegeCheck[]; tables: TablePrivileges[] }> {
  const [me] = await sql<
    { role: string; rolsuper: boolean; rolcreaterole: boolean; rolcreatedb: boolean; rolreplication: boolean; rolbypassrls: boolean }[]
  >`
    select current_user as role, rolsuper, rolcreaterole, rolcreatedb, rolreplication, rolbypassrls from pg_roles where rolname = current_user`;
  const asRoles = (
    await sql<
      { name: string }[]
    >`select rolname as name from pg_roles where rolname <> current_user and pg_has_role(current_user, oid, 'MEMBER') order by 1`
  ).map((r) => r.name);
  const owned = (
    await sql<{ name: string }[]>`
      select n.nspname || '.' || c.relname as name from pg_class c join pg_namespace n on n.oid = c.relnamespace
        where pg_has_role(current_user, c.relowner, 'MEMBER') and n.nspname not like 'pg_temp%' and n.nspname not like 'pg_toast%'
      union all select 'schema ' || nspname from pg_namespace where pg_has_role(current_user, nspowner, 'MEMBER') and nspname not like 'pg_temp%' and nspname not like 'pg_toast%'
      union all select 'function ' || p.oid::regprocedure from pg_proc p where pg_has_role(current_user, p.proowner, 'MEMBER')
      order by 1`
  ).map((r) => r.name);
  const tables = await sql<TablePrivileges[]>`
    select n.nspname || '.' || c.relname as table, pg_get_userbyid(c.relowner) as owner,
      has_table_privilege(c.oid, 'SELECT') as select, has_table_privilege(c.oid, 'INSERT') as insert,
      has_table_privilege(c.oid, 'UPDATE') as update, has_table_privilege(c.oid, 'DELETE') as delete,
      has_table_privilege(c.oid, 'TRUNCATE') as truncate, has_table_privilege(c.oid, 'REFERENCES') as references,
      has_table_privilege(c.oid, 'TRIGGER') as trigger
    from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where c.relkind in ('r', 'p') and n.nspname in ('public', 'pgboss', 'drizzle') order by 1`;
  const schemasWithCreate = (
    await sql<
      { name: string }[]
    >`select nspname as name from pg_namespace where has_schema_privilege(oid, 'CREATE') and nspname not like 'pg_temp%' and nspname not like 'pg_toast%' order by 1`
  ).map((r) => r.name);
  const [db] = await sql<{ create: boolean; temporary: boolean; replication: boolean }[]>`
    select has_database_privilege(current_database(), 'CREATE') as create, has_database_privilege(current_database(), 'TEMPORARY') as temporary,
      has_parameter_privilege('session_replication_role', 'SET') as replication`;
  // A guard function that resolves table names through the caller's search_path can be fooled by
  // a temporary table of the same name: each must carry its own search_path.
  const unpinned = (
    await sql<{ name: string }[]>`
      select p.proname as name from pg_proc p join pg_namespace n on n.oid = p.pronamespace
        where n.nspname = 'public' and left(p.proname, 9) = 'arrhenia_'
          and not exists (select 1 from unnest(coalesce(p.proconfig, '{}')) c where c like 'search_path=%' and c not like 'search_path=%pg_temp%,%')
        order by 1`
  ).map((r) => r.name);
  // Functions that run as their owner are ways around the freeze unless each is one we meant.
  const sameSignature = (a: string, b: string) => a.replace(/\s|^public\./g, "") === b.replace(/\s|^public\./g, "");
  const definers = (
    await sql<{ name: string }[]>`
      select p.oid::regprocedure::text as name from pg_proc p join pg_namespace n on n.oid = p.pronamespace
        where p.prosecdef and n.nspname in ('public', 'pgboss') and has_function_privilege(p.oid, 'EXECUTE') order by 1`
  ).map((r) => r.name);
  const unexpectedDefiners = definers.filter((d) => !RUNTIME_FUNCTIONS.some((f) => sameSignature(d, f)));
  const triggers = await sql<
    { name: string; enabled: string }[]
  >`select tgname as name, tgenabled as enabled from pg_trigger where tgname = any(${FREEZE_TRIGGERS})`;
  const missing = FREEZE_TRIGGERS.filter((t) => !triggers.some((x) => x.name === t && (x.enabled === "O" || x.enabled === "A")));
  const appendOnlyWritable = tables
    .filter((t) => (t.table === "public.decisions" || t.table === "public.audit_events") && (t.update || t.delete))
    .concat(tables.filter((t) => t.table === "public.identifier_registrations" && t.delete))
    .concat(tables.filter((t) => t.table === "public.submission_snapshots" && (t.insert || t.update || t.delete)))
    .map((t) => t.table);
  const ownerColumns = Object.entries(OWNER_WRITTEN_COLUMNS).flatMap(([table, columns]) => columns.map((c) => `${table}.${c}`));
  const ownerColumnsWritable = (
    await sql<{ name: string }[]>`
      select c.table_name || '.' || c.column_name as name from information_schema.columns c
        where c.table_schema = 'public' and c.table_name || '.' || c.column_name = any(${ownerColumns})
          and has_column_privilege('public.' || quote_ident(c.table_name), c.column_name, 'UPDATE') order by 1`
  ).map((r) => r.name);
  const engineRow = tables.find((t) => t.table === "public.arrhenia_engine");
  const engineWritable = engineRow ? (["insert", "update", "delete", "truncate"] as const).filter((p) => engineRow[p]) : [];

  const checks: PrivilegeCheck[] = [
    { check: "superuser", found: String(me.rolsuper), ok: !me.rolsuper },
    { check: "may create roles", found: String(me.rolcreaterole), ok: !me.rolcreaterole },
    { check: "may create databases", found: String(me.rolcreatedb), ok: !me.rolcreatedb },
    { check: "replication", found: String(me.rolreplication), ok: !me.rolreplication },
    { check: "bypasses row-level security", found: String(me.rolbypassrls), ok: !me.rolbypassrls },
    { check: "member of (may act as) roles", found: none(asRoles), ok: asRoles.length === 0 },
    {
      check: "owns objects",
      found: owned.length ? `${owned.length}: ${owned.slice(0, 5).join(", ")}${owned.length > 5 ? ", …" : ""}` : "none",
      ok: owned.length === 0,
    },
    ...(["truncate", "trigger", "references"] as const).map((p) => {
      const on = tables.filter((t) => t[p]).map((t) => t.table);
      return {
        check: `${p.toUpperCase()} on tables`,
        found: on.length ? `${on.length}: ${on.slice(0, 3).join(", ")}${on.length > 3 ? ", …" : ""}` : "none",
        ok: on.length === 0,
      };
    }),
    { check: "CREATE on schemas", found: none(schemasWithCreate), ok: schemasWithCreate.length === 0 },
    { check: "CREATE on the database", found: String(db.create), ok: !db.create },
    { check: "TEMPORARY on the database (tables that shadow)", found: String(db.temporary), ok: !db.temporary },
    { check: "guard functions without a fixed search_path", found: none(unpinned), ok: unpinned.length === 0 },
    { check: "may set session_replication_role", found: String(db.replication), ok: !db.replication },
    {
      check: "UPDATE/DELETE on append-only tables (INSERT on submission snapshots)",
      found: none(appendOnlyWritable),
      ok: appendOnlyWritable.length === 0,
    },
    {
      check: "current engine version row exists, and the role may not change it",
      found: engineRow ? none(engineWritable.map((p) => p.toUpperCase())) : "no table public.arrhenia_engine",
      ok: !!engineRow && engineWritable.length === 0,
    },
    {
      check: "UPDATE on columns only acceptance writes (identifier, checksum, publication time)",
      found: none(ownerColumnsWritable),
      ok: ownerColumnsWritable.length === 0,
    },
    { check: "freeze triggers missing or disabled", found: none(missing), ok: missing.length === 0 },
    {
      check: "owner-run functions it may call, beyond re-fit, acceptance and submission snapshots",
      found: none(unexpectedDefiners),
      ok: unexpectedDefiners.length === 0,
    },
  ];
  // Belt and braces: the attempts themselves (rolled back should any succeed).
  const attempts: [string, string][] = [
    ["SET session_replication_role = replica", "SET LOCAL session_replication_role = replica"],
    ["ALTER TABLE … DISABLE TRIGGER", "ALTER TABLE public.dataset_versions DISABLE TRIGGER dataset_versions_frozen_when_published"],
    ["DROP TRIGGER", "DROP TRIGGER version_points_frozen_when_published ON public.version_points"],
    ["TRUNCATE", "TRUNCATE public.version_points"],
    ["CREATE TEMP TABLE dataset_versions", "CREATE TEMP TABLE dataset_versions (id integer, state text)"],
    ["UPDATE the current engine version", "UPDATE public.arrhenia_engine SET engine_version = 'forged'"],
    ["INSERT a current engine version", "INSERT INTO public.arrhenia_engine (only_row, engine_version) VALUES (true, 'forged')"],
    ["DELETE the current engine version", "DELETE FROM public.arrhenia_engine"],
    ["publish a draft by hand", PUBLISH_BY_HAND],
    ["write an accept decision", WRITE_ACCEPT_DECISION],
    ["publish a version in review with a full row (identifier, checksum, time)", PUBLISH_FULL_ROW],
    ["set a draft's checksum", "UPDATE public.dataset_versions SET payload_sha256 = repeat('0', 64) WHERE false"],
    ["publish through the acceptance function as nobody", "SELECT * FROM public.arrhenia_publish_version(NULL, NULL, 'forged')"],
    ["change the document of a version in review", CHANGE_UNDER_REVIEW],
    ["add a point to a version in review", ADD_POINT_UNDER_REVIEW],
    ["write a submission snapshot directly", WRITE_SNAPSHOT],
    ["a submission snapshot by someone other than the dataset's owner", SNAPSHOT_BY_ANOTHER],
    ["publish with a series identifier not of our form", PUBLISH_FOREIGN_SERIES],
    ["record a lifecycle step at a time of its own choosing (arrhenia.recorded_at)", CHOOSE_RECORDED_TIME],
    ["CREATE FUNCTION", "CREATE FUNCTION public.arrhenia_forged_refit() RETURNS integer LANGUAGE sql SECURITY DEFINER AS 'SELECT 1'"],
    [
      "a re-fit by an engine that is not the current one",
      "SELECT public.arrhenia_append_refit_analysis(NULL, 'forged-engine', NULL, NULL, NULL)",
    ],
  ];
  for (const [check, statement] of attempts) {
    const refused = await isRefused(sql, statement);
    checks.push({ check: `${check} refused`, found: String(refused), ok: refused });
  }
  return { role: me.role, checks, tables };
}

/** Renders rows as a plain-text table (for the terminal). */
export function formatTable(rows: Record<string, unknown>[]): string {
  if (!rows.length) return "";
  const cols = Object.keys(rows[0]);
  const cell = (v: unknown) => (typeof v === "boolean" ? (v ? "yes" : "-") : String(v));
  const width = cols.map((c) => Math.max(c.length, ...rows.map((r) => cell(r[c]).length)));
  const line = (vals: string[]) =>
    vals
      .map((v, i) => v.padEnd(width[i]))
      .join("  ")
      .trimEnd();
  return [line(cols), line(width.map((w) => "-".repeat(w))), ...rows.map((r) => line(cols.map((c) => cell(r[c]))))].join("\n");
}

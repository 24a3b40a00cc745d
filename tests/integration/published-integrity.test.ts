import PgBoss from "pg-boss";
import postgres from "postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { formatTable, inspectRuntimePrivileges, PUBLISH_BY_HAND, PUBLISH_FULL_ROW, WRITE_ACCEPT_DECISION } from "@/db/privileges";
import canonicalize from "canonicalize";
import { applyTransition, payloadSha256 } from "@/lib/curation/transitions";
import { depositNewDataset, startNextVersion, updateDraft } from "@/lib/datasets/deposits";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { addDatasetMember, getVersionWithRole } from "@/lib/datasets/queries";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { recordRegistrationSuccess } from "@/lib/identifiers/queries";
import { newSeriesIdentifier } from "@/lib/identifiers/series-code";
import { listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { databaseUrl } from "@/lib/config";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// `sql` connects as DATABASE_URL's role: the runtime role the app itself uses (scripts/test.sh).

/** The same kind of record, about another reaction: OH + C2H6 → H2O + C2H5. */
const ETHANE_DEPOSIT = {
  ...EXAMPLE_DEPOSIT,
  reaction: {
    ...EXAMPLE_DEPOSIT.reaction,
    reactants: [
      { name: "hydroxyl radical", smiles: "[OH]", coefficient: 1 },
      { name: "ethane", smiles: "CC", coefficient: 1 },
    ],
    products: [
      { name: "water", smiles: "O", coefficient: 1 },
      { name: "ethyl radical", smiles: "[CH2]C", coefficient: 1 },
    ],
  },
};

let owner: UserDto, curator: UserDto, stranger: UserDto;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, curator, stranger] = await Promise.all([mk("pi-owner"), mk("pi-curator", "curator"), mk("pi-stranger")]);
});

async function publish(document: unknown) {
  const v = await depositNewDataset({ actor: owner, document });
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent with the source." });
  return v;
}

const reactionOf = async (versionId: number) =>
  (await sql<{ reaction_id: number }[]>`select reaction_id from dataset_versions where id = ${versionId}`)[0].reaction_id;

describe("a draft of the next version never moves a published version", () => {
  it("v1 published on reaction A stays on A after v2's draft is saved on reaction B", async () => {
    const v1 = await publish({ ...EXAMPLE_DEPOSIT, title: "Moved reaction v1" });
    const reactionA = await reactionOf(v1.id);
    const v2 = await startNextVersion({ actor: owner, versionId: v1.id });
    expect(await reactionOf(v2.id)).toBe(reactionA); // the draft starts as a copy
    const saved = await updateDraft({
      actor: owner,
      versionId: v2.id,
      expectedLockVersion: v2.lockVersion,
      document: { ...ETHANE_DEPOSIT, title: "Moved reaction v2" },
    });
    const reactionB = await reactionOf(saved.id);
    expect(reactionB).not.toBe(reactionA);

    // The version page's query, the reaction pages and the stored row all still say A for v1.
    expect((await getVersionWithRole({ versionId: v1.id, userId: null }))!.version.reactionId).toBe(reactionA);
    expect(await reactionOf(v1.id)).toBe(reactionA);
    const onA = (await listPublicVersionsOfReaction({ reactionId: reactionA })).map((v) => v.versionId);
    expect(onA).toContain(v1.id);
    const onB = await listPublicVersionsOfReaction({ reactionId: reactionB });
    expect(onB.map((v) => v.datasetId)).not.toContain(v1.datasetId);
    // The file's first test starts the analysis worker threads and RDKit: slow on a busy machine.
  }, 120_000);
});

describe("the freeze holds against the runtime role", () => {
  let published: { id: number; datasetId: number }, draft: { id: number; datasetId: number }, reactionA: number, otherReaction: number;
  let speciesId: number, otherSpeciesId: number, versionIdentifier: string, seriesIdentifier: string;
  let before: string;

  const snapshot = async () =>
    JSON.stringify(
      await sql`select
        (select to_jsonb(v) - 'updated_at' from dataset_versions v where id = ${published.id}) as version,
        (select jsonb_agg(to_jsonb(p) order by idx) from version_points p where version_id = ${published.id}) as points,
        (select jsonb_agg(to_jsonb(a) order by id) from version_analyses a where version_id = ${published.id}) as analyses,
        (select jsonb_agg(to_jsonb(f) order by id) from version_files f where version_id = ${published.id}) as files,
        (select to_jsonb(d) - 'updated_at' from datasets d where id = ${published.datasetId}) as dataset,
        (select jsonb_agg(to_jsonb(m) order by user_id) from dataset_members m where dataset_id = ${published.datasetId} and role = 'owner') as owners,
        (select jsonb_agg(to_jsonb(x) order by id) from decisions x where version_id = ${published.id}) as decisions,
        (select jsonb_agg(to_jsonb(r) order by identifier) from identifier_registrations r where dataset_id = ${published.datasetId}) as registrations,
        (select jsonb_agg(to_jsonb(s) order by id) from species s where id in (select species_id from reaction_participants where reaction_id = ${reactionA})) as species,
        (select jsonb_agg(to_jsonb(p) order by species_id, side) from reaction_participants p where reaction_id = ${reactionA}) as participants,
        (select to_jsonb(r) from reactions r where id = ${reactionA}) as reaction`,
    );

  beforeAll(async () => {
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Frozen record" } });
    // Fitted by an older engine (relabelled while still a draft), so that the current engine's re-fit is legitimate.
    await sql`update version_analyses set engine_version = 'kinetics-0' where version_id = ${v.id}`;
    // A supplementary file listed before publication (storage is not needed for the freeze).
    await sql`insert into version_files (version_id, filename, content_type, size_bytes, sha256, storage_key) values (${v.id}, 'table.csv', 'text/csv', 3, ${"a".repeat(64)}, ${"frozen-" + v.id})`;
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent with the source." });
    published = v;
    const d = await depositNewDataset({ actor: owner, document: { ...ETHANE_DEPOSIT, title: "Draft to move" } });
    await sql`insert into version_files (version_id, filename, content_type, size_bytes, sha256, storage_key) values (${d.id}, 'draft.csv', 'text/csv', 3, ${"b".repeat(64)}, ${"draft-" + d.id})`;
    draft = d;
    reactionA = await reactionOf(published.id);
    otherReaction = await reactionOf(draft.id);
    [{ speciesId }] = await sql<{ speciesId: number }[]>`
      select p.species_id as "speciesId" from reaction_participants p
        where p.reaction_id = ${reactionA} and exists (select 1 from species_names n where n.species_id = p.species_id) order by p.species_id limit 1`;
    [{ otherSpeciesId }] = await sql<{ otherSpeciesId: number }[]>`
      select species_id as "otherSpeciesId" from reaction_participants where reaction_id = ${otherReaction} and species_id not in (select species_id from reaction_participants where reaction_id = ${reactionA}) limit 1`;
    [{ versionIdentifier, seriesIdentifier }] = await sql<{ versionIdentifier: string; seriesIdentifier: string }[]>`
      select v.version_identifier as "versionIdentifier", d.series_identifier as "seriesIdentifier" from dataset_versions v join datasets d on d.id = v.dataset_id where v.id = ${published.id}`;
    await recordRegistrationSuccess({ identifier: versionIdentifier }); // the job's one allowed step
    before = await snapshot();
  });

  // What someone holding the app's credentials would try, with why it must fail.
  const refusedByTrigger = /published|append-only|cannot be|move forward|inserted as published/;
  const notAllowed = /permission denied|must be owner|must be superuser|must be a member|must have/;
  const attempts = (): [string, string, RegExp][] => [
    ["edit the published row", `update dataset_versions set title = 'changed' where id = ${published.id}`, refusedByTrigger],
    [
      "move it to another reaction",
      `update dataset_versions set reaction_id = ${otherReaction} where id = ${published.id}`,
      refusedByTrigger,
    ],
    ["unpublish it", `update dataset_versions set state = 'draft' where id = ${published.id}`, refusedByTrigger],
    ["renumber it", `update dataset_versions set number = 99 where id = ${published.id}`, refusedByTrigger],
    ["delete it", `delete from dataset_versions where id = ${published.id}`, refusedByTrigger],
    [
      "insert a version as published",
      `insert into dataset_versions (dataset_id, number, state, title, payload) values (${published.datasetId}, 77, 'published', 'forged', '{}')`,
      refusedByTrigger,
    ],
    [
      "publish a draft by hand (no identifier, checksum or decision)",
      `update dataset_versions set state = 'published', published_at = now() where id = ${draft.id}`,
      notAllowed,
    ],
    ["db:privileges' own attempt: publish a fresh draft by hand", PUBLISH_BY_HAND, notAllowed],
    [
      "publish an in-review version by hand with an identifier and checksum, but no decision",
      `update dataset_versions set state = 'in_review' where id = ${draft.id};
       update dataset_versions set state = 'published', published_at = now(), version_identifier = '10.5072/forged/1', payload_sha256 = 'x' where id = ${draft.id}`,
      notAllowed,
    ],
    [
      "publish an in-review version by hand, state only",
      `update dataset_versions set state = 'in_review' where id = ${draft.id};
       update dataset_versions set state = 'published' where id = ${draft.id}`,
      /published only by acceptance/,
    ],
    [
      "write a curator's accept decision itself",
      `update dataset_versions set state = 'in_review' where id = ${draft.id};
       insert into decisions (version_id, curator_id, decision, reason) values (${draft.id}, ${curator.id}, 'accept', 'forged')`,
      /accept decision is written only by acceptance/,
    ],
    ["db:privileges' own attempt: write an accept decision", WRITE_ACCEPT_DECISION, /accept decision is written only by acceptance/],
    ["db:privileges' own attempt: publish a full row by hand", PUBLISH_FULL_ROW, notAllowed],
    [
      "set a draft's checksum",
      `update dataset_versions set payload_sha256 = ${"'" + "0".repeat(64) + "'"} where id = ${draft.id}`,
      notAllowed,
    ],
    ["set a draft's identifier", `update dataset_versions set version_identifier = '10.5072/forged/1' where id = ${draft.id}`, notAllowed],
    ["set a draft's publication time", `update dataset_versions set published_at = now() where id = ${draft.id}`, notAllowed],
    [
      "publish through the function as a researcher",
      `update dataset_versions set state = 'in_review' where id = ${draft.id};
       select * from arrhenia_publish_version(${draft.id}, ${stranger.id}, 'forged')`,
      /only by an active curator/,
    ],
    [
      "publish through the function as a curator who co-edits the dataset",
      `update dataset_versions set state = 'in_review' where id = ${draft.id};
       insert into dataset_members (dataset_id, user_id, role) values (${draft.datasetId}, ${curator.id}, 'editor');
       select * from arrhenia_publish_version(${draft.id}, ${curator.id}, 'forged')`,
      /own co-editors/,
    ],
    [
      "publish a draft (never submitted) through the function",
      `select * from arrhenia_publish_version(${draft.id}, ${curator.id}, 'forged')`,
      /only by acceptance from review/,
    ],
    [
      "publish the published version again",
      `select * from arrhenia_publish_version(${published.id}, ${curator.id}, 'again')`,
      /only by acceptance from review/,
    ],
    [
      "replace the publication function",
      `create or replace function arrhenia_publish_version(integer, integer, text) returns table (version_identifier text, payload_sha256 text, published_at timestamptz) language sql as 'select null::text, null::text, now()'`,
      notAllowed,
    ],
    ["edit its points", `update version_points set rate_constant = 1 where version_id = ${published.id}`, refusedByTrigger],
    ["delete its points", `delete from version_points where version_id = ${published.id}`, refusedByTrigger],
    [
      "add a point",
      `insert into version_points (version_id, idx, temperature_k, rate_constant, original) values (${published.id}, 9999, 300, 1e-12, '{}')`,
      refusedByTrigger,
    ],
    [
      "move draft points in",
      `update version_points set version_id = ${published.id}, idx = idx + 10000 where version_id = ${draft.id}`,
      refusedByTrigger,
    ],
    ["edit its analysis", `update version_analyses set result = '{}' where version_id = ${published.id}`, refusedByTrigger],
    ["delete its analysis", `delete from version_analyses where version_id = ${published.id}`, refusedByTrigger],
    [
      "append an analysis directly (not the re-fit path)",
      `insert into version_analyses (version_id, engine_version, result, checks) values (${published.id}, 'forged-engine', '{}', '[]')`,
      refusedByTrigger,
    ],
    [
      "append through the re-fit path an analysis by the engine that already fitted it",
      `select arrhenia_append_refit_analysis(${published.id}, (select engine_version from version_analyses where version_id = ${published.id} order by id desc limit 1), '{}', '[]', null)`,
      /is not the current engine/,
    ],
    [
      "append through the re-fit path an analysis by an engine name of the caller's choosing",
      `select arrhenia_append_refit_analysis(${published.id}, 'forged-engine', '{}', '[]', null)`,
      /is not the current engine/,
    ],
    ["change the current engine version", `update arrhenia_engine set engine_version = 'forged-engine'`, notAllowed],
    [
      "move a draft analysis in",
      `update version_analyses set version_id = ${published.id} where version_id = ${draft.id}`,
      refusedByTrigger,
    ],
    ["rename its file", `update version_files set filename = 'other.csv' where version_id = ${published.id}`, refusedByTrigger],
    ["delete its file", `delete from version_files where version_id = ${published.id}`, refusedByTrigger],
    ["move a draft file in", `update version_files set version_id = ${published.id} where version_id = ${draft.id}`, refusedByTrigger],
    [
      "add a file",
      `insert into version_files (version_id, filename, content_type, size_bytes, sha256, storage_key) values (${published.id}, 'x', 'text/plain', 1, 'c', 'x')`,
      refusedByTrigger,
    ],
    [
      "change the series identifier",
      `update datasets set series_identifier = '10.5072/forged' where id = ${published.datasetId}`,
      refusedByTrigger,
    ],
    ["change the owner", `update datasets set owner_id = ${stranger.id} where id = ${published.datasetId}`, refusedByTrigger],
    ["delete the dataset", `delete from datasets where id = ${published.datasetId}`, refusedByTrigger],
    ["remove the owner link", `delete from dataset_members where dataset_id = ${published.datasetId} and role = 'owner'`, refusedByTrigger],
    [
      "demote the owner",
      `update dataset_members set role = 'viewer' where dataset_id = ${published.datasetId} and role = 'owner'`,
      refusedByTrigger,
    ],
    [
      "add a second owner",
      `insert into dataset_members (dataset_id, user_id, role) values (${published.datasetId}, ${stranger.id}, 'owner')`,
      refusedByTrigger,
    ],
    ["rewrite a decision", `update decisions set reason = 'forged' where version_id = ${published.id}`, notAllowed],
    ["delete a decision", `delete from decisions where version_id = ${published.id}`, notAllowed],
    [
      "re-point a registration",
      `update identifier_registrations set version_id = ${draft.id} where identifier = '${versionIdentifier}'`,
      refusedByTrigger,
    ],
    [
      "mark a registration unregistered",
      `update identifier_registrations set registered = false where identifier = '${versionIdentifier}'`,
      refusedByTrigger,
    ],
    [
      "back-date a registration",
      `update identifier_registrations set registered_at = now() - interval '1 year' where identifier = '${versionIdentifier}'`,
      refusedByTrigger,
    ],
    ["delete a registration", `delete from identifier_registrations where identifier = '${seriesIdentifier}'`, notAllowed],
    ["change a species it shows", `update species set formula = 'XYZ' where id = ${speciesId}`, refusedByTrigger],
    ["delete a species it shows", `delete from species where id = ${speciesId}`, refusedByTrigger],
    ["remove a species' names", `delete from species_names where species_id = ${speciesId}`, refusedByTrigger],
    ["rename its reaction", `update reactions set equation = 'A → B' where id = ${reactionA}`, refusedByTrigger],
    ["drop a participant", `delete from reaction_participants where reaction_id = ${reactionA}`, refusedByTrigger],
    [
      "add a participant",
      `insert into reaction_participants (reaction_id, species_id, side, coefficient) values (${reactionA}, ${otherSpeciesId}, 'product', 1)`,
      refusedByTrigger,
    ],
    ["rewrite the audit trail", `update audit_events set action = 'forged' where subject_id = '${published.id}'`, notAllowed],
    ["truncate points", `truncate version_points`, notAllowed],
    ["truncate everything", `truncate dataset_versions, datasets cascade`, notAllowed],
    ["disable the freeze trigger", `alter table dataset_versions disable trigger dataset_versions_frozen_when_published`, notAllowed],
    ["disable every trigger", `alter table version_points disable trigger all`, notAllowed],
    ["drop the freeze trigger", `drop trigger version_points_frozen_when_published on version_points`, notAllowed],
    [
      "replace the guard function",
      `create or replace function arrhenia_guard_published_children() returns trigger language plpgsql as $$ begin return new; end $$`,
      notAllowed,
    ],
    ["skip triggers by replication role", `set session_replication_role = replica`, /permission denied|must be superuser/],
    ["become the owner", `set role arrhenia_owner`, /permission denied|must be a member/],
    ["grant itself superuser", `alter role current_user superuser`, notAllowed],
    ["create a table", `create table public.scratch (id int)`, notAllowed],
    [
      "shadow dataset_versions with a temporary table, then edit the points",
      `create temp table dataset_versions (id int, state text); update public.version_points set rate_constant = 1 where version_id = ${published.id}`,
      notAllowed,
    ],
  ];

  it("refuses every statement an attacker with the app's credentials would try, and nothing changes", async () => {
    const list = attempts();
    expect(list.length).toBeGreaterThanOrEqual(30);
    const outcomes: { attempt: string; refused: string }[] = [];
    for (const [what, statement, reason] of list) {
      let error: Error | null = null;
      try {
        await sql.begin((tx) => tx.unsafe(statement));
      } catch (err) {
        error = err as Error;
      }
      outcomes.push({ attempt: what, refused: error ? error.message.slice(0, 90) : "NOT REFUSED" });
      expect(error, `${what}: ${statement}`).not.toBeNull();
      expect(error!.message, what).toMatch(reason);
    }
    if (process.env.SHOW_ATTEMPTS) console.log(formatTable(outcomes));
    expect(await snapshot()).toBe(before);
  });

  it("still allows what the product does: re-fits, aliases, co-editors, registration progress, editing drafts", async () => {
    // A re-fit by the current engine adds a row like the ones before it (here a copy of the newest),
    // through the one path that may, and never changes one.
    await sql`select arrhenia_append_refit_analysis(version_id, ${ENGINE_VERSION}, result, checks, null)
      from (select version_id, result, checks from version_analyses where version_id = ${published.id} order by id desc limit 1) newest`;
    await sql`insert into species_names (species_id, name) values (${speciesId}, ${"alias " + published.id}) on conflict do nothing`;
    await addDatasetMember({ datasetId: published.datasetId, userId: stranger.id, role: "viewer", actorId: owner.id });
    await sql`update identifier_registrations set attempts = attempts + 1, last_error = 'agency down' where identifier = ${seriesIdentifier}`;
    await sql`update version_points set rate_constant = rate_constant * 1 where version_id = ${draft.id}`;
    const [{ n }] = await sql<{ n: number }[]>`select count(*)::int as n from version_analyses where version_id = ${published.id}`;
    expect(n).toBe(2);
  });

  it("retraction still works, and then the retracted version is frozen too", async () => {
    const outcome = await applyTransition({
      versionId: published.id,
      actorId: curator.id,
      transition: "retract",
      reason: "The source table was misprinted.",
    });
    expect(outcome.to).toBe("retracted");
    const [row] = await sql`select state, retraction_notice from dataset_versions where id = ${published.id}`;
    expect(row).toMatchObject({ state: "retracted", retraction_notice: "The source table was misprinted." });
    await expect(sql`update dataset_versions set retraction_notice = 'edited' where id = ${published.id}`).rejects.toThrow(/published/);
    await expect(
      sql`update version_points set version_id = ${published.id}, idx = idx + 20000 where version_id = ${draft.id}`,
    ).rejects.toThrow(/published/);
  });
});

describe("the runtime role's privileges (npm run db:privileges)", () => {
  it("passes every check as the runtime role", async () => {
    const { role, checks, tables } = await inspectRuntimePrivileges(sql);
    expect(role).not.toBe("arrhenia");
    expect(checks.filter((c) => !c.ok)).toEqual([]);
    expect(tables.find((t) => t.table === "public.dataset_versions")).toMatchObject({
      owner: expect.not.stringMatching(role),
      select: true,
      // UPDATE on its columns but the identifier, checksum and publication time (drizzle/0017).
      update: false,
      truncate: false,
      trigger: false,
    });
  });

  it("pg-boss works as the runtime role: send, read, cancel, maintenance; creating a queue (DDL) is refused", async () => {
    const boss = new PgBoss({
      connectionString: databaseUrl(),
      migrate: false,
      schedule: false,
      maintenanceIntervalSeconds: 1,
      monitorStateIntervalSeconds: 1,
      max: 2,
    });
    const errors: Error[] = [];
    boss.on("error", (err) => errors.push(err));
    const maintained = new Promise<void>((resolve) => boss.once("maintenance", () => resolve()));
    const monitored = new Promise<void>((resolve) => boss.once("monitor-states", () => resolve()));
    await boss.start();
    try {
      // Far in the future, so no worker of another test file takes it.
      const id = await boss.send("refit", { versionId: -1 }, { startAfter: 3600 });
      expect((await boss.getJobById("refit", id!))?.state).toBe("created");
      await boss.cancel("refit", id!);
      expect((await boss.getJobById("refit", id!))?.state).toBe("cancelled");
      await boss.deleteJob("refit", id!);
      await Promise.all([maintained, monitored]);
      expect(errors).toEqual([]);
      await expect(boss.createQueue("scratch-queue")).rejects.toThrow(/permission denied/);
    } finally {
      await boss.stop({ graceful: false, wait: true });
    }
  });

  describe("as the schema owner", () => {
    const ownerUrl = process.env.MIGRATION_DATABASE_URL;
    const owner = ownerUrl ? postgres(ownerUrl, { max: 1, onnotice: () => {} }) : null;
    afterAll(() => owner?.end());
    it.skipIf(!owner)("fails: the owner could switch the freeze off", async () => {
      const { checks } = await inspectRuntimePrivileges(owner!);
      const failed = checks.filter((c) => !c.ok).map((c) => c.check);
      expect(failed).toEqual(expect.arrayContaining(["owns objects", "CREATE on schemas", "ALTER TABLE … DISABLE TRIGGER refused"]));
    });
    it.skipIf(!owner)("a guard function without a fixed search_path fails the runtime role's check", async () => {
      await owner!.unsafe(`create function arrhenia_unpinned_probe() returns boolean language sql as 'select true'`);
      try {
        const { checks } = await inspectRuntimePrivileges(sql);
        expect(checks.find((c) => c.check.startsWith("guard functions"))).toMatchObject({ ok: false, found: "arrhenia_unpinned_probe" });
      } finally {
        await owner!.unsafe(`drop function arrhenia_unpinned_probe()`);
      }
    });
    it.skipIf(!owner)(
      "even the owner meets the triggers: decisions and registrations stay append-only, published tables refuse TRUNCATE",
      async () => {
        const refused = (statement: string) =>
          expect(owner!.begin((tx) => tx.unsafe(statement))).rejects.toThrow(
            /append-only|move forward|cannot be truncated|cannot be deleted/,
          );
        await refused(`update decisions set reason = 'forged'`);
        await refused(`delete from decisions`);
        await refused(`delete from identifier_registrations`);
        await refused(`update identifier_registrations set kind = 'forged'`);
        await refused(`truncate version_points`);
        await refused(`truncate decisions`);
      },
    );
  });
});

describe("acceptance mints only identifiers of our form (drizzle/0021)", () => {
  async function submitted(title: string) {
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title } });
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    return v;
  }

  it("refuses a series identifier that is not <DOI prefix>/ARH-XXXX-XXXC with a right check symbol, as the runtime role", async () => {
    const v = await submitted("Forged series");
    const good = newSeriesIdentifier("10.5072");
    // The same code with another check symbol: Crockford's mod-37 symbol no longer matches.
    const wrongCheck = good.slice(0, -1) + (good.endsWith("0") ? "1" : "0");
    for (const forged of [
      "javascript:alert(1)//",
      "10.5072/forged",
      wrongCheck,
      good.toLowerCase(),
      `${good}/1`,
      good.replace("10.5072/", "10.50/"),
      good.replace("10.5072/", "https://evil.example/"),
      `${good}\n`,
      good.replace(/.$/, "I"),
    ]) {
      await expect(sql`update datasets set series_identifier = ${forged} where id = ${v.datasetId}`, forged).rejects.toThrow(
        /datasets_series_identifier_format/,
      );
    }
    const [row] = await sql`select series_identifier from datasets where id = ${v.datasetId}`;
    expect(row.series_identifier).toBeNull();
    // A right one (any configured prefix) is accepted and minted from.
    const other = newSeriesIdentifier("10.123456789");
    await sql`update datasets set series_identifier = ${other} where id = ${v.datasetId}`;
    const outcome = await applyTransition({
      versionId: v.id,
      actorId: curator.id,
      transition: "accept",
      reason: "Consistent with the source.",
    });
    expect(outcome.identifiers?.version).toBe(`${other}/1`);
  });

  const ownerUrl = process.env.MIGRATION_DATABASE_URL;
  it.skipIf(!ownerUrl)("the acceptance function itself refuses a series identifier stored before the constraint", async () => {
    const v = await submitted("Series stored before the check");
    const schemaOwner = postgres(ownerUrl!, { max: 1, onnotice: () => {} });
    try {
      // Rolled back: the constraint is dropped only inside this transaction, to stand for a row older than it.
      await expect(
        schemaOwner.begin(async (tx) => {
          await tx`alter table datasets drop constraint datasets_series_identifier_format`;
          await tx`update datasets set series_identifier = 'javascript:alert(1)//' where id = ${v.datasetId}`;
          await tx`select * from arrhenia_publish_version(${v.id}, ${curator.id}, 'forged')`;
        }),
      ).rejects.toThrow(/not one this repository mints/);
    } finally {
      await schemaOwner.end();
    }
    const [row] = await sql`select state, version_identifier from dataset_versions where id = ${v.id}`;
    expect(row).toEqual({ state: "submitted", version_identifier: null });
  });
});

describe("acceptance computes the checksum in the database, from the stored payload", () => {
  it("a published version's checksum is SHA-256 of its payload in RFC 8785 canonical JSON (the canonicalize package)", async () => {
    // A line break only where a field may hold lines (the description); a title is one line.
    const v = await publish({
      ...EXAMPLE_DEPOSIT,
      title: "Checksum “quoted” \\ ünïcode 𝑘 – one line",
      description: "A line\nbreak and a\ttab",
    });
    const [row] = await sql<
      { payload: unknown; payload_sha256: string }[]
    >`select payload, payload_sha256 from dataset_versions where id = ${v.id}`;
    expect(row.payload_sha256).toBe(payloadSha256(row.payload));
  });

  // RFC 8785 §3.2.2.3 and Appendix B: numbers as ECMAScript writes them; strings escaped as JSON.stringify does.
  const values: unknown[] = [
    [0, -0, 1, -1, 1.5, 0.1, 1e-7, 1e-6, 0.000001234, 1e21, 1e20, 123456789012345680000, 4.5e-12, 6.02214076e23, 1e100, -2.5e-300],
    [5e-324, 1.7976931348623157e308, 333333333.3333333, 9007199254740993, 295147905179352830000, 0.0001, 1e-5, 100, 1e15, 1e16],
    { b: 1, a: [true, false, null], "": "empty key", é: "e-acute", Z: "upper", aa: { y: "\u0001\u001f\u007f\u2028", x: 'tab\t"q"\\' } },
    "☺ 𝄞 \u00e9\u0301",
  ];
  it.each(values.map((v) => [JSON.stringify(v).slice(0, 60), v]))(
    "arrhenia_canonical_json(%s) equals canonicalize's",
    async (_label, value) => {
      const [row] = await sql<{ text: string }[]>`select arrhenia_canonical_json(${sql.json(value as never)}::jsonb) as text`;
      expect(row.text).toBe(canonicalize(value));
    },
  );
});

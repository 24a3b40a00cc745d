import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset, startNextVersion } from "@/lib/datasets/deposits";
import { refitVersion } from "@/lib/datasets/refit";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { MeilisearchEngine, meilisearchEngine } from "@/lib/search/engines/meilisearch";
import { applyIndexSettings } from "@/lib/search/meili/client";
import { reindexMeilisearch } from "@/lib/search/meili/reindex";
import { drainSearchOutbox } from "@/lib/search/outbox";
import { EMPTY_FILTERS } from "@/lib/search/params";
import type { EngineQuery, ParsedQuery } from "@/lib/search/types";
import { createUser, type UserDto } from "@/lib/users/queries";
import { startMeiliStandIn, type MeiliStandIn } from "../support/meili-stand-in";
import { sql, uniqueEmail } from "./helpers";
import { runSearchConformance } from "./search-conformance";

// The Meilisearch engine, its settings and its outbox, against the local stand-in service
// (tests/support/meili-stand-in.ts), with PostgreSQL's search documents as the reference.

let standIn: MeiliStandIn;
const saved = { url: process.env.MEILISEARCH_URL, index: process.env.MEILISEARCH_INDEX, engine: process.env.SEARCH_ENGINE };
let owner: UserDto;
let curator: UserDto;

beforeAll(async () => {
  standIn = await startMeiliStandIn();
  process.env.MEILISEARCH_URL = standIn.url;
  process.env.MEILISEARCH_INDEX = `datasets_${Date.now()}`;
  // Changes made before this file (other files, the seed) are not this file's business.
  await sql`delete from search_outbox`;
  owner = await createUser({ email: uniqueEmail("meili"), name: "Index Owner", passwordHash: "x", verified: true });
  curator = await createUser({ email: uniqueEmail("meilic"), name: "Index Curator", passwordHash: "x", role: "curator", verified: true });
});

afterAll(async () => {
  await sql`delete from search_outbox`;
  for (const [k, v] of [
    ["MEILISEARCH_URL", saved.url],
    ["MEILISEARCH_INDEX", saved.index],
    ["SEARCH_ENGINE", saved.engine],
  ] as const) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
  await standIn?.close();
});

beforeEach(async () => {
  standIn.failTasks = false;
  await standIn.up();
});

// The same queries and the same expected hits as the PostgreSQL engine (search-postgres.test.ts):
// the fixtures are published with MEILISEARCH_URL set, so they reach the index through the outbox.
runSearchConformance("Meilisearch (local stand-in)", {
  engine: () => meilisearchEngine,
  sync: async () => {
    await applyIndexSettings();
    const drained = await drainSearchOutbox();
    expect(drained.error).toBeNull();
  },
});

const docs = () => standIn.indexes.get(process.env.MEILISEARCH_INDEX!)?.docs ?? new Map<string, Record<string, unknown>>();
const outboxRows = async (versionId?: number) =>
  versionId === undefined
    ? await sql<{ version_id: number; attempts: number }[]>`select version_id, attempts from search_outbox order by id`
    : await sql<
        { version_id: number; attempts: number }[]
      >`select version_id, attempts from search_outbox where version_id = ${versionId} order by id`;

async function publish(title: string, document: Record<string, unknown> = {}) {
  const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, ...document, title } });
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
  return v;
}

const noFilters = EMPTY_FILTERS;
const query = (parsed: ParsedQuery, more: Partial<EngineQuery> = {}): EngineQuery => ({
  parsed,
  view: "datasets",
  filters: noFilters,
  sort: "newest",
  after: null,
  limit: 20,
  ...more,
});

describe("npm run search:setup", () => {
  it("creates the index and applies searchable (in weight order), filterable and sortable attributes and the species synonyms; running it again changes nothing", async () => {
    await applyIndexSettings();
    const index = standIn.indexes.get(process.env.MEILISEARCH_INDEX!)!;
    expect(index.primaryKey).toBe("id");
    const settings = index.settings;
    expect((settings.searchableAttributes as string[]).slice(0, 3)).toEqual(["title", "equation", "speciesNames"]);
    expect(settings.filterableAttributes).toEqual(expect.arrayContaining(["reactantKeys", "productKeys", "flags", "latest"]));
    expect(settings.sortableAttributes).toEqual(expect.arrayContaining(["publishedTs", "tSpan", "pointCount", "versionId"]));
    // Synonyms come from the species names table: every name of a species stands for its other names.
    await publish("Setup synonyms");
    await sql`insert into species_names (species_id, name) select id, 'OH' from species where canonical_smiles = '[OH]' on conflict do nothing`;
    await applyIndexSettings();
    const synonyms = index.settings.synonyms as Record<string, string[]>;
    expect(synonyms.oh).toEqual(expect.arrayContaining(["hydroxyl radical"]));
    expect(synonyms["hydroxyl radical"]).toEqual(expect.arrayContaining(["oh"]));
    const before = JSON.stringify(settings);
    await applyIndexSettings();
    expect(JSON.stringify(index.settings)).toBe(before);
  });
});

describe("the outbox", () => {
  it("keeps every change while the service is down, retries with back-off, and delivers once it is back (rows deleted only then)", async () => {
    await standIn.down("refused");
    const v = await publish("Outbox while down");
    expect((await outboxRows(v.id)).length).toBeGreaterThan(0);

    const failed = await drainSearchOutbox({ retryDelaySeconds: 0 });
    expect(failed.error).toMatch(/fetch failed|ECONNREFUSED|request/i);
    expect(failed.confirmed).toBe(0);
    expect((await outboxRows(v.id)).every((r) => r.attempts === 1)).toBe(true);

    // A 503 is no better: still kept, attempts counted.
    await standIn.up();
    await standIn.down("503");
    expect((await drainSearchOutbox({ retryDelaySeconds: 0 })).confirmed).toBe(0);
    expect((await outboxRows(v.id)).every((r) => r.attempts === 2)).toBe(true);

    // A task the service accepts but then fails is not a delivery either.
    await standIn.up();
    standIn.failTasks = true;
    expect((await drainSearchOutbox({ retryDelaySeconds: 0 })).confirmed).toBe(0);
    expect((await outboxRows(v.id)).length).toBeGreaterThan(0);
    standIn.failTasks = false;

    // Back-off: with a delay, the rows wait and a drain now leaves them alone.
    await drainSearchOutbox({ retryDelaySeconds: 0 });
    expect(await outboxRows(v.id)).toEqual([]);
    const doc = docs().get(String(v.id))!;
    expect(doc).toMatchObject({ versionId: v.id, title: "Outbox while down", latest: true, retracted: false });
  });

  it("a row that failed waits its back-off before it is tried again", async () => {
    await standIn.down("503");
    const v = await publish("Outbox back-off");
    await drainSearchOutbox({ retryDelaySeconds: 3600 });
    await standIn.up();
    const early = await drainSearchOutbox();
    expect(early.confirmed).toBe(0);
    expect(docs().has(String(v.id))).toBe(false);
    const [{ wait }] = await sql<{ wait: number }[]>`
      select extract(epoch from min(next_attempt_at) - now())::float8 as wait from search_outbox where version_id = ${v.id}`;
    expect(wait).toBeGreaterThan(3000);
    await sql`update search_outbox set next_attempt_at = now() where version_id = ${v.id}`;
    expect((await drainSearchOutbox()).confirmed).toBeGreaterThan(0);
    expect(docs().has(String(v.id))).toBe(true);
  });

  it("a retraction reaches the index (last state wins), and so does a re-fit", async () => {
    const v = await publish("Outbox retraction");
    await drainSearchOutbox();
    expect(docs().get(String(v.id))).toMatchObject({ retracted: false });

    // Two changes of one version before a drain: the index ends with the last.
    await standIn.down("refused");
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "retract", reason: "Wrong units in table 2." });
    expect((await drainSearchOutbox({ retryDelaySeconds: 0 })).confirmed).toBe(0);
    await standIn.up();
    await drainSearchOutbox();
    expect(docs().get(String(v.id))).toMatchObject({ retracted: true });
    expect(await outboxRows(v.id)).toEqual([]);

    // A re-fit rewrites the document in PostgreSQL and queues it; the index copy (spoilt here) is replaced.
    const w = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Outbox re-fit" } });
    await sql`update version_analyses set engine_version = 'kinetics-0' where version_id = ${w.id}`; // fitted by an older engine
    await applyTransition({ versionId: w.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: w.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    await drainSearchOutbox();
    const ea = docs().get(String(w.id))!.ea;
    expect(typeof ea).toBe("number");
    docs().get(String(w.id))!.ea = -1;
    expect(await refitVersion({ versionId: w.id })).toBe("refitted");
    expect((await outboxRows(w.id)).length).toBeGreaterThan(0);
    await drainSearchOutbox();
    expect(docs().get(String(w.id))!.ea).toBe(ea);
    expect(await outboxRows()).toEqual([]);
    // Two publications and a re-fit on analysis threads: room for a loaded machine (a hang detector, not a speed target).
  }, 90_000);

  it("a new version takes over the listing: the older one is sent again with latest = false", async () => {
    const v1 = await publish("Outbox versions");
    await drainSearchOutbox();
    const v2 = await startNextVersion({ actor: owner, versionId: v1.id });
    await applyTransition({ versionId: v2.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v2.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    await drainSearchOutbox();
    expect(docs().get(String(v1.id))).toMatchObject({ latest: false });
    expect(docs().get(String(v2.id))).toMatchObject({ latest: true });
  });
});

describe("the Meilisearch engine", () => {
  it("finds what PostgreSQL's documents hold: species, reaction patterns, key, windows, facets with live counts, sorts and pages", async () => {
    await publish("Engine conformance A");
    await publish("Engine conformance B", { keywords: ["shock tube"] });
    await reindexMeilisearch({ batchSize: 2 });
    const engine = new MeilisearchEngine();

    const listed = await sql<{ version_id: number; reactant_keys: string[]; reaction_key: string; t_min: number; t_max: number }[]>`
      select version_id, reactant_keys, reaction_key, t_min, t_max from search_documents where latest order by published_at desc, version_id desc`;
    const ids = (r: { hits: unknown[] }) => (r.hits as { versionId: number }[]).map((h) => h.versionId);

    const all = await engine.search(query({ kind: "all" }, { limit: 1000 }));
    expect(all.total).toBe(listed.length);
    expect(ids(all)).toEqual(listed.map((r) => r.version_id));

    const key = listed[0].reactant_keys[0];
    const species = await engine.search(query({ kind: "species", term: "x", inchiKeys: [key] }, { limit: 1000 }));
    const [{ n }] = await sql<{ n: number }[]>`
      select count(*)::int as n from search_documents where latest and (${key} = any(reactant_keys) or ${key} = any(product_keys))`;
    expect(species.total).toBe(n);

    const byKey = await engine.search(query({ kind: "reactionKey", key: listed[0].reaction_key }, { limit: 1000 }));
    expect(byKey.total).toBe(listed.filter((r) => r.reaction_key === listed[0].reaction_key).length);

    const reaction = await engine.search(
      query({ kind: "reaction", reactants: listed[0].reactant_keys.map((k) => [k]), products: [], otherReactants: false }, { limit: 1000 }),
    );
    expect(reaction.total).toBeGreaterThan(0);

    // Temperature window: overlap and cover.
    const { t_min, t_max } = listed[0];
    const overlap = await engine.search(
      query({ kind: "all" }, { filters: { ...noFilters, tMin: t_max, tMax: t_max + 1000 }, limit: 1000 }),
    );
    expect(overlap.total).toBe(listed.filter((r) => r.t_max >= t_max && r.t_min <= t_max + 1000).length);
    const covers = await engine.search(
      query({ kind: "all" }, { filters: { ...noFilters, tMin: t_min, tMax: t_max, tCovers: true }, limit: 1000 }),
    );
    expect(covers.total).toBe(listed.filter((r) => r.t_min <= t_min && r.t_max >= t_max).length);

    // Live counts: a facet's counts apply every other facet's filter but not its own.
    const classes = await sql<{ value: string; count: number }[]>`
      select reaction_class as value, count(*)::int as count from search_documents where latest group by 1 order by 2 desc, 1`;
    const narrowed = await engine.search(query({ kind: "all" }, { filters: { ...noFilters, reactionClass: [classes[0].value] } }));
    expect(narrowed.facets.reactionClass).toEqual(classes);
    expect(narrowed.total).toBe(classes[0].count);

    // Text, with a keyword only one of them has.
    const text = await engine.search(query({ kind: "text", text: "shock tube" }, { sort: "relevance" }));
    expect(text.total).toBeGreaterThan(0);

    // Pages: offset cursor, no overlap, nothing missed.
    const seen: number[] = [];
    let after: string | null = null;
    do {
      const page = await engine.search(query({ kind: "all" }, { limit: 3, after }));
      seen.push(...ids(page));
      after = page.nextAfter;
    } while (after !== null);
    expect(seen).toEqual(listed.map((r) => r.version_id));

    // Reactions view: one row per reaction, dataset counts from the same matches.
    const reactions = await engine.search(query({ kind: "all" }, { view: "reactions", limit: 1000 }));
    const [{ r }] = await sql<{ r: number }[]>`select count(distinct reaction_id)::int as r from search_documents where latest`;
    expect(reactions.total).toBe(r);
    // Every listed document counted once: as evidence, or apart when retracted.
    const rows = reactions.hits as { datasetCount: number; retractedCount: number }[];
    expect(rows.reduce((s, h) => s + h.datasetCount + h.retractedCount, 0)).toBe(listed.length);
    const [{ retracted }] = await sql<
      { retracted: number }[]
    >`select count(*)::int as retracted from search_documents where latest and retracted`;
    expect(rows.reduce((s, h) => s + h.retractedCount, 0)).toBe(retracted);
  });
});

import { describe, expect, it } from "vitest";
import { movePublicPagesMark, readPublicPagesMark } from "@/db/public-pages-mark";
import { getDb } from "@/db/client";
import { oweInvalidation } from "@/db/owed-invalidations";
import { settleOverdueInvalidations } from "@/lib/public-cache";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { keptPageKey, keptPagesInPostgres, keptPageTags, sweepKeptPages, type KeptPage } from "@/lib/kept-pages";
import { reactionPath } from "@/lib/reactions/paths";
import { rebuildStaleComparisonBases } from "@/lib/search/documents";
import { createRolePeople, publishedAlkanePages, sql } from "./helpers";

const GZIP = "gzip, deflate, br, zstd";
const BROWSER_ACCEPT = "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8";
const keyOf = (url: string, headers: Record<string, string> = {}) =>
  keptPageKey({ method: "GET", url, headers: { accept: BROWSER_ACCEPT, "accept-encoding": GZIP, ...headers } });
const page = (text: string): KeptPage => ({
  status: 200,
  headers: { "content-type": "text/html; charset=utf-8", "content-encoding": "gzip", vary: "rsc" },
  body: Buffer.from(text),
});

describe("pages kept in the database", () => {
  it("are keyed by their canonical address and body encoding only", () => {
    expect(keyOf("/datasets/12/v3")).toBe("/datasets/12/v3\ngzip");
    expect(keyOf("/datasets/12/v3", { "accept-encoding": "br" })).toBe("/datasets/12/v3\nidentity");
    expect(keyOf("/datasets/12/v3", { "accept-encoding": "gzip;q=0, identity;q=0" })).toBeNull();
    // A query (units, a data choice), a citation format by Accept, another spelling of the address: not kept.
    expect(keyOf("/datasets/12/v3?k=cm3")).toBeNull();
    expect(keyOf("/datasets/12/v3", { accept: "application/x-bibtex" })).toBeNull();
    expect(keyOf("/datasets/012/v3")).toBeNull();
    expect(keyOf("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).toBe("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N\ngzip");
    expect(keyOf("/species/vnwktoketHGBQD-UHFFFAOYSA-N")).toBeNull();
    const key = "IUAWJZWBUGYCRS-UHFFFAOYSA-N+VNWKTOKETHGBQD-UHFFFAOYSA-N>>XLYOFNOQVPJJNP-UHFFFAOYSA-N";
    expect(keyOf(reactionPath(key))).toBe(`${reactionPath(key)}\ngzip`);
    expect(keyOf(reactionPath(key).replace("~", "%7E"))).toBeNull();
    expect(keyOf("/reactions/17")).toBeNull();
    expect(keyOf("/reactions")).toBeNull();
    expect(keptPageKey({ method: "HEAD", url: "/datasets/12/v3", headers: {} })).toBeNull();
  });

  it("are served while nothing they show changed, and rendered again when it did", { timeout: 120_000 }, async () => {
    const people = await createRolePeople("kept");
    const a = await publishedAlkanePages("a", people);
    const b = await publishedAlkanePages("b", people);
    const build = `test-build-${Date.now()}`;
    const store = keptPagesInPostgres({ build });

    // Tags: what each page shows.
    const datasetTags = await keptPageTags(a.dataset);
    expect(datasetTags).toEqual(expect.arrayContaining([`dataset:${a.dataset.split("/")[2]}`, `reaction:${a.reactionId}`, "all"]));
    const reactionTags = (await keptPageTags(a.reaction))!;
    expect(reactionTags).toContain(`reaction:${a.reactionId}`);
    expect(reactionTags.filter((t) => t.startsWith("name:"))).toHaveLength(4);
    const speciesTags = (await keptPageTags(a.species))!;
    expect(speciesTags).toContain(`species:${a.species.split("/")[2]}`);
    expect(speciesTags.filter((t) => t.startsWith("name:")).length).toBeGreaterThanOrEqual(4);
    // Nothing public at the address: nothing is kept.
    expect(await keptPageTags("/datasets/999999999/v1")).toBeNull();
    expect(await keptPageTags("/species/AAAAAAAAAAAAAA-BBBBBBBBBB-C")).toBeNull();

    const keepAll = async () => {
      const mark = await readPublicPagesMark();
      for (const p of [a.dataset, a.reaction, a.species, b.dataset, b.reaction, b.species])
        await store.keep(keyOf(p)!, page(`rendered ${p} at ${mark}`), mark);
      return mark;
    };
    const read = async (p: string) => (await store.read(keyOf(p)!))?.body.toString() ?? null;
    const mark = await keepAll();
    expect(await read(a.dataset)).toBe(`rendered ${a.dataset} at ${mark}`);
    const kept = await store.read(keyOf(a.reaction)!);
    expect(kept).toMatchObject({ status: 200, headers: { "content-encoding": "gzip", vary: "rsc" } });
    // Another build (or public address) does not serve them.
    expect(await keptPagesInPostgres({ build: `${build}-other` }).read(keyOf(a.dataset)!)).toBeNull();

    // Another dataset of reaction A is published: A's reaction and dataset pages are rendered again,
    // B's pages stay kept (no tag of theirs moved), although the public pages' mark moved.
    const more = await depositNewDataset({ actor: people.owner, document: { ...a.document, title: "Kept pages a, second dataset" } });
    await applyTransition({ versionId: more.id, actorId: people.owner.id, transition: "submit" });
    await applyTransition({ versionId: more.id, actorId: people.curator.id, transition: "accept", reason: "For the test." });
    expect(await readPublicPagesMark()).not.toBe(mark);
    expect(await read(a.reaction)).toBeNull();
    expect(await read(a.dataset)).toBeNull();
    expect(await read(a.species)).toBeNull();
    expect(await read(b.dataset)).toBe(`rendered ${b.dataset} at ${mark}`);
    expect(await read(b.reaction)).toBe(`rendered ${b.reaction} at ${mark}`);
    expect(await read(b.species)).toBe(`rendered ${b.species} at ${mark}`);

    // A render whose request arrived before a change is not kept as after it, nor replaces a later one.
    const now = await readPublicPagesMark();
    await store.keep(keyOf(a.reaction)!, page("after"), now);
    await store.keep(keyOf(a.reaction)!, page("from before"), mark);
    expect(await read(a.reaction)).toBe("after");

    // A species renamed by a publication (its new name now the most used): every page writing it is rendered again.
    const [{ id: alkaneB }] = await sql<{ id: number }[]>`select id from species where inchi_key = ${b.species.split("/")[2]}`;
    const [{ name: before }] = await sql<{ name: string }[]>`select name from species_display_names where species_id = ${alkaneB}`;
    const renaming = { ...b.document, title: "Kept pages b, renamed" };
    renaming.reaction = {
      ...renaming.reaction,
      reactants: renaming.reaction.reactants.map((r) => (r.smiles === "[OH]" ? r : { ...r, name: "kept-b-renamed" })),
    };
    for (let i = 0; i < 2; i++) {
      const r = await depositNewDataset({ actor: people.owner, document: { ...renaming, title: `${renaming.title} ${i}` } });
      await applyTransition({ versionId: r.id, actorId: people.owner.id, transition: "submit" });
      await applyTransition({ versionId: r.id, actorId: people.curator.id, transition: "accept", reason: "For the test." });
    }
    const [{ name: after }] = await sql<{ name: string }[]>`select name from species_display_names where species_id = ${alkaneB}`;
    expect(after).not.toBe(before);
    const moved = await sql<{ tag: string }[]>`select tag from page_tag_moves where tag = ${`name:${alkaneB}`}`;
    expect(moved).toHaveLength(1);
    expect(await read(b.reaction)).toBeNull();
    expect(await read(b.species)).toBeNull();

    // The bulk rewrites move `all`: nothing kept before is served.
    const last = await readPublicPagesMark();
    await store.keep(keyOf(b.dataset)!, page("kept last"), last);
    await store.keep(keyOf(a.dataset)!, page("kept last"), last);
    expect(await read(b.dataset)).toBe("kept last");
    await sql`update search_reaction_summaries set consensus_result = null where reaction_id = ${a.reactionId}`;
    await rebuildStaleComparisonBases();
    expect(await read(b.dataset)).toBeNull();
    expect(await read(a.dataset)).toBeNull();

    // Other builds' pages and those past their lifetime are swept; this build's current ones stay.
    await store.keep(keyOf(b.dataset)!, page("kept at the end"), await readPublicPagesMark());
    await sql`update kept_pages set build = 'an older build' where key = ${keyOf(a.species)!}`;
    expect(await sweepKeptPages({ build })).toBeGreaterThanOrEqual(1);
    expect(await sql`select 1 from kept_pages where key = ${keyOf(a.species)!}`).toHaveLength(0);
    expect(await read(b.dataset)).toBe("kept at the end");
    await movePublicPagesMark([`dataset:${b.dataset.split("/")[2]}`]);
    expect(await read(b.dataset)).toBeNull();
  });

  it(
    "a change's invalidation is owed from its transaction: made after the commit, or by the sweep when it was lost",
    { timeout: 60_000 },
    async () => {
      const people = await createRolePeople("owed");
      const a = await publishedAlkanePages("owed", people);
      // The publication made its invalidation: nothing is owed for it.
      expect(await sql`select 1 from owed_invalidations where ${`reaction:${a.reactionId}`} = any(tags)`).toHaveLength(0);

      const store = keptPagesInPostgres({ build: `owed-build-${Date.now()}` });
      await store.keep(keyOf(a.reaction)!, page("kept"), await readPublicPagesMark());
      expect((await store.read(keyOf(a.reaction)!))?.body.toString()).toBe("kept");
      // A change committed, and its process ended before invalidating: the row stays.
      const owed = await getDb().transaction((tx) => oweInvalidation(tx, [`reaction:${a.reactionId}`, "search"]));
      // (Another test's overdue row may be settled meanwhile: the files run side by side, so only this row is looked at.)
      await settleOverdueInvalidations();
      expect(await sql`select 1 from owed_invalidations where id = ${owed}`).toHaveLength(1);
      expect(await store.read(keyOf(a.reaction)!)).not.toBeNull();
      // Once overdue, the sweep makes it: the page is rendered again and the row goes.
      await sql`update owed_invalidations set created_at = now() - interval '1 minute' where id = ${owed}`;
      expect(await settleOverdueInvalidations()).toBeGreaterThanOrEqual(1);
      expect(await store.read(keyOf(a.reaction)!)).toBeNull();
      expect(await sql`select 1 from owed_invalidations where id = ${owed}`).toHaveLength(0);
      // A change rolled back owes nothing.
      await getDb()
        .transaction(async (tx) => {
          await oweInvalidation(tx, ["rolled-back"]);
          throw new Error("rolled back");
        })
        .catch(() => undefined);
      expect(await sql`select 1 from owed_invalidations where 'rolled-back' = any(tags)`).toHaveLength(0);
    },
  );
});

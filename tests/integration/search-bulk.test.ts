import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { buildSearchDocument, rebuildSearchDocuments } from "@/lib/search/documents";
import { seedDemo } from "../../scripts/seed/seed-data";
import { seedDemoDatasets } from "../../scripts/seed/seed-datasets";
import { seedDemoRevision } from "../../scripts/seed/seed-revisions";
import { readPublicPagesMark } from "@/db/public-pages-mark";
import { sql } from "./helpers";

/** Every column of every search document (the generated ones too) and every summary but its write time. */
async function snapshot() {
  const [{ documents }] = await sql<{ documents: unknown[] | null }[]>`
    select json_agg(to_jsonb(d) order by d.version_id) as documents from search_documents d`;
  const [{ summaries }] = await sql<{ summaries: unknown[] | null }[]>`
    select json_agg(to_jsonb(s) - 'updated_at' order by s.reaction_id) as summaries from search_reaction_summaries s`;
  return { documents: documents ?? [], summaries: summaries ?? [] };
}

describe("the bulk rebuild of the search documents", () => {
  it("writes exactly the rows the publishing transaction's builder writes, version by version", { timeout: 300_000 }, async () => {
    // The demo data (invented), plus whatever earlier files published.
    await seedDemo();
    await seedDemoDatasets();
    await seedDemoRevision();
    const ids = (await sql<{ id: number }[]>`select id from dataset_versions where state in ('published', 'retracted') order by id`).map(
      (r) => r.id,
    );
    expect(ids.length).toBeGreaterThan(30);

    // One version at a time, each in its own transaction with its summaries, as publishing does.
    await sql`delete from search_documents`;
    await sql`delete from search_reaction_summaries`;
    for (const id of ids) await getDb().transaction((tx) => buildSearchDocument(tx, id));
    const oneByOne = await snapshot();

    // From nothing, in batches.
    await sql`delete from search_documents`;
    await sql`delete from search_reaction_summaries`;
    expect(await rebuildSearchDocuments()).toBe(ids.length);
    const bulk = await snapshot();
    // (A public version without a measured range or a reaction has no document either way.)
    expect(bulk.documents.length).toBeGreaterThan(30);
    expect(bulk.summaries.length).toBeGreaterThan(5);
    expect(bulk).toEqual(oneByOne);

    // Over existing rows (on conflict), with a stale row and a missing one: the same again.
    await sql`update search_documents set title = 'stale', latest = not latest where version_id = ${ids[0]}`;
    await sql`delete from search_documents where version_id = ${ids[ids.length - 1]}`;
    const mark = await readPublicPagesMark();
    await rebuildSearchDocuments();
    expect(await snapshot()).toEqual(oneByOne);
    // A running server's kept pages and data are read again (display names, kept consensus).
    expect(await readPublicPagesMark()).not.toBe(mark);
  });
});

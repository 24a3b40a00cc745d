import { describe, expect, it } from "vitest";
import { movePublicPagesMark, readPublicPagesMark } from "@/db/public-pages-mark";
import { KEPT_PAGE_HOURS, keptPagesInPostgres, type KeptPage } from "@/lib/kept-pages";
import { listPagesToRenderAhead, RENEW_BEFORE_HOURS, startRenderAhead } from "@/lib/render-ahead";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { createRolePeople, depositInState, publishedAlkanePages, sql } from "./helpers";

const page = (path: string): KeptPage => ({
  status: 200,
  headers: { "content-type": "text/html; charset=utf-8", "content-encoding": "gzip" },
  body: Buffer.from(`<p>${path}</p>`),
});

/** Every page of `kinds` that the loop would render now for `build`. */
async function allToRender(build: string, { kinds = [0, 1, 2], hours = KEPT_PAGE_HOURS }: { kinds?: number[]; hours?: number } = {}) {
  const paths: string[] = [];
  for (const kind of kinds) {
    for (let after: number | null = null; ;) {
      const batch = await listPagesToRenderAhead({ build, kind, after, limit: 500, hours });
      if (batch.length === 0) break;
      paths.push(...batch.map((p) => p.path));
      after = batch[batch.length - 1].id;
    }
  }
  return paths;
}

describe("rendering the public pages ahead of their readers", () => {
  it("lists every public page without a servable kept copy, and none other", { timeout: 120_000 }, async () => {
    const people = await createRolePeople("ahead");
    const a = await publishedAlkanePages("ahead-a", people);
    const draft = await depositInState({
      ...people,
      document: labelledAlkaneDeposit({ title: "Render ahead draft", name: "ahead-draft-alkane", carbons: 21 }),
      state: "draft",
    });
    const build = `ahead-build-${Date.now()}`;
    const store = keptPagesInPostgres({ build });

    const before = await allToRender(build);
    expect(before).toEqual(expect.arrayContaining([a.dataset, a.reaction, a.species]));
    // A draft's page is no public page: never rendered ahead.
    expect(before.filter((p) => p.startsWith(`/datasets/${draft.datasetId}/`))).toEqual([]);
    // Each page once.
    expect(new Set(before).size).toBe(before.length);

    // Kept (gzip) under the current mark: no longer listed; kept plain only, or by another build: still listed.
    const mark = await readPublicPagesMark();
    await store.keep(`${a.dataset}\ngzip`, page(a.dataset), mark);
    await store.keep(`${a.species}\nidentity`, { ...page(a.species), headers: { "content-type": "text/html" } }, mark);
    await keptPagesInPostgres({ build: `${build}-other` }).keep(`${a.reaction}\ngzip`, page(a.reaction), mark);
    const after = await allToRender(build);
    expect(after).not.toContain(a.dataset);
    expect(after).toEqual(expect.arrayContaining([a.reaction, a.species]));

    // Near the end of its lifetime: listed again by a loop that renews it (RENEW_BEFORE_HOURS early).
    await sql`update kept_pages set kept_at = now() - interval '23 hours' where key = ${`${a.dataset}\ngzip`}`;
    const listed = (hours: number) => allToRender(build, { kinds: [2], hours });
    expect(await listed(KEPT_PAGE_HOURS)).not.toContain(a.dataset);
    expect(await listed(KEPT_PAGE_HOURS - RENEW_BEFORE_HOURS)).toContain(a.dataset);
    await sql`update kept_pages set kept_at = now() where key = ${`${a.dataset}\ngzip`}`;

    // What the page shows changed (its reaction's tag moved): listed again.
    await movePublicPagesMark([`reaction:${a.reactionId}`]);
    expect(await allToRender(build)).toContain(a.dataset);
  });

  it("asks for each page one at a time, only while no reader's page renders, and stops", { timeout: 120_000 }, async () => {
    const people = await createRolePeople("ahead-loop");
    const a = await publishedAlkanePages("ahead-b", people);
    const build = `ahead-loop-${Date.now()}`;
    const store = keptPagesInPostgres({ build });
    const asked: string[] = [];
    let inFlight = 0;
    let most = 0;
    let readerRendering = true;
    const loop = startRenderAhead({
      build,
      busy: () => readerRendering,
      quietMs: 5,
      idleMs: 60_000,
      log: () => {},
      // As the front server does: renders the page and keeps it under the mark its request arrived with.
      ask: async (path) => {
        inFlight += 1;
        most = Math.max(most, inFlight);
        const mark = await readPublicPagesMark();
        await new Promise((r) => setTimeout(r, 1));
        await store.keep(`${path}\ngzip`, page(path), mark);
        asked.push(path);
        inFlight -= 1;
        return 200;
      },
    });
    try {
      await new Promise((r) => setTimeout(r, 300));
      // A reader's page is rendering: nothing asked.
      expect(asked).toEqual([]);
      readerRendering = false;
      const deadline = Date.now() + 90_000;
      while (![a.dataset, a.reaction, a.species].every((p) => asked.includes(p)) && Date.now() < deadline)
        await new Promise((r) => setTimeout(r, 20));
      expect(asked).toEqual(expect.arrayContaining([a.reaction, a.species, a.dataset]));
      // Reaction and species pages come before the dataset versions.
      expect(asked.indexOf(a.reaction)).toBeLessThan(asked.indexOf(a.dataset));
      expect(most).toBe(1);
    } finally {
      await loop.stop();
    }
    // Stopped: nothing more is asked (the stop waited for the page being asked for).
    const count = asked.length;
    await new Promise((r) => setTimeout(r, 100));
    expect(asked.length).toBe(count);
    expect(loop.stats().rendered).toBe(count);
    expect(loop.stats().failed).toBe(0);
  });
});

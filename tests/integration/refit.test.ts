import { afterEach, describe, expect, it } from "vitest";
import * as cacheInvalidations from "@/app/api/cache-invalidations/route";
const cacheInvalidationsRoute = cacheInvalidations.POST;
import { CACHE_KEY_ENV, CACHE_KEY_HEADER, forwardCacheInvalidations } from "@/lib/public-cache";
import { listVersionCacheTags } from "@/lib/reactions/public-queries";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { getRecordedEngineVersion } from "@/lib/datasets/queries";
import { listStaleVersions, refitVersion } from "@/lib/datasets/refit";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// `sql` connects as the runtime role (DATABASE_URL), as the app does.

async function people(tag: string): Promise<[UserDto, UserDto]> {
  const owner = await createUser({ email: uniqueEmail(tag), name: "Refit Owner", passwordHash: "x", verified: true });
  const curator = await createUser({
    email: uniqueEmail(tag + "c"),
    name: "Refit Curator",
    passwordHash: "x",
    role: "curator",
    verified: true,
  });
  return [owner, curator];
}

/** A version fitted by an older engine: a draft's analysis may still be relabelled, then it is published (or not). */
async function fittedByOlderEngine(owner: UserDto, curator: UserDto, title: string, publish: boolean) {
  const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title } });
  await sql`update version_analyses set engine_version = 'kinetics-0' where version_id = ${v.id}`;
  if (publish) {
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
  }
  return v;
}

const enginesOf = async (versionId: number) =>
  (await sql<{ engine_version: string }[]>`select engine_version from version_analyses where version_id = ${versionId} order by id`).map(
    (r) => r.engine_version,
  );

describe("re-fitting after an engine change", () => {
  it("the database knows the current engine version, as the code does", async () => {
    expect(await sql`select engine_version from arrhenia_engine`).toEqual([{ engine_version: ENGINE_VERSION }]);
    // enqueueStaleRefits queues re-fits only while this holds (a database recording another engine would refuse them all).
    expect(await getRecordedEngineVersion()).toBe(ENGINE_VERSION);
  });

  it("adds a current analysis to stale versions, published ones included, and leaves current ones alone", async () => {
    const [owner, curator] = await people("refit");
    const current = await depositNewDataset({ actor: owner, document: EXAMPLE_DEPOSIT });
    expect(await refitVersion({ versionId: current.id })).toBe("current");
    const draft = await fittedByOlderEngine(owner, curator, "Refit draft", false);
    const published = await fittedByOlderEngine(owner, curator, "Refit published", true);

    const stale = await listStaleVersions();
    expect(stale).toEqual(expect.arrayContaining([draft.id, published.id]));
    expect(stale).not.toContain(current.id);
    expect(await refitVersion({ versionId: published.id })).toBe("refitted");
    expect(await refitVersion({ versionId: draft.id })).toBe("refitted");
    const rows =
      await sql`select engine_version, result is not null as has_result from version_analyses where version_id = ${published.id} order by id desc`;
    expect(rows[0]).toEqual({ engine_version: ENGINE_VERSION, has_result: true });
    expect(rows.length).toBe(2); // the frozen row stays; the new one is added
    // A second run of the job finds it current; nothing is added twice.
    expect(await refitVersion({ versionId: published.id })).toBe("current");
    expect(await enginesOf(published.id)).toEqual(["kinetics-0", ENGINE_VERSION]);
  });

  it("the runtime role cannot forge a re-fit: other engines, the same engine twice, moving the engine row, its own function", async () => {
    const [owner, curator] = await people("refit-forge");
    const v = await fittedByOlderEngine(owner, curator, "Refit guarded", true);
    // Direct writes to a published version's analyses are refused by the trigger.
    await expect(
      sql`insert into version_analyses (version_id, engine_version, result, checks) values (${v.id}, 'kinetics-99', '{}', '[]')`,
    ).rejects.toThrow(/published.*re-fit adds analyses through arrhenia_append_refit_analysis only/);
    await expect(sql`update version_analyses set engine_version = 'x' where version_id = ${v.id}`).rejects.toThrow(/published/);
    await expect(sql`delete from version_analyses where version_id = ${v.id}`).rejects.toThrow(/published/);
    // Through the function, any engine name but the current one is refused, whatever it is.
    for (const forged of ["kinetics-99", "kinetics-0", "", " ", ENGINE_VERSION + " ", ENGINE_VERSION.toUpperCase()]) {
      await expect(sql`select arrhenia_append_refit_analysis(${v.id}, ${forged}, '{}', '[]', null)`, forged).rejects.toThrow(
        /is not the current engine/,
      );
    }
    await expect(sql`select arrhenia_append_refit_analysis(${v.id}, null, '{}', '[]', null)`).rejects.toThrow(/is not the current engine/);
    // The current engine: once, and a second time is refused.
    await sql`select arrhenia_append_refit_analysis(${v.id}, ${ENGINE_VERSION}, '{}', '[]', null)`;
    await expect(sql`select arrhenia_append_refit_analysis(${v.id}, ${ENGINE_VERSION}, '{}', '[]', null)`).rejects.toThrow(
      /already fitted/,
    );
    // The engine row cannot be moved to a name of the caller's choosing, nor replaced, nor emptied.
    const denied = /permission denied/;
    await expect(sql`update arrhenia_engine set engine_version = 'kinetics-forged'`).rejects.toThrow(denied);
    await expect(sql`delete from arrhenia_engine`).rejects.toThrow(denied);
    await expect(
      sql`insert into arrhenia_engine (only_row, engine_version) values (true, 'kinetics-forged') on conflict do nothing`,
    ).rejects.toThrow(denied);
    await expect(sql`truncate arrhenia_engine`).rejects.toThrow(denied);
    // Nor can it bring its own owner-run function or a table that shadows the engine row.
    await expect(
      sql.unsafe(`create function public.forge_refit() returns integer language sql security definer as 'select 1'`),
    ).rejects.toThrow(denied);
    await expect(sql.unsafe(`create function pg_temp.arrhenia_engine() returns text language sql as 'select 1'`)).rejects.toThrow(denied);
    await expect(sql.unsafe(`create temp table arrhenia_engine (only_row boolean, engine_version text)`)).rejects.toThrow(denied);

    expect(await enginesOf(v.id)).toEqual(["kinetics-0", ENGINE_VERSION]);
    expect(await sql`select engine_version from arrhenia_engine`).toEqual([{ engine_version: ENGINE_VERSION }]);
    // enqueueStaleRefits queues re-fits only while this holds (a database recording another engine would refuse them all).
    expect(await getRecordedEngineVersion()).toBe(ENGINE_VERSION);
    expect(await refitVersion({ versionId: v.id })).toBe("current");
  });
});

describe("a re-fit by the background worker reaches the public pages' cache", () => {
  afterEach(() => forwardCacheInvalidations(null));

  it("forwards the same tags as the publishing transaction, outside any request", async () => {
    const [owner, curator] = await people("refit-cache");
    const sent: string[][] = [];
    forwardCacheInvalidations(async (tags) => void sent.push(tags));
    const v = await fittedByOlderEngine(owner, curator, "Refit cache tags", true);
    // Acceptance (outside a request here too) forwarded the tags of what it published (and the
    // display names it changed, name:<species id>, which a re-fit never changes).
    expect(sent).toHaveLength(1);
    const published = sent[0].filter((t) => !t.startsWith("name:")).sort();
    expect(await refitVersion({ versionId: v.id })).toBe("refitted");
    expect(sent).toHaveLength(2);
    expect([...sent[1]].sort()).toEqual(published);
    expect([...sent[1]].sort()).toEqual([...(await listVersionCacheTags({ versionId: v.id }))].sort());
    expect(sent[1]).toEqual(
      expect.arrayContaining(["public", "search", expect.stringMatching(/^reaction:\d+$/), expect.stringMatching(/^species:/)]),
    );
    // Nothing re-fitted, nothing sent.
    expect(await refitVersion({ versionId: v.id })).toBe("current");
    expect(sent).toHaveLength(2);
  });

  it("the receiving endpoint answers only the server's own workers", async () => {
    const key = "k".repeat(48);
    process.env[CACHE_KEY_ENV] = key;
    const post = (headers: Record<string, string>, body: unknown) =>
      cacheInvalidationsRoute(
        new Request("http://127.0.0.1/api/cache-invalidations", {
          method: "POST",
          headers: { "content-type": "application/json", ...headers },
          body: JSON.stringify(body),
        }),
        { params: Promise.resolve({}) },
      );
    expect((await post({}, { tags: ["public"] })).status).toBe(404);
    expect((await post({ [CACHE_KEY_HEADER]: "x".repeat(48) }, { tags: ["public"] })).status).toBe(404);
    expect((await post({ [CACHE_KEY_HEADER]: key }, { tags: [] })).status).toBe(422);
    expect((await post({ [CACHE_KEY_HEADER]: key }, { tags: ["public", "search"] })).status).toBe(204);
    // Other methods, even with the key: the same 404 (a 405 would show that the endpoint exists).
    for (const method of ["GET", "PUT", "DELETE", "PATCH"] as const) {
      const res = await cacheInvalidations[method](
        new Request("http://127.0.0.1/api/cache-invalidations", { method, headers: { [CACHE_KEY_HEADER]: key } }),
        { params: Promise.resolve({}) },
      );
      expect(res.status, method).toBe(404);
    }
    delete process.env[CACHE_KEY_ENV];
    expect((await post({ [CACHE_KEY_HEADER]: key }, { tags: ["public"] })).status).toBe(404);
  });
});

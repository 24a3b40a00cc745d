import { describe, expect, it, vi } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { refitVersion } from "@/lib/datasets/refit";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { forwardCacheInvalidations } from "@/lib/public-cache";
import { listVersionCacheTags } from "@/lib/reactions/public-queries";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// The analysis worker answers for real, except while `fitFails` is set: then the stored document
// still validates but its fit fails, as after an engine change that no longer fits some data.
const state = vi.hoisted(() => ({ fitFails: false }));
vi.mock("@/lib/workers/pool", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/lib/workers/pool")>();
  return {
    ...real,
    runAnalysisTask: (async (name: string, input: unknown, options: unknown) => {
      const answer = await (real.runAnalysisTask as (...args: unknown[]) => Promise<Record<string, unknown>>)(name, input, options);
      if (!state.fitFails || name !== "checkDocument" || !answer.ok) return answer;
      return { ...answer, analysis: { ok: false, message: "the fit did not converge" } };
    }) as typeof real.runAnalysisTask,
  };
});

describe("a re-fit that fails", () => {
  it("is stored as the newest analysis and tells the public pages, as a successful one does", async () => {
    const owner = await createUser({ email: uniqueEmail("refit-fail"), name: "Failing Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("refit-failc"),
      name: "Failing Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Refit that fails" } });
    await sql`update version_analyses set engine_version = 'kinetics-0' where version_id = ${v.id}`;
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    const sent: string[][] = [];
    forwardCacheInvalidations(async (tags) => void sent.push(tags));
    const mark = async () =>
      (await sql<{ mark: string }[]>`select (case when is_called then last_value else 0 end)::text as mark from public_pages_mark`)[0].mark;
    const before = await mark();
    state.fitFails = true;
    try {
      expect(await refitVersion({ versionId: v.id })).toBe("invalid");
    } finally {
      state.fitFails = false;
      forwardCacheInvalidations(null);
    }
    const [newest] = await sql<{ result: unknown; error: string | null }[]>`
      select result, error from version_analyses where version_id = ${v.id} order by id desc limit 1`;
    expect(newest.result).toBeNull();
    expect(sent).toHaveLength(1);
    expect([...sent[0]].sort()).toEqual([...(await listVersionCacheTags({ versionId: v.id }))].sort());
    expect(BigInt(await mark())).toBeGreaterThan(BigInt(before));
  });
});

import { describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { listStaleVersions, refitVersion } from "@/lib/datasets/refit";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

describe("re-fitting after an engine change", () => {
  it("adds a current analysis to stale versions, published ones included, and leaves current ones alone", async () => {
    const owner = await createUser({ email: uniqueEmail("refit"), name: "Refit Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("refitc"),
      name: "Refit Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const draft = await depositNewDataset({ actor: owner, document: EXAMPLE_DEPOSIT });
    const published = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Refit published" } });
    await applyTransition({ versionId: published.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: published.id, actorId: curator.id, transition: "accept", reason: "Consistent." });

    expect(await refitVersion({ versionId: draft.id })).toBe("current");
    // Pretend both were fitted by an older engine: add an older analysis row as the newest.
    for (const id of [draft.id, published.id]) {
      await sql`insert into version_analyses (version_id, engine_version, result, checks) values (${id}, 'kinetics-0', null, '[]')`;
    }
    const stale = await listStaleVersions();
    expect(stale).toEqual(expect.arrayContaining([draft.id, published.id]));
    expect(await refitVersion({ versionId: published.id })).toBe("refitted");
    expect(await refitVersion({ versionId: draft.id })).toBe("refitted");
    const rows =
      await sql`select engine_version, result is not null as has_result from version_analyses where version_id = ${published.id} order by id desc`;
    expect(rows[0]).toEqual({ engine_version: ENGINE_VERSION, has_result: true });
    expect(rows.length).toBe(3); // frozen rows stay; the new one is added
  });
});

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
      await sql`select arrhenia_append_refit_analysis(${id}, 'kinetics-0', null, '[]', null)`;
    }
    const stale = await listStaleVersions();
    expect(stale).toEqual(expect.arrayContaining([draft.id, published.id]));
    expect(await refitVersion({ versionId: published.id })).toBe("refitted");
    expect(await refitVersion({ versionId: draft.id })).toBe("refitted");
    const rows =
      await sql`select engine_version, result is not null as has_result from version_analyses where version_id = ${published.id} order by id desc`;
    expect(rows[0]).toEqual({ engine_version: ENGINE_VERSION, has_result: true });
    expect(rows.length).toBe(3); // frozen rows stay; the new one is added
    // A second run of the job finds it current; nothing is added twice.
    expect(await refitVersion({ versionId: published.id })).toBe("current");
    expect((await sql`select count(*)::int as n from version_analyses where version_id = ${published.id}`)[0].n).toBe(3);
  });

  it("only the re-fit path may add to a published version's analyses, only appending, never by the engine that fitted it last", async () => {
    const owner = await createUser({ email: uniqueEmail("refit2"), name: "Refit Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("refit2c"),
      name: "Refit Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Refit guarded" } });
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    // The runtime role (these tests' connection) cannot insert directly, nor update or delete.
    await expect(
      sql`insert into version_analyses (version_id, engine_version, result, checks) values (${v.id}, 'kinetics-99', '{}', '[]')`,
    ).rejects.toThrow(/published.*re-fit adds analyses through arrhenia_append_refit_analysis only/);
    await expect(sql`update version_analyses set engine_version = 'x' where version_id = ${v.id}`).rejects.toThrow(/published/);
    await expect(sql`delete from version_analyses where version_id = ${v.id}`).rejects.toThrow(/published/);
    // Through the function: refused for the engine that fitted it last, accepted for another.
    await expect(sql`select arrhenia_append_refit_analysis(${v.id}, ${ENGINE_VERSION}, '{}', '[]', null)`).rejects.toThrow(
      /already fitted/,
    );
    await sql`select arrhenia_append_refit_analysis(${v.id}, 'kinetics-0', null, '[]', null)`;
    expect(await refitVersion({ versionId: v.id })).toBe("refitted");
    const engines = await sql`select engine_version from version_analyses where version_id = ${v.id} order by id`;
    expect(engines.map((r) => r.engine_version)).toEqual([ENGINE_VERSION, "kinetics-0", ENGINE_VERSION]);
  });
});

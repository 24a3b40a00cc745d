import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

import { createDraftAction, saveDraftAction, transitionAction } from "@/app/deposits/actions";
import { GET as getVersion, PUT as putVersion } from "@/app/api/v1/versions/[id]/route";
import { getCurrentUser } from "@/lib/auth/session";
import { addDatasetMember } from "@/lib/datasets/queries";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let owner: UserDto, editor: UserDto;

beforeAll(async () => {
  const mk = (tag: string) => createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role: "researcher", verified: true });
  [owner, editor] = await Promise.all([mk("draft-owner"), mk("draft-editor")]);
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const json = (d: unknown) => JSON.stringify(d);
const ok = <T extends { ok: boolean }>(r: T) => {
  if (!r.ok) throw new Error(`expected a save, got ${JSON.stringify(r)}`);
  return r as Extract<T, { ok: true }>;
};

async function stored(versionId: number) {
  const [v] = await sql`
    select title, payload, draft_document, draft_problems, lock_version, point_count,
      (select count(*)::int from version_points where version_id = ${versionId}) as points,
      (select count(*)::int from version_analyses where version_id = ${versionId}) as analyses
    from dataset_versions where id = ${versionId}`;
  return v;
}

describe("editor saves of incomplete drafts", () => {
  it("stores a new deposit with only a title, with what it lacks, and no rows", async () => {
    as(owner);
    const r = ok(await createDraftAction(json({ title: "Only a title so far", points: [{ T: "29o", k: 1e-12 }] })));
    expect(r.problems?.length).toBeGreaterThan(2);
    expect(r.problems?.map((p) => p.pointer)).toEqual(expect.arrayContaining(["/points/0/T", "/reaction"]));
    const v = await stored(r.versionId);
    expect(v).toMatchObject({ title: "Only a title so far", lock_version: 1, point_count: 0, points: 0, analyses: 0 });
    expect(v.draft_document.points[0].T).toBe("29o");
    expect(v.draft_problems.length).toBe(r.problems?.length);
  });

  it("refuses a deposit without a title, one with text PostgreSQL cannot store and one with a number too large to store, storing nothing", async () => {
    as(owner);
    const [{ n: before }] = await sql`select count(*)::int as n from dataset_versions where created_by = ${owner.id}`;
    const untitled = await createDraftAction(json({ title: "  ", description: "x" }));
    expect(untitled).toMatchObject({ ok: false, status: 422, errors: [{ pointer: "/title" }] });
    const nul = await createDraftAction(json({ title: "With a NUL", description: "a\u0000b" }));
    expect(nul).toMatchObject({ ok: false, status: 422, errors: [{ pointer: "/description" }] });
    // A control character is never kept in a draft either (the deposit rule of lib/deposits/text-characters.ts).
    const bell = await createDraftAction(json({ title: "With a bell", creators: [{ name: "A" }, { name: "Tanaka\u0007, Emi" }] }));
    expect(bell).toMatchObject({ ok: false, status: 422, errors: [{ pointer: "/creators/1/name" }] });
    expect(JSON.stringify(bell)).toContain("U+0007");
    // A number beyond the largest double would be stored by jsonb as null: refused where it is.
    const huge = await createDraftAction('{"title":"A number too large","points":[{"T":300,"k":1e400}]}');
    expect(huge).toMatchObject({ ok: false, status: 422, errors: [{ pointer: "/points/0/k" }] });
    const [{ n: after }] = await sql`select count(*)::int as n from dataset_versions where created_by = ${owner.id}`;
    expect(after).toBe(before);
  });

  it("keeps the last valid document, points and analysis while an incomplete one is saved over it, and clears the draft document once valid", async () => {
    as(owner);
    const created = ok(await createDraftAction(json(EXAMPLE_DEPOSIT)));
    expect(created.problems).toEqual([]);
    const before = await stored(created.versionId);
    expect(before.points).toBe(EXAMPLE_DEPOSIT.points.length);

    const broken = { ...EXAMPLE_DEPOSIT, title: "Renamed while broken", points: [{ T: 300, k: -1 }] };
    const saved = ok(await saveDraftAction(created.versionId, created.lockVersion, json(broken)));
    expect(saved.problems?.map((p) => p.pointer)).toContain("/points/0/k");
    const during = await stored(created.versionId);
    expect(during).toMatchObject({ title: "Renamed while broken", lock_version: 2, points: EXAMPLE_DEPOSIT.points.length, analyses: 1 });
    expect(during.payload).toEqual(before.payload);
    expect(during.draft_document.points).toEqual([{ T: 300, k: -1 }]);

    // The API shows the last valid document and still refuses an invalid one (the schema is its contract).
    const put = await putVersion(
      new Request(`http://127.0.0.1/api/v1/versions/${created.versionId}`, {
        method: "PUT",
        headers: { "if-match": '"2"' },
        body: json(broken),
      }),
      { params: Promise.resolve({ id: String(created.versionId) }) },
    );
    expect(put.status).toBe(422);
    const got = await getVersion(new Request(`http://127.0.0.1/api/v1/versions/${created.versionId}`), {
      params: Promise.resolve({ id: String(created.versionId) }),
    });
    expect(got.status).toBe(200);

    // Submission needs a valid document: refused with the list, nothing changes.
    const refused = await transitionAction(created.versionId, "submit");
    expect(refused).toMatchObject({ ok: false, status: 422, message: expect.stringMatching(/not ready to submit/) });
    expect(refused.ok ? [] : refused.errors.map((e) => e.pointer)).toContain("/points/0/k");
    const [{ state }] = await sql`select state from dataset_versions where id = ${created.versionId}`;
    expect(state).toBe("draft");

    const fixed = ok(await saveDraftAction(created.versionId, 2, json({ ...EXAMPLE_DEPOSIT, title: "Fixed" })));
    expect(fixed.problems).toEqual([]);
    const after = await stored(created.versionId);
    expect(after).toMatchObject({ title: "Fixed", draft_document: null, draft_problems: null, lock_version: 3 });
    expect(ok(await transitionAction(created.versionId, "submit")).state).toBe("submitted");
  });
});

describe("editor saves that lose the lock", () => {
  it("change nothing and bring back the co-editor's draft and lock version; a save on top of it succeeds", async () => {
    as(owner);
    const created = ok(await createDraftAction(json(EXAMPLE_DEPOSIT)));
    const [{ dataset_id: datasetId }] = await sql`select dataset_id from dataset_versions where id = ${created.versionId}`;
    await addDatasetMember({ datasetId, userId: editor.id, role: "editor", actorId: owner.id });

    as(editor);
    const theirs = { ...EXAMPLE_DEPOSIT, description: "The editor's summary", points: [{ T: 300 }] };
    const theirSave = ok(await saveDraftAction(created.versionId, created.lockVersion, json(theirs)));
    expect(theirSave.lockVersion).toBe(2);

    as(owner);
    const mine = { ...EXAMPLE_DEPOSIT, title: "The owner's title" };
    const stale = await saveDraftAction(created.versionId, created.lockVersion, json(mine));
    expect(stale).toMatchObject({ ok: false, status: 409 });
    if (stale.ok) return;
    expect(stale.latest).toMatchObject({ lockVersion: 2, document: { description: "The editor's summary", points: [{ T: 300 }] } });
    expect(stale.latest?.problems.map((p) => p.pointer)).toContain("/points/0/k");
    expect((await stored(created.versionId)).draft_document.description).toBe("The editor's summary");

    const merged = { ...EXAMPLE_DEPOSIT, title: "The owner's title", description: "The editor's summary" };
    const saved = ok(await saveDraftAction(created.versionId, stale.latest!.lockVersion, json(merged)));
    expect(saved.lockVersion).toBe(3);
    expect(await stored(created.versionId)).toMatchObject({ title: "The owner's title", draft_document: null });
  });
});

import { beforeAll, describe, expect, it } from "vitest";
import { applyTransition, payloadSha256 } from "@/lib/curation/transitions";
import { addDatasetMember, createDatasetDraft, saveDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const points: StoredPoint[] = [
  { T: 300, k: 1e-12, original: { T: 300, k: 1e-12 } },
  { T: 350, k: 2e-12, original: { T: 350, k: 2e-12 } },
];
const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };

let owner: UserDto, editor: UserDto, stranger: UserDto, curator: UserDto, coCurator: UserDto, admin: UserDto;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, editor, stranger, curator, coCurator, admin] = await Promise.all([
    mk("owner"),
    mk("editor"),
    mk("stranger"),
    mk("curator", "curator"),
    mk("cocurator", "curator"),
    mk("admin", "admin"),
  ]);
});

async function newDraft() {
  const v = await createDatasetDraft({
    ownerId: owner.id,
    title: "OH + CH4 test",
    payload: { title: "OH + CH4 test", points: [1, 2] },
    points,
    analysis,
  });
  await addDatasetMember({ datasetId: v.datasetId, userId: editor.id, role: "editor", actorId: owner.id });
  await addDatasetMember({ datasetId: v.datasetId, userId: coCurator.id, role: "editor", actorId: owner.id });
  return v;
}

async function status(p: Promise<unknown>): Promise<number | "ok"> {
  try {
    await p;
    return "ok";
  } catch (err) {
    return (err as { status?: number }).status ?? 500;
  }
}

describe("lifecycle in the database, per role", () => {
  it("only the owner submits", async () => {
    const v = await newDraft();
    for (const who of [editor, curator, admin])
      expect(await status(applyTransition({ versionId: v.id, actorId: who.id, transition: "submit" }))).toBe(403);
    // Someone who may not see the draft is not told it exists.
    expect(await status(applyTransition({ versionId: v.id, actorId: stranger.id, transition: "submit" }))).toBe(404);
    expect(await status(applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" }))).toBe("ok");
    const [row] = await sql`select state, submitted_at from dataset_versions where id = ${v.id}`;
    expect(row.state).toBe("submitted");
    expect(row.submitted_at).toBeInstanceOf(Date);
  });

  it("curators (not co-editing ones) review; a decision needs a reason; each step is audited", async () => {
    const v = await newDraft();
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    expect(await status(applyTransition({ versionId: v.id, actorId: coCurator.id, transition: "start_review" }))).toBe(403);
    expect(await status(applyTransition({ versionId: v.id, actorId: stranger.id, transition: "start_review" }))).toBe(404);
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "start_review" });
    expect(await status(applyTransition({ versionId: v.id, actorId: curator.id, transition: "return", reason: "" }))).toBe(422);
    await applyTransition({
      versionId: v.id,
      actorId: curator.id,
      transition: "return",
      reason: "Give the bath gas of each point.",
    });
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit", reply: "Each point now has its bath gas." });
    await applyTransition({ versionId: v.id, actorId: admin.id, transition: "start_review" });
    const out = await applyTransition({ versionId: v.id, actorId: admin.id, transition: "accept", reason: "Complete and consistent." });
    expect(out.to).toBe("published");
    const events =
      await sql`select action from audit_events where subject_type = 'dataset_version' and subject_id = ${String(v.id)} order by id`;
    expect(events.map((e) => e.action)).toEqual([
      "dataset.created",
      "dataset.submit",
      "dataset.start_review",
      "dataset.return",
      "dataset.submit",
      "dataset.start_review",
      "dataset.accept",
    ]);
    const ds = await sql`select decision, reason from decisions where version_id = ${v.id} order by id`;
    expect(ds.map((d) => d.decision)).toEqual(["return", "accept"]);
  });

  it("acceptance freezes the version: hash, identifiers, and a trigger that refuses changes", async () => {
    const v = await newDraft();
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    const out = await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Fine." });
    expect(out.identifiers?.series).toMatch(/^10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{3}[0-9A-Z*~$=]$/);
    // The code is drawn at random: it never spells the database id (the prefix "10.5072" may contain its digits).
    expect(out.identifiers?.series).not.toMatch(new RegExp(`arrhenia\\.${v.datasetId}|ARH-0*${v.datasetId}-`));
    expect(out.identifiers?.version).toBe(`${out.identifiers?.series}/1`);
    const [row] = await sql`select payload, payload_sha256, version_identifier, published_at from dataset_versions where id = ${v.id}`;
    expect(row.payload_sha256).toBe(payloadSha256(row.payload));
    expect(row.version_identifier).toBe(out.identifiers?.version);
    const regs = await sql`select identifier, registered from identifier_registrations where dataset_id = ${v.datasetId} order by kind`;
    expect(regs).toHaveLength(2);

    await expect(sql`update dataset_versions set title = 'changed' where id = ${v.id}`).rejects.toThrow(/published and cannot be changed/);
    await expect(sql`update dataset_versions set payload = '{}' where id = ${v.id}`).rejects.toThrow(/published/);
    await expect(sql`delete from dataset_versions where id = ${v.id}`).rejects.toThrow(/cannot be deleted/);
    await expect(sql`update version_points set rate_constant = 1 where version_id = ${v.id}`).rejects.toThrow(
      /version_points cannot be changed/,
    );
    await expect(sql`delete from version_points where version_id = ${v.id}`).rejects.toThrow(/published/);
    await expect(
      sql`insert into version_points (version_id, idx, temperature_k, rate_constant, original) values (${v.id}, 99, 300, 1, '{}')`,
    ).rejects.toThrow(/published/);
    await expect(
      saveDraft({ versionId: v.id, actorId: owner.id, expectedLockVersion: 1, title: "x", payload: {}, points, analysis }),
    ).rejects.toThrow(/can no longer be edited/);
    const [after] = await sql`select title, payload_sha256 from dataset_versions where id = ${v.id}`;
    expect(after).toEqual({ title: "OH + CH4 test", payload_sha256: row.payload_sha256 });

    // Retraction is the one change allowed, with a public notice; after it nothing changes.
    expect(await status(applyTransition({ versionId: v.id, actorId: owner.id, transition: "retract", reason: "mine" }))).toBe(403);
    await applyTransition({
      versionId: v.id,
      actorId: curator.id,
      transition: "retract",
      reason: "Detector calibration error found by the authors.",
    });
    const [retracted] = await sql`select state, retraction_notice from dataset_versions where id = ${v.id}`;
    expect(retracted.state).toBe("retracted");
    await expect(sql`update dataset_versions set retraction_notice = 'edited' where id = ${v.id}`).rejects.toThrow(/published/);
  });

  it("a stale save gets a conflict and never overwrites a co-editor", async () => {
    const v = await newDraft();
    const first = await saveDraft({
      versionId: v.id,
      actorId: editor.id,
      expectedLockVersion: 1,
      title: "Editor's title",
      payload: { title: "Editor's title" },
      points,
      analysis,
    });
    expect(first.lockVersion).toBe(2);
    await expect(
      saveDraft({
        versionId: v.id,
        actorId: owner.id,
        expectedLockVersion: 1,
        title: "Owner's stale title",
        payload: {},
        points: points.slice(0, 1),
        analysis,
      }),
    ).rejects.toMatchObject({
      status: 409,
      message: expect.stringMatching(/Someone saved this draft after you opened it/),
    });
    const [row] = await sql`select title, lock_version, point_count from dataset_versions where id = ${v.id}`;
    expect(row).toEqual({ title: "Editor's title", lock_version: 2, point_count: 2 });
    const [{ n }] = await sql`select count(*)::int as n from version_points where version_id = ${v.id}`;
    expect(n).toBe(2);
  });
});

describe("a new version", () => {
  it("starts as a draft copy of the published one (owner only, one open draft at a time) and gets its own identifier", async () => {
    const { startNextVersion } = await import("@/lib/datasets/deposits");
    const v1 = await newDraft();
    await applyTransition({ versionId: v1.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v1.id, actorId: curator.id, transition: "accept", reason: "Fine." });
    await expect(startNextVersion({ actor: editor, versionId: v1.id })).rejects.toMatchObject({ status: 403 });
    // v1 is public, so a stranger sees it but may not continue it.
    await expect(startNextVersion({ actor: stranger, versionId: v1.id })).rejects.toMatchObject({ status: 403 });
    const v2 = await startNextVersion({ actor: owner, versionId: v1.id });
    expect(v2).toMatchObject({ number: 2, state: "draft", datasetId: v1.datasetId, title: "OH + CH4 test" });
    const [copy] =
      await sql`select (select payload from dataset_versions where id = ${v1.id}) = payload as same_payload, point_count from dataset_versions where id = ${v2.id}`;
    expect(copy).toEqual({ same_payload: true, point_count: 2 });
    await expect(startNextVersion({ actor: owner, versionId: v1.id })).rejects.toMatchObject({ status: 409 });
    await applyTransition({ versionId: v2.id, actorId: owner.id, transition: "submit" });
    const out = await applyTransition({ versionId: v2.id, actorId: curator.id, transition: "accept", reason: "Second version fine." });
    const [{ series }] = await sql`select series_identifier as series from datasets where id = ${v1.datasetId}`;
    expect(out.identifiers).toEqual({ version: `${series}/2`, series });
    const [v1row] = await sql`select state, version_identifier from dataset_versions where id = ${v1.id}`;
    expect(v1row).toEqual({ state: "published", version_identifier: `${series}/1` });
  });
});

describe("a reaction-class id retired after publication", () => {
  it("stays in the published document, and the next version starts with the current id", async () => {
    const { startNextVersion } = await import("@/lib/datasets/deposits");
    const legacy = { title: "OH + CH4 test", reaction: { class: "h_abstraction", order: 2 }, points: [1, 2] };
    const v1 = await createDatasetDraft({ ownerId: owner.id, title: "OH + CH4 test", payload: legacy, points, analysis });
    await applyTransition({ versionId: v1.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v1.id, actorId: curator.id, transition: "accept", reason: "Fine." });
    const v2 = await startNextVersion({ actor: owner, versionId: v1.id });
    const rows =
      await sql`select id, payload -> 'reaction' as reaction from dataset_versions where id in (${v1.id}, ${v2.id}) order by number`;
    expect(rows.map((r) => r.reaction)).toEqual([
      { class: "h_abstraction", order: 2 },
      { class: "hydrogen-abstraction", order: 2 },
    ]);
  });
});

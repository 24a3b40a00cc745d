import { beforeAll, describe, expect, it } from "vitest";
import { listReturningCurators, listSubmissionSnapshots } from "@/lib/curation/queries";
import { diffSubmissions } from "@/lib/curation/submission-diff";
import { transitionVersion } from "@/lib/datasets/deposits";
import { createDatasetDraft, saveDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };
const pt = (T: number, k: number): StoredPoint => ({ T, k, original: { T, k } });
const firstPoints = [pt(300, 1e-12), pt(350, 2e-12), pt(400, 3e-12)];
const doc = (title: string, rows: StoredPoint[]) => ({ title, units: { T: "K" }, points: rows.map((p) => ({ T: p.T, k: p.k })) });

let owner: UserDto, curator: UserDto, otherCurator: UserDto;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, curator, otherCurator] = await Promise.all([mk("snap-owner"), mk("snap-curator", "curator"), mk("snap-curator2", "curator")]);
});

async function submittedDraft() {
  const v = await createDatasetDraft({
    ownerId: owner.id,
    title: "Snapshot test",
    payload: doc("Snapshot test", firstPoints),
    points: firstPoints,
    analysis,
  });
  await transitionVersion({ actor: owner, versionId: v.id, transition: "submit" });
  return v;
}

/** Submitted, returned by `curator`, edited (one point changed, one removed, title changed): ready to resubmit. */
async function returnedAndEdited() {
  const v = await submittedDraft();
  await transitionVersion({ actor: curator, versionId: v.id, transition: "return", reason: "The 400 K point is off by ten." });
  const edited = [pt(300, 1e-12), pt(400, 3.1e-12)];
  await saveDraft({
    versionId: v.id,
    actorId: owner.id,
    expectedLockVersion: 1,
    title: "Snapshot test, corrected",
    payload: doc("Snapshot test, corrected", edited),
    points: edited,
    analysis,
  });
  return v;
}

async function mailJobs(to: string) {
  return sql<{ subject: string; text: string }[]>`
    select data->>'subject' as subject, data->>'text' as text from pgboss.job where name = 'mail' and data->>'to' = ${to} order by created_on desc`;
}

describe("submission snapshots", () => {
  it("every submission keeps the document and its points; a resubmission keeps the reply", async () => {
    const v = await returnedAndEdited();
    await transitionVersion({
      actor: owner,
      versionId: v.id,
      transition: "submit",
      reply: "  Corrected the 400 K point; dropped 350 K.  ",
    });
    const snaps = await listSubmissionSnapshots({ versionId: v.id });
    expect(snaps.map((s) => s.sequence)).toEqual([2, 1]);
    expect(snaps[1]).toMatchObject({ reply: null, payload: doc("Snapshot test", firstPoints) });
    expect(snaps[1].points.map((p) => p.k)).toEqual([1e-12, 2e-12, 3e-12]);
    expect(snaps[0].reply).toBe("Corrected the 400 K point; dropped 350 K.");
    expect(snaps[0].points).toHaveLength(2);
    // What the review page shows: the title changed, 350 K removed, 400 K changed.
    const d = diffSubmissions(snaps[1].payload, snaps[0].payload);
    expect(d.fields).toEqual([{ kind: "changed", path: "title", before: "Snapshot test", after: "Snapshot test, corrected" }]);
    expect(d.points.map((p) => [p.kind, p.rowBefore, p.rowAfter])).toEqual([
      ["changed", 2, 2],
      ["removed", 3, undefined],
    ]);
    // The reply is on the audit trail of the submission too.
    const [event] =
      await sql`select details from audit_events where subject_type = 'dataset_version' and subject_id = ${String(v.id)} and action = 'dataset.submit' order by id desc limit 1`;
    expect(event.details.reply).toBe("Corrected the 400 K point; dropped 350 K.");
  });

  it("a resubmission needs a reply: required, bounded, storable; a first submission takes none", async () => {
    const v = await returnedAndEdited();
    for (const reply of [undefined, "  ", "x".repeat(2001), "Fixed\u0000"])
      await expect(transitionVersion({ actor: owner, versionId: v.id, transition: "submit", reply })).rejects.toMatchObject({
        status: 422,
      });
    const [row] = await sql`select state from dataset_versions where id = ${v.id}`;
    expect(row.state).toBe("returned");
    const fresh = await createDatasetDraft({
      ownerId: owner.id,
      title: "No reply",
      payload: doc("No reply", firstPoints),
      points: firstPoints,
      analysis,
    });
    await expect(transitionVersion({ actor: owner, versionId: fresh.id, transition: "submit", reply: "hello" })).rejects.toMatchObject({
      status: 422,
    });
  });

  it("the curator who returned it is mailed the reason and the reply when it comes back; other curators the plain notice", async () => {
    const v = await returnedAndEdited();
    expect((await listReturningCurators({ versionId: v.id })).map((c) => c.id)).toEqual([curator.id]);
    await transitionVersion({ actor: owner, versionId: v.id, transition: "submit", reply: "Corrected the 400 K point." });
    const [back] = await mailJobs(curator.email);
    expect(back.subject).toMatch(/^Back for review after your return/);
    expect(back.text).toContain("Your reason for returning it: The 400 K point is off by ten.");
    expect(back.text).toContain("Their reply: Corrected the 400 K point.");
    expect(back.text).toContain(`/review/${v.id}`);
    const [plain] = await mailJobs(otherCurator.email);
    expect(plain.subject).toMatch(/^Waiting for review/);
  });
});

describe("snapshots are append-only in the database (runtime role)", () => {
  const refused = /append-only|permission denied|must be owner|snapshot|cannot be truncated/;

  it("refuses changing, deleting and truncating snapshots, and switching the guard off", async () => {
    const v = await submittedDraft();
    const attacks = [
      sql`update submission_snapshots set reply = 'rewritten' where version_id = ${v.id}`,
      sql`update submission_snapshots set payload = '{}' where version_id = ${v.id}`,
      sql`delete from submission_snapshots where version_id = ${v.id}`,
      sql`truncate submission_snapshots`,
      sql`alter table submission_snapshots disable trigger submission_snapshots_append_only`,
      sql`set session_replication_role = replica`,
      sql`drop trigger submission_snapshots_append_only on submission_snapshots`,
    ];
    for (const attack of attacks) await expect(attack).rejects.toThrow(refused);
    const [priv] =
      await sql`select has_table_privilege(current_user, 'submission_snapshots', 'UPDATE') as u, has_table_privilege(current_user, 'submission_snapshots', 'DELETE') as d`;
    expect(priv).toEqual({ u: false, d: false });
    const [row] = await sql`select count(*)::int as n, max(reply) as reply from submission_snapshots where version_id = ${v.id}`;
    expect(row).toEqual({ n: 1, reply: null });
  });

  it("refuses a forged snapshot: no INSERT for the runtime role, and the function writes only what was submitted, by the owner, once", async () => {
    const v = await submittedDraft();
    const forgedPoints = sql.json(firstPoints.map(() => ({ T: 1, k: 1 })));
    // Snapshot #2 of a submitted version with every point replaced, signed by a curator.
    await expect(
      sql`insert into submission_snapshots (version_id, sequence, submitted_by, reply, payload, points)
        values (${v.id}, 2, ${curator.id}, 'forged reply', ${sql.json(doc("Snapshot test", firstPoints))}, ${forgedPoints})`,
    ).rejects.toThrow(/permission denied/);
    const [priv] = await sql`select has_table_privilege(current_user, 'submission_snapshots', 'INSERT') as i`;
    expect(priv.i).toBe(false);
    // The function, outside the transaction that submitted the version.
    await expect(sql`select arrhenia_take_submission_snapshot(${v.id}, ${owner.id}, 'forged reply')`).rejects.toThrow(
      /only as it is submitted, in the same transaction/,
    );
    // Of a draft.
    const draft = await createDatasetDraft({
      ownerId: owner.id,
      title: "Forged",
      payload: doc("Forged", firstPoints),
      points: firstPoints,
      analysis,
    });
    await expect(sql`select arrhenia_take_submission_snapshot(${draft.id}, ${owner.id}, null)`).rejects.toThrow(/only as it is submitted/);
    // Submitted by hand in the attacker's transaction: not in a curator's name, and only once.
    const submitByHand = (as: number, times = 1) =>
      sql.begin(async (tx) => {
        await tx`update dataset_versions set state = 'submitted', submitted_at = now() where id = ${draft.id}`;
        for (let i = 0; i < times; i++) await tx`select arrhenia_take_submission_snapshot(${draft.id}, ${as}, 'forged reply')`;
      });
    await expect(submitByHand(curator.id)).rejects.toThrow(/submitted only by the owner of its dataset/);
    await expect(submitByHand(owner.id, 2)).rejects.toThrow(/already has the snapshot of this submission/);
    const rows =
      await sql`select version_id, sequence, submitted_by, reply, points from submission_snapshots where version_id in (${v.id}, ${draft.id}) order by version_id, sequence`;
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ version_id: v.id, sequence: 1, submitted_by: owner.id, reply: null });
    expect(rows[0].points.map((p: { T: number; k: number }) => [p.T, p.k])).toEqual(firstPoints.map((p) => [p.T, p.k]));
  });

  it("a snapshot is built from the stored payload and points, whatever the caller holds", async () => {
    const v = await submittedDraft();
    const [snap] =
      await sql`select s.payload = v.payload as same_payload, s.points from submission_snapshots s join dataset_versions v on v.id = s.version_id where s.version_id = ${v.id}`;
    expect(snap.same_payload).toBe(true);
    expect(snap.points).toEqual(
      firstPoints.map((p) => ({
        T: p.T,
        k: p.k,
        sigmaLnK: null,
        pressurePa: null,
        bathGas: null,
        note: null,
        original: { T: p.T, k: p.k },
      })),
    );
  });
});

describe("a version under review keeps the document the curators review (runtime role)", () => {
  const refused = /under review/;

  it("refuses changing its document, points and files while submitted or in review; withdraw and return change only the state", async () => {
    const v = await submittedDraft();
    const attacks = (id: number) => [
      sql`update dataset_versions set payload = ${sql.json({ title: "Something else" })} where id = ${id}`,
      sql`update dataset_versions set draft_document = ${sql.json({ title: "Something else" })} where id = ${id}`,
      sql`update dataset_versions set draft_problems = ${sql.json([{ pointer: "", message: "x" }])} where id = ${id}`,
      // The trigger refuses before the foreign key is checked.
      sql`update dataset_versions set reaction_id = 2147483647 where id = ${id}`,
      sql`update dataset_versions set title = 'Renamed', lock_version = lock_version + 1 where id = ${id}`,
      sql`update dataset_versions set submitted_at = now() where id = ${id}`,
      sql`delete from dataset_versions where id = ${id}`,
      sql`update version_points set rate_constant = 1 where version_id = ${id}`,
      sql`delete from version_points where version_id = ${id}`,
      sql`insert into version_points (version_id, idx, temperature_k, rate_constant, original) values (${id}, 99, 1, 1, '{}')`,
      sql`insert into version_files (version_id, filename, content_type, size_bytes, sha256, storage_key) values (${id}, 'x.csv', 'text/csv', 1, 'c', 'k')`,
    ];
    const before = await sql`select payload, title, lock_version, point_count from dataset_versions where id = ${v.id}`;
    for (const attack of attacks(v.id)) await expect(attack).rejects.toThrow(refused);
    await transitionVersion({ actor: curator, versionId: v.id, transition: "start_review" });
    for (const attack of attacks(v.id)) await expect(attack).rejects.toThrow(refused);
    expect(await sql`select payload, title, lock_version, point_count from dataset_versions where id = ${v.id}`).toEqual(before);
    const [{ n }] = await sql`select count(*)::int as n from version_points where version_id = ${v.id}`;
    expect(n).toBe(3);
    // Returned to the authors: the state changed, and they may edit again.
    await transitionVersion({ actor: curator, versionId: v.id, transition: "return", reason: "Add the pressure." });
    await saveDraft({
      versionId: v.id,
      actorId: owner.id,
      expectedLockVersion: 1,
      title: "Snapshot test, with pressure",
      payload: doc("Snapshot test, with pressure", firstPoints),
      points: firstPoints,
      analysis,
    });
    // Withdrawn after resubmitting: back to a draft, editable.
    await transitionVersion({ actor: owner, versionId: v.id, transition: "submit", reply: "Pressure added." });
    await transitionVersion({ actor: owner, versionId: v.id, transition: "withdraw" });
    await sql`update version_points set note = 'edited as a draft' where version_id = ${v.id} and idx = 0`;
    const [row] = await sql`select state, title from dataset_versions where id = ${v.id}`;
    expect(row).toEqual({ state: "draft", title: "Snapshot test, with pressure" });
  });
});

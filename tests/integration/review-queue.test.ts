import { beforeAll, describe, expect, it } from "vitest";
import { countReviewQueue, listCheckSummaries, listReviewQueue } from "@/lib/curation/queries";
import { applyTransition } from "@/lib/curation/transitions";
import { createDatasetDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

const pt = (T: number, k: number): StoredPoint => ({ T, k, original: { T, k } });
const points = [pt(300, 1e-12), pt(350, 2e-12), pt(400, 3e-12)];
// Invented findings: one warning from the fit; the balance check passed (not a finding).
const analysis: AnalysisSummary = {
  engineVersion: "test",
  result: { flags: [{ code: "narrow_range", severity: "warn", message: "The measured range is narrow (100 K)." }] },
  checks: [{ code: "balanced", severity: "info", message: "Elements and charge balance." }],
};

let owner: UserDto, curator: UserDto;
beforeAll(async () => {
  owner = await createUser({
    email: uniqueEmail("queue-owner"),
    name: "queue owner",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
  curator = await createUser({
    email: uniqueEmail("queue-curator"),
    name: "queue curator",
    passwordHash: "x",
    role: "curator",
    verified: true,
  });
});

async function submitted(title: string) {
  const v = await createDatasetDraft({ ownerId: owner.id, title, payload: { title, units: { T: "K" } }, points, analysis });
  await applyTransition({ actorId: owner.id, versionId: v.id, transition: "submit" });
  return v.id;
}

// Through the lifecycle itself (no mail): the queue's answers are what is tested, not the notices.
describe("the review queue: waiting for a curator, or with the authors", () => {
  it("lists a returned version only among those with their authors, and counts it there", async () => {
    const tag = `queue ${Date.now()}`;
    const before = await countReviewQueue({});
    const waitingId = await submitted(`${tag} waiting`);
    const returnedId = await submitted(`${tag} returned`);
    await applyTransition({ actorId: curator.id, versionId: returnedId, transition: "return", reason: "Say how row 2 was checked." });

    const after = await countReviewQueue({});
    expect(after.waiting - before.waiting).toBe(1);
    expect(after.returned - before.returned).toBe(1);
    expect(after.waiting).toBe(after.submitted + after.inReview);

    const ids = async (states?: ("submitted" | "in_review" | "returned")[]) =>
      (await listReviewQueue({ states, sort: "submitted", direction: "desc", pageSize: 100 })).rows.map((r) => r.versionId);
    expect(await ids()).toContain(waitingId);
    expect(await ids()).not.toContain(returnedId);
    const withAuthors = await listReviewQueue({ states: ["returned"], sort: "submitted", direction: "desc", pageSize: 100 });
    const row = withAuthors.rows.find((r) => r.versionId === returnedId);
    expect(row).toMatchObject({ handledBy: "queue curator" });
    expect(row!.returnedSeconds).toBeGreaterThanOrEqual(0);
    expect(withAuthors.rows.map((r) => r.versionId)).not.toContain(waitingId);
  });

  it("filters by days waited on the database's clock: a version submitted just now is not older than a day", async () => {
    const id = await submitted(`older ${Date.now()}`);
    const ids = async (olderThanDays?: number) =>
      (await listReviewQueue({ olderThanDays, sort: "submitted", direction: "desc", pageSize: 100 })).rows.map((r) => r.versionId);
    expect(await ids()).toContain(id);
    for (const days of [1, 5, 3650]) expect(await ids(days)).not.toContain(id);
  });

  it("sums up each version's findings in words, with the first of the most severe kind", async () => {
    const id = await submitted(`checks ${Date.now()}`);
    const summary = (await listCheckSummaries([id])).get(id);
    // The passed balance check is neither counted nor called a note.
    expect(summary).toMatchObject({ words: "1 warning", worst: "warn", counts: { error: 0, warn: 1, info: 0 } });
    expect(summary!.first?.message).toBe("The measured range is narrow (100 K).");
  });

  it("says nothing was found when the only check is a passed one, and never sorts it as a note", async () => {
    const title = `balanced only ${Date.now()}`;
    const v = await createDatasetDraft({
      ownerId: owner.id,
      title,
      payload: { title, units: { T: "K" } },
      points,
      analysis: { ...analysis, result: { flags: [] } },
    });
    await applyTransition({ actorId: owner.id, versionId: v.id, transition: "submit" });
    expect((await listCheckSummaries([v.id])).get(v.id)).toMatchObject({ words: "no findings", worst: "none", first: null });
    const rows = (await listReviewQueue({ sort: "submitted", direction: "desc", pageSize: 100 })).rows;
    expect(rows.find((r) => r.versionId === v.id)?.worstFlag).toBe("none");
  });
});

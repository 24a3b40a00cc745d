import postgres from "postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { databaseOn, withDatabase } from "@/db/client";
import { applyTransition } from "@/lib/curation/transitions";
import { listSubmissionSnapshots } from "@/lib/curation/queries";
import { createDatasetDraft, listDecisions, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };
const pt = (T: number, k: number): StoredPoint => ({ T, k, original: { T, k } });
const points = [pt(300, 1e-12), pt(400, 3e-12)];

let owner: UserDto, curator: UserDto;
beforeAll(async () => {
  owner = await createUser({
    email: uniqueEmail("clock-owner"),
    name: "clock owner",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
  curator = await createUser({
    email: uniqueEmail("clock-curator"),
    name: "clock curator",
    passwordHash: "x",
    role: "curator",
    verified: true,
  });
});

const draft = (title: string) => createDatasetDraft({ ownerId: owner.id, title, payload: { title, units: { T: "K" } }, points, analysis });

describe("the time a lifecycle step is recorded at (arrhenia_recorded_at)", () => {
  it("is now() for the runtime role, whatever it sets", async () => {
    const [{ same }] = await sql.begin(async (tx) => {
      await tx`select set_config('arrhenia.recorded_at', '2000-01-01 00:00:00+00', true)`;
      return tx<{ same: boolean }[]>`select arrhenia_recorded_at() = now() as same`;
    });
    expect(same).toBe(true);
  });

  const ownerUrl = process.env.MIGRATION_DATABASE_URL;
  const ownerClient = ownerUrl ? postgres(ownerUrl, { max: 1, onnotice: () => {} }) : null;
  afterAll(() => ownerClient?.end());

  it.skipIf(!ownerClient)("is the owner's chosen time: a submission and a return recorded days ago, through every guard", async () => {
    const v = await draft(`clock ${Date.now()}`);
    const submittedAt = new Date(Date.now() - 3 * 86_400_000);
    const returnedAt = new Date(Date.now() - 86_400_000);
    await withDatabase(databaseOn(ownerClient!), async () => {
      await ownerClient!`select set_config('arrhenia.recorded_at', ${submittedAt.toISOString()}, false)`;
      await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
      await ownerClient!`select set_config('arrhenia.recorded_at', ${returnedAt.toISOString()}, false)`;
      await applyTransition({ versionId: v.id, actorId: curator.id, transition: "return", reason: "Say how the 400 K point was read." });
    });
    await ownerClient!`select set_config('arrhenia.recorded_at', '', false)`;
    const [row] = await sql<{ submitted_at: Date; state: string }[]>`select submitted_at, state from dataset_versions where id = ${v.id}`;
    expect(row).toMatchObject({ state: "returned", submitted_at: submittedAt });
    expect((await listSubmissionSnapshots({ versionId: v.id }))[0].createdAt).toEqual(submittedAt);
    expect((await listDecisions({ versionId: v.id }))[0].createdAt).toEqual(returnedAt);
    const events = await sql<{ action: string; at: Date }[]>`
      select action, at from audit_events where subject_type = 'dataset_version' and subject_id = ${String(v.id)}
        and action in ('dataset.submit', 'dataset.return') order by id`;
    expect(events.map((e) => [e.action, e.at])).toEqual([
      ["dataset.submit", submittedAt],
      ["dataset.return", returnedAt],
    ]);
    // The freeze still holds for the owner: the submitted document cannot be rewritten by setting the clock.
    const triggers = await ownerClient!<{ n: number }[]>`select count(*)::int as n from pg_trigger
      where tgname in ('dataset_versions_frozen_under_review', 'submission_snapshots_append_only', 'decisions_append_only') and tgenabled in ('O', 'A')`;
    expect(triggers[0].n).toBe(3);
  });
});

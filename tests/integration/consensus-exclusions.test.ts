import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
vi.mock("@/lib/mail/queue", () => ({ enqueueMail: vi.fn() }));
vi.mock("@/lib/identifiers/queue", () => ({ enqueueIdentifierRegistration: vi.fn() }));

import { excludeFromConsensusAction, includeInConsensusAction } from "@/app/reactions/[id]/actions";
import { idleState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/session";
import { addDatasetMember } from "@/lib/datasets/queries";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { listConsensusExclusions } from "@/lib/reactions/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { consensusDocument, publish } from "./consensus-fixtures";
import { sql, uniqueEmail } from "./helpers";

/**
 * The curator's consensus exclusion through its server actions, against the real database: who may,
 * the reason rules, the audit trail, and that the published version itself is never touched.
 */
const CARBONS = 5; // Br + n-pentane: a reaction of this file alone
type Who = "anonymous" | "researcher" | "owner" | "co-editing curator" | "curator" | "admin";
const people: Partial<Record<Who, UserDto>> = {};
let published: { versionId: number; datasetId: number; reactionId: number };
let retracted: { versionId: number };
let draftId: number;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"]) =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  people.researcher = await mk("excl-researcher", "researcher");
  people.owner = await mk("excl-owner", "researcher");
  people["co-editing curator"] = await mk("excl-cocurator", "curator");
  people.curator = await mk("excl-curator", "curator");
  people.admin = await mk("excl-admin", "admin");
  const doc = (title: string) => consensusDocument({ carbons: CARBONS, title: `Br + pentane ${title}`, category: "experiment" });
  const as = { owner: people.owner, curator: people.curator };
  published = await publish(doc("published"), as);
  await addDatasetMember({
    datasetId: published.datasetId,
    userId: people["co-editing curator"].id,
    role: "editor",
    actorId: people.owner.id,
  });
  retracted = await publish(doc("retracted"), { ...as, retract: true });
  draftId = (await depositNewDataset({ actor: people.owner, document: doc("draft") })).id;
}, 120_000);

const as = (who: Who) => vi.mocked(getCurrentUser).mockResolvedValue(people[who as Exclude<Who, "anonymous">] ?? null);
const form = (values: Record<string, string>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
};
const exclude = (versionId: number, reason?: string) =>
  excludeFromConsensusAction(idleState, form({ versionId: String(versionId), ...(reason !== undefined ? { reason } : {}) }));
const include = (versionId: number) => includeInConsensusAction(idleState, form({ versionId: String(versionId) }));

const exclusionOf = async (versionId: number) =>
  (await sql`select reason, excluded_by from consensus_exclusions where version_id = ${versionId}`)[0] ?? null;
const auditOf = async (versionId: number) =>
  sql<{ action: string; actor_id: number; details: Record<string, unknown> }[]>`
    select action, actor_id, details from audit_events
    where subject_type = 'dataset_version' and subject_id = ${String(versionId)} and action like 'consensus.%' order by id`;
/** Everything of the version a reader could see change: it must stay as published. */
const frozenView = async (versionId: number) =>
  (
    await sql`select v.state, v.lock_version, v.title, v.payload, v.payload_sha256, v.version_identifier, v.updated_at, v.reaction_id,
      (select count(*)::int from version_points p where p.version_id = v.id) as points,
      (select count(*)::int from version_analyses a where a.version_id = v.id) as analyses
    from dataset_versions v where v.id = ${versionId}`
  )[0];

describe("who may leave a version out of the consensus (and take it back)", () => {
  const table: [Who, RegExp | "ok"][] = [
    ["anonymous", /sign in/i],
    ["researcher", /role does not allow/],
    ["owner", /role does not allow/],
    ["co-editing curator", /Only curators who do not co-edit this dataset/],
    ["curator", "ok"],
    ["admin", "ok"],
  ];
  for (const [who, want] of table) {
    it(`${who} → ${want === "ok" ? "allowed, audited, version untouched" : "refused, nothing stored"}`, async () => {
      const before = await frozenView(published.versionId);
      const auditBefore = (await auditOf(published.versionId)).length;
      as(who);
      const reason = `Offset by a factor of 1000: looks like mol vs molecule units (${who}).`;
      const out = await exclude(published.versionId, reason);
      if (want !== "ok") {
        expect(out.status).toBe("error");
        expect(out.message).toMatch(want);
        expect(await exclusionOf(published.versionId)).toBeNull();
        // Taking back is refused alike (here there is nothing to take back either way).
        const back = await include(published.versionId);
        expect(back.status).toBe("error");
        expect(back.message).toMatch(want);
        expect(await auditOf(published.versionId)).toHaveLength(auditBefore);
        return;
      }
      expect(out).toMatchObject({ status: "ok", message: "Left out of the consensus." });
      expect(await exclusionOf(published.versionId)).toEqual({ reason, excluded_by: people[who]!.id });
      expect(await listConsensusExclusions({ reactionId: published.reactionId })).toEqual([
        { versionId: published.versionId, reason, excludedAt: expect.any(Date) },
      ]);
      const back = await include(published.versionId);
      expect(back).toMatchObject({ status: "ok", message: "Included in the consensus again." });
      expect(await exclusionOf(published.versionId)).toBeNull();
      const audit = (await auditOf(published.versionId)).slice(auditBefore);
      expect(audit).toEqual([
        { action: "consensus.excluded", actor_id: people[who]!.id, details: { reactionId: published.reactionId, reason } },
        { action: "consensus.included", actor_id: people[who]!.id, details: { reactionId: published.reactionId, previousReason: reason } },
      ]);
      // The deposit and the published version are exactly as they were.
      expect(await frozenView(published.versionId)).toEqual(before);
    });
  }

  it("only published versions: a retracted one or a draft is refused (409-style message)", async () => {
    as("curator");
    for (const versionId of [retracted.versionId, draftId]) {
      const out = await exclude(versionId, "Not comparable with the others.");
      expect(out.status).toBe("error");
      expect(out.message).toMatch(/only published versions enter a consensus/);
      expect(await exclusionOf(versionId)).toBeNull();
    }
  });

  it("a version that does not exist, or a malformed id, is 'No such dataset version'", async () => {
    as("curator");
    for (const id of ["2147483646", "abc", "0", "1.5"]) {
      expect(await excludeFromConsensusAction(idleState, form({ versionId: id, reason: "Some reason." }))).toMatchObject({
        status: "error",
        message: "No such dataset version",
      });
      expect(await includeInConsensusAction(idleState, form({ versionId: id }))).toMatchObject({
        status: "error",
        message: "No such dataset version",
      });
    }
  });
});

describe("the reason", () => {
  const cases: [string, string | undefined, RegExp][] = [
    ["missing", undefined, /Give a reason/],
    ["empty", "", /at least 3 characters/],
    ["blank after trimming", "   ab   ", /at least 3 characters/],
    ["too long", "x".repeat(1001), /under 1000 characters/],
    ["holding U+0000", "bad\u0000reason", /cannot|U\+0000|stored/i],
  ];
  for (const [what, reason, message] of cases) {
    it(`${what}: refused on the field, nothing stored or audited`, async () => {
      as("curator");
      const auditBefore = (await auditOf(published.versionId)).length;
      const out = await exclude(published.versionId, reason);
      expect(out.status).toBe("error");
      expect(out.fieldErrors?.reason).toMatch(message);
      expect(await exclusionOf(published.versionId)).toBeNull();
      expect(await auditOf(published.versionId)).toHaveLength(auditBefore);
    });
  }

  it("is trimmed, may be 1000 characters, and can be changed (audited with the previous one)", async () => {
    as("curator");
    const long = "y".repeat(1000);
    expect((await exclude(published.versionId, `  ${long}  `)).status).toBe("ok");
    expect((await exclusionOf(published.versionId))!.reason).toBe(long);
    as("admin");
    expect(await exclude(published.versionId, "Duplicate of another record of the same measurements.")).toMatchObject({
      status: "ok",
      message: "Reason changed.",
    });
    const audit = await auditOf(published.versionId);
    expect(audit.at(-1)).toEqual({
      action: "consensus.exclusion_changed",
      actor_id: people.admin!.id,
      details: { reactionId: published.reactionId, reason: "Duplicate of another record of the same measurements.", previousReason: long },
    });
    expect((await include(published.versionId)).status).toBe("ok");
  });

  it("taking back what is not left out is refused, without an audit row", async () => {
    as("curator");
    const auditBefore = (await auditOf(published.versionId)).length;
    expect(await include(published.versionId)).toMatchObject({ status: "error", message: "This version is not left out of the consensus" });
    expect(await auditOf(published.versionId)).toHaveLength(auditBefore);
  });

  it("the database refuses a short reason itself (the last line behind the form)", async () => {
    await expect(
      sql`insert into consensus_exclusions (version_id, reason, excluded_by) values (${published.versionId}, 'ab', ${people.curator!.id})`,
    ).rejects.toThrow(/consensus_exclusions_reason_length/);
  });
});

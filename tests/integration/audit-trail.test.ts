import { beforeAll, describe, expect, it } from "vitest";
import { getDatasetAuditTrailOrThrow } from "@/lib/audit/queries";
import { transitionVersion } from "@/lib/datasets/deposits";
import { addDatasetMember, createDatasetDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };
const points: StoredPoint[] = [
  { T: 300, k: 1e-12, original: { T: 300, k: 1e-12 } },
  { T: 350, k: 2e-12, original: { T: 350, k: 2e-12 } },
];

type Who = "anonymous" | "researcher" | "owner" | "editor" | "viewer" | "curator" | "admin" | "curator, member as viewer";
const people = {} as Record<Who, UserDto | null>;
let datasetId: number;
let versionId: number;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(`audit-${tag}`), name: `audit ${tag}`, passwordHash: "x", role, verified: true });
  people.anonymous = null;
  people.researcher = await mk("researcher");
  people.owner = await mk("owner");
  people.editor = await mk("editor");
  people.viewer = await mk("viewer");
  people.curator = await mk("curator", "curator");
  people.admin = await mk("admin", "admin");
  people["curator, member as viewer"] = await mk("curator-member", "curator");
  const v = await createDatasetDraft({
    ownerId: people.owner!.id,
    title: "Audit trail test",
    payload: { title: "Audit trail test" },
    points,
    analysis,
  });
  datasetId = v.datasetId;
  versionId = v.id;
  for (const [who, role] of [
    ["editor", "editor"],
    ["viewer", "viewer"],
    ["curator, member as viewer", "viewer"],
  ] as const)
    await addDatasetMember({ datasetId, userId: people[who]!.id, role, actorId: people.owner!.id });
  await transitionVersion({ actor: people.owner!, versionId, transition: "submit" });
  await transitionVersion({ actor: people.curator!, versionId, transition: "start_review" });
  await transitionVersion({ actor: people.curator!, versionId, transition: "return", reason: "State the bath gas." });
  await transitionVersion({ actor: people.owner!, versionId, transition: "submit", reply: "Bath gas stated: He." });
});

// Site role × dataset role → may they read the dataset's audit trail? Others are not told it exists.
const table: [Who, "ok" | 404][] = [
  ["anonymous", 404],
  ["researcher", 404],
  ["owner", "ok"],
  ["editor", "ok"],
  ["viewer", "ok"],
  ["curator", "ok"],
  ["admin", "ok"],
  ["curator, member as viewer", "ok"],
];

describe("a dataset's audit trail: who may read it", () => {
  it.each(table)("%s → %s", async (who, want) => {
    const got = await getDatasetAuditTrailOrThrow({ datasetId, viewer: people[who] }).then(
      () => "ok" as const,
      (err: { status?: number }) => err.status ?? 500,
    );
    expect(got).toBe(want);
  });

  it("a dataset that does not exist is a 404 for curators too", async () => {
    await expect(getDatasetAuditTrailOrThrow({ datasetId: 2 ** 31 - 1, viewer: people.admin })).rejects.toMatchObject({ status: 404 });
  });
});

describe("what the trail shows", () => {
  it("who did what when, newest first, with the reason and the reply", async () => {
    const trail = await getDatasetAuditTrailOrThrow({ datasetId, viewer: people.viewer });
    expect(trail.title).toBe("Audit trail test");
    const rows = trail.entries.map((e) => [e.action, e.actor, e.versionNumber]);
    expect(rows.slice(0, 4)).toEqual([
      ["dataset.submit", "audit owner", 1],
      ["dataset.return", "audit curator", 1],
      ["dataset.start_review", "audit curator", 1],
      ["dataset.submit", "audit owner", 1],
    ]);
    expect(trail.entries[0].details.reply).toBe("Bath gas stated: He.");
    expect(trail.entries[1].details.reason).toBe("State the bath gas.");
    expect(trail.entries.filter((e) => e.action === "dataset.member_added")).toHaveLength(3);
    expect(trail.entries.some((e) => e.action === "dataset.created")).toBe(true);
  });
});

import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
// Hundreds of transitions here: their mails and registrations would only pile up in the shared queues.
vi.mock("@/lib/mail/queue", () => ({ enqueueMail: vi.fn() }));
vi.mock("@/lib/identifiers/queue", () => ({ enqueueIdentifierRegistration: vi.fn() }));

import { inviteAction, saveDraftAction, startNextVersionAction, transitionAction } from "@/app/deposits/actions";
import { GET as getVersion, PUT as putVersion } from "@/app/api/v1/versions/[id]/route";
import { POST as postFile } from "@/app/api/v1/versions/[id]/files/route";
import { POST as postNext } from "@/app/api/v1/versions/[id]/next/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { getCurrentUser } from "@/lib/auth/session";
import { assertVersionCapability, versionStates, type VersionAction } from "@/lib/curation/capabilities";
import { lifecycle, type CoEditorRole, type Transition, type VersionState } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { addDatasetMember, createDatasetDraft, type StoredPoint } from "@/lib/datasets/queries";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

/**
 * Site role × dataset role × state × action, through the real route handlers and server actions.
 * The expected answer of each cell comes from the pure capability function, whose own table
 * (tests/unit/curation/capabilities.test.ts) is written out by hand: this test proves that every
 * entry point asks it, and that a refused request changes nothing.
 */

type Person = { name: string; siteRole: UserDto["role"] | null; datasetRole: CoEditorRole | null; user: UserDto | null };
const people: Person[] = [
  { name: "anonymous", siteRole: null, datasetRole: null, user: null },
  { name: "other researcher", siteRole: "researcher", datasetRole: null, user: null },
  { name: "owner", siteRole: "researcher", datasetRole: "owner", user: null },
  { name: "editor", siteRole: "researcher", datasetRole: "editor", user: null },
  { name: "viewer", siteRole: "researcher", datasetRole: "viewer", user: null },
  { name: "curator", siteRole: "curator", datasetRole: null, user: null },
  { name: "co-editing curator", siteRole: "curator", datasetRole: "editor", user: null },
  { name: "admin", siteRole: "admin", datasetRole: null, user: null },
];
const byName = (n: string) => people.find((p) => p.name === n)!;

beforeAll(async () => {
  for (const p of people) {
    if (p.siteRole)
      p.user = await createUser({
        email: uniqueEmail(p.name.replace(/\W/g, "")),
        name: p.name,
        passwordHash: "x",
        role: p.siteRole,
        verified: true,
      });
  }
});

const points: StoredPoint[] = EXAMPLE_DEPOSIT.points.map((p) => ({ T: p.T, k: p.k, original: { T: p.T, k: p.k } }));
const path: Record<VersionState, [Transition, string][]> = {
  draft: [],
  submitted: [["submit", "owner"]],
  in_review: [
    ["submit", "owner"],
    ["start_review", "curator"],
  ],
  returned: [
    ["submit", "owner"],
    ["return", "curator"],
  ],
  published: [
    ["submit", "owner"],
    ["accept", "curator"],
  ],
  declined: [
    ["submit", "owner"],
    ["decline", "curator"],
  ],
  retracted: [
    ["submit", "owner"],
    ["accept", "curator"],
    ["retract", "curator"],
  ],
};

/** A version in `state` whose dataset has an owner, an editor, a viewer and a co-editing curator. */
async function versionIn(state: VersionState) {
  const owner = byName("owner").user!;
  const v = await createDatasetDraft({
    ownerId: owner.id,
    title: EXAMPLE_DEPOSIT.title,
    payload: EXAMPLE_DEPOSIT as unknown as Record<string, unknown>,
    points,
    analysis: { engineVersion: "test", result: { flags: [] }, checks: [] },
  });
  for (const n of ["editor", "viewer", "co-editing curator"]) {
    const p = byName(n);
    await addDatasetMember({ datasetId: v.datasetId, userId: p.user!.id, role: p.datasetRole!, actorId: owner.id });
  }
  for (const [t, by] of path[state])
    await applyTransition({ versionId: v.id, actorId: byName(by).user!.id, transition: t, reason: "Reason for the record." });
  return v.id;
}

async function snapshot(versionId: number) {
  const [row] =
    await sql`select v.state, v.lock_version, v.title, (select count(*)::int from dataset_versions w where w.dataset_id = v.dataset_id) as versions,
    (select count(*)::int from version_files f where f.version_id = v.id) as files, (select count(*)::int from dataset_invitations i where i.dataset_id = v.dataset_id) as invitations
    from dataset_versions v where v.id = ${versionId}`;
  return row;
}

const req = (url: string, init: RequestInit = {}) => new Request(`http://127.0.0.1${url}`, init);
const ctx = (id: number) => ({ params: Promise.resolve({ id: String(id) }) });
const reason = "Reason for the record.";
// A returned version is submitted again with the authors' reply (lib/curation/capabilities.ts).
const reply = "Answered the return.";

/** Performs `action` through its real entry point; returns the HTTP status (or the action's). */
async function perform(action: VersionAction, versionId: number, state: VersionState): Promise<number> {
  switch (action) {
    case "view":
      return (await getVersion(req(`/api/v1/versions/${versionId}`), ctx(versionId))).status;
    case "view_decisions": {
      const res = await getVersion(req(`/api/v1/versions/${versionId}`), ctx(versionId));
      if (res.status !== 200) return res.status;
      return (await res.json()).data.decisions !== undefined ? 200 : 403;
    }
    case "edit": {
      const [{ lock_version }] = await sql`select lock_version from dataset_versions where id = ${versionId}`;
      const body = JSON.stringify({ ...EXAMPLE_DEPOSIT, title: "Edited through the API" });
      return (
        await putVersion(
          req(`/api/v1/versions/${versionId}`, { method: "PUT", body, headers: { "if-match": `"${lock_version}"` } }),
          ctx(versionId),
        )
      ).status;
    }
    case "upload_files": {
      const form = new FormData();
      form.set("file", new File(["T,k\n300,1e-12\n"], "raw.csv", { type: "text/csv" }));
      return (await postFile(req(`/api/v1/versions/${versionId}/files`, { method: "POST", body: form }), ctx(versionId))).status;
    }
    case "start_next_version":
      return (await postNext(req(`/api/v1/versions/${versionId}/next`, { method: "POST" }), ctx(versionId))).status;
    case "invite":
      return (await inviteAction(versionId, uniqueEmail("invitee"), "viewer")).status;
    default:
      return (
        await postTransition(
          req(`/api/v1/versions/${versionId}/transitions`, {
            method: "POST",
            body: JSON.stringify({ transition: action, reason, ...(action === "submit" && state === "returned" ? { reply } : {}) }),
          }),
          ctx(versionId),
        )
      ).status;
  }
}

const okStatus: Partial<Record<VersionAction, number>> = { upload_files: 201, start_next_version: 201 };
const actions: VersionAction[] = [
  "view",
  "view_decisions",
  "edit",
  "upload_files",
  "start_next_version",
  "invite",
  ...(Object.keys(lifecycle) as Transition[]),
];

function expected(p: Person, state: VersionState, action: VersionAction): number {
  // Everything but reading needs a signed-in depositor before the version is even looked at.
  if (!p.user && action !== "view" && action !== "view_decisions") return 401;
  try {
    assertVersionCapability({ state, siteRole: p.siteRole, datasetRole: p.datasetRole }, action);
    return okStatus[action] ?? 200;
  } catch (err) {
    if (action === "view_decisions" && (err as AppError).status === 403) return 403;
    return (err as AppError).status;
  }
}

describe("who may do what to a version: every cell through the real entry points", () => {
  for (const state of versionStates) {
    it(`a ${state} version`, async () => {
      const shared = await versionIn(state);
      const before = await snapshot(shared);
      const cells: string[] = [];
      let allowed = 0;
      for (const p of people) {
        for (const action of actions) {
          const want = expected(p, state, action);
          const mutates = action !== "view" && action !== "view_decisions";
          // An allowed change gets a version of its own; refused ones share one, which must stay as it was.
          const id = want < 300 && mutates ? await versionIn(state) : shared;
          vi.mocked(getCurrentUser).mockResolvedValue(p.user);
          const got = await perform(action, id, state);
          if (want < 300) allowed++;
          if (got !== want) cells.push(`${p.name} ${action}: expected ${want}, got ${got}`);
        }
      }
      expect(cells).toEqual([]);
      expect(await snapshot(shared)).toEqual(before);
      expect(allowed).toBeGreaterThan(0);
    }, 120_000);
  }
});

describe("the editor's server actions answer like the routes", () => {
  it("someone else's draft is not found, not forbidden; a co-editor is forbidden", async () => {
    const id = await versionIn("draft");
    vi.mocked(getCurrentUser).mockResolvedValue(byName("other researcher").user);
    const submit = await transitionAction(id, "submit");
    expect(submit).toMatchObject({ ok: false, status: 404 });
    expect(JSON.stringify(submit)).not.toMatch(/owner/);
    expect(await startNextVersionAction(id)).toMatchObject({ ok: false, status: 404 });
    expect(await saveDraftAction(id, 1, JSON.stringify(EXAMPLE_DEPOSIT))).toMatchObject({ ok: false, status: 404 });
    expect(await inviteAction(id, uniqueEmail("x"), "editor")).toMatchObject({ ok: false, status: 404 });
    vi.mocked(getCurrentUser).mockResolvedValue(byName("editor").user);
    expect(await transitionAction(id, "submit")).toMatchObject({
      ok: false,
      status: 403,
      message: "Only the dataset's owner may submit it",
    });
    vi.mocked(getCurrentUser).mockResolvedValue(byName("owner").user);
    expect(await transitionAction(id, "submit")).toMatchObject({ ok: true, state: "submitted" });
  });
});

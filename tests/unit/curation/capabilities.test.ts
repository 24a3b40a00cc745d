import { describe, expect, it } from "vitest";
import type { Role } from "@/db/users";
import {
  assertVersionCapability,
  versionActions,
  versionCapabilities,
  versionStates,
  type VersionAction,
} from "@/lib/curation/capabilities";
import type { CoEditorRole, VersionState } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";

type Who = { name: string; siteRole: Role | null; datasetRole: CoEditorRole | null };
const people: Who[] = [
  { name: "anonymous", siteRole: null, datasetRole: null },
  { name: "other researcher", siteRole: "researcher", datasetRole: null },
  { name: "owner", siteRole: "researcher", datasetRole: "owner" },
  { name: "editor", siteRole: "researcher", datasetRole: "editor" },
  { name: "viewer", siteRole: "researcher", datasetRole: "viewer" },
  { name: "curator", siteRole: "curator", datasetRole: null },
  { name: "co-editing curator", siteRole: "curator", datasetRole: "editor" },
  { name: "admin", siteRole: "admin", datasetRole: null },
];

/**
 * The expected table, written out by hand (not derived from the code under test): for each person,
 * the states in which each action is allowed. Actions not listed are never allowed.
 */
const editable: VersionState[] = ["draft", "returned"];
const finished: VersionState[] = ["published", "retracted"];
const curatorTable: Partial<Record<VersionAction, VersionState[]>> = {
  view: [...versionStates],
  view_decisions: [...versionStates],
  start_review: ["submitted"],
  return: ["submitted", "in_review"],
  accept: ["submitted", "in_review"],
  decline: ["submitted", "in_review"],
  retract: ["published"],
  exclude_from_consensus: ["published"],
};
const expected: Record<string, Partial<Record<VersionAction, VersionState[]>>> = {
  anonymous: { view: finished },
  "other researcher": { view: finished },
  owner: {
    view: [...versionStates],
    view_decisions: [...versionStates],
    edit: editable,
    upload_files: editable,
    submit: editable,
    withdraw: ["submitted", "in_review"],
    start_next_version: finished,
    invite: [...versionStates],
  },
  editor: { view: [...versionStates], view_decisions: [...versionStates], edit: editable, upload_files: editable },
  viewer: { view: [...versionStates], view_decisions: [...versionStates] },
  curator: curatorTable,
  "co-editing curator": { view: [...versionStates], view_decisions: [...versionStates], edit: editable, upload_files: editable },
  admin: curatorTable,
};

describe("versionCapabilities: site role × dataset role × state × action", () => {
  it("knows every state and action", () => {
    expect(versionStates).toHaveLength(7);
    expect(versionActions).toHaveLength(14);
  });
  for (const who of people) {
    for (const state of versionStates) {
      it(`${who.name} on a ${state} version`, () => {
        const caps = versionCapabilities({ state, siteRole: who.siteRole, datasetRole: who.datasetRole });
        const want = Object.fromEntries(versionActions.map((a) => [a, (expected[who.name][a] ?? []).includes(state)]));
        expect(caps).toEqual(want);
      });
    }
  }
});

function statusOf(fn: () => unknown): number | "ok" {
  try {
    fn();
    return "ok";
  } catch (err) {
    if (err instanceof AppError) return err.status;
    throw err;
  }
}

describe("assertVersionCapability: 404 hides, 403 refuses the person, 409 refuses the state", () => {
  const rows: [VersionState, Who["name"], VersionAction, number | "ok"][] = [
    ["draft", "other researcher", "submit", 404],
    ["draft", "anonymous", "view", 404],
    ["in_review", "other researcher", "accept", 404],
    ["draft", "editor", "submit", 403],
    ["draft", "viewer", "edit", 403],
    ["draft", "curator", "submit", 403],
    ["draft", "curator", "edit", 403],
    ["in_review", "co-editing curator", "accept", 403],
    ["published", "other researcher", "start_next_version", 403],
    ["published", "owner", "retract", 403],
    ["draft", "editor", "invite", 403],
    ["submitted", "owner", "edit", 409],
    ["published", "owner", "submit", 409],
    ["draft", "curator", "accept", 409],
    ["draft", "owner", "start_next_version", 409],
    ["published", "editor", "upload_files", 409],
    ["published", "co-editing curator", "exclude_from_consensus", 403],
    ["published", "owner", "exclude_from_consensus", 403],
    ["retracted", "curator", "exclude_from_consensus", 409],
    ["published", "admin", "exclude_from_consensus", "ok"],
    ["draft", "owner", "submit", "ok"],
    ["published", "anonymous", "view", "ok"],
  ];
  for (const [state, name, action, status] of rows) {
    it(`${action} on ${state} by ${name} → ${status}`, () => {
      const who = people.find((p) => p.name === name)!;
      expect(statusOf(() => assertVersionCapability({ state, siteRole: who.siteRole, datasetRole: who.datasetRole }, action))).toBe(status);
    });
  }

  it("tells a co-editing curator why they may not review", () => {
    expect(() => assertVersionCapability({ state: "in_review", siteRole: "curator", datasetRole: "editor" }, "accept")).toThrow(
      /another curator/,
    );
  });
});

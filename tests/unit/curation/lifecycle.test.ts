import { describe, expect, it } from "vitest";
import { planTransition } from "@/lib/curation/capabilities";
import { lifecycle, type CoEditorRole, type Transition, type VersionState } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";

type Who = { role: "researcher" | "curator" | "admin"; datasetRole: CoEditorRole | null };
const owner: Who = { role: "researcher", datasetRole: "owner" };
const editor: Who = { role: "researcher", datasetRole: "editor" };
const viewer: Who = { role: "researcher", datasetRole: "viewer" };
const stranger: Who = { role: "researcher", datasetRole: null };
const curator: Who = { role: "curator", datasetRole: null };
const coEditingCurator: Who = { role: "curator", datasetRole: "editor" };
const admin: Who = { role: "admin", datasetRole: null };

function outcome(state: VersionState, t: Transition, who: Who, reason = "a reason") {
  try {
    // A returned version goes back with the authors' reply (checkReplyOrThrow).
    return planTransition(state, t, who, reason, state === "returned" && t === "submit" ? "Answered the return." : undefined);
  } catch (err) {
    if (err instanceof AppError) return err.status;
    throw err;
  }
}

describe("lifecycle rules", () => {
  const table: [VersionState, Transition, Who, string, VersionState | number][] = [
    ["draft", "submit", owner, "owner", "submitted"],
    ["draft", "submit", editor, "editor", 403],
    ["draft", "submit", viewer, "viewer", 403],
    ["draft", "submit", stranger, "other researcher (may not see it)", 404],
    ["draft", "submit", curator, "curator", 403],
    ["returned", "submit", owner, "owner resubmits", "submitted"],
    ["submitted", "withdraw", owner, "owner", "draft"],
    ["submitted", "withdraw", editor, "editor", 403],
    ["submitted", "start_review", curator, "curator", "in_review"],
    ["submitted", "start_review", admin, "admin", "in_review"],
    ["submitted", "start_review", owner, "owner", 403],
    ["submitted", "start_review", coEditingCurator, "curator who co-edits", 403],
    ["in_review", "return", curator, "curator", "returned"],
    ["in_review", "accept", curator, "curator", "published"],
    ["in_review", "accept", coEditingCurator, "curator who co-edits", 403],
    ["in_review", "accept", stranger, "other researcher (may not see it)", 404],
    ["published", "retract", stranger, "other researcher on a public version", 403],
    ["in_review", "decline", curator, "curator", "declined"],
    ["published", "retract", curator, "curator", "retracted"],
    ["published", "retract", owner, "owner", 403],
    ["draft", "accept", curator, "curator on a draft", 409],
    ["published", "submit", owner, "owner on a published version", 409],
    ["declined", "start_review", curator, "curator on a declined version", 409],
    ["retracted", "retract", curator, "curator on a retracted version", 409],
  ];
  for (const [state, t, who, name, expected] of table) {
    it(`${t} on ${state} by ${name} → ${expected}`, () => expect(outcome(state, t, who)).toBe(expected));
  }

  it("decisions and retraction need a reason", () => {
    for (const t of ["accept", "return", "decline"] as const) {
      expect(outcome("in_review", t, curator, "")).toBe(422);
    }
    expect(outcome("published", "retract", curator, "  ")).toBe(422);
    expect(outcome("draft", "submit", owner, "")).toBe("submitted");
  });

  it("a reason too short is told so, not called missing", () => {
    const message = (reason: string) => {
      try {
        planTransition("in_review", "accept", curator, reason);
      } catch (err) {
        return err instanceof AppError ? err.errors[0]?.message : null;
      }
      return null;
    };
    expect(message("ok")).toBe("a reason needs at least 3 characters");
    expect(message(" ")).toBe("required");
  });

  it("every state can be reached and published is left only by retraction", () => {
    const reachable = new Set<VersionState>(["draft", ...Object.values(lifecycle).map((r) => r.to)]);
    expect([...reachable].sort()).toEqual(["declined", "draft", "in_review", "published", "retracted", "returned", "submitted"]);
    const fromPublished = Object.entries(lifecycle)
      .filter(([, r]) => r.from.includes("published"))
      .map(([t]) => t);
    expect(fromPublished).toEqual(["retract"]);
  });
});

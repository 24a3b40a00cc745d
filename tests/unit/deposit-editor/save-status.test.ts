import { describe, expect, it } from "vitest";
import { NEEDS_TITLE, saveStateWords, stateAfterFailure } from "@/components/deposit-editor/save-status";
import { LARGE_TABLE_ROWS, ROW_WINDOW, visibleRows, windowStartFor } from "@/components/deposit-editor/row-window";
import { blockingChecks, stateWords } from "@/components/deposit-editor/words";

describe("stateAfterFailure", () => {
  it("turns the lock conflict into a conflict (merged in the editor), and any other 409 into a failure with the server's reason", () => {
    expect(
      stateAfterFailure(
        {
          ok: false,
          status: 409,
          message: "Someone saved this draft after you opened it. Reload to see their changes; nothing of yours was stored.",
          errors: [],
        },
        true,
      ),
    ).toEqual({ kind: "conflict" });
    expect(
      stateAfterFailure({ ok: false, status: 409, message: "This version is submitted and can no longer be edited", errors: [] }, false),
    ).toEqual({ kind: "failed", message: "this version is submitted and can no longer be edited; your edits are still here." });
  });

  it("keeps the server's words for a refused document and remembers whether autosave sent it", () => {
    const errors = [{ pointer: "/title", message: "A draft is saved once it has a title." }];
    expect(stateAfterFailure({ ok: false, status: 422, message: "Give the deposit a title", errors }, true)).toEqual({
      kind: "invalid",
      message: "Give the deposit a title",
      count: 1,
      auto: true,
    });
  });
});

describe("saveStateWords", () => {
  it("says when the draft was saved, that it is saving, or why it was not saved", () => {
    const at = new Date(2024, 0, 1, 14, 5);
    expect(saveStateWords({ kind: "saved", at }, false)).toBe("Saved 14:05");
    expect(saveStateWords({ kind: "saved", at }, true)).toMatch(/newer changes not saved yet/);
    expect(saveStateWords({ kind: "saved", at: new Date(2024, 0, 1, 9, 7) }, false)).toBe("Saved 09:07");
    expect(saveStateWords({ kind: "saving", auto: true }, true)).toBe("Saving…");
    expect(saveStateWords({ kind: "failed", message: NEEDS_TITLE }, true)).toMatch(/^Not saved: give the deposit a title/);
    expect(saveStateWords({ kind: "invalid", message: "The draft cannot be stored: x", count: 1, auto: false }, true)).toBe(
      "Not saved: the draft cannot be stored: x",
    );
    expect(saveStateWords({ kind: "idle" }, false)).toBe("");
  });
});

describe("visibleRows", () => {
  it("shows every row of a table up to the limit, and a window of rows beyond it", () => {
    expect(visibleRows(LARGE_TABLE_ROWS, 0)).toEqual({ from: 0, to: LARGE_TABLE_ROWS, windowed: false });
    expect(visibleRows(LARGE_TABLE_ROWS + 1, 0)).toEqual({ from: 0, to: ROW_WINDOW, windowed: true });
    expect(visibleRows(1000, 950)).toEqual({ from: 1000 - ROW_WINDOW, to: 1000, windowed: true });
    expect(windowStartFor(349)).toBe(200);
  });
});

describe("words", () => {
  it("name states plainly and find the checks that stop a submission", () => {
    expect(stateWords("returned")).toBe("returned for revision");
    expect(stateWords("in_review")).toBe("in review");
    expect(
      blockingChecks([
        { code: "balanced", severity: "info", message: "" },
        { code: "unbalanced", severity: "error", message: "H does not balance" },
      ]),
    ).toEqual([{ code: "unbalanced", severity: "error", message: "H does not balance" }]);
  });
});

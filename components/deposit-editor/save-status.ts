/**
 * What the editor says about saving, from the result of a save action. A stale save (409) stops
 * autosave until the page is reloaded: the co-editor's version is never overwritten, and ours stays
 * on screen.
 */
import type { FieldError } from "@/lib/errors";

export type SaveState =
  | { kind: "idle" }
  | { kind: "saving"; auto: boolean }
  | { kind: "saved"; at: Date }
  | { kind: "invalid"; message: string; count: number; auto: boolean }
  | { kind: "conflict"; detail?: string }
  | { kind: "failed"; message: string };

/** Result of createDraftAction / saveDraftAction (the EditorResult of app/deposits/actions). */
export type SaveResult =
  | { ok: true; versionId: number; lockVersion: number; state: string }
  | { ok: false; status: number; message: string; errors: FieldError[] };

export const CONFLICT_MESSAGE =
  "Someone else saved this draft after you opened it. Reload to see their changes — your edits are still here and were not stored.";

/** Milliseconds without a change before an existing draft saves itself. */
export const AUTOSAVE_DELAY_MS = 3000;

/** The state after a failed save. */
export function stateAfterFailure(result: Extract<SaveResult, { ok: false }>, auto: boolean): SaveState {
  switch (result.status) {
    case 409:
      // The lock message is ours to word; any other conflict (the version left the draft state) is the server's.
      return /saved this draft after you opened it/i.test(result.message)
        ? { kind: "conflict" }
        : { kind: "conflict", detail: result.message };
    case 422:
      return { kind: "invalid", message: result.message, count: result.errors.length, auto };
    case 401:
      return { kind: "failed", message: "You are signed out. Sign in again in another tab, then save; your edits are still here." };
    case 403:
    case 404:
      return { kind: "failed", message: `${result.message}. Your edits were not stored.` };
    case 413:
      return { kind: "failed", message: `${result.message} Your edits were not stored.` };
    default:
      return { kind: "failed", message: result.message || "The draft could not be saved. Your edits are still here; try again." };
  }
}

/** hh:mm on the person's clock, 24-hour. */
export function clockTime(at: Date): string {
  return `${String(at.getHours()).padStart(2, "0")}:${String(at.getMinutes()).padStart(2, "0")}`;
}

/** "Saved at 14:05" etc., for the status line (announced politely). */
export function saveStateWords(state: SaveState, dirty: boolean): string {
  switch (state.kind) {
    case "idle":
      return dirty ? "Changes not saved yet." : "";
    case "saving":
      return "Saving…";
    case "saved":
      return `Saved at ${clockTime(state.at)}${dirty ? "; newer changes not saved yet." : "."}`;
    case "invalid":
      return `Not saved: ${state.count === 1 ? "1 problem" : `${state.count} problems`} to correct, listed above and beside the fields.`;
    case "conflict":
      return "Not saved: someone else saved this draft first.";
    case "failed":
      return `Not saved. ${state.message}`;
  }
}

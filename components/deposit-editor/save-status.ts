/**
 * What the editor says about saving, from the result of a save action. A stale save (409) stops
 * autosave until the person has merged the two drafts: the co-editor's version is never
 * overwritten, and ours stays on screen.
 */
import type { EditorResult } from "@/app/deposits/actions";

export type SaveState =
  | { kind: "idle" }
  | { kind: "saving"; auto: boolean }
  | { kind: "saved"; at: Date }
  | { kind: "invalid"; message: string; count: number; auto: boolean }
  | { kind: "conflict" }
  | { kind: "failed"; message: string };

/** Result of createDraftAction / saveDraftAction. */
export type SaveResult = EditorResult;

/** Why a deposit without a title is not saved (the one thing a draft needs). */
export const NEEDS_TITLE = "give the deposit a title and it is saved at once; everything else can be completed later.";

/** Milliseconds without a change before the draft saves itself. */
export const AUTOSAVE_DELAY_MS = 1500;

/** The state after a failed save. */
export function stateAfterFailure(result: Extract<SaveResult, { ok: false }>, auto: boolean): SaveState {
  switch (result.status) {
    case 409:
      // A lost lock is merged (the editor gets the co-editor's draft with it); any other conflict
      // (the version left the draft state) is the server's to word.
      return /saved this draft after you opened it/i.test(result.message)
        ? { kind: "conflict" }
        : { kind: "failed", message: `${lowerFirst(result.message)}; your edits are still here.` };
    case 422:
      return { kind: "invalid", message: result.message, count: result.errors.length, auto };
    case 401:
      return { kind: "failed", message: "you are signed out. Sign in again in another tab, then save; your edits are still here." };
    case 403:
    case 404:
    case 413:
      return { kind: "failed", message: `${lowerFirst(result.message.replace(/\.$/, ""))}; your edits are still here.` };
    default:
      return {
        kind: "failed",
        message: result.message ? lowerFirst(result.message) : "the draft could not be saved; your edits are still here.",
      };
  }
}

function lowerFirst(text: string): string {
  return text.charAt(0).toLowerCase() + text.slice(1);
}

/** hh:mm on the person's clock, 24-hour. */
export function clockTime(at: Date): string {
  return `${String(at.getHours()).padStart(2, "0")}:${String(at.getMinutes()).padStart(2, "0")}`;
}

/** "Saved 14:05", "Saving…", "Not saved: …", for the status line (announced politely). */
export function saveStateWords(state: SaveState, dirty: boolean): string {
  switch (state.kind) {
    case "idle":
      return dirty ? "Not saved yet." : "";
    case "saving":
      return "Saving…";
    case "saved":
      return `Saved ${clockTime(state.at)}${dirty ? "; newer changes not saved yet." : ""}`;
    case "invalid":
      return `Not saved: ${lowerFirst(state.message)}`;
    case "conflict":
      return "Not saved: a co-editor saved first. Choose what to keep below.";
    case "failed":
      return `Not saved: ${state.message}`;
  }
}

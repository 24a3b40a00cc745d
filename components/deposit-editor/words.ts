/** Plain words for lifecycle states, roles, severities and decisions, shared by the list and the editor. */
import { severityNoun } from "@/lib/curation/check-summary";
import type { CoEditorRole, VersionState } from "@/lib/curation/lifecycle";

export const STATE_WORDS: Record<VersionState, string> = {
  draft: "draft",
  submitted: "submitted",
  in_review: "in review",
  returned: "returned for revision",
  published: "published",
  declined: "declined",
  retracted: "retracted",
};

export function stateWords(state: string): string {
  return STATE_WORDS[state as VersionState] ?? state.replace(/_/g, " ");
}

export const ROLE_WORDS: Record<CoEditorRole, string> = { owner: "owner", editor: "editor", viewer: "viewer" };

export type Severity = "info" | "warn" | "error";

/** A severity in words (never colour alone), as the review pages word it: problem, warning, note. */
export function severityWords(severity: string): string {
  return severity === "none" ? "no findings" : severityNoun(severity);
}

export const DECISION_WORDS: Record<string, string> = {
  accept: "accepted",
  return: "returned to the authors",
  decline: "declined",
};

/** A stored finding of the checks: species, balance, magnitude, and the fit diagnostics. */
export interface StoredCheck {
  code: string;
  severity: string;
  message: string;
}

/** The stored checks that stop a submission (error severity). */
export function blockingChecks(checks: StoredCheck[]): StoredCheck[] {
  return checks.filter((c) => c.severity === "error");
}

/**
 * The field a stored check is about, for the "Not ready to submit" list: the reaction's species
 * for identity and balance, else the document as a whole.
 */
export function checkPointer(code: string): string {
  return REACTION_CHECK_CODES.has(code) ? "/reaction/products" : "";
}

/** Codes of the identity and balance checks, shown in the reaction section. */
export const REACTION_CHECK_CODES = new Set(["balanced", "unbalanced", "products_unknown"]);

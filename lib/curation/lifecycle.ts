import type { Role } from "@/db/users";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";

export type VersionState = "draft" | "submitted" | "in_review" | "changes_requested" | "published" | "declined" | "retracted";
export type CoEditorRole = "owner" | "editor" | "viewer";
export type Transition = "submit" | "withdraw" | "start_review" | "request_changes" | "accept" | "decline" | "retract";

/** Who acts, as far as the lifecycle cares: site role and role on this dataset (if any). */
export interface TransitionActor {
  role: Role;
  datasetRole: CoEditorRole | null;
}

interface Rule {
  from: readonly VersionState[];
  to: VersionState;
  /** "owner": only the dataset's owner; "curator": dataset.review, and not a co-editor of it. */
  by: "owner" | "curator";
  needsReason: boolean;
}

/**
 * The lifecycle, one rule per transition:
 * draft → submitted → in_review → changes_requested → submitted … → published | declined;
 * published → retracted (with a public notice).
 */
export const lifecycle: Record<Transition, Rule> = {
  submit: { from: ["draft", "changes_requested"], to: "submitted", by: "owner", needsReason: false },
  withdraw: { from: ["submitted", "in_review"], to: "draft", by: "owner", needsReason: false },
  start_review: { from: ["submitted"], to: "in_review", by: "curator", needsReason: false },
  request_changes: { from: ["submitted", "in_review"], to: "changes_requested", by: "curator", needsReason: true },
  accept: { from: ["submitted", "in_review"], to: "published", by: "curator", needsReason: true },
  decline: { from: ["submitted", "in_review"], to: "declined", by: "curator", needsReason: true },
  retract: { from: ["published"], to: "retracted", by: "curator", needsReason: true },
};

const stateWords: Record<VersionState, string> = {
  draft: "a draft",
  submitted: "submitted",
  in_review: "in review",
  changes_requested: "waiting for changes",
  published: "published",
  declined: "declined",
  retracted: "retracted",
};

const transitionWords: Record<Transition, string> = {
  submit: "submitted",
  withdraw: "withdrawn",
  start_review: "taken into review",
  request_changes: "sent back for changes",
  accept: "accepted",
  decline: "declined",
  retract: "retracted",
};

/**
 * Decides whether `actor` may apply `transition` to a version in `state`; returns the next state
 * or throws 403 (not allowed for this person) / 409 (not possible in this state) / 422 (no reason).
 */
export function planTransition(state: VersionState, transition: Transition, actor: TransitionActor, reason?: string): VersionState {
  const rule = lifecycle[transition];
  if (rule.by === "owner" && actor.datasetRole !== "owner") {
    throw new AppError("forbidden", `Only the dataset's owner may ${transition.replace("_", " ")} it`);
  }
  if (rule.by === "curator") {
    if (!can(actor.role, "dataset.review")) throw new AppError("forbidden", "Only curators may do this");
    if (actor.datasetRole !== null) throw new AppError("forbidden", "You co-edit this dataset, so another curator must review it");
  }
  if (!rule.from.includes(state)) {
    throw new AppError("conflict", `This version is ${stateWords[state]}; it cannot be ${transitionWords[transition]} now`);
  }
  if (rule.needsReason && !(reason && reason.trim().length >= 3)) {
    throw new AppError("validation_failed", "Give a reason: it is sent to the authors and kept on the record", [{ pointer: "/reason", message: "required" }]);
  }
  return rule.to;
}

/** What co-editor roles may do on a draft. */
export function canEditDraft(datasetRole: CoEditorRole | null): boolean {
  return datasetRole === "owner" || datasetRole === "editor";
}

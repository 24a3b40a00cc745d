import type { Role } from "@/db/users";

export type VersionState = "draft" | "submitted" | "in_review" | "returned" | "published" | "declined" | "retracted";
export type CoEditorRole = "owner" | "editor" | "viewer";
export type Transition = "submit" | "withdraw" | "start_review" | "return" | "accept" | "decline" | "retract";

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
 * draft → submitted → in_review → returned → submitted … → published | declined;
 * published → retracted (with a public notice).
 */
export const lifecycle: Record<Transition, Rule> = {
  submit: { from: ["draft", "returned"], to: "submitted", by: "owner", needsReason: false },
  withdraw: { from: ["submitted", "in_review"], to: "draft", by: "owner", needsReason: false },
  start_review: { from: ["submitted"], to: "in_review", by: "curator", needsReason: false },
  return: { from: ["submitted", "in_review"], to: "returned", by: "curator", needsReason: true },
  accept: { from: ["submitted", "in_review"], to: "published", by: "curator", needsReason: true },
  decline: { from: ["submitted", "in_review"], to: "declined", by: "curator", needsReason: true },
  retract: { from: ["published"], to: "retracted", by: "curator", needsReason: true },
};

export const stateWords: Record<VersionState, string> = {
  draft: "a draft",
  submitted: "submitted",
  in_review: "in review",
  returned: "returned for revision",
  published: "published",
  declined: "declined",
  retracted: "retracted",
};

export const transitionWords: Record<Transition, string> = {
  submit: "submitted",
  withdraw: "withdrawn",
  start_review: "taken into review",
  return: "returned to the authors",
  accept: "accepted",
  decline: "declined",
  retract: "retracted",
};

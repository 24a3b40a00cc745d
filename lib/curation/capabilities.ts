import { describeUnstorableText } from "@/lib/storable-text";
import type { Role } from "@/db/users";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { lifecycle, stateWords, transitionWords, type CoEditorRole, type Transition, type VersionState } from "./lifecycle";

/** Everything a person can do to one dataset version. */
export type VersionAction =
  "view" | "view_decisions" | "edit" | "upload_files" | "start_next_version" | "invite" | "exclude_from_consensus" | Transition;

export const versionActions: readonly VersionAction[] = [
  "view",
  "view_decisions",
  "edit",
  "upload_files",
  "start_next_version",
  "invite",
  "exclude_from_consensus",
  ...(Object.keys(lifecycle) as Transition[]),
];

export const versionStates: readonly VersionState[] = ["draft", "submitted", "in_review", "returned", "published", "declined", "retracted"];

/** What each role on a dataset allows, before the state of the version is considered. */
export const datasetRoleTable = {
  owner: { edit: true, invite: true, startNextVersion: true, authorTransitions: true },
  editor: { edit: true, invite: false, startNextVersion: false, authorTransitions: false },
  viewer: { edit: false, invite: false, startNextVersion: false, authorTransitions: false },
} as const satisfies Record<CoEditorRole, { edit: boolean; invite: boolean; startNextVersion: boolean; authorTransitions: boolean }>;

/** States whose content may change: the document, its points and its files. */
export const editableStates: readonly VersionState[] = ["draft", "returned"];
/** States from which the next version may start: the newest one must be finished. */
export const finishedStates: readonly VersionState[] = ["published", "retracted"];

export interface CapabilityInput {
  state: VersionState;
  /** null for anonymous callers. */
  siteRole: Role | null;
  /** null when the person holds no role on the dataset. */
  datasetRole: CoEditorRole | null;
}

export type VersionCapabilities = Record<VersionAction, boolean>;

/**
 * Who may do what to one version, from its state, the person's site role and their dataset role.
 * Every entry point asserts it and every page renders from it; nothing else decides.
 */
export function versionCapabilities({ state, siteRole, datasetRole }: CapabilityInput): VersionCapabilities {
  const member = datasetRole ? datasetRoleTable[datasetRole] : null;
  const curator = can(siteRole, "dataset.review");
  const view = finishedStates.includes(state) || datasetRole !== null || curator;
  const depositor = can(siteRole, "dataset.deposit");
  const edit = depositor && !!member?.edit && editableStates.includes(state);
  const caps: VersionCapabilities = {
    view,
    view_decisions: datasetRole !== null || curator,
    edit,
    upload_files: edit,
    start_next_version: depositor && !!member?.startNextVersion && finishedStates.includes(state),
    invite: depositor && !!member?.invite,
    // Leaving a published version out of its reaction's consensus (or taking it back) is a
    // curator's judgement of the data, so, as with reviews, never by one who co-edits it.
    exclude_from_consensus: curator && datasetRole === null && state === "published",
    submit: false,
    withdraw: false,
    start_review: false,
    return: false,
    accept: false,
    decline: false,
    retract: false,
  };
  for (const [t, rule] of Object.entries(lifecycle) as [Transition, (typeof lifecycle)[Transition]][]) {
    // A curator who co-edits a dataset never reviews it.
    const byRole = rule.by === "owner" ? depositor && !!member?.authorTransitions : curator && datasetRole === null;
    caps[t] = byRole && rule.from.includes(state);
  }
  return caps;
}

const denials: Record<VersionAction, string> = {
  view: "No such dataset version",
  view_decisions: "Only co-editors and curators see the decisions",
  edit: "Only the owner and editors of this dataset may change it",
  upload_files: "Only the owner and editors may add or remove files",
  start_next_version: "Only the dataset's owner may start a new version",
  invite: "Only the dataset's owner may invite co-editors",
  exclude_from_consensus: "Only curators who do not co-edit this dataset may leave it out of a consensus or include it again",
  submit: "Only the dataset's owner may submit it",
  withdraw: "Only the dataset's owner may withdraw it",
  start_review: "Only curators may do this",
  return: "Only curators may do this",
  accept: "Only curators may do this",
  decline: "Only curators may do this",
  retract: "Only curators may do this",
};

const stateDenials: Partial<Record<VersionAction, (state: VersionState) => string>> = {
  edit: (s) => `This version is ${stateWords[s]} and can no longer be edited`,
  upload_files: () => "Files can be added to or removed from drafts only",
  start_next_version: (s) => `This version is ${stateWords[s]}; finish it before starting another`,
  exclude_from_consensus: (s) => `This version is ${stateWords[s]}; only published versions enter a consensus`,
};

/**
 * Throws unless `action` is allowed: 404 to whoever may not see the version (its existence is not
 * revealed), 403 to whoever sees it but whose roles never allow the action, 409 when the roles
 * allow it but not in this state.
 */
export function assertVersionCapability(input: CapabilityInput, action: VersionAction): VersionCapabilities {
  const caps = versionCapabilities(input);
  if (!caps.view) throw new AppError("not_found", denials.view);
  if (caps[action]) return caps;
  const inSomeState = versionStates.some((state) => versionCapabilities({ ...input, state })[action]);
  if (!inSomeState) {
    const coEditingCurator =
      can(input.siteRole, "dataset.review") &&
      input.datasetRole !== null &&
      action in lifecycle &&
      lifecycle[action as Transition].by === "curator";
    throw new AppError("forbidden", coEditingCurator ? "You co-edit this dataset, so another curator must review it" : denials[action]);
  }
  if (action in lifecycle)
    throw new AppError("conflict", `This version is ${stateWords[input.state]}; it cannot be ${transitionWords[action as Transition]} now`);
  throw new AppError(
    "conflict",
    stateDenials[action]?.(input.state) ?? `This version is ${stateWords[input.state]}; that is not possible now`,
  );
}

/** Bounds of the authors' reply to a return (characters, after trimming). */
export const REPLY_MIN = 3;
export const REPLY_MAX = 2000;

/**
 * The authors' reply when a returned version is submitted again: required there (3 … 2000
 * characters, storable text), refused anywhere else. Returns the trimmed reply, or undefined.
 */
export function checkReplyOrThrow(state: VersionState, transition: Transition, reply: string | undefined): string | undefined {
  const text = reply?.trim() ?? "";
  const answersReturn = transition === "submit" && state === "returned";
  if (!answersReturn) {
    if (text)
      throw new AppError("validation_failed", "A reply goes only with a resubmission after a return", [
        { pointer: "/reply", message: "not expected here" },
      ]);
    return undefined;
  }
  const fail = (message: string) =>
    new AppError("validation_failed", `The reply to the curator ${message}`, [{ pointer: "/reply", message }]);
  if (text.length < REPLY_MIN) throw fail(`is required: say in a few words what you changed (at least ${REPLY_MIN} characters)`);
  if (text.length > REPLY_MAX) throw fail(`is ${text.length} characters long; keep it under ${REPLY_MAX}`);
  const unstorable = describeUnstorableText(text);
  if (unstorable) throw fail(unstorable);
  return text;
}

/**
 * Decides a lifecycle transition for `actor` on a version in `state`: returns the next state or
 * throws 404 / 403 / 409 (as assertVersionCapability) or 422 when a required reason or reply is missing.
 */
export function planTransition(
  state: VersionState,
  transition: Transition,
  actor: { role: Role | null; datasetRole: CoEditorRole | null },
  reason?: string,
  reply?: string,
): VersionState {
  assertVersionCapability({ state, siteRole: actor.role, datasetRole: actor.datasetRole }, transition);
  const rule = lifecycle[transition];
  if (rule.needsReason && !(reason && reason.trim().length >= 3)) {
    const given = Boolean(reason && reason.trim());
    throw new AppError("validation_failed", "Give a reason: it is sent to the authors and kept on the record", [
      { pointer: "/reason", message: given ? "a reason needs at least 3 characters" : "required" },
    ]);
  }
  checkReplyOrThrow(state, transition, reply);
  return rule.to;
}

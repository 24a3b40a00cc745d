import "server-only";
import { can } from "@/lib/auth/permissions";
import { canEditDraft, type Transition } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { AppError } from "@/lib/errors";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { enqueueMail } from "@/lib/mail/queue";
import { decisionMail, submissionMail } from "@/lib/mail/templates";
import { listActiveCurators, type UserDto } from "@/lib/users/queries";
import { prepareDepositOrThrow, prepareDepositTextOrThrow } from "./prepare";

/** A deposit document parsed, or still as the JSON text of a request body (parsed off this thread). */
type DocumentSource = { document: unknown; text?: undefined } | { text: string; document?: undefined };

function prepareSource(source: DocumentSource) {
  return source.text !== undefined ? prepareDepositTextOrThrow(source.text) : prepareDepositOrThrow(source.document);
}
import { createDatasetDraft, createNextVersion, getVersionWithRole, listDatasetMembers, saveDraft } from "./queries";

/** Creates a dataset from a deposit document; a document with any problem stores nothing. */
export async function depositNewDataset({ actor, ...source }: { actor: UserDto } & DocumentSource) {
  const prepared = await prepareSource(source);
  return createDatasetDraft({
    ownerId: actor.id,
    title: prepared.title,
    payload: prepared.document as unknown as Record<string, unknown>,
    points: prepared.points,
    analysis: prepared.analysis,
    reaction: prepared.reaction,
  });
}

/** Replaces a draft's document (owner or editor), guarded by the lock version the editor loaded. */
export async function updateDraft({ actor, versionId, expectedLockVersion, ...source }: { actor: UserDto; versionId: number; expectedLockVersion: number } & DocumentSource) {
  const found = await getVersionWithRole({ versionId, userId: actor.id });
  if (!found || (!found.datasetRole && !can(actor.role, "dataset.review"))) throw new AppError("not_found", "No such dataset version");
  if (!canEditDraft(found.datasetRole)) throw new AppError("forbidden", "Only the owner and editors of this dataset may change it");
  // Prepared before the save: a failed upload leaves the draft exactly as it was.
  const prepared = await prepareSource(source);
  return saveDraft({
    versionId,
    actorId: actor.id,
    expectedLockVersion,
    title: prepared.title,
    payload: prepared.document as unknown as Record<string, unknown>,
    points: prepared.points,
    analysis: prepared.analysis,
    reaction: prepared.reaction,
  });
}

/** Who may see a version: anyone once published; before that its co-editors, curators and admins. */
export async function getVisibleVersionOrThrow({ versionId, viewer }: { versionId: number; viewer: UserDto | null }) {
  const found = await getVersionWithRole({ versionId, userId: viewer?.id ?? null });
  const isPublic = found && (found.version.state === "published" || found.version.state === "retracted");
  if (!found || (!isPublic && !found.datasetRole && !(viewer && can(viewer.role, "dataset.review")))) {
    throw new AppError("not_found", "No such dataset version");
  }
  return found;
}

/**
 * Applies a lifecycle transition, then queues the mail it causes: curators hear of each
 * submission; owner and co-editors of each decision and retraction.
 */
export async function transitionVersion({ actor, versionId, transition, reason }: { actor: UserDto; versionId: number; transition: Transition; reason?: string }) {
  const outcome = await applyTransition({ versionId, actorId: actor.id, transition, reason });
  const found = await getVersionWithRole({ versionId, userId: null });
  const title = found?.version.title ?? "your dataset";
  if (transition === "submit") {
    for (const c of await listActiveCurators()) await enqueueMail(submissionMail(c.email, c.name, title, versionId));
  }
  if (outcome.identifiers) {
    // After the commit: the registration job retries until the agency has both identifiers.
    await enqueueIdentifierRegistration(outcome.identifiers.version);
    // A later version changes what the series record lists, so it is sent again.
    await enqueueIdentifierRegistration(outcome.identifiers.series, (found?.version.number ?? 1) > 1 ? { refresh: true } : {});
  }
  if (transition === "accept" || transition === "request_changes" || transition === "decline" || transition === "retract") {
    const members = await listDatasetMembers({ datasetId: outcome.datasetId });
    const published = outcome.identifiers && found ? { identifier: outcome.identifiers.version, path: `/datasets/${outcome.datasetId}/v${found.version.number}` } : undefined;
    for (const m of members) await enqueueMail(decisionMail(m.email, m.name, title, versionId, transition, reason ?? "", published));
  }
  return outcome;
}


/** The owner starts the next version of a published dataset as a draft copy of the latest. */
export async function startNextVersion({ actor, versionId }: { actor: UserDto; versionId: number }) {
  const found = await getVersionWithRole({ versionId, userId: actor.id });
  if (!found || !found.datasetRole) throw new AppError("not_found", "No such dataset version");
  if (found.datasetRole !== "owner") throw new AppError("forbidden", "Only the dataset's owner may start a new version");
  return createNextVersion({ datasetId: found.version.datasetId, actorId: actor.id });
}

import { versionPath } from "@/lib/identifiers/paths";
import "server-only";
import { assertVersionCapability, type VersionAction } from "@/lib/curation/capabilities";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition, type TransitionOutcome } from "@/lib/curation/transitions";
import { AppError } from "@/lib/errors";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { enqueueMail } from "@/lib/mail/queue";
import { describeUnstorableText } from "@/lib/storable-text";
import { decisionMail, resubmissionMail, submissionMail } from "@/lib/mail/templates";
import { listReturningCurators } from "@/lib/curation/queries";
import type { Transaction } from "@/db/client";
import { listActiveCurators, type UserDto } from "@/lib/users/queries";
import { prepareDepositBytesOrThrow, prepareDepositOrThrow, prepareDepositTextOrThrow } from "./prepare";

/**
 * A deposit document parsed, or still as the JSON text or the UTF-8 bytes of a request body
 * (decoded and parsed off this thread; bytes are moved to the worker, unusable afterwards).
 */
type DocumentSource =
  | { document: unknown; text?: undefined; bytes?: undefined }
  | { text: string; document?: undefined; bytes?: undefined }
  | { bytes: Uint8Array; document?: undefined; text?: undefined };

function prepareSource(source: DocumentSource) {
  if (source.bytes !== undefined) return prepareDepositBytesOrThrow(source.bytes);
  return source.text !== undefined ? prepareDepositTextOrThrow(source.text) : prepareDepositOrThrow(source.document);
}
import { createDatasetDraft, createNextVersion, getVersionWithRole, listDatasetMembers, saveDraft, type VersionDto } from "./queries";

/** Work that commits or rolls back with the change (an Idempotency-Key's record). */
type BeforeCommit<T> = (tx: Transaction, created: T) => Promise<void>;

/** Creates a dataset from a deposit document; a document with any problem stores nothing. */
export async function depositNewDataset({
  actor,
  beforeCommit,
  ...source
}: { actor: UserDto; beforeCommit?: BeforeCommit<VersionDto> } & DocumentSource) {
  const prepared = await prepareSource(source);
  return createDatasetDraft({
    ownerId: actor.id,
    title: prepared.title,
    payload: prepared.document as unknown as Record<string, unknown>,
    points: prepared.points,
    analysis: prepared.analysis,
    reaction: prepared.reaction,
    beforeCommit,
  });
}

/** Replaces a draft's document (owner or editor), guarded by the lock version the editor loaded. */
export async function updateDraft({
  actor,
  versionId,
  expectedLockVersion,
  ...source
}: { actor: UserDto; versionId: number; expectedLockVersion: number } & DocumentSource) {
  await getVersionForOrThrow({ versionId, actor, action: "edit" });
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

/**
 * A version with the caller's dataset role and capabilities, when `action` is allowed to them
 * (lib/curation/capabilities.ts): 404 if they may not see it, 403 / 409 if they may not do that.
 */
export async function getVersionForOrThrow({
  versionId,
  actor,
  action,
}: {
  versionId: number;
  actor: UserDto | null;
  action: VersionAction;
}) {
  const found = await getVersionWithRole({ versionId, userId: actor?.id ?? null });
  if (!found) throw new AppError("not_found", "No such dataset version");
  const capabilities = assertVersionCapability(
    { state: found.version.state, siteRole: actor?.role ?? null, datasetRole: found.datasetRole },
    action,
  );
  return { ...found, capabilities };
}

/** Who may see a version: anyone once published; before that its co-editors, curators and admins. */
export async function getVisibleVersionOrThrow({ versionId, viewer }: { versionId: number; viewer: UserDto | null }) {
  return getVersionForOrThrow({ versionId, actor: viewer, action: "view" });
}

/**
 * Applies a lifecycle transition and, in the same transaction, queues the mail and identifier
 * registrations it causes (curators hear of each submission; owner and co-editors of each
 * decision and retraction): they exist exactly when the transition commits.
 */
export async function transitionVersion({
  actor,
  versionId,
  transition,
  reason,
  reply,
  beforeCommit,
}: {
  actor: UserDto;
  versionId: number;
  transition: Transition;
  reason?: string;
  /** The authors' answer to a return, sent with the resubmission (required then). */
  reply?: string;
  beforeCommit?: BeforeCommit<TransitionOutcome>;
}) {
  const unstorable = reason === undefined ? null : describeUnstorableText(reason);
  if (unstorable)
    throw new AppError("validation_failed", `The reason ${unstorable}`, [{ pointer: "/reason", message: `This text ${unstorable}.` }]);
  // Read before the transaction, so it holds one connection and only its own locks.
  const found = await getVersionWithRole({ versionId, userId: null });
  const title = found?.version.title ?? "your dataset";
  const curators = transition === "submit" ? await listActiveCurators() : [];
  // A resubmission after a return: the curators who returned it hear of it with the authors' reply.
  const returning = transition === "submit" && found?.version.state === "returned" ? await listReturningCurators({ versionId }) : [];
  const members =
    ["accept", "return", "decline", "retract"].includes(transition) && found
      ? await listDatasetMembers({ datasetId: found.version.datasetId })
      : [];
  return applyTransition({
    versionId,
    actorId: actor.id,
    transition,
    reason,
    reply,
    beforeCommit: async (tx, outcome) => {
      const back = outcome.from === "returned" ? returning : [];
      for (const c of back) await enqueueMail(resubmissionMail(c.email, c.name, title, versionId, c.reason, reply!.trim()), { tx });
      for (const c of curators)
        if (!back.some((b) => b.id === c.id)) await enqueueMail(submissionMail(c.email, c.name, title, versionId), { tx });
      if (outcome.identifiers) {
        // The registration job retries until the agency has both identifiers.
        await enqueueIdentifierRegistration(outcome.identifiers.version, { tx });
        // A later version changes what the series record lists, so it is sent again.
        await enqueueIdentifierRegistration(outcome.identifiers.series, { tx, refresh: (found?.version.number ?? 1) > 1 });
      }
      if (transition === "accept" || transition === "return" || transition === "decline" || transition === "retract") {
        const published =
          outcome.identifiers && found
            ? { identifier: outcome.identifiers.version, path: versionPath(outcome.datasetId, found.version.number) }
            : undefined;
        for (const m of members)
          await enqueueMail(decisionMail(m.email, m.name, title, versionId, transition, reason ?? "", published), { tx });
      }
      await beforeCommit?.(tx, outcome);
    },
  });
}

/** The owner starts the next version of a published dataset as a draft copy of the latest. */
export async function startNextVersion({
  actor,
  versionId,
  beforeCommit,
}: {
  actor: UserDto;
  versionId: number;
  beforeCommit?: BeforeCommit<VersionDto>;
}) {
  const found = await getVersionForOrThrow({ versionId, actor, action: "start_next_version" });
  return createNextVersion({ datasetId: found.version.datasetId, actorId: actor.id, beforeCommit });
}

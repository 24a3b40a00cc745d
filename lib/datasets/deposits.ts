import { versionPath } from "@/lib/identifiers/paths";
import "server-only";
import { assertVersionCapability, type VersionAction } from "@/lib/curation/capabilities";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition, type TransitionOutcome } from "@/lib/curation/transitions";
import { AppError } from "@/lib/errors";
import { assertNotTooDeep, findNumberTooLarge } from "@/lib/json-depth";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { enqueueMail } from "@/lib/mail/queue";
import { describeUnstorableText, findUnstorableText } from "@/lib/storable-text";
import { findForbiddenCharacters } from "@/lib/deposits/text-characters";
import { decisionMail, resubmissionMail, submissionMail } from "@/lib/mail/templates";
import { listReturningCurators } from "@/lib/curation/queries";
import type { Transaction } from "@/db/client";
import { listActiveCurators, type UserDto } from "@/lib/users/queries";
import { prepareDepositBytesOrThrow, prepareDepositOrThrow, prepareDepositTextOrThrow, type PreparedDeposit } from "./prepare";

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
import {
  createDatasetDraft,
  createNextVersion,
  getDatasetSummary,
  getVersionWithRole,
  listDatasetMembers,
  listPublicVersions,
  saveDraft,
  type IncompleteDraft,
  type VersionDto,
} from "./queries";

/** The problems an incomplete draft keeps (the first ones; the editor shows them all again on the next save). */
const MAX_KEPT_PROBLEMS = 200;

/**
 * The editor's document, prepared if valid; otherwise, when it has a title and nothing PostgreSQL
 * cannot store, kept as an incomplete draft with its problems. Malformed JSON, a missing title and
 * unstorable text are still refused (422), so nothing half-readable is stored.
 */
async function prepareDraftText(
  text: string,
): Promise<{ prepared: PreparedDeposit; incomplete?: undefined } | { incomplete: IncompleteDraft & { title: string } }> {
  try {
    return { prepared: await prepareDepositTextOrThrow(text) };
  } catch (err) {
    if (!(err instanceof AppError) || err.code !== "validation_failed") throw err;
    let doc: unknown;
    try {
      // The worker found the text readable; an editor's draft is parsed here only when it is incomplete.
      doc = JSON.parse(text);
    } catch {
      throw err;
    }
    if (doc === null || typeof doc !== "object" || Array.isArray(doc)) throw err;
    // The checks below walk the tree recursively (the worker refused such a document already).
    assertNotTooDeep(doc);
    const title = (doc as { title?: unknown }).title;
    if (typeof title !== "string" || title.trim() === "")
      throw new AppError("validation_failed", "Give the deposit a title to save it; everything else can be completed later.", [
        { pointer: "/title", message: "A draft is saved once it has a title." },
      ]);
    const huge = findNumberTooLarge(doc);
    if (huge !== null) {
      const message = `The number at ${huge} is too large to store (beyond about 1.8e308); correct it to save the draft.`;
      throw new AppError("validation_failed", `The draft cannot be stored: ${message}`, [{ pointer: huge, message }]);
    }
    // Text that cannot be stored, or holds a character the deposit rules refuse, is never kept in a draft either.
    const unstorable = findUnstorableText(doc, MAX_KEPT_PROBLEMS);
    if (unstorable.length) throw new AppError("validation_failed", `The draft cannot be stored: ${unstorable[0].message}`, unstorable);
    const forbidden = findForbiddenCharacters(doc, MAX_KEPT_PROBLEMS);
    if (forbidden.length) throw new AppError("validation_failed", `The draft cannot be stored: ${forbidden[0].message}`, forbidden);
    const problems = err.errors.slice(0, MAX_KEPT_PROBLEMS).map(({ pointer, message }) => ({ pointer, message }));
    return { incomplete: { document: doc as Record<string, unknown>, problems, title: title.trim() } };
  }
}

/** Work that commits or rolls back with the change (an Idempotency-Key's record). */
type BeforeCommit<T> = (tx: Transaction, created: T) => Promise<void>;

/** Creates a dataset from a deposit document; a document with any problem stores nothing. */
export async function depositNewDataset({
  actor,
  beforeCommit,
  ...source
}: { actor: UserDto; beforeCommit?: BeforeCommit<VersionDto> } & DocumentSource) {
  return depositPrepared(actor, await prepareSource(source), beforeCommit);
}

function depositPrepared(actor: UserDto, prepared: PreparedDeposit, beforeCommit?: BeforeCommit<VersionDto>) {
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

function savePrepared(actor: UserDto, versionId: number, expectedLockVersion: number, prepared: PreparedDeposit) {
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
 * The editor's save of a new deposit: a valid document as depositNewDataset stores it, an
 * incomplete one (with a title) as a draft with its problems and no rows.
 */
export async function depositNewDraft({ actor, text }: { actor: UserDto; text: string }) {
  const out = await prepareDraftText(text);
  if (!out.incomplete) return depositPrepared(actor, out.prepared);
  const { title, ...incomplete } = out.incomplete;
  return createDatasetDraft({ ownerId: actor.id, title, payload: incomplete.document, points: [], analysis: null, incomplete });
}

/** The editor's save over a draft: like updateDraft, but an incomplete document is kept with its problems. */
export async function updateDraftFromEditor({
  actor,
  versionId,
  expectedLockVersion,
  text,
}: {
  actor: UserDto;
  versionId: number;
  expectedLockVersion: number;
  text: string;
}) {
  await getVersionForOrThrow({ versionId, actor, action: "edit" });
  const out = await prepareDraftText(text);
  if (!out.incomplete) return savePrepared(actor, versionId, expectedLockVersion, out.prepared);
  const { title, ...incomplete } = out.incomplete;
  return saveDraft({ versionId, actorId: actor.id, expectedLockVersion, title, incomplete });
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
  return savePrepared(actor, versionId, expectedLockVersion, await prepareSource(source));
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
  // An accepted later version: the version before it gains an IsPreviousVersionOf relation.
  const previous =
    transition === "accept" && found && found.version.number > 1
      ? (await listPublicVersions({ datasetId: found.version.datasetId })).find(
          (v) => v.number < found.version.number && v.versionIdentifier,
        )
      : undefined;
  const seriesOfRetracted =
    transition === "retract" && found
      ? ((await getDatasetSummary({ datasetId: found.version.datasetId }))?.seriesIdentifier ?? null)
      : null;
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
        if (previous?.versionIdentifier) await enqueueIdentifierRegistration(previous.versionIdentifier, { tx, refresh: true });
      }
      // A retraction changes the version's registered metadata (a Withdrawn date, a description) and
      // may change which version the series record describes: both are sent again.
      if (transition === "retract" && found?.version.versionIdentifier) {
        await enqueueIdentifierRegistration(found.version.versionIdentifier, { tx, refresh: true });
        if (seriesOfRetracted) await enqueueIdentifierRegistration(seriesOfRetracted, { tx, refresh: true });
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

import "server-only";
import { createHash } from "node:crypto";
import canonicalize from "canonicalize";
import { and, eq, isNull, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { datasetMembers, datasets, datasetVersions, decisions, identifierRegistrations } from "@/db/datasets";
import { recordedAt } from "@/db/recorded-at";
import { users, type Role } from "@/db/users";
import { recordAuditEvent } from "@/lib/audit/record";
import { addPublishedSpeciesNames } from "@/lib/datasets/species-queries";
import { AppError } from "@/lib/errors";
import { mintSeriesIdentifier } from "@/lib/identifiers/mint";
import { invalidatePublicCache, nameTag } from "@/lib/public-cache";
import { oweInvalidation } from "@/db/owed-invalidations";
import { listVersionCacheTags } from "@/lib/reactions/public-queries";
import { buildSearchDocument } from "@/lib/search/documents";
import { queueWatchNotice } from "@/lib/watches/notify";
import { planTransition } from "./capabilities";
import type { CoEditorRole, Transition, VersionState } from "./lifecycle";

/** SHA-256 of the payload in RFC 8785 canonical JSON: the same document always gives the same hash. */
export function payloadSha256(payload: unknown): string {
  return createHash("sha256")
    .update(canonicalize(payload) ?? "null", "utf8")
    .digest("hex");
}

export interface TransitionOutcome {
  versionId: number;
  datasetId: number;
  from: VersionState;
  to: VersionState;
  /** Minted on acceptance. */
  identifiers?: { version: string; series: string };
}

/**
 * Applies one lifecycle transition in one transaction: locks the version, re-reads the actor's
 * site role and dataset role from the database, checks the rule, changes the state, records the
 * decision (for curator decisions) and an audit event. Acceptance freezes the version through the
 * database's arrhenia_publish_version: payload hash, identifiers, publication time — after which
 * the database refuses any change.
 */
export async function applyTransition({
  versionId,
  actorId,
  transition,
  reason,
  reply,
  beforeCommit,
}: {
  versionId: number;
  actorId: number;
  transition: Transition;
  reason?: string;
  /** The authors' answer when a returned version is submitted again (required then, refused otherwise). */
  reply?: string;
  /** Work that must commit or roll back with the transition (queuing the mail and jobs it causes). */
  beforeCommit?: (tx: Transaction, outcome: TransitionOutcome) => Promise<void>;
}): Promise<TransitionOutcome> {
  /** What a publication or retraction invalidates once committed, and its row owed until then (db/owed-invalidations.ts). */
  const invalidations: { tags: string[]; owed: number }[] = [];
  const outcome = await getDb().transaction(async (tx) => {
    const [version] = await tx
      .select({
        id: datasetVersions.id,
        datasetId: datasetVersions.datasetId,
        number: datasetVersions.number,
        state: datasetVersions.state,
        payload: datasetVersions.payload,
        participantNames: datasetVersions.participantNames,
        draftProblems: datasetVersions.draftProblems,
      })
      .from(datasetVersions)
      .where(eq(datasetVersions.id, versionId))
      .for("update");
    if (!version) throw new AppError("not_found", "No such dataset version");
    const [actor] = await tx.select({ role: users.role, deactivatedAt: users.deactivatedAt }).from(users).where(eq(users.id, actorId));
    if (!actor || actor.deactivatedAt) throw new AppError("unauthenticated", "Sign in to do this");
    const [membership] = await tx
      .select({ role: datasetMembers.role })
      .from(datasetMembers)
      .where(and(eq(datasetMembers.datasetId, version.datasetId), eq(datasetMembers.userId, actorId)));
    const datasetRole: CoEditorRole | null = membership?.role ?? null;
    const to = planTransition(version.state, transition, { role: actor.role as Role, datasetRole }, reason, reply);
    // Only a valid document is submitted: an incomplete draft lists what it still needs.
    if (transition === "submit" && version.draftProblems) {
      const n = version.draftProblems.length;
      throw new AppError(
        "validation_failed",
        `The draft is not ready to submit: ${n} problem${n === 1 ? "" : "s"} to correct first`,
        version.draftProblems,
      );
    }
    const now = new Date();
    const outcome: TransitionOutcome = { versionId, datasetId: version.datasetId, from: version.state, to };

    if (transition === "return" || transition === "decline") {
      await tx.insert(decisions).values({ versionId, curatorId: actorId, decision: transition, reason: reason!.trim() });
    }
    if (transition === "accept") {
      const series = await seriesIdentifierFor(tx, version.datasetId);
      // The one path to publication (drizzle/0017): the database function, run as the schema owner,
      // checks the curator again, writes the accept decision and sets the identifier, the payload's
      // checksum (computed from the stored payload) and the publication time.
      const [published] = await tx.execute<{ version_identifier: string }>(
        sql`select version_identifier from arrhenia_publish_version(${versionId}, ${actorId}, ${reason!.trim()})`,
      );
      const ids = { version: published.version_identifier, series };
      outcome.identifiers = ids;
      await addPublishedSpeciesNames(tx, version.participantNames);
      // One registration row per identifier: re-running registration never mints twice.
      await tx
        .insert(identifierRegistrations)
        .values([
          { identifier: ids.version, kind: "version", versionId, datasetId: version.datasetId },
          { identifier: ids.series, kind: "series", datasetId: version.datasetId },
        ])
        .onConflictDoNothing();
    } else if (transition === "retract") {
      await tx
        .update(datasetVersions)
        .set({ state: to, retractedAt: now, retractionNotice: reason!.trim(), updatedAt: now })
        .where(eq(datasetVersions.id, versionId));
    } else {
      await tx
        .update(datasetVersions)
        // submitted_at is the transaction's recorded time (now(); drizzle/0026): the snapshot function checks it was submitted in this transaction.
        .set({ state: to, updatedAt: recordedAt, ...(transition === "submit" ? { submittedAt: recordedAt } : {}) })
        .where(eq(datasetVersions.id, versionId));
    }
    // The search document commits or rolls back with the publication or retraction it describes.
    if (transition === "accept" || transition === "retract") {
      const renamed = await buildSearchDocument(tx, versionId);
      // Species whose display name changed show it on every page with an equation naming them.
      const tags = [...(await listVersionCacheTags({ versionId, db: tx })), ...renamed.map(nameTag)];
      invalidations.push({ tags, owed: await oweInvalidation(tx, tags) });
      // Watchers hear of it once it commits (a job in this transaction; the mail never holds the request).
      await queueWatchNotice({ versionId, event: transition === "accept" ? "published" : "retracted", at: now.toISOString() }, { tx });
    }
    // Every submission is kept as it was sent (append-only, drizzle/0020–0021): curators compare with it.
    if (transition === "submit") await takeSubmissionSnapshot(tx, { versionId, actorId, reply: reply?.trim() });
    await recordAuditEvent(tx, {
      actorId,
      action: `dataset.${transition}`,
      subjectType: "dataset_version",
      subjectId: versionId,
      details: {
        from: version.state,
        to,
        ...(reason ? { reason: reason.trim() } : {}),
        ...(reply?.trim() ? { reply: reply.trim() } : {}),
        ...(outcome.identifiers ? { identifiers: outcome.identifiers } : {}),
      },
    });
    if (beforeCommit) await beforeCommit(tx, outcome);
    return outcome;
  });
  // What the public sees changed only on publication and retraction: its pages' cached data go stale now.
  // (A transaction run again after a lost connection pushes again: the last is the one that committed.)
  const invalidation = invalidations.at(-1);
  if (invalidation) await invalidatePublicCache(invalidation.tags, { owed: invalidation.owed });
  return outcome;
}

/**
 * The dataset's series identifier, minted (and stored) with its first publication. The dataset row
 * is locked, so two versions accepted at once share one series; a random code already taken by
 * another dataset is drawn again.
 */
async function seriesIdentifierFor(tx: Transaction, datasetId: number): Promise<string> {
  const [row] = await tx.select({ series: datasets.seriesIdentifier }).from(datasets).where(eq(datasets.id, datasetId)).for("update");
  if (row?.series) return row.series;
  for (let attempt = 0; attempt < 8; attempt++) {
    const series = mintSeriesIdentifier();
    const [taken] = await tx.select({ id: datasets.id }).from(datasets).where(eq(datasets.seriesIdentifier, series));
    if (taken) continue;
    await tx
      .update(datasets)
      .set({ seriesIdentifier: series })
      .where(and(eq(datasets.id, datasetId), isNull(datasets.seriesIdentifier)));
    return series;
  }
  throw new Error("No free series code after 8 draws");
}

/**
 * Keeps the submitted document and its points as the version's next snapshot (the version is already
 * `submitted`, in this transaction): the owner-run arrhenia_take_submission_snapshot (drizzle/0021)
 * builds it from the stored payload and points; the runtime role cannot write snapshots itself.
 */
async function takeSubmissionSnapshot(
  tx: Transaction,
  { versionId, actorId, reply }: { versionId: number; actorId: number; reply?: string },
) {
  await tx.execute(sql`select arrhenia_take_submission_snapshot(${versionId}, ${actorId}, ${reply || null})`);
}

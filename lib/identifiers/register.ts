import "server-only";
// Registers minted identifiers with the DOI agency. Safe to run any number of times: a registered
// identifier is skipped, and the agency call is an upsert, so a retry after a lost answer updates
// the same record instead of minting another.
import { sourceCslItem } from "@/lib/citation/csl";
import { DEFAULT_STYLE, formatReference } from "@/lib/citation/formats";
import { appUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { registerDoi, type AgencyOptions } from "./client";
import { getCollectionRegistrationSubject, type CollectionRegistrationSubject } from "@/lib/collections/queries";
import { buildCollectionDoiMetadata, buildDoiMetadata, type DataciteBody } from "./datacite";
import {
  getRegistrationSubject,
  listPendingIdentifiers,
  recordRegistrationFailure,
  recordRegistrationSuccess,
  type RegistrationSubject,
} from "./queries";

export interface RegistrationOutcome {
  identifier: string;
  /** `registered`: sent and accepted now; `already_registered`: nothing sent. */
  status: "registered" | "already_registered";
}

/**
 * Registers one identifier. Throws when the agency refuses or cannot be reached, after counting
 * the attempt and storing the error, so that a job runner retries it. `refresh` re-sends the
 * metadata of an identifier already registered (a series after a new version, say); the agency
 * updates its record and mints nothing.
 */
export async function registerIdentifier(
  identifier: string,
  { refresh = false, agency }: { refresh?: boolean; agency?: AgencyOptions } = {},
): Promise<RegistrationOutcome> {
  // A dataset version or series, else a collection version (the same queue registers both).
  const subject = await getRegistrationSubject({ identifier });
  const collection = subject ? null : await getCollectionRegistrationSubject({ identifier });
  if (!subject && !collection) throw new AppError("not_found", `No identifier ${identifier} awaits registration`);
  if ((subject ?? collection)!.registered && !refresh) return { identifier, status: "already_registered" };
  try {
    await registerDoi({ ...agency, body: subject ? buildRegistrationBody(subject) : buildCollectionRegistrationBody(collection!) });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    await recordRegistrationFailure({ identifier, error: message });
    throw err;
  }
  await recordRegistrationSuccess({ identifier });
  return { identifier, status: "registered" };
}

/**
 * Registers every identifier still pending (of one dataset, or all). Each is tried even when an
 * earlier one fails; if any failed, throws one error naming them after the others are done.
 */
export async function registerPendingIdentifiers({ datasetId, agency }: { datasetId?: number; agency?: AgencyOptions } = {}): Promise<
  RegistrationOutcome[]
> {
  const outcomes: RegistrationOutcome[] = [];
  const failures: string[] = [];
  for (const identifier of await listPendingIdentifiers({ datasetId })) {
    try {
      outcomes.push(await registerIdentifier(identifier, { agency }));
    } catch (err) {
      failures.push(`${identifier}: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  if (failures.length) throw new Error(`${failures.length} identifier registration(s) failed — ${failures.join("; ")}`);
  return outcomes;
}

/** The agency body for one identifier, from what the database holds about it. */
export function buildRegistrationBody(subject: RegistrationSubject): DataciteBody {
  const described = subject.described;
  if (!described) throw new Error(`${subject.identifier} has no published version to describe`);
  const common = {
    doi: subject.identifier,
    datasetId: subject.datasetId,
    baseUrl: appUrl(),
    payload: described.payload,
    fallbackTitle: described.title,
    versionNumber: described.number,
    retraction: described.state === "retracted" ? { at: described.retractedAt ?? null, notice: described.retractionNotice ?? null } : null,
    sourceReference: sourceReferenceText(described.payload),
    verifiedCreatorIds: described.verifiedCreatorIds,
  };
  if (subject.kind === "version") {
    const previous = subject.versions.filter((v) => v.number < described.number).at(-1);
    const next = subject.versions.find((v) => v.number > described.number);
    return buildDoiMetadata({
      ...common,
      kind: "version",
      publishedAt: described.publishedAt,
      seriesIdentifier: subject.seriesIdentifier,
      previousVersionIdentifier: previous?.versionIdentifier ?? null,
      nextVersionIdentifier: next?.versionIdentifier ?? null,
    });
  }
  // A series was first made public with its first version.
  const first = subject.versions.find((v) => v.publishedAt)?.publishedAt ?? described.publishedAt;
  return buildDoiMetadata({
    ...common,
    kind: "series",
    publishedAt: first,
    versionIdentifiers: subject.versions.map((v) => v.versionIdentifier),
  });
}

/** The agency body for one collection version. */
export function buildCollectionRegistrationBody(subject: CollectionRegistrationSubject): DataciteBody {
  return buildCollectionDoiMetadata({ ...subject, doi: subject.identifier, baseUrl: appUrl() });
}

/** The source publication a deposit names, as its formatted reference (the Cite panel's default style), or null. */
function sourceReferenceText(payload: Record<string, unknown>): string | null {
  const source = payload.source && typeof payload.source === "object" ? (payload.source as Record<string, unknown>) : undefined;
  const item = sourceCslItem(source);
  return item ? formatReference(item, DEFAULT_STYLE) : null;
}

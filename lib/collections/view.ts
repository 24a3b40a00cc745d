import "server-only";
// What the collection pages and endpoints show: one collection version with its members, their
// citations and parameters, and the collection's own citation (lib/citation's builder and formats).
import { buildCslItem, type CslItem } from "@/lib/citation/csl";
import { citationLine } from "@/lib/citation/citation-line";
import { CITATION_FORMATS, formatCitation, formatCslJson, type CitationFormat, type CitationStyleId } from "@/lib/citation/formats";
import { getPublicCitation } from "@/lib/citation/public-citation";
import { appUrl } from "@/lib/config";
import { getPublicVersionPoints } from "@/lib/datasets/public-version";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { collectionPath, collectionVersionPath } from "@/lib/identifiers/paths";
import { parseIdOrThrow } from "@/lib/ids";
import { versionMechanismSubjectOrThrow } from "@/lib/exports/subjects";
import { convertMechanismFits, DEFAULT_MECHANISM_ENERGY, mechanismRateUnits, type MechanismSubject } from "@/lib/exports/mechanism";
import type { SpeciesNaming } from "@/lib/exports/species-names";
import { buildCollectionCanteraYaml, buildCollectionTable, type CollectionExportHeader } from "./mechanism-export";
import { getCollection, listCollectionMembers, type CollectionDto, type CollectionMemberDto, type CollectionVersionDto } from "./queries";

export { collectionPath, collectionVersionPath };

export interface CollectionVersionView {
  collection: CollectionDto;
  version: CollectionVersionDto;
  members: CollectionMemberDto[];
  /** The owner looks at their own collection (drafts shown, editing offered). */
  isOwner: boolean;
}

/** The collection id and version number of a path (`2` or `v2`); anything else is a 404. */
export function collectionVersionPathOrThrow(params: { id: string; n?: string }): { collectionId: number; number: number } {
  const collectionId = parseIdOrThrow(params.id, "collection");
  return { collectionId, number: parseIdOrThrow(params.n?.replace(/^v/, ""), "version number") };
}

/**
 * One version of a collection as `viewerId` may see it: `number` given, that version; otherwise the
 * newest published one (the owner: the newest, a draft included). A 404 for anything else.
 */
export async function loadCollectionVersionOrThrow({
  collectionId,
  number,
  viewerId,
}: {
  collectionId: number;
  number?: number;
  viewerId: number | null;
}): Promise<CollectionVersionView> {
  const collection = await getCollection({ collectionId, viewerId });
  const version = collection
    ? number === undefined
      ? collection.versions[0]
      : collection.versions.find((v) => v.number === number)
    : undefined;
  if (!collection || !version)
    throw new AppError(
      "not_found",
      number === undefined ? `No collection ${collectionId}` : `Collection ${collectionId} has no version ${number}`,
    );
  return {
    collection,
    version,
    members: await listCollectionMembers({ collectionVersionId: version.id }),
    isOwner: viewerId !== null && viewerId === collection.ownerId,
  };
}

/** The collection version as one CSL item (a draft has no identifier or date). */
export function collectionCslItem({ collection, version }: Pick<CollectionVersionView, "collection" | "version">): CslItem {
  return buildCslItem({
    kind: "version",
    identifier: version.versionIdentifier,
    title: version.title,
    creators: [collection.ownerName],
    publishedAt: version.publishedAt,
    versionNumber: version.number,
    url: `${appUrl()}${collectionVersionPath(collection.id, version.number)}`,
  });
}

export const collectionCitationLine = (view: Pick<CollectionVersionView, "collection" | "version">) =>
  citationLine({
    kind: "version",
    identifier: view.version.versionIdentifier,
    title: view.version.title,
    creators: [view.collection.ownerName],
    publishedAt: view.version.publishedAt,
    versionNumber: view.version.number,
    url: `${appUrl()}${collectionVersionPath(view.collection.id, view.version.number)}`,
  });

/** Each member's own citation item (every member is a published or retracted version, so each has one). */
export async function memberCslItems(members: CollectionMemberDto[]): Promise<CslItem[]> {
  const items: CslItem[] = [];
  for (const m of members) {
    const cited = await getPublicCitation({ datasetId: m.datasetId, versionNumber: m.number });
    if (cited) items.push(cited.versionItem);
  }
  return items;
}

/** The collection's citation in one format, and with `members` every member's after it; a file to download. */
export async function collectionCitationResponse(
  view: CollectionVersionView,
  { format, style, members }: { format: CitationFormat; style: CitationStyleId; members: boolean },
): Promise<Response> {
  const own = collectionCslItem(view);
  const memberItems = members ? await memberCslItems(view.members) : [];
  const body =
    format === "csl-json"
      ? memberItems.length
        ? JSON.stringify([own, ...memberItems], null, 2) + "\n"
        : formatCslJson(own)
      : [own, ...memberItems].map((item) => formatCitation(item, format, style)).join(format === "text" ? "" : "\n");
  const { mediaType, ext } = CITATION_FORMATS[format];
  const base = view.version.versionIdentifier?.split("/").slice(1).join("-") || `collection-${view.collection.id}-v${view.version.number}`;
  return new Response(body, {
    headers: {
      "content-type": `${mediaType}; charset=utf-8`,
      "content-disposition": `attachment; filename="${base}${members ? "-with-members" : ""}.${ext}"`,
      "x-content-type-options": "nosniff",
    },
  });
}

/** The members' parameters (each member's preferred fit) and the members left out, with why. */
async function memberSubjects(members: CollectionMemberDto[]) {
  const subjects: MechanismSubject[] = [];
  const skipped: CollectionExportHeader["skipped"] = [];
  const byVersion = new Map<number, { subject: MechanismSubject; citation: string | null }>();
  for (const m of members) {
    const loaded = await getPublicVersionPoints({ versionId: m.versionId });
    const label = `${m.title}, version ${m.number}${m.versionIdentifier ? ` (doi:${m.versionIdentifier})` : ""}`;
    if (!loaded?.analysis) {
      skipped.push({ label, reason: "no fit to export" });
      continue;
    }
    const subject = await versionMechanismSubjectOrThrow(loaded);
    subjects.push(subject);
    byVersion.set(m.versionId, { subject, citation: loaded.about.citation });
  }
  return { subjects, skipped, byVersion };
}

/** What the collection page shows of one member's fit: the preferred one, k in its canonical unit, Ea in kJ mol⁻¹. */
export interface MemberParameters {
  model: string;
  A: number;
  n: number;
  Ea: number;
  T0: number;
  kUnit: string;
  Tmin: number;
  Tmax: number;
  citation: string | null;
}

export async function listMemberParameters(members: CollectionMemberDto[]): Promise<Map<number, MemberParameters>> {
  const { byVersion } = await memberSubjects(members);
  const out = new Map<number, MemberParameters>();
  for (const [versionId, { subject, citation }] of byVersion) {
    const kUnit = mechanismRateUnits(subject.order)[0];
    const fit = convertMechanismFits(subject, { kUnit, energyUnit: DEFAULT_MECHANISM_ENERGY }).find((f) => f.preferred)!;
    out.set(versionId, {
      model: fit.model === "arrhenius" ? "Arrhenius" : "modified Arrhenius",
      A: fit.A,
      n: fit.n,
      Ea: fit.Ea,
      T0: fit.T0,
      kUnit,
      Tmin: subject.range.Tmin,
      Tmax: subject.range.Tmax,
      citation,
    });
  }
  return out;
}

/** The combined parameters file (plain text or Cantera YAML) of a collection version. */
export async function collectionParametersResponse(
  view: CollectionVersionView,
  { format, energy, names }: { format: "table" | "cantera-yaml"; energy: string; names: SpeciesNaming },
): Promise<Response> {
  const { subjects, skipped } = await memberSubjects(view.members);
  const header: CollectionExportHeader = {
    title: view.version.title,
    versionNumber: view.version.number,
    identifier: view.version.versionIdentifier,
    landingPage: `${appUrl()}${collectionVersionPath(view.collection.id, view.version.number)}`,
    citation: collectionCitationLine(view),
    caution: FIT_CAUTION,
    skipped,
  };
  const body =
    format === "table" ? buildCollectionTable(header, subjects, energy) : buildCollectionCanteraYaml(header, subjects, energy, names);
  const base = view.version.versionIdentifier?.split("/").slice(1).join("-") || `collection-${view.collection.id}-v${view.version.number}`;
  return new Response(body, {
    headers: {
      "content-type": format === "table" ? "text/plain; charset=utf-8" : "application/yaml; charset=utf-8",
      "content-disposition": `attachment; filename="${base}-parameters.${format === "table" ? "txt" : "yaml"}"`,
      "x-content-type-options": "nosniff",
    },
  });
}

/** The JSON of GET /api/v1/collections/:id (and of a version). */
export function collectionJson(view: CollectionVersionView) {
  const base = appUrl();
  return {
    id: view.collection.id,
    owner: { name: view.collection.ownerName },
    seriesIdentifier: view.collection.seriesIdentifier,
    version: {
      number: view.version.number,
      state: view.version.state,
      title: view.version.title,
      description: view.version.description,
      versionIdentifier: view.version.versionIdentifier,
      publishedAt: view.version.publishedAt?.toISOString() ?? null,
      url: `${base}${collectionVersionPath(view.collection.id, view.version.number)}`,
      citation: view.version.state === "published" ? collectionCitationLine(view) : null,
    },
    versions: view.collection.versions.map((v) => ({
      number: v.number,
      state: v.state,
      versionIdentifier: v.versionIdentifier,
      publishedAt: v.publishedAt?.toISOString() ?? null,
      memberCount: v.memberCount,
    })),
    members: view.members.map((m) => ({
      versionId: m.versionId,
      datasetId: m.datasetId,
      number: m.number,
      title: m.title,
      equation: m.equation,
      state: m.state,
      versionIdentifier: m.versionIdentifier,
      retractionNotice: m.retractionNotice,
      newerVersion: m.newer?.number ?? null,
      note: m.note,
      url: `${base}/datasets/${m.datasetId}/v${m.number}`,
    })),
    caution: FIT_CAUTION,
  };
}

// DataCite metadata (kernel 4, as the JSON:API `dois` resource of a registration agency's REST
// API) for our version and series identifiers. Pure: no I/O, so the same stored version always
// gives the same body, which keeps re-registration an exact upsert. The one builder: registration
// sends it, and GET …/versions/:n/datacite.json and datacite.xml serve it (buildDataciteXml).
import { create } from "xmlbuilder2";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { creatorName, familyWithParticle, sortedNameText } from "@/lib/citation/names";
import { isDoiSyntax } from "./mint";
import { mapStrings, xmlSafeText } from "@/lib/text/clean";

/** DataCite relation types we emit (a subset of the schema's controlled list). */
export type RelationType =
  | "IsVersionOf"
  | "HasVersion"
  | "IsNewVersionOf"
  | "IsPreviousVersionOf"
  | "IsSupplementTo"
  | "IsDescribedBy"
  | "IsDerivedFrom"
  | "References"
  | "Cites"
  | "HasPart";

export interface DataciteRelatedIdentifier {
  relatedIdentifier: string;
  relatedIdentifierType: "DOI" | "URL" | "ISBN";
  relationType: RelationType;
}

export interface DataciteCreator {
  name: string;
  nameType?: "Personal" | "Organizational";
  givenName?: string;
  familyName?: string;
  nameIdentifiers?: { nameIdentifier: string; nameIdentifierScheme: "ORCID"; schemeUri: string }[];
  affiliation?: { name: string }[];
}

export interface DataciteRights {
  rights: string;
  rightsUri: string;
  rightsIdentifier: string;
  rightsIdentifierScheme: "SPDX";
  schemeUri: string;
}

export interface DataciteAttributes {
  doi: string;
  event: "publish";
  url: string;
  titles: { title: string }[];
  creators: DataciteCreator[];
  publisher: string;
  publicationYear: number;
  types: { resourceTypeGeneral: "Dataset" | "Collection"; resourceType: string };
  version?: string;
  dates?: { date: string; dateType: "Issued" | "Withdrawn"; dateInformation?: string }[];
  subjects?: { subject: string; subjectScheme?: string }[];
  relatedIdentifiers: DataciteRelatedIdentifier[];
  rightsList: DataciteRights[];
  descriptions: { description: string; descriptionType: "Abstract" | "Other" }[];
  fundingReferences?: { funderName: string; awardNumber?: string; awardTitle?: string }[];
  schemaVersion: string;
}

/** The JSON:API document sent with `PUT /dois/{doi}`. */
export interface DataciteBody {
  data: { type: "dois"; attributes: DataciteAttributes };
}

interface CommonInput {
  /** The identifier being registered (DOI syntax, no `doi:` or resolver prefix). */
  doi: string;
  datasetId: number;
  /** Public base URL of the site, without a trailing slash (e.g. `https://arrhenia.example`). */
  baseUrl: string;
  /** The deposit document of the version described (for a series: its newest published version). */
  payload: unknown;
  /** Used when the payload has no title (the version row always has one). */
  fallbackTitle: string;
  /** Publication time of the version (for a series: of its first version); null → `now`'s year. */
  publishedAt: Date | null;
  /** Number of the version described (for a series: its newest). */
  versionNumber: number;
  /** Clock for the publication year when `publishedAt` is missing (tests pin it). */
  now?: Date;
  /** Set when the version described was retracted: when, and the curator's stated reason. */
  retraction?: { at: Date | null; notice: string | null } | null;
  /**
   * The source publication's formatted reference (lib/citation, by the caller: the builder stays
   * pure), named in a description; without it the description names the reference's title.
   */
  sourceReference?: string | null;
  /**
   * Position in the document's `creators` → the ORCID iD verified on the account linked to that
   * entry (creator_people). Only these become name identifiers: an iD typed into a deposit proves
   * nothing, so it is not sent.
   */
  verifiedCreatorIds?: ReadonlyMap<number, string>;
}

export type DoiMetadataInput =
  | (CommonInput & {
      kind: "version";
      /** The dataset's series identifier, if minted. */
      seriesIdentifier: string | null;
      /** Identifier of the version just before this one, if it was published. */
      previousVersionIdentifier?: string | null;
      /** Identifier of the version just after this one, once it is published. */
      nextVersionIdentifier?: string | null;
    })
  | (CommonInput & {
      kind: "series";
      /** Identifiers of every published (or retracted) version, oldest first. */
      versionIdentifiers: string[];
    });

/** SPDX ids the deposit schema allows, with their SPDX full names. */
const spdxNames: Record<string, string> = {
  "CC-BY-4.0": "Creative Commons Attribution 4.0 International",
  "CC0-1.0": "Creative Commons Zero v1.0 Universal",
  "CC-BY-SA-4.0": "Creative Commons Attribution Share Alike 4.0 International",
  "CC-BY-3.0": "Creative Commons Attribution 3.0 Unported",
  "CC-BY-SA-3.0": "Creative Commons Attribution Share Alike 3.0 Unported",
  "ODC-By-1.0": "Open Data Commons Attribution License v1.0",
  "ODbL-1.0": "Open Data Commons Open Database License v1.0",
  "PDDL-1.0": "Open Data Commons Public Domain Dedication & License 1.0",
  "CDLA-Permissive-2.0": "Community Data License Agreement Permissive 2.0",
  "CDLA-Sharing-1.0": "Community Data License Agreement Sharing 1.0",
};

/** The deposit schema's default licence, applied when a payload names none. */
export const DEFAULT_LICENCE = "CC-BY-4.0";

/** DataCite's standard code for a value that is unavailable. */
const UNAVAILABLE = ":unav";

/** Deposit relation words → DataCite relation types. */
const relationTypes: Record<string, RelationType> = {
  described_by: "IsDescribedBy",
  supplement_to: "IsSupplementTo",
  derived_from: "IsDerivedFrom",
  updates: "IsNewVersionOf",
  compared_with: "References",
  cites: "Cites",
};

const ORCID_ID = /^\d{4}-\d{4}-\d{4}-\d{3}[\dX]$/;

/** Landing page of a version (`…/datasets/12/v3`) or, without a number, of the dataset. */
export function buildLandingUrl({
  baseUrl,
  datasetId,
  versionNumber,
}: {
  baseUrl: string;
  datasetId: number;
  versionNumber?: number;
}): string {
  const base = `${baseUrl.replace(/\/$/, "")}/datasets/${datasetId}`;
  return versionNumber === undefined ? base : `${base}/v${versionNumber}`;
}

/**
 * A DOI written as `https://doi.org/…`, `doi:…` or bare, reduced to the bare form; null when
 * what remains is not DOI syntax. Deposits validate this already; stored payloads may predate it.
 */
export function normaliseDoi(value: unknown): string | null {
  const text = asString(value);
  if (!text) return null;
  const bare = text.replace(/^(https?:\/\/(dx\.)?doi\.org\/|doi:)/i, "");
  return isDoiSyntax(bare) ? bare : null;
}

/** An ORCID iD as given (bare or as its https address) → `https://orcid.org/…`, or null. */
export function orcidUri(value: unknown): string | null {
  const text = asString(value)?.replace(/^https?:\/\/orcid\.org\//i, "");
  return text && ORCID_ID.test(text) ? `https://orcid.org/${text}` : null;
}

/** Builds the JSON:API body that registers (or updates) one identifier. */
export function buildDoiMetadata(input: DoiMetadataInput): DataciteBody {
  const doc = asRecord(input.payload);
  const source = asRecord(doc.source);
  const reference = asRecord(source.reference);
  const sourceDoi = normaliseDoi(source.doi) ?? normaliseDoi(reference.DOI);
  const related: DataciteRelatedIdentifier[] = [];

  if (input.kind === "version") {
    if (input.seriesIdentifier) related.push(doiRelation(input.seriesIdentifier, "IsVersionOf"));
    if (input.previousVersionIdentifier) related.push(doiRelation(input.previousVersionIdentifier, "IsNewVersionOf"));
    if (input.nextVersionIdentifier) related.push(doiRelation(input.nextVersionIdentifier, "IsPreviousVersionOf"));
  } else {
    for (const id of input.versionIdentifiers) if (id !== input.doi) related.push(doiRelation(id, "HasVersion"));
  }
  // The source publication by the one identifier it has, best first: DOI, ISBN, web address; none → no relation.
  const sourceIsbn = isbnOf(reference.ISBN);
  const sourceUrl = asString(reference.URL);
  if (sourceDoi) related.push(doiRelation(sourceDoi, "IsSupplementTo"));
  else if (sourceIsbn) related.push({ relatedIdentifier: sourceIsbn, relatedIdentifierType: "ISBN", relationType: "IsSupplementTo" });
  else if (sourceUrl && /^https?:\/\//.test(sourceUrl))
    related.push({ relatedIdentifier: sourceUrl, relatedIdentifierType: "URL", relationType: "IsSupplementTo" });
  for (const item of asArray(doc.relatedIdentifiers)) {
    const r = asRecord(item);
    const relationType = relationTypes[asString(r.relation) ?? ""];
    if (!relationType) continue;
    if (r.kind === "doi") {
      const doi = normaliseDoi(r.identifier);
      if (doi) related.push(doiRelation(doi, relationType));
    } else if (r.kind === "url") {
      const url = asString(r.identifier);
      if (url && /^https?:\/\//.test(url)) related.push({ relatedIdentifier: url, relatedIdentifierType: "URL", relationType });
    }
  }

  const description = asString(doc.description);
  const locator = asString(source.locator);
  const descriptions: DataciteAttributes["descriptions"] = [];
  if (description) descriptions.push({ description, descriptionType: "Abstract" });
  const sourceText = sourceDescription({
    locator,
    reference: input.sourceReference ?? null,
    title: asString(reference.title),
    doi: sourceDoi,
  });
  if (sourceText) descriptions.push({ description: sourceText, descriptionType: "Other" });
  const retraction = input.retraction ?? null;
  const retractedOn = retraction?.at ? retraction.at.toISOString().slice(0, 10) : null;
  if (retraction) {
    const notice = retraction.notice?.trim().replace(/\s+/g, " ");
    descriptions.push({
      description:
        `This version was retracted${retractedOn ? ` on ${retractedOn}` : ""} by the curators of Arrhenia and should not be used; ` +
        `it stays readable so that citations of it can be followed.${notice ? ` Reason: ${/[.!?]$/.test(notice) ? notice : `${notice}.`}` : ""}`,
      descriptionType: "Other",
    });
  }

  const subjects: NonNullable<DataciteAttributes["subjects"]> = asArray(doc.keywords)
    .map(asString)
    .filter((s): s is string => !!s)
    .map((subject) => ({ subject }));
  // The reaction class and the species by the names the deposit gives them.
  const reaction = asRecord(doc.reaction);
  const reactionClass = reactionClassFor(reaction.class);
  if (reactionClass) subjects.push({ subject: reactionClass.label, subjectScheme: "Arrhenia reaction class" });
  for (const item of [...asArray(reaction.reactants), ...asArray(reaction.products)]) {
    const name = asString(asRecord(item).name);
    if (name && !subjects.some((s) => s.subject === name && s.subjectScheme === "species"))
      subjects.push({ subject: name, subjectScheme: "species" });
  }
  const fundingReferences = asArray(doc.funding).flatMap((item) => {
    const f = asRecord(item);
    const funderName = asString(f.funder);
    if (!funderName) return [];
    const awardNumber = asString(f.awardId);
    const awardTitle = asString(f.awardTitle);
    return [{ funderName, ...(awardNumber ? { awardNumber } : {}), ...(awardTitle ? { awardTitle } : {}) }];
  });
  const issued = input.publishedAt ? input.publishedAt.toISOString().slice(0, 10) : null;

  const attributes: DataciteAttributes = {
    doi: input.doi,
    event: "publish",
    url: buildLandingUrl({
      baseUrl: input.baseUrl,
      datasetId: input.datasetId,
      versionNumber: input.kind === "version" ? input.versionNumber : undefined,
    }),
    titles: [{ title: asString(doc.title) ?? (input.fallbackTitle.trim() || UNAVAILABLE) }],
    creators: buildCreators(doc.creators, input.verifiedCreatorIds ?? new Map()),
    publisher: "Arrhenia",
    publicationYear: (input.publishedAt ?? input.now ?? new Date()).getUTCFullYear(),
    types: { resourceTypeGeneral: "Dataset", resourceType: "Rate constants k(T)" },
    // A series stands for every version, so it carries no version number of its own.
    ...(input.kind === "version" ? { version: String(input.versionNumber) } : {}),
    ...(issued || retractedOn
      ? {
          dates: [
            ...(issued ? [{ date: issued, dateType: "Issued" as const }] : []),
            // Kernel 4.x dateType "Withdrawn": the date the resource was removed from use (from memory).
            ...(retractedOn ? [{ date: retractedOn, dateType: "Withdrawn" as const, dateInformation: "Retracted" }] : []),
          ],
        }
      : {}),
    ...(subjects.length ? { subjects } : {}),
    relatedIdentifiers: dedupeRelations(related),
    rightsList: [buildRights(asString(doc.license) ?? DEFAULT_LICENCE)],
    descriptions,
    ...(fundingReferences.length ? { fundingReferences } : {}),
    schemaVersion: "http://datacite.org/schema/kernel-4",
  };
  // What registration sends and what the XML carries: no character XML 1.0 cannot hold.
  return { data: { type: "dois", attributes: mapStrings(attributes, xmlSafeText) } };
}

/** What a collection version's registration says: its own text, its owner, its members and its neighbours. */
export interface CollectionDoiInput {
  doi: string;
  baseUrl: string;
  collectionId: number;
  versionNumber: number;
  title: string;
  description: string;
  publishedAt: Date | null;
  ownerName: string;
  /** The owner's verified ORCID iD, if any (an iD typed by hand proves nothing and is not sent). */
  ownerOrcid: string | null;
  /** The version identifiers of its members, in their order: one HasPart each. */
  memberIdentifiers: string[];
  previousVersionIdentifier: string | null;
  nextVersionIdentifier: string | null;
  now?: Date;
}

/** Landing page of a collection version: `…/collections/4/versions/2`. */
export const collectionLandingUrl = (baseUrl: string, collectionId: number, versionNumber: number) =>
  `${baseUrl.replace(/\/$/, "")}/collections/${collectionId}/versions/${versionNumber}`;

/**
 * The registration body of one collection version: resourceTypeGeneral "Collection", HasPart for
 * every member, IsNewVersionOf / IsPreviousVersionOf between the collection's versions. The
 * collection is a list of references made by its owner, offered under CC0 (each member keeps its own licence).
 */
export function buildCollectionDoiMetadata(input: CollectionDoiInput): DataciteBody {
  const related: DataciteRelatedIdentifier[] = input.memberIdentifiers.map((id) => doiRelation(id, "HasPart"));
  if (input.previousVersionIdentifier) related.push(doiRelation(input.previousVersionIdentifier, "IsNewVersionOf"));
  if (input.nextVersionIdentifier) related.push(doiRelation(input.nextVersionIdentifier, "IsPreviousVersionOf"));
  const issued = input.publishedAt ? input.publishedAt.toISOString().slice(0, 10) : null;
  const description = input.description.trim();
  const attributes: DataciteAttributes = {
    doi: input.doi,
    event: "publish",
    url: collectionLandingUrl(input.baseUrl, input.collectionId, input.versionNumber),
    titles: [{ title: input.title.trim() || UNAVAILABLE }],
    creators: buildCreators([{ name: input.ownerName }], input.ownerOrcid ? new Map([[0, input.ownerOrcid]]) : new Map<number, string>()),
    publisher: "Arrhenia",
    publicationYear: (input.publishedAt ?? input.now ?? new Date()).getUTCFullYear(),
    types: { resourceTypeGeneral: "Collection", resourceType: "Collection of rate-constant dataset versions" },
    version: String(input.versionNumber),
    ...(issued ? { dates: [{ date: issued, dateType: "Issued" as const }] } : {}),
    relatedIdentifiers: dedupeRelations(related),
    rightsList: [buildRights("CC0-1.0")],
    descriptions: [
      ...(description ? [{ description, descriptionType: "Abstract" as const }] : []),
      {
        description: `A collection of ${input.memberIdentifiers.length} published dataset ${input.memberIdentifiers.length === 1 ? "version" : "versions"} on Arrhenia; each member keeps its own identifier, licence and citation.`,
        descriptionType: "Other",
      },
    ],
    schemaVersion: "http://datacite.org/schema/kernel-4",
  };
  return { data: { type: "dois", attributes: mapStrings(attributes, xmlSafeText) } };
}

/** What a description says of the source publication: where in it the numbers are, and which it is. */
function sourceDescription({
  locator,
  reference,
  title,
  doi,
}: {
  locator: string | null;
  reference: string | null;
  title: string | null;
  doi: string | null;
}): string | null {
  const named = reference ?? (title ? `“${title}”${doi ? ` (doi:${doi})` : ""}` : null);
  if (named) return `Numbers taken from ${locator ? `${locator} of ` : ""}the source publication: ${named}`;
  return locator ? `Numbers taken from ${locator} of the source publication.` : null;
}

/** An ISBN (10 or 13 digits, hyphens and spaces allowed) as given, or null. */
function isbnOf(value: unknown): string | null {
  const text = asString(value);
  if (!text) return null;
  const digits = text.replace(/[\s-]/g, "");
  return /^(97[89]\d{10}|\d{9}[\dX])$/i.test(digits) ? text : null;
}

function buildCreators(value: unknown, verifiedIds: ReadonlyMap<number, string>): DataciteCreator[] {
  const creators = asArray(value).flatMap((item, position): DataciteCreator[] => {
    const c = asRecord(item);
    const deposited = asString(c.name);
    if (!deposited) return [];
    // The same name parts as the CSL item's (lib/citation/names.ts): "Emi Tanaka" and "Tanaka, Emi" alike.
    const parts = creatorName(deposited);
    const creator: DataciteCreator =
      parts.kind === "organisation"
        ? { name: parts.name, nameType: "Organizational" }
        : {
            name: sortedNameText(parts),
            nameType: "Personal",
            ...(parts.given ? { givenName: parts.given } : {}),
            familyName: familyWithParticle(parts),
          };
    const orcid = orcidUri(verifiedIds.get(position));
    if (orcid) creator.nameIdentifiers = [{ nameIdentifier: orcid, nameIdentifierScheme: "ORCID", schemeUri: "https://orcid.org" }];
    const affiliation = asString(c.affiliation);
    if (affiliation) creator.affiliation = [{ name: affiliation }];
    return [creator];
  });
  // The agency requires at least one creator.
  return creators.length ? creators : [{ name: UNAVAILABLE }];
}

function buildRights(id: string): DataciteRights {
  return {
    rights: spdxNames[id] ?? id,
    rightsUri: `https://spdx.org/licenses/${encodeURIComponent(id)}.html`,
    rightsIdentifier: id,
    rightsIdentifierScheme: "SPDX",
    schemeUri: "https://spdx.org/licenses/",
  };
}

function doiRelation(doi: string, relationType: RelationType): DataciteRelatedIdentifier {
  return { relatedIdentifier: doi, relatedIdentifierType: "DOI", relationType };
}

function dedupeRelations(items: DataciteRelatedIdentifier[]): DataciteRelatedIdentifier[] {
  const seen = new Set<string>();
  return items.filter((r) => {
    const key = `${r.relationType} ${r.relatedIdentifierType} ${r.relatedIdentifier.toLowerCase()}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

function asRecord(value: unknown): Record<string, unknown> {
  return value && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
}

function asArray(value: unknown): unknown[] {
  return Array.isArray(value) ? value : [];
}

function asString(value: unknown): string | null {
  return typeof value === "string" && value.trim() ? value.trim() : null;
}

/** An xmlbuilder2 node (the package exports no name for its type). */
export type XmlNode = ReturnType<typeof create>;

const KERNEL_NS = "http://datacite.org/schema/kernel-4";
const XSI_NS = "http://www.w3.org/2001/XMLSchema-instance";
const KERNEL_SCHEMA = "http://schema.datacite.org/meta/kernel-4/metadata.xsd";

/**
 * A text for xmlbuilder2's `txt`/`att`: characters XML cannot carry removed and every "&" written
 * as "&amp;" here. xmlbuilder2 escapes "<", ">" and '"' itself but leaves an "&" that starts
 * something entity-like ("&nbsp;", "&#0;", "&amp;") as it is, so a title holding such text would
 * come out as an undefined entity or read as another character; an "&amp;" it always leaves.
 */
export function xmlBuilderText(text: string): string {
  return xmlSafeText(text).replace(/&/g, "&amp;");
}

/**
 * The same metadata as DataCite XML (kernel 4: `resource` in the kernel-4 namespace with its schema
 * location), built with xmlbuilder2; every text and attribute passes through xmlBuilderText first.
 */
export function buildDataciteXml(attributes: DataciteAttributes): string {
  const doc = create({ version: "1.0", encoding: "UTF-8" });
  appendDataciteResource(doc, attributes);
  return doc.end({ prettyPrint: true }) + "\n";
}

/** The DataCite kernel-4 namespace and its schema, as an OAI-PMH metadata format declares them. */
export const DATACITE_KERNEL = { namespace: KERNEL_NS, schema: KERNEL_SCHEMA } as const;

/**
 * Appends the `resource` element of these attributes under `parent` (a document, or an element of
 * another document such as an OAI-PMH record's `metadata`): the one place the XML is built.
 */
export function appendDataciteResource(parent: XmlNode, attributes: DataciteAttributes): XmlNode {
  const a = mapStrings(attributes, xmlBuilderText);
  const root = parent.ele(KERNEL_NS, "resource").att(XSI_NS, "xsi:schemaLocation", `${KERNEL_NS} ${KERNEL_SCHEMA}`);
  root.ele("identifier", { identifierType: "DOI" }).txt(a.doi);
  const creators = root.ele("creators");
  for (const c of a.creators) {
    const el = creators.ele("creator");
    el.ele("creatorName", c.nameType ? { nameType: c.nameType } : {}).txt(c.name);
    if (c.givenName) el.ele("givenName").txt(c.givenName);
    if (c.familyName) el.ele("familyName").txt(c.familyName);
    for (const n of c.nameIdentifiers ?? [])
      el.ele("nameIdentifier", { nameIdentifierScheme: n.nameIdentifierScheme, schemeURI: n.schemeUri }).txt(n.nameIdentifier);
    for (const af of c.affiliation ?? []) el.ele("affiliation").txt(af.name);
  }
  const titles = root.ele("titles");
  for (const t of a.titles) titles.ele("title").txt(t.title);
  root.ele("publisher").txt(a.publisher);
  root.ele("publicationYear").txt(String(a.publicationYear));
  root.ele("resourceType", { resourceTypeGeneral: a.types.resourceTypeGeneral }).txt(a.types.resourceType);
  if (a.subjects?.length) {
    const subjects = root.ele("subjects");
    for (const s of a.subjects) subjects.ele("subject", s.subjectScheme ? { subjectScheme: s.subjectScheme } : {}).txt(s.subject);
  }
  if (a.dates?.length) {
    const dates = root.ele("dates");
    for (const d of a.dates)
      dates.ele("date", { dateType: d.dateType, ...(d.dateInformation ? { dateInformation: d.dateInformation } : {}) }).txt(d.date);
  }
  if (a.relatedIdentifiers.length) {
    const related = root.ele("relatedIdentifiers");
    for (const r of a.relatedIdentifiers)
      related
        .ele("relatedIdentifier", { relatedIdentifierType: r.relatedIdentifierType, relationType: r.relationType })
        .txt(r.relatedIdentifier);
  }
  if (a.version) root.ele("version").txt(a.version);
  const rights = root.ele("rightsList");
  for (const r of a.rightsList)
    rights
      .ele("rights", {
        rightsURI: r.rightsUri,
        rightsIdentifier: r.rightsIdentifier,
        rightsIdentifierScheme: r.rightsIdentifierScheme,
        schemeURI: r.schemeUri,
      })
      .txt(r.rights);
  if (a.descriptions.length) {
    const descriptions = root.ele("descriptions");
    for (const d of a.descriptions) descriptions.ele("description", { descriptionType: d.descriptionType }).txt(d.description);
  }
  if (a.fundingReferences?.length) {
    const funding = root.ele("fundingReferences");
    for (const f of a.fundingReferences) {
      const el = funding.ele("fundingReference");
      el.ele("funderName").txt(f.funderName);
      if (f.awardNumber) el.ele("awardNumber").txt(f.awardNumber);
      if (f.awardTitle) el.ele("awardTitle").txt(f.awardTitle);
    }
  }
  return root;
}

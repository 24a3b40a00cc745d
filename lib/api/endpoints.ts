import { z } from "zod";
import { analysisRequestSchema } from "@/lib/analyses/analyse-request";
import {
  addMembersSchema,
  collectionCitationQuerySchema,
  collectionListQuerySchema,
  collectionParametersQuerySchema,
  createCollectionSchema,
  patchCollectionSchema,
} from "@/lib/collections/schemas";
import { mechanismCheckBodySchema, shareBodySchema, speciesChoicesBodySchema } from "@/lib/mechanisms/request";
import { citationQuerySchema } from "@/lib/citation/request";
import { transitionRequestSchema } from "@/lib/curation/transition-request";
import {
  pointsCsvQuerySchema,
  reactionParametersQuerySchema,
  searchExportQuerySchema,
  versionParametersQuerySchema,
} from "@/lib/exports/requests";
import { OAI_VERBS } from "@/lib/oai/protocol";
import { searchParameterSchemas } from "@/lib/search/params";
import { userPatchSchema, type ApiTokenScope } from "@/lib/users/schemas";
import type { ResponseSchemaName } from "./responses";

/**
 * THE list of REST API endpoints: the published scope table (/docs/api, checked against every
 * handler by a test), the OpenAPI document (/api/v1/openapi.json, lib/api/openapi.ts) and the
 * examples of the docs page are all made from it. Adding an endpoint is one entry here.
 * Query and body schemas are the ones the handlers parse with.
 */

export type HttpMethod = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

export interface QueryParameter {
  name: string;
  schema: z.ZodType;
  description?: string;
  /** Shown in the curl and Python examples. */
  example?: string;
}

export interface Endpoint {
  method: HttpMethod;
  /** Express-style path: `/api/v1/datasets/:id/versions/:n`. */
  path: string;
  /** The token scope the handler declares; null: public (a token sent anyway must still be valid). */
  scope: ApiTokenScope | null;
  /** Who may call it, in words (the published table's third column). */
  who: string;
  tag:
    | "Datasets"
    | "Reactions and species"
    | "Search"
    | "Deposits"
    | "Analysis"
    | "Citation"
    | "Harvesting"
    | "Files"
    | "People"
    | "Document"
    | "Mechanisms"
    | "Collections";
  summary: string;
  description?: string;
  /** Example values of the path's parameters, for the examples. */
  pathExample?: Record<string, string>;
  query?: QueryParameter[];
  body?: { contentType: string; schema?: z.ZodType; description: string; example?: string };
  /** Request headers the endpoint reads (If-Match, Idempotency-Key). */
  headers?: { name: string; required: boolean; description: string }[];
  /** `schema` names the answer's zod schema (lib/api/responses.ts), for JSON answers. */
  ok: { status: number; contentType: string; description: string; schema?: ResponseSchemaName };
  /** Schemas of the path's parameters where the name alone does not tell (PATH_PARAMETERS has the rest). */
  pathParameters?: Record<string, z.ZodType>;
  /** Problem statuses beyond the ones every endpoint may answer (400, 401, 429, 500, 503). */
  errors: number[];
  /** Public read with ETag, Cache-Control and 304 (withApi's `cache`). */
  cached?: boolean;
}

const JSON_TYPE = "application/json";
const depositBody = {
  contentType: JSON_TYPE,
  description: "A deposit document (JSON Schema at /schemas/deposit/v1.json; the format is described on /docs/deposit-format).",
  example: "@deposit.json",
};
const consensusQuery: QueryParameter[] = [
  {
    name: "include",
    schema: z.enum(["all", "measured", "calculated"]),
    description: "Which datasets: all (default), measured or calculated.",
  },
  { name: "Tmin", schema: z.string(), description: "Lower end of the temperature window, K." },
  { name: "Tmax", schema: z.string(), description: "Upper end of the temperature window, K." },
];
const search = searchParameterSchemas();
const searchQuery: QueryParameter[] = Object.entries(search).map(([name, schema]) => ({
  name,
  schema,
  ...(name === "q" ? { example: "OH + CH4" } : name === "limit" ? { example: "20" } : {}),
}));
const citationShape = citationQuerySchema.shape;
/** The query parameters of a zod object, for the document and the examples. */
const queryOf = (shape: Record<string, z.ZodType>, examples: Record<string, string> = {}): QueryParameter[] =>
  Object.entries(shape).map(([name, schema]) => ({ name, schema, ...(examples[name] ? { example: examples[name] } : {}) }));
const ifMatch = {
  name: "If-Match",
  required: true,
  description: 'The lock version you edited, the ETag of GET /api/v1/versions/:id ("3"). Missing: 428; stale: 412.',
};
const idempotencyKey = {
  name: "Idempotency-Key",
  required: false,
  description: "1–255 visible ASCII characters; a retry with the same key and body answers the first response.",
};
const PUBLIC_VERSIONS = "anyone, for published and retracted versions";

/** A database id in a path: 1 … 2³¹−1 (lib/ids.ts; anything else is a 404). */
const pathId = (what: string) => z.int().min(1).max(2_147_483_647).describe(`${what} id`);
/** A reaction key as its page writes it ("~" for ">>"; lib/reactions/paths.ts) or the reaction's numeric id. */
const KEY_PART = "(?:[0-9.e-]+\\*)?[A-Z]{14}-[A-Z]{10}-[A-Z]";
const KEY_SIDE = `${KEY_PART}(?:\\+${KEY_PART})*`;
const reactionPathParameter = z
  .union([pathId("Reaction"), z.string().regex(new RegExp(`^${KEY_SIDE}~(?:${KEY_SIDE}|\\*)$`))])
  .describe("The reaction key as the reaction page writes it (InChIKeys joined by +, ~ between the sides), or its numeric id");

/** The schema of each path parameter by name; an endpoint's `pathParameters` overrides one. */
export const PATH_PARAMETERS: Record<string, z.ZodType> = {
  id: pathId("Record"),
  n: z.int().min(1).max(2_147_483_647).describe("Version number: 1, 2, …"),
  inchikey: z
    .string()
    .regex(/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/)
    .describe("Standard InChIKey, upper case"),
  fileId: pathId("File"),
};

const datasetId = { id: pathId("Dataset") };

/** A public read of one version by dataset id and version number (published or retracted; any other is a 404). */
function publicVersionRead(
  entry: Pick<Endpoint, "summary" | "ok"> & Partial<Pick<Endpoint, "tag" | "query" | "cached" | "description">> & { under: string },
): Endpoint {
  const { under, ...rest } = entry;
  return {
    method: "GET",
    path: `/api/v1/datasets/:id/versions/:n${under}`,
    scope: null,
    who: PUBLIC_VERSIONS,
    tag: "Datasets",
    pathExample: { id: "1", n: "1" },
    pathParameters: datasetId,
    errors: [404],
    ...rest,
  };
}

export const API_ENDPOINTS: Endpoint[] = [
  // ---- public reads ----
  {
    method: "GET",
    path: "/api/v1/datasets",
    scope: null,
    who: "anyone (published and retracted datasets only)",
    tag: "Datasets",
    summary: "List datasets matching the search parameters, a page at a time",
    description: "The search parameters of GET /api/v1/search with view=datasets; `nextCursor` leads to the next page.",
    query: searchQuery,
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ query, parsed, understood, total, hits, facets, nextCursor, caution }",
      schema: "SearchAnswer",
    },
    errors: [],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/datasets/:id",
    pathParameters: datasetId,
    scope: null,
    who: "anyone, for datasets with a published or retracted version",
    tag: "Datasets",
    summary: "One dataset: its series identifier and every public version",
    pathExample: { id: "1" },
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: { id, seriesIdentifier, title, newestVersion, landingPage, versions } }",
      schema: "DatasetSeries",
    },
    errors: [404],
    cached: true,
  },
  publicVersionRead({
    under: "",
    summary: "One public version: its deposit document, identifiers, state and newest analysis",
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "The version, its document and newest analysis.",
      schema: "PublicVersion",
    },
    cached: true,
  }),
  publicVersionRead({
    under: "/points",
    summary: "Every point of a public version, as deposited and in canonical units, with residuals and findings",
    ok: { status: 200, contentType: JSON_TYPE, description: "The layout of points.json under `data`.", schema: "VersionPoints" },
    cached: true,
  }),
  publicVersionRead({
    under: "/analysis",
    summary: "The newest re-fit of a public version: Arrhenius, modified Arrhenius and Eyring fits, diagnostics and flags",
    ok: { status: 200, contentType: JSON_TYPE, description: "The newest analysis and its engine version.", schema: "VersionAnalysis" },
    cached: true,
  }),
  {
    method: "GET",
    path: "/api/v1/datasets/:id/citation",
    pathParameters: datasetId,
    scope: null,
    who: "anyone, for published and retracted versions",
    tag: "Citation",
    summary: "How to cite a dataset: one version (?version=n) or every version",
    pathExample: { id: "1" },
    query: [
      { name: "format", schema: citationShape.format, example: "bibtex" },
      { name: "style", schema: citationShape.style, description: "For format=text." },
      { name: "version", schema: citationShape.version, example: "1" },
    ],
    ok: { status: 200, contentType: "application/x-bibtex", description: "BibTeX, RIS, CSL-JSON or a formatted reference, by `format`." },
    errors: [404],
  },
  {
    method: "GET",
    path: "/api/v1/datasets/:id/citation/references",
    pathParameters: datasetId,
    scope: null,
    who: "anyone, for published and retracted versions",
    tag: "Citation",
    summary:
      "The formatted references of a version, its series and its source publication in one style (what a version page's Cite panel shows)",
    pathExample: { id: "1" },
    query: [
      { name: "style", schema: citationShape.style, example: "acs" },
      { name: "version", schema: citationShape.version, example: "1", description: "Without it, the newest public version." },
    ],
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description:
        "`{ style, version, series, source }`: `series` is null without a series identifier, `source` when the deposit names no source reference.",
    },
    errors: [404],
    cached: true,
  },
  publicVersionRead({
    under: "/datacite.json",
    tag: "Citation",
    summary: "DataCite metadata (kernel 4) of a version, as JSON",
    ok: { status: 200, contentType: JSON_TYPE, description: "DataCite JSON." },
  }),
  publicVersionRead({
    under: "/datacite.xml",
    tag: "Citation",
    summary: "DataCite metadata (kernel 4) of a version, as XML",
    ok: { status: 200, contentType: "application/xml", description: "DataCite XML." },
  }),
  publicVersionRead({
    under: "/parameters",
    summary: "Mechanism-ready parameters (A, n, Ea, T0, valid range) of a version's fits, as a table or Cantera YAML",
    query: queryOf(versionParametersQuerySchema.shape, { format: "cantera-yaml", k: "cm3 mol-1 s-1", energy: "kcal mol-1" }),
    ok: { status: 200, contentType: "text/plain or application/yaml", description: "An aligned table, or a YAML block with units." },
  }),
  publicVersionRead({
    under: "/export.json",
    summary: "A version's deposit document with its re-fits, flags and the engine version",
    ok: { status: 200, contentType: JSON_TYPE, description: "{ about, document, analysis }" },
  }),
  {
    method: "GET",
    path: "/api/v1/reactions/:id/parameters",
    pathParameters: { id: reactionPathParameter },
    scope: null,
    who: "anyone (reactions with published data)",
    tag: "Reactions and species",
    summary: "Mechanism-ready parameters of a reaction's consensus, as a table or Cantera YAML",
    pathExample: { id: "1" },
    query: queryOf(reactionParametersQuerySchema.shape, { format: "table" }),
    ok: { status: 200, contentType: "text/plain or application/yaml", description: "An aligned table, or a YAML block with units." },
    errors: [404],
  },
  {
    method: "GET",
    path: "/api/v1/search/export",
    scope: null,
    who: "anyone (published and retracted datasets only)",
    tag: "Search",
    summary: "The whole result of a search, streamed as CSV, JSON lines or JSON (every search parameter but limit and cursor)",
    query: [
      ...queryOf(searchExportQuerySchema.shape, { format: "csv" }),
      ...searchQuery.filter((p) => p.name !== "limit" && p.name !== "cursor"),
    ],
    ok: { status: 200, contentType: "text/csv, application/jsonl or application/json", description: "Streamed rows." },
    errors: [],
  },
  {
    method: "GET",
    path: "/api/v1/reactions/:id",
    pathParameters: { id: reactionPathParameter },
    scope: null,
    who: "anyone, for reactions with published data",
    tag: "Reactions and species",
    summary: "One reaction by its key (`~` for its `>>`; the numeric id too), its datasets and its consensus",
    pathExample: { id: "1" },
    query: consensusQuery,
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: { reaction, datasets, units, selection, consensus, unavailable, caution } }",
    },
    errors: [404],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/reactions/:id/consensus",
    pathParameters: { id: reactionPathParameter },
    scope: null,
    who: "anyone",
    tag: "Reactions and species",
    summary: "A reaction's consensus expression, what went in and why the rest did not",
    pathExample: { id: "1" },
    query: consensusQuery,
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { reaction, units, selection, consensus, unavailable, caution } }" },
    errors: [404],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/species/:inchikey",
    scope: null,
    who: "anyone, for species of reactions with published data",
    tag: "Reactions and species",
    summary: "A species by its InChIKey: identity, names and the public reactions it takes part in",
    pathExample: { inchikey: "VNWKTOKETHGBQD-UHFFFAOYSA-N" },
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: { inchiKey, inchi, smiles, formula, charge, molarMass, name, names, reactions } }",
      schema: "Species",
    },
    errors: [404],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/classes",
    scope: null,
    who: "anyone",
    tag: "Reactions and species",
    summary: "Every reaction class with its counts of public reactions and datasets",
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: [{ id, label, description, reactions, datasets, landingPage }] }",
      schema: "Classes",
    },
    errors: [],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/search",
    scope: null,
    who: "anyone (published and retracted datasets only)",
    tag: "Search",
    summary: "Datasets or reactions matching a text, a species or a reaction pattern and filters",
    query: searchQuery,
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ query, parsed, understood, total, hits, facets, nextCursor, caution }",
      schema: "SearchAnswer",
    },
    errors: [],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/search/suggest",
    scope: null,
    who: "anyone (published data only)",
    tag: "Search",
    summary: "Species and reactions for a search box as the reader types",
    query: [{ name: "q", schema: z.string().max(500), example: "meth" }],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ species, reactions }" },
    errors: [],
    cached: true,
  },
  {
    method: "GET",
    path: "/api/v1/identifiers",
    scope: null,
    who: "anyone",
    tag: "Citation",
    summary: "What a version or series identifier resolves to",
    query: [{ name: "identifier", schema: z.string(), example: "10.5072/ARH-4F7K-9QXM/2" }],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { … } } with the page it resolves to." },
    errors: [404, 422],
  },
  {
    method: "GET",
    path: "/api/v1/versions/:id/points.csv",
    pathParameters: { id: pathId("Version") },
    scope: null,
    who: "anyone, for published and retracted versions",
    tag: "Datasets",
    summary: "A public version's points as CSV (by version id), in deposited and canonical units",
    pathExample: { id: "1" },
    query: queryOf(pointsCsvQuerySchema.shape),
    ok: { status: 200, contentType: "text/csv", description: "CSV with a # header block." },
    errors: [404],
  },
  {
    method: "GET",
    path: "/api/v1/versions/:id/points.json",
    pathParameters: { id: pathId("Version") },
    scope: null,
    who: "anyone, for published and retracted versions",
    tag: "Datasets",
    summary: "A public version's points as JSON (by version id)",
    pathExample: { id: "1" },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ about, points }" },
    errors: [404],
  },
  {
    method: "POST",
    path: "/api/v1/analyses",
    scope: null,
    who: "anyone",
    tag: "Analysis",
    summary: "Fit posted (T, k) points as every deposited dataset is fitted; nothing is stored",
    body: {
      contentType: JSON_TYPE,
      schema: analysisRequestSchema,
      description: "Points, reaction order, units and T0.",
      example: '{"order": 2, "points": [{"T": 250, "k": 2.1e-15}, {"T": 300, "k": 6.4e-15}, {"T": 350, "k": 1.2e-14}]}',
    },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ units, analysis, caution }" },
    errors: [413, 422],
  },
  {
    method: "GET",
    path: "/api/v1/species/preview",
    scope: null,
    who: "anyone",
    tag: "Reactions and species",
    summary: "Identity and structure picture of a species given by SMILES or InChI",
    query: [
      { name: "smiles", schema: z.string(), example: "[OH]" },
      { name: "inchi", schema: z.string() },
    ],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { inchiKey, formula, …, svg } }" },
    errors: [422],
  },
  // ---- deposits with a personal token ----
  {
    method: "GET",
    path: "/api/v1/deposits",
    scope: "deposit:read",
    who: "researchers, curators and admins: their own datasets",
    tag: "Deposits",
    summary: "My deposits: every dataset I own or co-edit, newest version of each, drafts included",
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: [{ datasetId, versionId, number, title, state, role, lockVersion, problems, … }] }",
      schema: "MyDeposits",
    },
    errors: [403],
  },
  {
    method: "POST",
    path: "/api/v1/validate",
    scope: "deposit:read",
    who: "researchers, curators and admins",
    tag: "Deposits",
    summary: "Check a deposit document as a deposit is checked and fit it, storing nothing",
    description: "200 whether or not the document is valid: `valid`, every error with its JSON pointer, and the analysis when valid.",
    body: depositBody,
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { valid, errors, analysis } }", schema: "Validation" },
    errors: [403, 413],
  },
  {
    method: "POST",
    path: "/api/v1/datasets",
    scope: "deposit:write",
    who: "researchers",
    tag: "Deposits",
    summary: "Create a draft dataset from a deposit document",
    body: depositBody,
    headers: [idempotencyKey],
    ok: {
      status: 201,
      contentType: JSON_TYPE,
      description: "The new draft, and Location.",
      schema: "CreatedDraft",
    },
    errors: [403, 409, 413, 422],
  },
  {
    method: "GET",
    path: "/api/v1/versions/:id",
    scope: "deposit:read",
    who: "anyone for published versions; co-editors and curators otherwise",
    tag: "Deposits",
    summary: "One version by id, drafts included for their members; the ETag is its lock version",
    pathExample: { id: "1" },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { id, state, lockVersion, document, analysis, … } }" },
    errors: [403, 404],
  },
  {
    method: "PUT",
    path: "/api/v1/versions/:id",
    scope: "deposit:write",
    who: "owner and editors of a draft",
    tag: "Deposits",
    summary: "Replace a draft's deposit document",
    pathExample: { id: "1" },
    body: depositBody,
    headers: [ifMatch],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { versionId, lockVersion, state } } with the new ETag." },
    errors: [403, 404, 409, 412, 413, 422, 428],
  },
  {
    method: "POST",
    path: "/api/v1/versions/:id/transitions",
    scope: "deposit:write",
    who: "owner (submit, withdraw); curators (review, decide, retract)",
    tag: "Deposits",
    summary: "Submit, withdraw, review, decide or retract a version",
    pathExample: { id: "1" },
    body: {
      contentType: JSON_TYPE,
      schema: transitionRequestSchema,
      description: "The transition and its reason.",
      example: '{"transition": "submit"}',
    },
    headers: [idempotencyKey],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { … the version's new state } }" },
    errors: [403, 404, 409, 422],
  },
  {
    method: "POST",
    path: "/api/v1/versions/:id/next",
    scope: "deposit:write",
    who: "owner of a published version",
    tag: "Deposits",
    summary: "Start the next version of a published dataset as a draft copy",
    pathExample: { id: "1" },
    headers: [idempotencyKey],
    ok: { status: 201, contentType: JSON_TYPE, description: "{ data: { versionId, number, state, lockVersion } } and Location." },
    errors: [403, 404, 409],
  },
  {
    method: "GET",
    path: "/api/v1/versions/:id/files",
    scope: "deposit:read",
    who: "whoever may see the version",
    tag: "Files",
    summary: "A version's supplementary files",
    pathExample: { id: "1" },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: [ … ] }" },
    errors: [403, 404],
  },
  {
    method: "POST",
    path: "/api/v1/versions/:id/files",
    scope: "deposit:write",
    who: "owner and editors of a draft",
    tag: "Files",
    summary: "Add a supplementary file (multipart field “file”, at most 25 MB)",
    pathExample: { id: "1" },
    body: { contentType: "multipart/form-data", description: "One field named file.", example: "file=@spectra.zip" },
    headers: [idempotencyKey],
    ok: { status: 201, contentType: JSON_TYPE, description: "{ data: { … the file } }" },
    errors: [403, 404, 409, 413, 422],
  },
  {
    method: "GET",
    path: "/api/v1/files/:fileId",
    scope: "deposit:read",
    who: "whoever may see the version",
    tag: "Files",
    summary: "Download a supplementary file",
    pathExample: { fileId: "1" },
    ok: { status: 200, contentType: "application/octet-stream", description: "The file." },
    errors: [403, 404],
  },
  {
    method: "DELETE",
    path: "/api/v1/files/:fileId",
    scope: "deposit:write",
    who: "owner and editors of a draft",
    tag: "Files",
    summary: "Remove a supplementary file from a draft",
    pathExample: { fileId: "1" },
    ok: { status: 204, contentType: JSON_TYPE, description: "Nothing." },
    errors: [403, 404, 409],
  },
  // ---- people (admins) ----
  {
    method: "GET",
    path: "/api/v1/users",
    scope: "admin",
    who: "admins",
    tag: "People",
    summary: "Everyone with an account",
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: [ … ] }" },
    errors: [403],
  },
  {
    method: "PATCH",
    path: "/api/v1/users/:id",
    scope: "admin",
    who: "admins",
    tag: "People",
    summary: "Change a person's role or deactivate the account (audited)",
    pathExample: { id: "2" },
    body: { contentType: JSON_TYPE, schema: userPatchSchema, description: "role and/or active.", example: '{"role": "curator"}' },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { … the person } }" },
    errors: [403, 404, 422],
  },
  // ---- harvesting (OAI-PMH 2.0; arguments read by lib/oai/protocol.ts, answers are protocol XML, errors included) ----
  {
    method: "GET",
    path: "/oai",
    scope: null,
    who: "anyone; published versions only (retracted ones as deleted records)",
    tag: "Harvesting",
    summary: "OAI-PMH 2.0 repository: Identify, ListMetadataFormats, ListSets, ListIdentifiers, ListRecords, GetRecord",
    query: [
      { name: "verb", schema: z.enum(OAI_VERBS), example: "ListRecords" },
      { name: "metadataPrefix", schema: z.enum(["oai_dc", "oai_datacite"]), example: "oai_datacite" },
      { name: "identifier", schema: z.string(), description: "oai:<host>:<version identifier>" },
      { name: "set", schema: z.string(), description: "A reaction class id (ListSets names them)." },
      { name: "from", schema: z.string(), description: "YYYY-MM-DD or YYYY-MM-DDThh:mm:ssZ, inclusive." },
      { name: "until", schema: z.string(), description: "YYYY-MM-DD or YYYY-MM-DDThh:mm:ssZ, inclusive." },
      { name: "resumptionToken", schema: z.string(), description: "From the previous page; alone with the verb." },
    ],
    ok: { status: 200, contentType: "text/xml", description: "An OAI-PMH response; protocol errors are error elements in it." },
    errors: [],
  },
  {
    method: "POST",
    path: "/oai",
    scope: null,
    who: "anyone; published versions only (retracted ones as deleted records)",
    tag: "Harvesting",
    summary: "The same OAI-PMH requests, the arguments in a form-encoded body",
    body: { contentType: "application/x-www-form-urlencoded", description: "The arguments of the GET form, e.g. verb=Identify." },
    ok: { status: 200, contentType: "text/xml", description: "An OAI-PMH response; protocol errors are error elements in it." },
    errors: [413],
  },
  // ---- mechanism checks ----
  {
    method: "POST",
    path: "/api/v1/mechanism-checks",
    scope: "deposit:read",
    who: "signed-in people; the check is theirs",
    tag: "Mechanisms",
    summary: "Check a mechanism (Cantera YAML or the plain-text layout) against the published data",
    description:
      "The body is the mechanism itself (text; window and name in the query) or JSON {text, name?, window?: {Tmin, Tmax}, format?}. At most 20 MB and 50 000 reactions; a file that cannot be read is refused at once (422 naming line and column), malformed lines are listed with line and column and the rest is checked. Every check, small or large, then runs as a background job: the answer is 202 with the check queued; poll the Location (GET /api/v1/mechanism-checks/:id) until its state is done (the report) or failed (the error in words). Elementary modified-Arrhenius reactions get a verdict against their reaction's consensus (agrees, disagrees, extrapolated, no data); other rate types are listed as not checked yet.",
    query: [
      { name: "Tmin", schema: z.coerce.number(), description: "Lower end of the use window, K (default 300).", example: "300" },
      { name: "Tmax", schema: z.coerce.number(), description: "Upper end of the use window, K (default 2500).", example: "2500" },
      { name: "name", schema: z.string(), description: "A name for the check." },
      { name: "format", schema: z.enum(["auto", "cantera-yaml", "plain-text"]) },
    ],
    body: {
      contentType: JSON_TYPE,
      schema: mechanismCheckBodySchema,
      description: "The mechanism and the use window.",
      example:
        '{"text": "SPECIES OH CH4 CH3 H2O END\\nREACTIONS\\nOH+CH4<=>CH3+H2O 1.0E8 1.6 3120\\nEND\\n", "window": {"Tmin": 300, "Tmax": 2000}}',
    },
    ok: {
      status: 202,
      contentType: JSON_TYPE,
      description: "{ data: { id, state: 'queued', url, reactions, problems } }; Location names the check to poll.",
    },
    errors: [400, 401, 403, 413, 422],
  },
  {
    method: "GET",
    path: "/api/v1/mechanism-checks/:id",
    scope: "deposit:read",
    who: "its owner, or anyone with its share link (?share=…)",
    tag: "Mechanisms",
    summary:
      "One mechanism check: its state and progress while queued or running, then its report; format=json downloads the report as a file, format=csv as CSV, format=mapping its species mapping",
    query: [
      { name: "format", schema: z.enum(["json", "csv", "mapping"]), example: "csv" },
      { name: "share", schema: z.string(), description: "The share token of the owner's link." },
    ],
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description:
        "{ data: { id, state (queued, running, done, failed), stage, progress, total, progressText, attempts, error, name, report: { about, summary, problems, species, reactions } | null } }",
    },
    errors: [400, 404],
  },
  {
    method: "POST",
    path: "/api/v1/mechanism-checks/:id/share",
    scope: "deposit:read",
    who: "its owner",
    tag: "Mechanisms",
    summary: "Turn a check's share link on (a new token each time) or off",
    body: { contentType: JSON_TYPE, schema: shareBodySchema, description: "{shared: true|false}", example: '{"shared": true}' },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { shared, url } }" },
    errors: [401, 403, 404, 422],
  },
  {
    method: "POST",
    path: "/api/v1/mechanism-checks/species-choices",
    scope: "deposit:read",
    who: "signed-in people: their own choices",
    tag: "Mechanisms",
    summary: "Remember which species a mechanism name stands for (JSON, or the mapping CSV with columns name and inchikey)",
    body: {
      contentType: JSON_TYPE,
      schema: speciesChoicesBodySchema,
      description: "The choices; text/csv takes the mapping a report downloads (rows without an InChIKey are skipped).",
      example: '{"choices": [{"name": "C2H5OH", "inchiKey": "LFQSCWFLJHTTHZ-UHFFFAOYSA-N"}]}',
    },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { saved } }" },
    errors: [401, 403, 413, 422],
  },
  {
    method: "DELETE",
    path: "/api/v1/mechanism-checks/species-choices",
    scope: "deposit:read",
    who: "signed-in people: their own choices",
    tag: "Mechanisms",
    summary: "Forget one remembered choice (the next check matches that name by name and composition again)",
    query: queryOf({ name: z.string().min(1).max(200).describe("The species name as the mechanism writes it") }, { name: "C2H5OH" }),
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { forgotten } }" },
    errors: [400, 401, 403, 404],
  },
  {
    method: "POST",
    path: "/api/v1/mechanism-checks/:id/rerun",
    scope: "deposit:read",
    who: "its owner",
    tag: "Mechanisms",
    summary: "Run a finished or failed check again, with the owner's species choices as they are now",
    ok: { status: 202, contentType: JSON_TYPE, description: "{ data: { id, state: 'queued', url } }; Location names the check to poll." },
    errors: [401, 403, 404, 409],
  },
  {
    method: "GET",
    path: "/api/v1/mechanism-checks/species-search",
    scope: "deposit:read",
    who: "signed-in people",
    tag: "Mechanisms",
    summary: "Species a mechanism name may stand for, by name (any part), formula, SMILES, InChI or InChIKey (at most 20)",
    query: [{ name: "q", schema: z.string(), description: "The text searched.", example: "[O]" }],
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: [{ inchiKey, formula, smiles, name, names }] }" },
    errors: [400, 401, 403],
  },
  // ---- collections ----
  {
    method: "POST",
    path: "/api/v1/collections",
    scope: "deposit:write",
    who: "signed-in people; the collection is theirs",
    tag: "Collections",
    summary: "Make a collection: a title, a description and published dataset versions (by version id, each with an optional note)",
    description:
      "The collection starts as a private draft (version 1). Only published dataset versions can join: a draft, someone else's unpublished version or a retracted version is refused (422 naming the member by its JSON pointer), and nothing is stored.",
    body: {
      contentType: JSON_TYPE,
      schema: createCollectionSchema,
      description: "{title, description?, members?: [{versionId, note?}]}",
      example: '{"title": "Rate data behind our mechanism, release 2", "members": [{"versionId": 1, "note": "used for R12"}]}',
    },
    ok: { status: 201, contentType: JSON_TYPE, description: "{ data: { id, number, state, url } }; Location names the collection." },
    errors: [401, 403, 413, 422],
  },
  {
    method: "GET",
    path: "/api/v1/collections",
    scope: null,
    who: "anyone; published collections only",
    tag: "Collections",
    summary: "The published collections, most recently published first",
    query: queryOf(collectionListQuerySchema.shape, { limit: "20" }),
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: [ { id, number, title, versionIdentifier, publishedAt, owner, memberCount, url } ], meta }",
      schema: "CollectionList",
    },
    errors: [],
  },
  {
    method: "GET",
    path: "/api/v1/collections/:id",
    scope: "deposit:read",
    who: "anyone for published collections; its owner sees the draft too",
    tag: "Collections",
    summary: "A collection's newest version with its members (its owner: the draft, if any)",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: {
      status: 200,
      contentType: JSON_TYPE,
      description: "{ data: { id, owner, seriesIdentifier, version, versions, members, caution } }",
      schema: "Collection",
    },
    errors: [404],
  },
  {
    method: "PATCH",
    path: "/api/v1/collections/:id",
    scope: "deposit:write",
    who: "its owner, while the newest version is a draft",
    tag: "Collections",
    summary: "Change the draft's title or description (a published version never changes: 409)",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    body: {
      contentType: JSON_TYPE,
      schema: patchCollectionSchema,
      description: "{title?, description?}",
      example: '{"title": "Release 3"}',
    },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { … the collection } }" },
    errors: [401, 403, 404, 409, 422],
  },
  {
    method: "DELETE",
    path: "/api/v1/collections/:id",
    scope: "deposit:write",
    who: "its owner, while it was never published",
    tag: "Collections",
    summary: "Delete a collection that was never published (a published one stays: 409)",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: { status: 204, contentType: JSON_TYPE, description: "Deleted." },
    errors: [401, 403, 404, 409],
  },
  {
    method: "POST",
    path: "/api/v1/collections/:id/members",
    scope: "deposit:write",
    who: "its owner, while the newest version is a draft",
    tag: "Collections",
    summary:
      "Add published dataset versions to the draft (all or none; a member already there keeps its place, a note given replaces its note)",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    body: {
      contentType: JSON_TYPE,
      schema: addMembersSchema,
      description: "{members: [{versionId, note?}]}",
      example: '{"members": [{"versionId": 2}]}',
    },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { number, memberCount } }" },
    errors: [401, 403, 404, 409, 413, 422],
  },
  {
    method: "DELETE",
    path: "/api/v1/collections/:id/members/:versionId",
    scope: "deposit:write",
    who: "its owner, while the newest version is a draft",
    tag: "Collections",
    summary: "Take one member out of the draft",
    pathExample: { id: "1", versionId: "2" },
    pathParameters: { id: pathId("Collection"), versionId: pathId("Version") },
    ok: { status: 204, contentType: JSON_TYPE, description: "Removed." },
    errors: [401, 403, 404, 409],
  },
  {
    method: "POST",
    path: "/api/v1/collections/:id/publish",
    scope: "deposit:write",
    who: "its owner",
    tag: "Collections",
    summary: "Publish the draft: frozen from then on, with its own identifier registered with DataCite metadata (HasPart for every member)",
    description:
      "Every member must still be published (a member retracted since it was added is named, 422). The identifier is `<series>/<n>`; the series is minted with the first publication.",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { id, number, state, versionIdentifier, url } }" },
    errors: [401, 403, 404, 409, 422],
  },
  {
    method: "POST",
    path: "/api/v1/collections/:id/revisions",
    scope: "deposit:write",
    who: "its owner, when the newest version is published",
    tag: "Collections",
    summary: "Start a new version: a draft copied from the latest published one (members retracted since are left out and listed)",
    pathExample: { id: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: { status: 201, contentType: JSON_TYPE, description: "{ data: { id, number, state, leftOut, url } }" },
    errors: [401, 403, 404, 409],
  },
  {
    method: "GET",
    path: "/api/v1/collections/:id/versions/:n",
    scope: "deposit:read",
    who: "anyone for published versions; its owner sees the draft too",
    tag: "Collections",
    summary: "One version of a collection with its members",
    pathExample: { id: "1", n: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: { status: 200, contentType: JSON_TYPE, description: "{ data: { … the collection at that version } }" },
    errors: [404],
  },
  {
    method: "GET",
    path: "/api/v1/collections/:id/versions/:n/citation",
    scope: null,
    who: "anyone, for published versions",
    tag: "Collections",
    summary: "The collection version's citation; members=1 adds every member's citation after it",
    pathExample: { id: "1", n: "1" },
    pathParameters: { id: pathId("Collection") },
    query: queryOf(collectionCitationQuerySchema.shape, { format: "bibtex", members: "1" }),
    ok: {
      status: 200,
      contentType: "application/x-bibtex",
      description: "The citation as a file (BibTeX, RIS, CSL-JSON or a formatted reference).",
    },
    errors: [400, 404],
  },
  {
    method: "GET",
    path: "/api/v1/collections/:id/versions/:n/parameters",
    scope: null,
    who: "anyone, for published versions",
    tag: "Collections",
    summary:
      "Every member's preferred fit in one mechanism file (plain text or Cantera YAML), each reaction commented with its version identifier",
    pathExample: { id: "1", n: "1" },
    pathParameters: { id: pathId("Collection") },
    query: queryOf(collectionParametersQuerySchema.shape, { format: "cantera-yaml" }),
    ok: {
      status: 200,
      contentType: "application/yaml",
      description: "The file, with the caution and the collection's citation in its header.",
    },
    errors: [400, 404],
  },
  {
    method: "GET",
    path: "/api/v1/collections/:id/versions/:n/datacite.json",
    scope: null,
    who: "anyone, for published versions",
    tag: "Collections",
    summary: "The DataCite metadata the collection version is registered with (resourceTypeGeneral Collection, HasPart each member)",
    pathExample: { id: "1", n: "1" },
    pathParameters: { id: pathId("Collection") },
    ok: { status: 200, contentType: JSON_TYPE, description: "The JSON:API body sent to the agency." },
    errors: [404],
  },
  // ---- this document ----
  {
    method: "GET",
    path: "/api/v1/openapi.json",
    scope: null,
    who: "anyone",
    tag: "Document",
    summary: "This API as an OpenAPI 3.1 document",
    ok: { status: 200, contentType: JSON_TYPE, description: "The OpenAPI document." },
    errors: [],
    cached: true,
  },
];

import { z } from "zod";
import { SEARCH_FACETS } from "@/lib/search/types";

/**
 * zod schemas of the REST API's main JSON answers: the OpenAPI document describes each answer with
 * its schema (components/schemas, by the names in RESPONSE_SCHEMAS), and
 * tests/integration/api-responses.test.ts parses every handler's real answer with it, so the
 * document and the handlers cannot drift apart. Objects are strict: a field a handler adds must be
 * described here first. Deposit documents and analyses keep their own published descriptions (the
 * deposit JSON Schema, /docs/api's fit conventions) and are open objects here. Pure.
 */

const isoDate = z.iso.datetime({ offset: true }).describe("ISO 8601 date-time");
const url = z.string().describe("Absolute URL of the page");
const versionState = z.enum(["draft", "submitted", "in_review", "returned", "published", "declined", "retracted"]);
const publicState = z.enum(["published", "retracted"]);
const openObject = z.record(z.string(), z.unknown());
const caution = z.string().describe("The caution sentence every answer with fitted parameters carries");
const versionIdentifier = z.string().describe('DOI-style version identifier, "10.5072/ARH-4F7K-9QXM/2"');

/** GET /api/v1/datasets/:id */
export const datasetSeriesResponse = z.strictObject({
  data: z.strictObject({
    id: z.int(),
    seriesIdentifier: z.string().nullable(),
    title: z.string().nullable(),
    newestVersion: z.int(),
    landingPage: url,
    versions: z.array(
      z.strictObject({
        number: z.int(),
        state: publicState,
        versionIdentifier: versionIdentifier.nullable(),
        publishedAt: isoDate.nullable(),
        retractedAt: isoDate.nullable(),
        landingPage: url,
        href: z.string(),
      }),
    ),
  }),
});

/** GET /api/v1/datasets/:id/versions/:n */
export const publicVersionResponse = z.strictObject({
  data: z.strictObject({
    id: z.int(),
    datasetId: z.int(),
    number: z.int(),
    state: publicState,
    title: z.string(),
    versionIdentifier: versionIdentifier.nullable(),
    payloadSha256: z.string().nullable(),
    publishedAt: isoDate.nullable(),
    retraction: z.strictObject({ at: isoDate, notice: z.string().nullable() }).nullable(),
    document: openObject.describe("The deposit document as stored (JSON Schema at /schemas/deposit/v1.json)"),
    analysis: z.strictObject({ engineVersion: z.string(), result: openObject.nullable(), checks: z.array(openObject) }).nullable(),
    caution,
    landingPage: url,
  }),
});

/** GET /api/v1/datasets/:id/versions/:n/analysis */
export const versionAnalysisResponse = z.strictObject({
  data: z.strictObject({
    engineVersion: z.string(),
    createdAt: isoDate.nullable(),
    result: openObject.nullable().describe("Every fit, diagnostics, curvature test and flags (conventions on /docs/api)"),
    checks: z.array(openObject),
    error: z.string().nullable(),
    caution,
  }),
});

const unitsOfPoints = z.strictObject({ T: z.string(), k: z.string(), pressure: z.string() }).describe("ASCII unit ids");

/** GET /api/v1/datasets/:id/versions/:n/points (and points.json, without the `data` wrapper) */
export const versionPointsResponse = z.strictObject({
  data: z.strictObject({
    about: z.strictObject({
      versionIdentifier: versionIdentifier.nullable(),
      title: z.string(),
      version: z.int(),
      state: z.string(),
      retraction: z.strictObject({ at: z.string().nullable(), notice: z.string().nullable() }).nullable(),
      licence: z.string(),
      citation: z.string(),
      landingPage: url,
      caution,
      /** The deposit's notes on its other conditions, when it gives any. */
      otherConditions: z.string().nullable(),
      units: unitsOfPoints,
      residuals: z
        .strictObject({
          model: z.enum(["arrhenius", "modified_arrhenius"]),
          weighted: z.boolean(),
          engineVersion: z.string().nullable(),
          definition: z.string().nullable(),
        })
        .nullable(),
    }),
    points: z.array(
      z.strictObject({
        row: z.int(),
        deposited: openObject.describe("T, k, uncertainty and pressure as deposited, with their units"),
        converted: z.strictObject({
          T: z.number(),
          k: z.number(),
          sigmaLnK: z.number().nullable(),
          pressure: z.number().nullable(),
        }),
        bathGas: z.string().nullable(),
        note: z.string().nullable(),
        residualLnK: z.number().nullable(),
        residualInSigma: z.number().nullable(),
        findings: z.array(z.strictObject({ code: z.string(), reason: z.string() })),
      }),
    ),
  }),
});

/** GET /api/v1/classes */
export const classesResponse = z.strictObject({
  data: z.array(
    z.strictObject({
      id: z.string(),
      label: z.string(),
      description: z.string(),
      reactions: z.int(),
      datasets: z.int(),
      landingPage: url,
    }),
  ),
});

/** GET /api/v1/species/:inchikey */
export const speciesResponse = z.strictObject({
  data: z.strictObject({
    id: z.int(),
    inchiKey: z.string().regex(/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/),
    inchi: z.string(),
    smiles: z.string(),
    formula: z.string().describe("Hill formula"),
    charge: z.int(),
    molarMass: z.number().describe("g mol-1"),
    name: z.string(),
    names: z.array(z.string()),
    landingPage: url,
    reactions: z.array(
      z.strictObject({
        id: z.int(),
        key: z.string(),
        equation: z.string(),
        datasets: z.int(),
        retracted: z.int(),
        asReactant: z.boolean(),
        asProduct: z.boolean(),
        href: z.string(),
        landingPage: url,
      }),
    ),
  }),
});

const datasetHit = z.strictObject({
  versionId: z.int(),
  datasetId: z.int(),
  versionNumber: z.int(),
  versionIdentifier: versionIdentifier.nullable(),
  retracted: z.boolean(),
  title: z.string(),
  equation: z.string(),
  reactionKey: z.string(),
  reactionClass: z.string().nullable(),
  methodCategory: z.string().nullable(),
  tMin: z.number(),
  tMax: z.number(),
  pointCount: z.int(),
  ea: z.number().nullable().describe("J mol-1"),
  a: z.number().nullable(),
  aUnit: z.string().nullable().describe('ASCII unit id, "cm3 molecule-1 s-1"'),
  flags: z.array(z.string()),
  creators: z.array(z.string()),
  publishedAt: isoDate,
});

const reactionHit = z.strictObject({
  reactionId: z.int(),
  reactionKey: z.string(),
  equation: z.string(),
  datasetCount: z.int(),
  retractedCount: z.int(),
  tMin: z.number().nullable(),
  tMax: z.number().nullable(),
  consensus: z
    .strictObject({
      model: z.enum(["arrhenius", "modified_arrhenius"]),
      a: z.number(),
      n: z.number(),
      ea: z.number(),
      aUnit: z.string(),
      tMin: z.number(),
      tMax: z.number(),
    })
    .nullable(),
  spread: z.number().nullable(),
});

/** GET /api/v1/search and GET /api/v1/datasets (datasets hits only) */
export const searchResponse = z.strictObject({
  query: openObject.describe("The search as understood: text, view, filters, sort, limit"),
  parsed: z.string().describe("What the text was understood as, in words"),
  understood: openObject,
  total: z.int(),
  hits: z.union([z.array(datasetHit), z.array(reactionHit)]),
  facets: z.record(z.enum(SEARCH_FACETS), z.array(z.strictObject({ value: z.string(), count: z.int() }))),
  nextCursor: z.string().nullable(),
  caution,
});

/** GET /api/v1/deposits */
export const depositsResponse = z.strictObject({
  data: z.array(
    z.strictObject({
      datasetId: z.int(),
      versionId: z.int(),
      number: z.int(),
      title: z.string(),
      state: versionState,
      role: z.enum(["owner", "editor", "viewer"]),
      lockVersion: z.int(),
      versionIdentifier: versionIdentifier.nullable(),
      problems: z.int(),
      updatedAt: isoDate,
      submittedAt: isoDate.nullable(),
      publishedAt: isoDate.nullable(),
      href: z.string(),
    }),
  ),
});

const fieldError = z.object({ pointer: z.string(), message: z.string() }).loose();

/** POST /api/v1/validate */
export const validateResponse = z.strictObject({
  data: z.union([
    z.strictObject({
      valid: z.literal(true),
      title: z.string(),
      points: z.int(),
      errors: z.array(fieldError).max(0),
      analysis: openObject.nullable(),
    }),
    z.strictObject({ valid: z.literal(false), summary: z.string(), errors: z.array(fieldError), analysis: z.null() }),
  ]),
});

/** POST /api/v1/datasets (201) */
export const createdDraftResponse = z.strictObject({
  data: z.strictObject({ versionId: z.int(), datasetId: z.int(), number: z.int(), state: versionState, lockVersion: z.int() }),
});

/** The named answers, as components/schemas of the OpenAPI document. */
const collectionState = z.enum(["draft", "published"]);

/** GET /api/v1/collections/:id (and …/versions/:n) */
export const collectionResponse = z.strictObject({
  data: z.strictObject({
    id: z.int(),
    owner: z.strictObject({ name: z.string() }),
    seriesIdentifier: z.string().nullable().describe("Minted with the first publication; every version's identifier is <series>/<n>"),
    version: z.strictObject({
      number: z.int(),
      state: collectionState,
      title: z.string(),
      description: z.string(),
      versionIdentifier: versionIdentifier.nullable(),
      publishedAt: isoDate.nullable(),
      url,
      citation: z.string().nullable().describe("The collection's one-line citation; null for a draft"),
    }),
    versions: z.array(
      z.strictObject({
        number: z.int(),
        state: collectionState,
        versionIdentifier: versionIdentifier.nullable(),
        publishedAt: isoDate.nullable(),
        memberCount: z.int(),
      }),
    ),
    members: z.array(
      z.strictObject({
        versionId: z.int(),
        datasetId: z.int(),
        number: z.int(),
        title: z.string(),
        equation: z.string(),
        state: publicState.describe("A member retracted after the collection was published stays, marked"),
        versionIdentifier: versionIdentifier.nullable(),
        retractionNotice: z.string().nullable(),
        newerVersion: z.int().nullable().describe("The dataset's newest published version when it is newer than the member"),
        note: z.string().nullable(),
        url,
      }),
    ),
    caution,
  }),
});

/** GET /api/v1/collections */
export const collectionListResponse = z.strictObject({
  data: z.array(
    z.strictObject({
      id: z.int(),
      number: z.int(),
      title: z.string(),
      versionIdentifier: versionIdentifier.nullable(),
      publishedAt: isoDate.nullable(),
      owner: z.strictObject({ name: z.string() }),
      memberCount: z.int(),
      url: z.string().describe("The collection's page (its newest published version), a path"),
    }),
  ),
  meta: z.strictObject({ limit: z.int(), offset: z.int() }),
});

export const RESPONSE_SCHEMAS = {
  Collection: collectionResponse,
  CollectionList: collectionListResponse,
  DatasetSeries: datasetSeriesResponse,
  PublicVersion: publicVersionResponse,
  VersionAnalysis: versionAnalysisResponse,
  VersionPoints: versionPointsResponse,
  Classes: classesResponse,
  Species: speciesResponse,
  SearchAnswer: searchResponse,
  MyDeposits: depositsResponse,
  Validation: validateResponse,
  CreatedDraft: createdDraftResponse,
} as const;

export type ResponseSchemaName = keyof typeof RESPONSE_SCHEMAS;

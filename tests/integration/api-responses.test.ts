import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import type { z } from "zod";
import * as classes from "@/app/api/v1/classes/route";
import * as datasetById from "@/app/api/v1/datasets/[id]/route";
import * as versionAnalysis from "@/app/api/v1/datasets/[id]/versions/[n]/analysis/route";
import * as versionPoints from "@/app/api/v1/datasets/[id]/versions/[n]/points/route";
import * as versionByNumber from "@/app/api/v1/datasets/[id]/versions/[n]/route";
import * as datasets from "@/app/api/v1/datasets/route";
import * as deposits from "@/app/api/v1/deposits/route";
import * as search from "@/app/api/v1/search/route";
import * as speciesByKey from "@/app/api/v1/species/[inchikey]/route";
import * as validate from "@/app/api/v1/validate/route";
import * as collections from "@/app/api/v1/collections/route";
import * as collectionById from "@/app/api/v1/collections/[id]/route";
import { createCollection, publishCollection } from "@/lib/collections/queries";
import { API_ENDPOINTS } from "@/lib/api/endpoints";
import { RESPONSE_SCHEMAS, type ResponseSchemaName } from "@/lib/api/responses";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { createApiToken, createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

/**
 * The OpenAPI document's answer schemas (lib/api/responses.ts) against the handlers' real answers:
 * each named schema parses the JSON its endpoint wrote, strictly (a field the document does not
 * describe fails here), for a published version made for the test.
 */

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
const call = (handler: unknown, path: string, params: Record<string, string> = {}, init: RequestInit = {}) =>
  (handler as Handler)(new Request(`http://127.0.0.1${path}`, init), { params: Promise.resolve(params) });

let owner: UserDto;
let token: string;
let writeToken: string;
let published: { datasetId: number; inchiKey: string };
let collectionId: number;

beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("answers"), name: "answers", passwordHash: "x", role: "researcher", verified: true });
  const curator = await createUser({ email: uniqueEmail("answers-cur"), name: "cur", passwordHash: "x", role: "curator", verified: true });
  const doc = structuredClone(EXAMPLE_DEPOSIT);
  doc.title = `Answer schemas ${uniqueEmail("t")}`;
  const v = await depositNewDataset({ actor: owner, document: doc });
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "For the test." });
  const [row] = await sql`select s.inchi_key from dataset_versions v join reaction_participants rp on rp.reaction_id = v.reaction_id
    join species s on s.id = rp.species_id where v.id = ${v.id} limit 1`;
  published = { datasetId: v.datasetId, inchiKey: row.inchi_key };
  // A published collection holding it, with a note.
  collectionId = (
    await createCollection({
      ownerId: owner.id,
      title: "Answer schemas collection",
      description: "",
      members: [{ versionId: v.id, note: "used for R1" }],
    })
  ).id;
  await publishCollection({ collectionId, actorId: owner.id });
  token = (await createApiToken({ userId: owner.id, name: "answers", scopes: ["deposit:read"] })).secret;
  writeToken = (await createApiToken({ userId: owner.id, name: "answers-write", scopes: ["deposit:write"] })).secret;
}, 120_000);

/** Each named answer, and how to get a real one. */
const answers: [ResponseSchemaName, string, () => Promise<Response>][] = [
  ["DatasetSeries", "GET /api/v1/datasets/:id", () => call(datasetById.GET, "/x", { id: String(published.datasetId) })],
  [
    "PublicVersion",
    "GET /api/v1/datasets/:id/versions/:n",
    () => call(versionByNumber.GET, "/x", { id: String(published.datasetId), n: "1" }),
  ],
  [
    "VersionPoints",
    "GET /api/v1/datasets/:id/versions/:n/points",
    () => call(versionPoints.GET, "/x", { id: String(published.datasetId), n: "1" }),
  ],
  [
    "VersionAnalysis",
    "GET /api/v1/datasets/:id/versions/:n/analysis",
    () => call(versionAnalysis.GET, "/x", { id: String(published.datasetId), n: "1" }),
  ],
  ["Classes", "GET /api/v1/classes", () => call(classes.GET, "/api/v1/classes")],
  ["Collection", "GET /api/v1/collections/:id", () => call(collectionById.GET, "/x", { id: String(collectionId) })],
  ["CollectionList", "GET /api/v1/collections", () => call(collections.GET, "/api/v1/collections?limit=100")],
  ["Species", "GET /api/v1/species/:inchikey", () => call(speciesByKey.GET, "/x", { inchikey: published.inchiKey })],
  ["SearchAnswer", "GET /api/v1/datasets", () => call(datasets.GET, "/api/v1/datasets?q=Answer+schemas&limit=5")],
  ["SearchAnswer", "GET /api/v1/search", () => call(search.GET, "/api/v1/search?view=reactions&limit=5")],
  [
    "MyDeposits",
    "GET /api/v1/deposits",
    () => call(deposits.GET, "/api/v1/deposits", {}, { headers: { authorization: `Bearer ${token}` } }),
  ],
  [
    "Validation",
    "POST /api/v1/validate",
    () =>
      call(
        validate.POST,
        "/api/v1/validate",
        {},
        { method: "POST", body: JSON.stringify(EXAMPLE_DEPOSIT), headers: { authorization: `Bearer ${token}` } },
      ),
  ],
  [
    "Validation",
    "POST /api/v1/validate",
    () =>
      call(
        validate.POST,
        "/api/v1/validate",
        {},
        {
          method: "POST",
          body: JSON.stringify({ ...EXAMPLE_DEPOSIT, points: [{ T: -5, k: 1 }] }),
          headers: { authorization: `Bearer ${token}` },
        },
      ),
  ],
];

describe("the answers the OpenAPI document describes are the answers the handlers write", () => {
  it.each(answers)("%s parses %s", async (name, endpoint, get) => {
    const res = await get();
    expect(res.status).toBe(200);
    const body = await res.json();
    const parsed = (RESPONSE_SCHEMAS[name] as z.ZodType).safeParse(body);
    expect(parsed.success ? [] : parsed.error.issues.slice(0, 5)).toEqual([]);
    const [method, path] = endpoint.split(" ");
    expect(API_ENDPOINTS.find((e) => e.method === method && e.path === path)?.ok.schema).toBe(name);
  });

  it("CreatedDraft parses POST /api/v1/datasets (201)", async () => {
    const doc = { ...structuredClone(EXAMPLE_DEPOSIT), title: `Answer schemas draft ${uniqueEmail("d")}` };
    const res = await call(
      datasets.POST,
      "/api/v1/datasets",
      {},
      { method: "POST", body: JSON.stringify(doc), headers: { authorization: `Bearer ${writeToken}` } },
    );
    expect(res.status).toBe(201);
    const parsed = RESPONSE_SCHEMAS.CreatedDraft.safeParse(await res.json());
    expect(parsed.success ? [] : parsed.error.issues).toEqual([]);
    expect(API_ENDPOINTS.find((e) => e.method === "POST" && e.path === "/api/v1/datasets")?.ok.schema).toBe("CreatedDraft");
  });

  it("a search hit carries its rate-constant unit in the files' ASCII spelling", async () => {
    const body = await (await call(datasets.GET, "/api/v1/datasets?q=Answer+schemas&limit=5")).json();
    for (const hit of body.hits) if (hit.aUnit) expect(hit.aUnit).toMatch(/^[\x20-\x7e]+$/);
  });
});

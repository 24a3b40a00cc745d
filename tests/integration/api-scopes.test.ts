import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import * as analyses from "@/app/api/v1/analyses/route";
import * as classes from "@/app/api/v1/classes/route";
import * as datasetById from "@/app/api/v1/datasets/[id]/route";
import * as versionAnalysis from "@/app/api/v1/datasets/[id]/versions/[n]/analysis/route";
import * as versionPoints from "@/app/api/v1/datasets/[id]/versions/[n]/points/route";
import * as versionByNumber from "@/app/api/v1/datasets/[id]/versions/[n]/route";
import * as deposits from "@/app/api/v1/deposits/route";
import * as openapi from "@/app/api/v1/openapi.json/route";
import * as reactionByKey from "@/app/api/v1/reactions/[id]/route";
import * as speciesByKey from "@/app/api/v1/species/[inchikey]/route";
import * as validate from "@/app/api/v1/validate/route";
import * as datasetCitation from "@/app/api/v1/datasets/[id]/citation/route";
import * as datasetCitationReferences from "@/app/api/v1/datasets/[id]/citation/references/route";
import * as dataciteJson from "@/app/api/v1/datasets/[id]/versions/[n]/datacite.json/route";
import * as dataciteXml from "@/app/api/v1/datasets/[id]/versions/[n]/datacite.xml/route";
import * as versionExport from "@/app/api/v1/datasets/[id]/versions/[n]/export.json/route";
import * as versionParameters from "@/app/api/v1/datasets/[id]/versions/[n]/parameters/route";
import * as reactionParameters from "@/app/api/v1/reactions/[id]/parameters/route";
import * as searchExport from "@/app/api/v1/search/export/route";
import * as datasets from "@/app/api/v1/datasets/route";
import * as files from "@/app/api/v1/files/[fileId]/route";
import * as identifiers from "@/app/api/v1/identifiers/route";
import * as reactionConsensus from "@/app/api/v1/reactions/[id]/consensus/route";
import * as search from "@/app/api/v1/search/route";
import * as searchSuggest from "@/app/api/v1/search/suggest/route";
import * as speciesPreview from "@/app/api/v1/species/preview/route";
import * as userById from "@/app/api/v1/users/[id]/route";
import * as users from "@/app/api/v1/users/route";
import * as versionFiles from "@/app/api/v1/versions/[id]/files/route";
import * as next from "@/app/api/v1/versions/[id]/next/route";
import * as pointsCsv from "@/app/api/v1/versions/[id]/points.csv/route";
import * as pointsJson from "@/app/api/v1/versions/[id]/points.json/route";
import * as version from "@/app/api/v1/versions/[id]/route";
import * as transitions from "@/app/api/v1/versions/[id]/transitions/route";
import * as oai from "@/app/oai/route";
import * as mechanismChecks from "@/app/api/v1/mechanism-checks/route";
import * as mechanismCheck from "@/app/api/v1/mechanism-checks/[id]/route";
import * as mechanismCheckShare from "@/app/api/v1/mechanism-checks/[id]/share/route";
import * as speciesChoices from "@/app/api/v1/mechanism-checks/species-choices/route";
import * as mechanismCheckRerun from "@/app/api/v1/mechanism-checks/[id]/rerun/route";
import * as mappingSpeciesSearch from "@/app/api/v1/mechanism-checks/species-search/route";
import * as collectionsRoute from "@/app/api/v1/collections/route";
import * as collectionRoute from "@/app/api/v1/collections/[id]/route";
import * as collectionMembersRoute from "@/app/api/v1/collections/[id]/members/route";
import * as collectionMemberRoute from "@/app/api/v1/collections/[id]/members/[versionId]/route";
import * as collectionPublishRoute from "@/app/api/v1/collections/[id]/publish/route";
import * as collectionRevisionsRoute from "@/app/api/v1/collections/[id]/revisions/route";
import * as collectionVersionRoute from "@/app/api/v1/collections/[id]/versions/[n]/route";
import * as collectionCitationRoute from "@/app/api/v1/collections/[id]/versions/[n]/citation/route";
import * as collectionParametersRoute from "@/app/api/v1/collections/[id]/versions/[n]/parameters/route";
import * as collectionDataciteRoute from "@/app/api/v1/collections/[id]/versions/[n]/datacite.json/route";
import { createTokenAction } from "@/app/settings/actions";
import { idleState } from "@/lib/auth/action-state";
import type { ApiOptions } from "@/lib/auth/api";
import { endpointScopes } from "@/lib/auth/endpoint-scopes";
import { getCurrentUser } from "@/lib/auth/session";
import { createApiToken, createUser, revokeApiToken, type ApiTokenScope, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail, uniqueIp } from "./helpers";

const modules: Record<string, Record<string, unknown>> = {
  "/api/v1/analyses": analyses,
  "/api/v1/classes": classes,
  "/api/v1/datasets/:id": datasetById,
  "/api/v1/datasets/:id/versions/:n": versionByNumber,
  "/api/v1/datasets/:id/versions/:n/points": versionPoints,
  "/api/v1/datasets/:id/versions/:n/analysis": versionAnalysis,
  "/api/v1/deposits": deposits,
  "/api/v1/openapi.json": openapi,
  "/api/v1/reactions/:id": reactionByKey,
  "/api/v1/species/:inchikey": speciesByKey,
  "/api/v1/validate": validate,
  "/api/v1/datasets": datasets,
  "/api/v1/datasets/:id/citation": datasetCitation,
  "/api/v1/datasets/:id/citation/references": datasetCitationReferences,
  "/api/v1/datasets/:id/versions/:n/datacite.json": dataciteJson,
  "/api/v1/datasets/:id/versions/:n/datacite.xml": dataciteXml,
  "/api/v1/datasets/:id/versions/:n/export.json": versionExport,
  "/api/v1/datasets/:id/versions/:n/parameters": versionParameters,
  "/api/v1/reactions/:id/parameters": reactionParameters,
  "/api/v1/search/export": searchExport,
  "/api/v1/files/:fileId": files,
  "/api/v1/identifiers": identifiers,
  "/api/v1/reactions/:id/consensus": reactionConsensus,
  "/api/v1/search": search,
  "/api/v1/search/suggest": searchSuggest,
  "/api/v1/species/preview": speciesPreview,
  "/api/v1/users/:id": userById,
  "/api/v1/users": users,
  "/api/v1/versions/:id/files": versionFiles,
  "/api/v1/versions/:id/next": next,
  "/api/v1/versions/:id/points.csv": pointsCsv,
  "/api/v1/versions/:id/points.json": pointsJson,
  "/api/v1/versions/:id": version,
  "/api/v1/versions/:id/transitions": transitions,
  "/oai": oai,
  "/api/v1/mechanism-checks": mechanismChecks,
  "/api/v1/mechanism-checks/:id": mechanismCheck,
  "/api/v1/mechanism-checks/:id/share": mechanismCheckShare,
  "/api/v1/mechanism-checks/species-choices": speciesChoices,
  "/api/v1/mechanism-checks/:id/rerun": mechanismCheckRerun,
  "/api/v1/mechanism-checks/species-search": mappingSpeciesSearch,
  "/api/v1/collections": collectionsRoute,
  "/api/v1/collections/:id": collectionRoute,
  "/api/v1/collections/:id/members": collectionMembersRoute,
  "/api/v1/collections/:id/members/:versionId": collectionMemberRoute,
  "/api/v1/collections/:id/publish": collectionPublishRoute,
  "/api/v1/collections/:id/revisions": collectionRevisionsRoute,
  "/api/v1/collections/:id/versions/:n": collectionVersionRoute,
  "/api/v1/collections/:id/versions/:n/citation": collectionCitationRoute,
  "/api/v1/collections/:id/versions/:n/parameters": collectionParametersRoute,
  "/api/v1/collections/:id/versions/:n/datacite.json": collectionDataciteRoute,
};

let admin: UserDto, researcher: UserDto, subject: UserDto;
beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"]) =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [admin, researcher, subject] = await Promise.all([
    mk("scopeadmin", "admin"),
    mk("scoperesearcher", "researcher"),
    mk("scopesubject", "researcher"),
  ]);
});

async function tokenFor(user: UserDto, scopes: ApiTokenScope[]) {
  return (await createApiToken({ userId: user.id, name: "test", scopes })).secret;
}

describe("every endpoint declares the scope it needs, as the API page says", () => {
  it("each handler's scope matches the published table, and the table lists every handler", () => {
    const declared: string[] = [];
    for (const [path, mod] of Object.entries(modules)) {
      for (const method of ["GET", "POST", "PUT", "PATCH", "DELETE"]) {
        const handler = mod[method] as { apiOptions?: ApiOptions } | undefined;
        if (!handler) continue;
        declared.push(`${method} ${path}`);
        const row = endpointScopes.find((e) => e.method === method && e.path === path);
        expect(row, `${method} ${path} is missing from the table`).toBeDefined();
        expect(handler.apiOptions?.scope ?? null, `${method} ${path}`).toBe(row!.scope);
        // Admin-only permissions need the admin scope.
        if (handler.apiOptions?.permission?.startsWith("user.")) expect(handler.apiOptions.scope).toBe("admin");
      }
    }
    expect(endpointScopes.map((e) => `${e.method} ${e.path}`).sort()).toEqual(declared.sort());
  });
});

describe("admin endpoints and token scopes", () => {
  const patch = (secret: string, body: unknown) =>
    userById.PATCH(
      new Request(`http://127.0.0.1/api/v1/users/${subject.id}`, {
        method: "PATCH",
        body: JSON.stringify(body),
        headers: { authorization: `Bearer ${secret}` },
      }),
      {
        params: Promise.resolve({ id: String(subject.id) }),
      },
    );
  const list = (secret: string) =>
    users.GET(new Request("http://127.0.0.1/api/v1/users", { headers: { authorization: `Bearer ${secret}` } }), {
      params: Promise.resolve({}),
    });

  const table: [string, ApiTokenScope[], number][] = [
    ["deposit:read", ["deposit:read"], 403],
    ["deposit:write", ["deposit:write"], 403],
    ["read + deposit", ["deposit:read", "deposit:write"], 403],
    ["none", [], 403],
    ["admin", ["admin"], 200],
  ];
  for (const [name, scopes, status] of table) {
    it(`an admin's token with scope ${name} → ${status}`, async () => {
      const secret = await tokenFor(admin, scopes);
      const res = await patch(secret, { role: "curator" });
      expect(res.status).toBe(status);
      expect((await list(secret)).status).toBe(status);
      const [row] = await sql`select role from users where id = ${subject.id}`;
      if (status === 403) {
        expect((await res.json()).code).toBe("forbidden");
        expect(row.role).toBe("researcher");
      } else {
        expect(row.role).toBe("curator");
        await sql`update users set role = 'researcher' where id = ${subject.id}`;
      }
    });
  }

  it("a researcher's token with the admin scope is still refused by the role", async () => {
    const secret = await tokenFor(researcher, ["admin"]);
    expect((await patch(secret, { role: "admin" })).status).toBe(403);
    const [row] = await sql`select role from users where id = ${researcher.id}`;
    expect(row.role).toBe("researcher");
  });
});

describe("revoked tokens are refused everywhere", () => {
  it("on public endpoints that ignore the caller, on endpoints that identify, and on protected ones", async () => {
    const { secret, token } = await createApiToken({ userId: researcher.id, name: "old", scopes: ["deposit:read", "deposit:write"] });
    await revokeApiToken({ userId: researcher.id, tokenId: token.id });
    const auth = { authorization: `Bearer ${secret}`, "x-forwarded-for": uniqueIp() };
    const calls: [string, Promise<Response>][] = [
      [
        "POST analyses",
        analyses.POST(
          new Request("http://127.0.0.1/api/v1/analyses", {
            method: "POST",
            headers: auth,
            body: JSON.stringify({
              order: 2,
              points: [
                { T: 300, k: 1e-12 },
                { T: 350, k: 2e-12 },
                { T: 400, k: 3e-12 },
              ],
            }),
          }),
          { params: Promise.resolve({}) },
        ),
      ],
      [
        "GET species preview",
        speciesPreview.GET(new Request("http://127.0.0.1/api/v1/species/preview?smiles=C", { headers: auth }), {
          params: Promise.resolve({}),
        }),
      ],
      [
        "GET version",
        version.GET(new Request("http://127.0.0.1/api/v1/versions/1", { headers: auth }), { params: Promise.resolve({ id: "1" }) }),
      ],
      [
        "GET file",
        files.GET(new Request("http://127.0.0.1/api/v1/files/1", { headers: auth }), { params: Promise.resolve({ fileId: "1" }) }),
      ],
      [
        "POST datasets",
        datasets.POST(new Request("http://127.0.0.1/api/v1/datasets", { method: "POST", headers: auth, body: "{}" }), {
          params: Promise.resolve({}),
        }),
      ],
    ];
    for (const [name, call] of calls) {
      const res = await call;
      expect(res.status, name).toBe(401);
      expect((await res.json()).code, name).toBe("unauthenticated");
    }
  });

  it("the same public endpoints still answer without a token", async () => {
    const res = await speciesPreview.GET(
      new Request("http://127.0.0.1/api/v1/species/preview?smiles=C", { headers: { "x-forwarded-for": uniqueIp() } }),
      { params: Promise.resolve({}) },
    );
    expect(res.status).toBe(200);
  });
});

describe("creating a token with the admin scope", () => {
  const form = (scopes: string[]) => {
    const fd = new FormData();
    fd.set("name", "ops");
    for (const s of scopes) fd.append("scopes", s);
    return fd;
  };
  const table: [string, () => UserDto, "ok" | "error"][] = [
    ["researcher", () => researcher, "error"],
    ["admin", () => admin, "ok"],
  ];
  for (const [who, user, status] of table) {
    it(`${who} → ${status}`, async () => {
      vi.mocked(getCurrentUser).mockResolvedValue(user());
      const [{ n: before }] = await sql`select count(*)::int as n from api_tokens where user_id = ${user().id}`;
      const out = await createTokenAction(idleState, form(["deposit:read", "admin"]));
      expect(out.status).toBe(status);
      const [{ n: after }] = await sql`select count(*)::int as n from api_tokens where user_id = ${user().id}`;
      expect(after - before).toBe(status === "ok" ? 1 : 0);
      vi.mocked(getCurrentUser).mockResolvedValue(null);
    });
  }
});

describe("a token that may change things may also read", () => {
  it("deposit and admin tokens read a published version; a token with no scope does not", async () => {
    const [published] = await sql`select id from dataset_versions where state = 'published' order by id limit 1`;
    const get = async (scopes: ApiTokenScope[]) =>
      (
        await version.GET(
          new Request(`http://127.0.0.1/api/v1/versions/${published.id}`, {
            headers: { authorization: `Bearer ${await tokenFor(admin, scopes)}` },
          }),
          { params: Promise.resolve({ id: String(published.id) }) },
        )
      ).status;
    expect(await get(["deposit:write"])).toBe(200);
    expect(await get(["admin"])).toBe(200);
    expect(await get(["deposit:read"])).toBe(200);
    expect(await get([])).toBe(403);
  });
});

describe("an Authorization header that is not one bearer token is a 401, never anonymous", () => {
  const headers = ["Token xyz", "Basic dXNlcjpwYXNz", "Bearer", "Bearer ", "Bearer a b", "Bearer arh_key_x;y", "bearer,arh_key_x", ""];
  for (const authorization of headers) {
    it(`“${authorization}” on every endpoint and method → 401 problem+json naming the Bearer scheme`, async () => {
      for (const [path, mod] of Object.entries(modules)) {
        for (const method of ["GET", "POST", "PUT", "PATCH", "DELETE"]) {
          const handler = mod[method] as ((req: Request, ctx: { params: Promise<unknown> }) => Promise<Response>) | undefined;
          if (!handler) continue;
          const url = `http://127.0.0.1${path.replace(/:\w+/g, "1")}?smiles=C&identifier=x`;
          const body = method === "GET" || method === "DELETE" ? undefined : "{}";
          const res = await handler(new Request(url, { method, body, headers: { authorization, "x-forwarded-for": uniqueIp() } }), {
            params: Promise.resolve({ id: "1", fileId: "1" }),
          });
          const where = `${method} ${path}`;
          expect(res.status, where).toBe(401);
          expect(res.headers.get("content-type"), where).toBe("application/problem+json");
          expect(res.headers.get("www-authenticate"), where).toMatch(/^Bearer /);
          const problem = await res.json();
          expect(problem.code, where).toBe("unauthenticated");
          expect(problem.title, where).toContain("Authorization: Bearer <token>");
        }
      }
    });
  }
  it("the scheme name is case-insensitive (RFC 9110 §11.1): “bearer <valid token>” is served", async () => {
    const secret = await tokenFor(researcher, ["deposit:read"]);
    const res = await speciesPreview.GET(
      new Request("http://127.0.0.1/api/v1/species/preview?smiles=C", {
        headers: { authorization: `bearer ${secret}`, "x-forwarded-for": uniqueIp() },
      }),
      { params: Promise.resolve({}) },
    );
    expect(res.status).toBe(200);
  });
});

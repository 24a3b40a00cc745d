import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import * as classes from "@/app/api/v1/classes/route";
import * as datasetById from "@/app/api/v1/datasets/[id]/route";
import * as versionAnalysis from "@/app/api/v1/datasets/[id]/versions/[n]/analysis/route";
import * as versionPoints from "@/app/api/v1/datasets/[id]/versions/[n]/points/route";
import * as versionByNumber from "@/app/api/v1/datasets/[id]/versions/[n]/route";
import * as datasets from "@/app/api/v1/datasets/route";
import * as deposits from "@/app/api/v1/deposits/route";
import * as openapi from "@/app/api/v1/openapi.json/route";
import * as reactionByKey from "@/app/api/v1/reactions/[id]/route";
import * as speciesByKey from "@/app/api/v1/species/[inchikey]/route";
import * as validate from "@/app/api/v1/validate/route";
import * as version from "@/app/api/v1/versions/[id]/route";
import * as transitions from "@/app/api/v1/versions/[id]/transitions/route";
import { spendApiBudget } from "@/lib/auth/rate-limit";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { apiRateLimit } from "@/lib/config";
import { reactionSegment } from "@/lib/reactions/paths";
import { createApiToken, createUser, revokeApiToken, type ApiTokenScope, type UserDto } from "@/lib/users/queries";
import { fromAddress, sql, uniqueEmail, uniqueIp } from "./helpers";

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
const call = (handler: unknown, path: string, params: Record<string, string> = {}, init: RequestInit = {}) =>
  (handler as Handler)(new Request(`http://127.0.0.1${path}`, init), { params: Promise.resolve(params) });
const bearer = (secret: string | null): Record<string, string> => (secret ? { authorization: `Bearer ${secret}` } : {});

let owner: UserDto, other: UserDto, curator: UserDto, admin: UserDto;
let published: { datasetId: number; versionId: number; reactionKey: string };
let draft: { datasetId: number; versionId: number };
const tokens: Record<string, string> = {};

async function deposit(title: string, walk: Transition[]) {
  const doc = structuredClone(EXAMPLE_DEPOSIT);
  doc.title = `${title} ${uniqueEmail("t")}`;
  const v = await depositNewDataset({ actor: owner, document: doc });
  for (const t of walk)
    await applyTransition({
      versionId: v.id,
      actorId: t === "submit" ? owner.id : curator.id,
      transition: t,
      reason: t === "submit" ? undefined : "For the test.",
    });
  return v;
}

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"]) =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, other, curator, admin] = await Promise.all([
    mk("v1-owner", "researcher"),
    mk("v1-other", "researcher"),
    mk("v1-curator", "curator"),
    mk("v1-admin", "admin"),
  ]);
  const p = await deposit("REST v1 published", ["submit", "accept"]);
  const [row] = await sql`select r.key from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${p.id}`;
  published = { datasetId: p.datasetId, versionId: p.id, reactionKey: row.key };
  const d = await deposit("REST v1 draft", []);
  draft = { datasetId: d.datasetId, versionId: d.id };
  const mint = async (name: string, user: UserDto, scopes: ApiTokenScope[]) =>
    (tokens[name] = (await createApiToken({ userId: user.id, name, scopes })).secret);
  await mint("ownerRead", owner, ["deposit:read"]);
  await mint("ownerWrite", owner, ["deposit:write"]);
  await mint("otherWrite", other, ["deposit:write"]);
  await mint("adminOnly", admin, ["admin"]);
  await mint("noScope", owner, []);
  const revoked = await createApiToken({ userId: owner.id, name: "revoked", scopes: ["deposit:read", "deposit:write"] });
  await revokeApiToken({ userId: owner.id, tokenId: revoked.token.id });
  tokens.revoked = revoked.secret;
}, 120_000);

describe("public reads: published and retracted data only, as the pages show", () => {
  const reads = () =>
    [
      ["GET /api/v1/datasets", datasets.GET, `/api/v1/datasets?q=${encodeURIComponent("REST v1")}`, {}],
      ["GET /api/v1/datasets/:id", datasetById.GET, `/api/v1/datasets/${published.datasetId}`, { id: String(published.datasetId) }],
      [
        "GET …/versions/:n",
        versionByNumber.GET,
        `/api/v1/datasets/${published.datasetId}/versions/1`,
        { id: String(published.datasetId), n: "1" },
      ],
      [
        "GET …/versions/:n/points",
        versionPoints.GET,
        `/api/v1/datasets/${published.datasetId}/versions/1/points`,
        { id: String(published.datasetId), n: "1" },
      ],
      [
        "GET …/versions/:n/analysis",
        versionAnalysis.GET,
        `/api/v1/datasets/${published.datasetId}/versions/1/analysis`,
        { id: String(published.datasetId), n: "1" },
      ],
      [
        "GET /api/v1/reactions/:key",
        reactionByKey.GET,
        `/api/v1/reactions/${reactionSegment(published.reactionKey)}`,
        { id: reactionSegment(published.reactionKey) },
      ],
      [
        "GET /api/v1/species/:inchikey",
        speciesByKey.GET,
        `/api/v1/species/VNWKTOKETHGBQD-UHFFFAOYSA-N`,
        { inchikey: "VNWKTOKETHGBQD-UHFFFAOYSA-N" },
      ],
      ["GET /api/v1/classes", classes.GET, "/api/v1/classes", {}],
      ["GET /api/v1/openapi.json", openapi.GET, "/api/v1/openapi.json", {}],
    ] as const;

  // Anonymous, any valid token (whatever its scopes), and a revoked token (401 even on public endpoints).
  const callers: [string, () => string | null, number][] = [
    ["anonymous", () => null, 200],
    ["a token without scopes", () => tokens.noScope, 200],
    ["an admin-scoped token", () => tokens.adminOnly, 200],
    ["a token with deposit:read", () => tokens.ownerRead, 200],
    ["a revoked token", () => tokens.revoked, 401],
  ];
  for (const [who, secret, status] of callers) {
    it(`${who} → ${status} on every public read, with rate-limit fields`, async () => {
      for (const [name, handler, path, params] of reads()) {
        const res = await call(handler, path, params, { headers: bearer(secret()) });
        expect([name, res.status]).toEqual([name, status]);
        if (status === 200) {
          expect(res.headers.get("ratelimit-policy"), name).toMatch(/^"api";q=\d+;w=60$/);
          expect(res.headers.get("ratelimit"), name).toMatch(/^"api";r=\d+;t=\d+$/);
        } else expect(res.headers.get("content-type")).toBe("application/problem+json");
      }
    });
  }

  it("answers with the published version's content and finds it in the dataset list", async () => {
    const list = await (await call(datasets.GET, `/api/v1/datasets?q=${encodeURIComponent("REST v1 published")}&limit=5`)).json();
    expect(list.hits.map((h: { datasetId: number }) => h.datasetId)).toContain(published.datasetId);
    const ds = (await (await call(datasetById.GET, `/api/v1/datasets/${published.datasetId}`, { id: String(published.datasetId) })).json())
      .data;
    expect(ds.versions).toEqual([expect.objectContaining({ number: 1, state: "published" })]);
    const v = (
      await (
        await call(versionByNumber.GET, `/api/v1/datasets/${published.datasetId}/versions/1`, { id: String(published.datasetId), n: "1" })
      ).json()
    ).data;
    expect(v).toMatchObject({ datasetId: published.datasetId, number: 1, state: "published" });
    expect(v.lockVersion).toBeUndefined();
    const pts = (
      await (
        await call(versionPoints.GET, `/api/v1/datasets/${published.datasetId}/versions/1/points`, {
          id: String(published.datasetId),
          n: "1",
        })
      ).json()
    ).data;
    expect(pts.points).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    const r = (await (await call(reactionByKey.GET, `/api/v1/reactions/x`, { id: reactionSegment(published.reactionKey) })).json()).data;
    expect(r.reaction.key).toBe(published.reactionKey);
    expect(r.datasets.map((d: { datasetId: number }) => d.datasetId)).toContain(published.datasetId);
    expect(r).toHaveProperty("selection");
  });

  it("a draft's dataset, version, points and analysis are 404 to everyone, its owner's token included", async () => {
    const id = String(draft.datasetId);
    for (const secret of [null, tokens.ownerRead]) {
      const headers = bearer(secret);
      expect((await call(datasetById.GET, `/api/v1/datasets/${id}`, { id }, { headers })).status).toBe(404);
      for (const h of [versionByNumber.GET, versionPoints.GET, versionAnalysis.GET])
        expect((await call(h, `/api/v1/datasets/${id}/versions/1`, { id, n: "1" }, { headers })).status).toBe(404);
    }
    expect((await call(datasetById.GET, "/api/v1/datasets/abc", { id: "abc" })).status).toBe(404);
    expect((await call(speciesByKey.GET, "/api/v1/species/nope", { inchikey: "nope" })).status).toBe(404);
    expect((await call(reactionByKey.GET, "/api/v1/reactions/999999999", { id: "999999999" })).status).toBe(404);
  });

  it("GET /api/v1/datasets refuses the reactions view and unknown parameters with 400 naming them", async () => {
    const res = await call(datasets.GET, "/api/v1/datasets?view=reactions");
    expect(res.status).toBe(400);
    expect((await res.json()).errors[0].parameter).toBe("view");
    expect((await call(datasets.GET, "/api/v1/datasets?colour=red")).status).toBe(400);
  });
});

describe("ETag, Cache-Control and 304 (RFC 9110 §13.1.2)", () => {
  it("a public read sends a strong ETag and Cache-Control, and 304 with no body to a matching If-None-Match", async () => {
    const path = `/api/v1/datasets/${published.datasetId}`;
    const params = { id: String(published.datasetId) };
    const first = await call(datasetById.GET, path, params);
    const etag = first.headers.get("etag")!;
    expect(etag).toMatch(/^"[A-Za-z0-9_-]{32}"$/);
    expect(first.headers.get("cache-control")).toBe("public, max-age=60");
    const again = await call(datasetById.GET, path, params, { headers: { "if-none-match": etag } });
    expect(again.status).toBe(304);
    expect(await again.text()).toBe("");
    expect(again.headers.get("etag")).toBe(etag);
    // Weak comparison: W/ and a list match too; another tag does not.
    expect((await call(datasetById.GET, path, params, { headers: { "if-none-match": `"x", W/${etag}` } })).status).toBe(304);
    expect((await call(datasetById.GET, path, params, { headers: { "if-none-match": '"other"' } })).status).toBe(200);
    // A different answer has a different tag.
    const classesTag = (await call(classes.GET, "/api/v1/classes")).headers.get("etag");
    expect(classesTag).not.toBe(etag);
  });
});

describe("deposits with a personal token", () => {
  const doc = (title: string) => JSON.stringify({ ...EXAMPLE_DEPOSIT, title: `${title} ${uniqueEmail("d")}` });

  it("GET /api/v1/deposits: anonymous 401, no scope 403, deposit:read lists my drafts only, revoked 401", async () => {
    expect((await call(deposits.GET, "/api/v1/deposits")).status).toBe(401);
    const forbidden = await call(deposits.GET, "/api/v1/deposits", {}, { headers: bearer(tokens.noScope) });
    expect(forbidden.status).toBe(403);
    expect((await forbidden.json()).type).toBe("https://arrhenia.invalid/problems/forbidden");
    const mine = await call(deposits.GET, "/api/v1/deposits", {}, { headers: bearer(tokens.ownerRead) });
    expect(mine.status).toBe(200);
    const ids = (await mine.json()).data.map((d: { versionId: number }) => d.versionId);
    expect(ids).toEqual(expect.arrayContaining([draft.versionId, published.versionId]));
    const theirs = await (await call(deposits.GET, "/api/v1/deposits", {}, { headers: bearer(tokens.otherWrite) })).json();
    expect(theirs.data.map((d: { versionId: number }) => d.versionId)).not.toContain(draft.versionId);
    expect((await call(deposits.GET, "/api/v1/deposits", {}, { headers: bearer(tokens.revoked) })).status).toBe(401);
  });

  it("POST /api/v1/validate returns the analysis or every error, and stores nothing", async () => {
    const [{ n: before }] = await sql`select count(*)::int as n from dataset_versions`;
    const post = (body: string, secret: string | null) =>
      call(validate.POST, "/api/v1/validate", {}, { method: "POST", body, headers: bearer(secret) });
    expect((await post(doc("Validate"), null)).status).toBe(401);
    expect((await post(doc("Validate"), tokens.noScope)).status).toBe(403);
    expect((await post(doc("Validate"), tokens.revoked)).status).toBe(401);
    const ok = await (await post(doc("Validate"), tokens.ownerRead)).json();
    expect(ok.data).toMatchObject({ valid: true, errors: [] });
    expect(ok.data.analysis.result).toHaveProperty("arrhenius");
    const broken = {
      ...EXAMPLE_DEPOSIT,
      points: [
        { T: -5, k: 1e-12 },
        { T: 300, k: -1 },
      ],
    };
    const bad = await post(JSON.stringify(broken), tokens.ownerRead);
    expect(bad.status).toBe(200);
    const badJson = (await bad.json()).data;
    expect(badJson.valid).toBe(false);
    expect(badJson.errors.map((e: { pointer: string }) => e.pointer)).toEqual(expect.arrayContaining(["/points/0/T", "/points/1/k"]));
    const [{ n: after }] = await sql`select count(*)::int as n from dataset_versions`;
    expect(after).toBe(before);
  });

  it("create with deposit:write (deposit:read alone is 403), replace with If-Match (428 missing, 412 stale), submit", async () => {
    const create = (secret: string) =>
      call(datasets.POST, "/api/v1/datasets", {}, { method: "POST", body: doc("Token deposit"), headers: bearer(secret) });
    expect((await create(tokens.ownerRead)).status).toBe(403);
    expect((await create(tokens.revoked)).status).toBe(401);
    const created = await create(tokens.ownerWrite);
    expect(created.status).toBe(201);
    const { versionId, lockVersion } = (await created.json()).data;
    const id = String(versionId);
    const put = (secret: string, headers: Record<string, string>) =>
      call(
        version.PUT,
        `/api/v1/versions/${id}`,
        { id },
        { method: "PUT", body: doc("Replaced"), headers: { ...bearer(secret), ...headers } },
      );

    const missing = await put(tokens.ownerWrite, {});
    expect(missing.status).toBe(428);
    expect((await missing.json()).type).toBe("https://arrhenia.invalid/problems/precondition-required");
    expect((await put(tokens.ownerRead, { "if-match": `"${lockVersion}"` })).status).toBe(403);
    // Another person's draft is not found, never forbidden.
    expect((await put(tokens.otherWrite, { "if-match": `"${lockVersion}"` })).status).toBe(404);
    const other = await call(version.GET, `/api/v1/versions/${id}`, { id }, { headers: bearer(tokens.otherWrite) });
    expect(other.status).toBe(404);
    const saved = await put(tokens.ownerWrite, { "if-match": `"${lockVersion}"` });
    expect(saved.status).toBe(200);
    expect(saved.headers.get("etag")).toBe(`"${lockVersion + 1}"`);
    const stale = await put(tokens.ownerWrite, { "if-match": `"${lockVersion}"` });
    expect(stale.status).toBe(412);
    expect((await stale.json()).code).toBe("precondition_failed");
    const [row] = await sql`select lock_version from dataset_versions where id = ${versionId}`;
    expect(row.lock_version).toBe(lockVersion + 1);

    const submit = (secret: string) =>
      call(
        transitions.POST,
        `/api/v1/versions/${id}/transitions`,
        { id },
        {
          method: "POST",
          body: JSON.stringify({ transition: "submit" }),
          headers: bearer(secret),
        },
      );
    expect((await submit(tokens.ownerRead)).status).toBe(403);
    expect((await submit(tokens.otherWrite)).status).toBe(404);
    const submitted = await submit(tokens.ownerWrite);
    expect(submitted.status).toBe(200);
    const [after] = await sql`select state from dataset_versions where id = ${versionId}`;
    expect(after.state).toBe("submitted");
  });
});

describe("rate limits (draft-ietf-httpapi-ratelimit-headers-10)", () => {
  it("counts each request against the client's budget and answers 429 with Retry-After once it is spent", async () => {
    const user = await createUser({
      email: uniqueEmail("v1-limited"),
      name: "limited",
      passwordHash: "x",
      role: "researcher",
      verified: true,
    });
    const { secret } = await createApiToken({ userId: user.id, name: "busy script", scopes: ["deposit:read"] });
    const headers = bearer(secret);
    const first = await call(classes.GET, "/api/v1/classes", {}, { headers });
    expect(first.status).toBe(200);
    const limit = apiRateLimit();
    expect(first.headers.get("ratelimit-policy")).toBe(`"api";q=${limit};w=60`);
    expect(first.headers.get("ratelimit")).toMatch(new RegExp(`^"api";r=${limit - 1};t=\\d+$`));
    expect((await call(classes.GET, "/api/v1/classes", {}, { headers })).headers.get("ratelimit")).toMatch(
      new RegExp(`^"api";r=${limit - 2};`),
    );
    await spendApiBudget(`user:${user.id}`, limit);
    const refused = await call(classes.GET, "/api/v1/classes", {}, { headers });
    expect(refused.status).toBe(429);
    const retryAfter = Number(refused.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
    expect(refused.headers.get("ratelimit")).toBe(`"api";r=0;t=${retryAfter}`);
    const problem = await refused.json();
    expect(problem).toMatchObject({ status: 429, code: "rate_limited", type: "https://arrhenia.invalid/problems/rate-limited" });
    // Another client is not affected.
    expect((await call(classes.GET, "/api/v1/classes", {}, { headers: bearer(tokens.ownerRead) })).status).toBe(200);
  });
});

describe("rate limits of anonymous public reads", () => {
  it("are counted in the process (no row in PostgreSQL), with the same budget, fields and 429", async () => {
    const ip = uniqueIp();
    const limit = apiRateLimit();
    const first = await call(classes.GET, "/api/v1/classes", {}, { headers: fromAddress(ip) });
    expect(first.status).toBe(200);
    expect(first.headers.get("ratelimit")).toMatch(new RegExp(`^"api";r=${limit - 1};t=\\d+$`));
    const rows = await sql`select key from rate_limits where key like ${`%address:${ip}`}`;
    expect(rows).toHaveLength(0);
    await spendApiBudget(`address:${ip}`, limit);
    const refused = await call(classes.GET, "/api/v1/classes", {}, { headers: fromAddress(ip) });
    expect(refused.status).toBe(429);
    expect(Number(refused.headers.get("retry-after"))).toBeGreaterThanOrEqual(1);
    // Another address is not affected.
    expect((await call(classes.GET, "/api/v1/classes", {}, { headers: fromAddress(uniqueIp()) })).status).toBe(200);
    // A refused credential is counted against the address too: a bogus token does not step around a spent budget.
    for (const authorization of ["Bearer arh_key_bogus", "Basic eHg="])
      expect((await call(classes.GET, "/api/v1/classes", {}, { headers: { ...fromAddress(ip), authorization } })).status).toBe(429);
    const other = uniqueIp();
    const guessed = await call(
      classes.GET,
      "/api/v1/classes",
      {},
      { headers: { ...fromAddress(other), authorization: "Bearer arh_key_bogus" } },
    );
    expect(guessed.status).toBe(401);
    expect(guessed.headers.get("ratelimit")).toMatch(new RegExp(`^"api";r=${limit - 1};t=\\d+$`));
  });
});

describe("drizzle/0027 renames stored token scopes", () => {
  it("maps read → deposit:read and deposit → deposit:write, keeps admin, and leaves renamed tokens alone", async () => {
    const { readFileSync } = await import("node:fs");
    const rename = readFileSync("drizzle/0027_token_scope_names.sql", "utf8");
    const cases: [string[], string[]][] = [
      [["read"], ["deposit:read"]],
      [
        ["read", "deposit"],
        ["deposit:read", "deposit:write"],
      ],
      [["deposit"], ["deposit:write"]],
      [
        ["admin", "read"],
        ["admin", "deposit:read"],
      ],
      [["deposit:read"], ["deposit:read"]],
    ];
    const ids: number[] = [];
    for (const [i, [scopes]] of cases.entries()) {
      const [row] = await sql`insert into api_tokens (user_id, name, token_hash, prefix, scopes)
        values (${owner.id}, ${`old ${i}`}, ${`old-scopes-${i}-${uniqueEmail("h")}`}, 'arh_key_old', ${sql.array(scopes)}) returning id`;
      ids.push(row.id);
    }
    await sql.unsafe(rename);
    const rows = await sql`select id, scopes from api_tokens where id = any(${sql.array(ids)}::int[]) order by id`;
    expect(rows.map((r) => r.scopes)).toEqual(cases.map(([, after]) => after));
  });
});

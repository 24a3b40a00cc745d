import { mkdtempSync, readdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { NextRequest } from "next/server";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
process.env.STORAGE_DIR = mkdtempSync(path.join(tmpdir(), "arrhenia-body-limits-"));

import { POST as signInPost } from "@/app/api/auth/[...nextauth]/route";
import { POST as postAnalysis } from "@/app/api/v1/analyses/route";
import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { PATCH as patchUser } from "@/app/api/v1/users/[id]/route";
import { POST as postFile } from "@/app/api/v1/versions/[id]/files/route";
import { POST as postNext } from "@/app/api/v1/versions/[id]/next/route";
import { PUT as putVersion } from "@/app/api/v1/versions/[id]/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { getCurrentUser } from "@/lib/auth/session";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { createDatasetDraft } from "@/lib/datasets/queries";
import { MAX_FILE_BYTES } from "@/lib/datasets/files";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail, uniqueIp } from "./helpers";

const MB = 1024 * 1024;
const CHUNK = 64 * 1024;

/**
 * A body that would yield `total` bytes (200 MB) if read to the end, made on demand, with no
 * Content-Length: it counts what the server pulled, so a test can tell it stopped early.
 */
function endlessBody(total = 200 * MB, prefix = "") {
  let pulled = 0;
  const head = new TextEncoder().encode(prefix);
  const stream = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (pulled >= total) return controller.close();
        const chunk = pulled === 0 && head.length ? head : new Uint8Array(CHUNK).fill(0x20);
        pulled += chunk.byteLength;
        controller.enqueue(chunk);
      },
    },
    { highWaterMark: 0 },
  );
  return { stream, pulled: () => pulled };
}

function streamed(
  url: string,
  body: ReadableStream<Uint8Array>,
  { method = "POST", headers = {} }: { method?: string; headers?: Record<string, string> } = {},
) {
  return new Request(`http://127.0.0.1${url}`, { method, body, headers, duplex: "half" } as RequestInit);
}

let owner: UserDto, admin: UserDto;
beforeAll(async () => {
  owner = await createUser({
    email: uniqueEmail("limits-owner"),
    name: "Limits owner",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
  admin = await createUser({ email: uniqueEmail("limits-admin"), name: "Limits admin", passwordHash: "x", role: "admin", verified: true });
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = (params: Record<string, unknown> = {}) => ({ params: Promise.resolve(params) }) as never;
const countDatasets = async () => Number((await sql`select count(*) from datasets where owner_id = ${owner.id}`)[0].count);
const countVersions = async () =>
  Number(
    (await sql`select count(*) from dataset_versions v join datasets d on d.id = v.dataset_id where d.owner_id = ${owner.id}`)[0].count,
  );

async function draftOfOwner() {
  return createDatasetDraft({
    ownerId: owner.id,
    title: "Body limits",
    payload: {},
    points: [],
    analysis: { engineVersion: "t", result: null, checks: [] },
  });
}

async function expect413(res: Response, limitText: RegExp) {
  expect(res.status).toBe(413);
  expect(res.headers.get("content-type")).toMatch(/application\/problem\+json/);
  const problem = await res.json();
  expect(problem.code).toBe("payload_too_large");
  expect(problem.title).toMatch(limitText);
}

describe("chunked bodies without Content-Length are cut off at the route's limit", () => {
  it("POST /api/v1/datasets: 413 after reading just past 25 MB of a 200 MB body; no dataset stored", async () => {
    as(owner);
    const before = await countDatasets();
    const body = endlessBody();
    const res = await createDataset(streamed("/api/v1/datasets", body.stream, { headers: { "content-type": "application/json" } }), ctx());
    await expect413(res, /deposit document is larger than 25 MB, the limit/);
    expect(body.pulled()).toBeGreaterThan(MAX_DOCUMENT_BYTES);
    expect(body.pulled()).toBeLessThanOrEqual(MAX_DOCUMENT_BYTES + 2 * CHUNK);
    expect(await countDatasets()).toBe(before);
  });

  it("PUT /api/v1/versions/:id: 413 and the draft keeps its lock version", async () => {
    const v = await draftOfOwner();
    as(owner);
    const body = endlessBody();
    const res = await putVersion(
      streamed(`/api/v1/versions/${v.id}`, body.stream, { method: "PUT", headers: { "if-match": `"${v.lockVersion}"` } }),
      ctx({ id: String(v.id) }),
    );
    await expect413(res, /larger than 25 MB, the limit/);
    expect(body.pulled()).toBeLessThanOrEqual(MAX_DOCUMENT_BYTES + 2 * CHUNK);
    const [row] = await sql`select lock_version from dataset_versions where id = ${v.id}`;
    expect(row.lock_version).toBe(v.lockVersion);
  });

  it("POST /api/v1/versions/:id/files: 413 near 25 MB + multipart overhead; nothing stored, no file on disk", async () => {
    const v = await draftOfOwner();
    as(owner);
    const boundary = "----arrhenia-limit-test";
    const body = endlessBody(
      200 * MB,
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="huge.csv"\r\nContent-Type: text/csv\r\n\r\n`,
    );
    const res = await postFile(
      streamed(`/api/v1/versions/${v.id}/files`, body.stream, { headers: { "content-type": `multipart/form-data; boundary=${boundary}` } }),
      ctx({ id: String(v.id) }),
    );
    await expect413(res, /upload is larger than 25 MB, the limit/);
    expect(body.pulled()).toBeLessThanOrEqual(MAX_FILE_BYTES + 64 * 1024 + 2 * CHUNK);
    expect((await sql`select count(*) from version_files where version_id = ${v.id}`)[0].count).toBe("0");
    expect(readdirSync(process.env.STORAGE_DIR!)).toEqual([]);
  });

  it("POST /api/v1/analyses (anonymous): 413 past 12 MB", async () => {
    as(null);
    const body = endlessBody();
    const res = await postAnalysis(streamed("/api/v1/analyses", body.stream, { headers: { "x-forwarded-for": uniqueIp() } }), ctx());
    await expect413(res, /analysis request is larger than 12 MB, the limit/);
    expect(body.pulled()).toBeLessThanOrEqual(12 * MB + 2 * CHUNK);
  });

  it("small JSON commands (transitions, next version, role changes) stop after 1 MB", async () => {
    const v = await draftOfOwner();
    const versionsBefore = await countVersions();
    as(owner);
    let body = endlessBody();
    await expect413(
      await postTransition(streamed(`/api/v1/versions/${v.id}/transitions`, body.stream), ctx({ id: String(v.id) })),
      /larger than 1 MB, the limit/,
    );
    expect(body.pulled()).toBeLessThanOrEqual(MB + 2 * CHUNK);
    const [row] = await sql`select state from dataset_versions where id = ${v.id}`;
    expect(row.state).toBe("draft");

    body = endlessBody();
    await expect413(
      await postNext(streamed(`/api/v1/versions/${v.id}/next`, body.stream), ctx({ id: String(v.id) })),
      /larger than 1 MB, the limit/,
    );
    expect(body.pulled()).toBeLessThanOrEqual(MB + 2 * CHUNK);
    expect(await countVersions()).toBe(versionsBefore);

    as(admin);
    body = endlessBody();
    await expect413(
      await patchUser(streamed(`/api/v1/users/${owner.id}`, body.stream, { method: "PATCH" }), ctx({ id: String(owner.id) })),
      /larger than 1 MB, the limit/,
    );
    expect(body.pulled()).toBeLessThanOrEqual(MB + 2 * CHUNK);
  });

  it("the sign-in endpoint stops after 64 KB", async () => {
    const body = endlessBody();
    const req = new NextRequest("http://127.0.0.1/api/auth/callback/credentials", {
      method: "POST",
      body: body.stream,
      headers: { "content-type": "application/x-www-form-urlencoded" },
      duplex: "half",
    } as never);
    await expect413(
      await signInPost(req, ctx({ nextauth: ["callback", "credentials"] })),
      /sign-in request is larger than 64 KB, the limit/,
    );
    expect(body.pulled()).toBeLessThanOrEqual(64 * 1024 + 2 * CHUNK);
  });
});

describe("a declared Content-Length above the limit is refused before reading", () => {
  it("POST /api/v1/datasets with Content-Length 200 MB: 413, not one chunk pulled", async () => {
    as(owner);
    const body = endlessBody();
    const res = await createDataset(streamed("/api/v1/datasets", body.stream, { headers: { "content-length": String(200 * MB) } }), ctx());
    await expect413(res, /larger than 25 MB, the limit/);
    expect(body.pulled()).toBe(0);
  });
});

import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
// A crash of the app inside the creating transaction, right after the key was recorded: the
// transaction never commits (PostgreSQL rolls back a dead session's transaction the same way).
const crash = vi.hoisted(() => ({ insideTransaction: false }));
vi.mock("@/lib/idempotency/queries", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/lib/idempotency/queries")>();
  return {
    ...real,
    recordIdempotentResponse: async (...args: Parameters<typeof real.recordIdempotentResponse>) => {
      await real.recordIdempotentResponse(...args);
      if (crash.insideTransaction) {
        crash.insideTransaction = false;
        throw new Error("the process died before COMMIT");
      }
    },
  };
});
process.env.STORAGE_DIR = mkdtempSync(path.join(tmpdir(), "arrhenia-idempotency-"));

import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { GET as listFiles, POST as postFile } from "@/app/api/v1/versions/[id]/files/route";
import { POST as postNext } from "@/app/api/v1/versions/[id]/next/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { NextResponse } from "next/server";
import { getCurrentUser } from "@/lib/auth/session";
import { applyTransition } from "@/lib/curation/transitions";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createDatasetDraft } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let owner: UserDto, other: UserDto, curator: UserDto;
beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, other, curator] = await Promise.all([mk("idem-owner"), mk("idem-other"), mk("idem-curator", "curator")]);
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = (id?: number) => ({ params: Promise.resolve({ id: String(id ?? 0) }) });
let n = 0;
const newKey = () => `test-${Date.now()}-${++n}`;
const doc = (title: string) => JSON.stringify({ ...EXAMPLE_DEPOSIT, title });
const titled = async (title: string) =>
  Number((await sql`select count(*) from dataset_versions where payload->>'title' = ${title}`)[0].count);

function deposit(body: string, key?: string) {
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (key !== undefined) headers["idempotency-key"] = key;
  return createDataset(new Request("http://127.0.0.1/api/v1/datasets", { method: "POST", body, headers }), ctx());
}

describe("Idempotency-Key on POST /api/v1/datasets", () => {
  it("a retry with the same key and body replays the first answer and creates no second dataset", async () => {
    as(owner);
    const title = `Idempotent deposit ${newKey()}`;
    const key = newKey();
    const first = await deposit(doc(title), key);
    expect(first.status).toBe(201);
    const firstJson = await first.json();
    const retry = await deposit(doc(title), `"${key}"`); // the structured-field string form names the same key
    expect(retry.status).toBe(201);
    expect(retry.headers.get("idempotent-replayed")).toBe("true");
    expect(retry.headers.get("location")).toBe(first.headers.get("location"));
    expect(await retry.json()).toEqual(firstJson);
    expect(await titled(title)).toBe(1);
  });

  it("the same key with a different body is refused (422) and stores nothing", async () => {
    as(owner);
    const key = newKey();
    const a = `Idempotent A ${key}`;
    const b = `Idempotent B ${key}`;
    expect((await deposit(doc(a), key)).status).toBe(201);
    const res = await deposit(doc(b), key);
    expect(res.status).toBe(422);
    expect((await res.json()).title).toMatch(/Idempotency-Key was already used for a different request/);
    expect(await titled(b)).toBe(0);
  });

  it("without the header every POST creates a dataset, as before", async () => {
    as(owner);
    const title = `Not idempotent ${newKey()}`;
    expect((await deposit(doc(title))).status).toBe(201);
    expect((await deposit(doc(title))).status).toBe(201);
    expect(await titled(title)).toBe(2);
  });

  it("keys belong to their caller: another person's same key is a new request", async () => {
    const key = newKey();
    const title = `Shared key ${key}`;
    as(owner);
    const mine = await (await deposit(doc(title), key)).json();
    as(other);
    const theirs = await deposit(doc(title), key);
    expect(theirs.status).toBe(201);
    expect((await theirs.json()).data.datasetId).not.toBe(mine.data.datasetId);
    expect(await titled(title)).toBe(2);
  });

  it("two requests racing with one key create one dataset; both answer 201 with the same version", async () => {
    as(owner);
    const key = newKey();
    const title = `Race ${key}`;
    const [a, b] = await Promise.all([deposit(doc(title), key), deposit(doc(title), key)]);
    expect([a.status, b.status]).toEqual([201, 201]);
    const [ja, jb] = [await a.json(), await b.json()];
    expect(ja.data.versionId).toBe(jb.data.versionId);
    expect([a.headers.get("idempotent-replayed"), b.headers.get("idempotent-replayed")]).toContain("true");
    expect(await titled(title)).toBe(1);
  });

  it("a crash inside the creating transaction leaves neither the dataset nor the key: the retry creates it once", async () => {
    as(owner);
    const key = newKey();
    const title = `Crash inside ${key}`;
    crash.insideTransaction = true;
    const crashed = await deposit(doc(title), key);
    expect(crashed.status).toBe(500);
    expect(await titled(title)).toBe(0);
    expect((await sql`select count(*) from idempotency_keys where user_id = ${owner.id} and key = ${key}`)[0].count).toBe("0");
    const retry = await deposit(doc(title), key);
    expect(retry.status).toBe(201);
    expect(retry.headers.get("idempotent-replayed")).toBeNull();
    expect(await titled(title)).toBe(1);
  });

  it("a crash after the commit, before the answer was sent: the retry replays the dataset it created", async () => {
    as(owner);
    const key = newKey();
    const title = `Crash after ${key}`;
    const json = vi.spyOn(NextResponse, "json").mockImplementationOnce(() => {
      throw new Error("the process died before answering");
    });
    try {
      expect((await deposit(doc(title), key)).status).toBe(500);
    } finally {
      json.mockRestore();
    }
    expect(await titled(title)).toBe(1);
    const retry = await deposit(doc(title), key);
    expect(retry.status).toBe(201);
    expect(retry.headers.get("idempotent-replayed")).toBe("true");
    expect(await titled(title)).toBe(1);
  });

  it("a refused request frees its key: after fixing nothing, the retry is judged again, not replayed", async () => {
    as(owner);
    const key = newKey();
    const bad = JSON.stringify({ ...EXAMPLE_DEPOSIT, points: [] });
    expect((await deposit(bad, key)).status).toBe(422);
    const again = await deposit(bad, key);
    expect(again.status).toBe(422);
    expect(again.headers.get("idempotent-replayed")).toBeNull();
    expect((await sql`select count(*) from idempotency_keys where user_id = ${owner.id} and key = ${key}`)[0].count).toBe("0");
  });

  it("a malformed key is a 422", async () => {
    as(owner);
    const res = await deposit(doc("Bad key"), "has spaces in it");
    expect(res.status).toBe(422);
    expect((await res.json()).title).toMatch(/Idempotency-Key header/);
  });
});

describe("Idempotency-Key on next versions, files and transitions", () => {
  async function draft() {
    return createDatasetDraft({
      ownerId: owner.id,
      title: "Idempotency",
      payload: {},
      points: [],
      analysis: { engineVersion: "t", result: null, checks: [] },
    });
  }

  it("POST versions/:id/files: the retry (new multipart boundary, same file) returns the same file and stores one", async () => {
    const v = await draft();
    as(owner);
    const key = newKey();
    const upload = () => {
      const form = new FormData();
      form.set("file", new File(["T,k\n300,1e-12\n"], "raw.csv"));
      return postFile(
        new Request(`http://127.0.0.1/api/v1/versions/${v.id}/files`, { method: "POST", body: form, headers: { "idempotency-key": key } }),
        ctx(v.id),
      );
    };
    const first = await (await upload()).json();
    const retry = await upload();
    expect(retry.status).toBe(201);
    expect((await retry.json()).data.id).toBe(first.data.id);
    expect((await (await listFiles(new Request("http://127.0.0.1/"), ctx(v.id))).json()).data).toHaveLength(1);
  });

  it("POST versions/:id/transitions: a retried submit replays its answer instead of a 409", async () => {
    const v = await draft();
    as(owner);
    const key = newKey();
    const submit = (k?: string) =>
      postTransition(
        new Request(`http://127.0.0.1/api/v1/versions/${v.id}/transitions`, {
          method: "POST",
          body: JSON.stringify({ transition: "submit" }),
          headers: k ? { "idempotency-key": k } : {},
        }),
        ctx(v.id),
      );
    const first = await submit(key);
    expect(first.status).toBe(200);
    const retry = await submit(key);
    expect(retry.status).toBe(200);
    expect(await retry.json()).toEqual(await first.json());
    // Without the key the same call is judged afresh: the version is no longer a draft.
    expect((await submit()).status).toBe(409);
    expect(
      (
        await sql`select count(*) from audit_events where action = 'dataset.submit' and subject_type = 'dataset_version' and subject_id = ${v.id}`
      )[0].count,
    ).toBe("1");
  });

  it("POST versions/:id/next: the retry returns the same new version", async () => {
    const v = await draft();
    await applyTransition({ actorId: owner.id, versionId: v.id, transition: "submit" });
    await applyTransition({ actorId: curator.id, versionId: v.id, transition: "accept", reason: "Fine." });
    as(owner);
    const key = newKey();
    const next = () =>
      postNext(
        new Request(`http://127.0.0.1/api/v1/versions/${v.id}/next`, { method: "POST", headers: { "idempotency-key": key } }),
        ctx(v.id),
      );
    const first = await next();
    expect(first.status).toBe(201);
    const retry = await next();
    expect(retry.status).toBe(201);
    expect((await retry.json()).data.versionId).toBe((await first.json()).data.versionId);
    expect((await sql`select count(*) from dataset_versions where dataset_id = ${v.datasetId}`)[0].count).toBe("2");
  });

  // Each creating route records its key inside its own transaction: a crash there leaves nothing
  // behind (no row, no key), so the retry runs afresh and creates exactly one.
  it.each([
    {
      route: "files",
      call: (v: { id: number }, key: string) => {
        const form = new FormData();
        form.set("file", new File(["T,k\n300,1e-12\n"], "crash.csv"));
        return postFile(
          new Request(`http://127.0.0.1/api/v1/versions/${v.id}/files`, {
            method: "POST",
            body: form,
            headers: { "idempotency-key": key },
          }),
          ctx(v.id),
        );
      },
      created: async (v: { id: number }) => Number((await sql`select count(*) from version_files where version_id = ${v.id}`)[0].count),
      publish: false,
    },
    {
      route: "transitions",
      call: (v: { id: number }, key: string) =>
        postTransition(
          new Request(`http://127.0.0.1/api/v1/versions/${v.id}/transitions`, {
            method: "POST",
            body: JSON.stringify({ transition: "submit" }),
            headers: { "idempotency-key": key },
          }),
          ctx(v.id),
        ),
      created: async (v: { id: number }) =>
        Number((await sql`select count(*) from dataset_versions where id = ${v.id} and state = 'submitted'`)[0].count),
      publish: false,
    },
    {
      route: "next",
      call: (v: { id: number }, key: string) =>
        postNext(
          new Request(`http://127.0.0.1/api/v1/versions/${v.id}/next`, { method: "POST", headers: { "idempotency-key": key } }),
          ctx(v.id),
        ),
      created: async (v: { datasetId: number }) =>
        Number((await sql`select count(*) from dataset_versions where dataset_id = ${v.datasetId}`)[0].count) - 1,
      publish: true,
    },
  ])("POST versions/:id/$route: a crash inside its transaction stores nothing and frees the key", async ({ call, created, publish }) => {
    const v = await draft();
    if (publish) {
      await applyTransition({ actorId: owner.id, versionId: v.id, transition: "submit" });
      await applyTransition({ actorId: curator.id, versionId: v.id, transition: "accept", reason: "Fine." });
    }
    as(owner);
    const key = newKey();
    crash.insideTransaction = true;
    expect((await call(v, key)).status).toBe(500);
    expect(await created(v)).toBe(0);
    expect((await sql`select count(*) from idempotency_keys where user_id = ${owner.id} and key = ${key}`)[0].count).toBe("0");
    const retry = await call(v, key);
    expect(retry.status).toBeLessThan(300);
    expect(retry.headers.get("idempotent-replayed")).toBeNull();
    expect(await created(v)).toBe(1);
    const replay = await call(v, key);
    expect(replay.headers.get("idempotent-replayed")).toBe("true");
    expect(await created(v)).toBe(1);
  });
});

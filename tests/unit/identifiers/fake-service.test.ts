import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DoiAgencyError, doiPath, getDoi, registerDoi } from "@/lib/identifiers/client";
import { buildDoiMetadata, type DataciteBody } from "@/lib/identifiers/datacite";
import { startFakeDoiService, type FakeDoiService } from "@/lib/identifiers/fake-service";

const auth = { user: "ARRHENIA.TEST", password: "secret" };

function body(doi: string, title = "A dataset"): DataciteBody {
  return buildDoiMetadata({
    kind: "series",
    doi,
    datasetId: 1,
    versionNumber: 1,
    baseUrl: "http://127.0.0.1:3000",
    payload: { title },
    fallbackTitle: title,
    publishedAt: new Date("2025-01-01T00:00:00Z"),
    versionIdentifiers: [],
  });
}

async function refusal(p: Promise<unknown>): Promise<DoiAgencyError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof DoiAgencyError) return err;
    throw err;
  }
  throw new Error("expected a refusal");
}

describe("client against the fake registration service", () => {
  let fake: FakeDoiService;
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(path.join(tmpdir(), "fake-doi-"));
    fake = await startFakeDoiService({ port: 0, dataDir: dir, prefix: "10.5072", auth });
  });
  afterAll(async () => {
    await fake.close();
    await rm(dir, { recursive: true, force: true });
  });

  it("keeps the slash between prefix and suffix in the path", () => {
    expect(doiPath("10.5072/arrhenia.1.v2")).toBe("/dois/10.5072/arrhenia.1.v2");
    expect(doiPath("10.5072/a b")).toBe("/dois/10.5072/a%20b");
  });

  it("creates with the first PUT, updates with the next, and reads the record back", async () => {
    const created = await registerDoi({ baseUrl: fake.url, auth, body: body("10.5072/arrhenia.1") });
    expect(created.attributes).toMatchObject({ doi: "10.5072/arrhenia.1", state: "findable", url: "http://127.0.0.1:3000/datasets/1" });
    await registerDoi({ baseUrl: fake.url, auth, body: body("10.5072/arrhenia.1", "Renamed") });
    expect(fake.requests().map((r) => r.status)).toEqual([201, 200]);
    const record = await getDoi("10.5072/arrhenia.1", { baseUrl: fake.url, auth });
    expect(record?.attributes.titles).toEqual([{ title: "Renamed" }]);
    expect(fake.records().filter((r) => r.doi === "10.5072/arrhenia.1")).toMatchObject([{ writes: 2, state: "findable" }]);
    expect(await getDoi("10.5072/arrhenia.404", { baseUrl: fake.url, auth })).toBeNull();
  });

  it("refuses another prefix, a body for another DOI and a wrong resource type with 422 and says why", async () => {
    const other = await refusal(registerDoi({ baseUrl: fake.url, auth, body: body("10.9999/arrhenia.2") }));
    expect(other.status).toBe(422);
    expect(other.message).toMatch(/HTTP 422 — doi: Prefix must be 10\.5072/);
    expect(other.retryable).toBe(false);

    const res = await fetch(`${fake.url}/dois/10.5072/arrhenia.3`, {
      method: "PUT",
      headers: {
        authorization: `Basic ${Buffer.from("ARRHENIA.TEST:secret").toString("base64")}`,
        "content-type": "application/vnd.api+json",
      },
      body: JSON.stringify({ data: { type: "dois", attributes: { doi: "10.5072/arrhenia.4" } } }),
    });
    expect(res.status).toBe(422);
    expect(res.headers.get("content-type")).toBe("application/vnd.api+json");
    const wrongType = await fetch(`${fake.url}/dois/10.5072/arrhenia.3`, {
      method: "PUT",
      headers: { authorization: `Basic ${Buffer.from("ARRHENIA.TEST:secret").toString("base64")}` },
      body: JSON.stringify({ data: { type: "works" } }),
    });
    expect(wrongType.status).toBe(422);
    expect(fake.records().some((r) => r.doi.endsWith("arrhenia.3"))).toBe(false);
  });

  it("asks for the configured basic-auth account", async () => {
    const err = await refusal(registerDoi({ baseUrl: fake.url, auth: { ...auth, password: "wrong" }, body: body("10.5072/arrhenia.5") }));
    expect(err.status).toBe(401);
    expect((await fetch(`${fake.url}/dois/10.5072/arrhenia.1`)).status).toBe(401);
  });

  it("fails the next N requests with 500, dropping them or (after) storing and losing the answer", async () => {
    fake.failNext(1);
    const dropped = await refusal(registerDoi({ baseUrl: fake.url, auth, body: body("10.5072/arrhenia.6") }));
    expect(dropped.status).toBe(500);
    expect(dropped.retryable).toBe(true);
    expect(fake.records().some((r) => r.doi === "10.5072/arrhenia.6")).toBe(false);

    fake.failNext(1, { when: "after" });
    await refusal(registerDoi({ baseUrl: fake.url, auth, body: body("10.5072/arrhenia.6") }));
    await registerDoi({ baseUrl: fake.url, auth, body: body("10.5072/arrhenia.6") });
    expect(fake.records().filter((r) => r.doi === "10.5072/arrhenia.6")).toMatchObject([{ writes: 2 }]);
  });

  it("keeps its records in the data folder across restarts", async () => {
    const again = await startFakeDoiService({ port: 0, dataDir: dir, prefix: "10.5072" });
    try {
      expect(again.records().map((r) => r.doi)).toEqual(expect.arrayContaining(["10.5072/arrhenia.1", "10.5072/arrhenia.6"]));
      expect((await getDoi("10.5072/arrhenia.1", { baseUrl: again.url, auth: null }))?.attributes.titles).toEqual([{ title: "Renamed" }]);
    } finally {
      await again.close();
    }
  });

  it("reports an unreachable agency with status 0", async () => {
    const gone = await startFakeDoiService({ port: 0 });
    await gone.close();
    const err = await refusal(getDoi("10.5072/arrhenia.1", { baseUrl: gone.url, auth: null }));
    expect(err.status).toBe(0);
    expect(err.retryable).toBe(true);
    expect(err.message).toMatch(/unreachable/);
  });
});

import http from "node:http";
import { gunzipSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { bytesResponse } from "@/lib/http/byte-body";

// A stand-in of GET /api/v1/search that keeps its answers' bytes, as the real one does
// (lib/search/index.ts): the front server may send them again without running it
// (lib/http/front-routes.ts answerKept), with the headers the route sent them with.
const kept = new Map<string, Uint8Array>();
const ran: string[] = [];
const route = async (req: Request) => {
  const q = new URL(req.url).searchParams.get("q") ?? "";
  ran.push(q);
  let bytes = kept.get(q);
  if (!bytes) {
    bytes = Buffer.from(JSON.stringify({ q, hits: "x".repeat(3000) }));
    kept.set(q, bytes);
  }
  return bytesResponse(bytes, {
    headers: {
      "content-type": "application/json",
      etag: '"kept-1"',
      "cache-control": "public, max-age=60",
      "ratelimit-policy": '"api";q=100;w=60',
      ratelimit: '"api";r=99;t=60',
    },
  });
};
vi.mock("@/app/api/v1/search/route", () => ({ GET: route }));
vi.mock("@/app/api/v1/search/suggest/route", () => ({ GET: route }));
vi.mock("@/lib/search", () => ({
  keptSearchAnswerBytes: async (params: URLSearchParams) => {
    if (params.get("q") === "fails") throw new Error("the mark could not be read");
    if (params.get("q") === "down") throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" });
    return kept.get(params.get("q") ?? "") ?? null;
  },
}));

import { askFront, startFrontBefore } from "./front-server";

let app: http.Server;
let front: { port: number; close: () => Promise<void> };

beforeAll(async () => {
  app = http.createServer((req, res) => res.end("from the app"));
  front = await startFrontBefore(app, { answersHere: true });
});

afterAll(async () => {
  await front.close();
  await new Promise((resolve) => app.close(resolve));
});

const ask = (method: string, path: string, headers: http.OutgoingHttpHeaders = {}) => askFront(front.port, method, path, headers);

/** The headers that say the same of every answer (not the date, not the budget, which each path counts: checked apart). */
const LASTING = ["content-type", "etag", "cache-control", "vary", "content-length", "content-encoding"];
const lasting = (headers: http.IncomingHttpHeaders) => Object.fromEntries(LASTING.map((name) => [name, headers[name]]));

describe("kept answers sent by the front server without running the route", () => {
  it("sends a kept answer again with the route's own headers and bytes, counting the client's budget", async () => {
    const first = await ask("GET", "/api/v1/search?q=again");
    expect(ran).toEqual(["again"]);
    const second = await ask("GET", "/api/v1/search?q=again");
    expect(ran).toEqual(["again"]);
    expect(second.status).toBe(200);
    expect(second.body.equals(first.body)).toBe(true);
    expect(lasting(second.headers)).toEqual(lasting(first.headers));
    // The budget is the front server's count of this client, as the route's would be.
    expect(second.headers["ratelimit-policy"]).toMatch(/^"api";q=\d+;w=\d+$/);
    expect(second.headers.ratelimit).toMatch(/^"api";r=\d+;t=\d+$/);
  });

  it("gzips it to a client that takes gzip (weak tag), and sends HEAD without a body", async () => {
    await ask("GET", "/api/v1/search?q=zipped");
    const zipped = await ask("GET", "/api/v1/search?q=zipped", { "accept-encoding": "gzip" });
    expect(ran.filter((q) => q === "zipped")).toHaveLength(1);
    expect(zipped.headers["content-encoding"]).toBe("gzip");
    expect(zipped.headers.etag).toBe('W/"kept-1"');
    expect(zipped.headers.vary).toBe("Accept-Encoding");
    expect(JSON.parse(gunzipSync(zipped.body).toString()).q).toBe("zipped");
    const head = await ask("HEAD", "/api/v1/search?q=zipped");
    expect(ran.filter((q) => q === "zipped")).toHaveLength(1);
    expect(head.status).toBe(200);
    expect(head.body.length).toBe(0);
    expect(Number(head.headers["content-length"])).toBeGreaterThan(3000);
  });

  it("runs the route for a credential, a conditional request, a query it would refuse, and when the mark cannot be read", async () => {
    await ask("GET", "/api/v1/search?q=asked");
    expect(ran.filter((q) => q === "asked")).toHaveLength(1);
    await ask("GET", "/api/v1/search?q=asked", { authorization: "Bearer abc" });
    await ask("GET", "/api/v1/search?q=asked", { "if-none-match": '"kept-1"' });
    await ask("GET", "/api/v1/search?q=asked&x=%00");
    expect(ran.filter((q) => q === "asked")).toHaveLength(4);
    await ask("GET", "/api/v1/search?q=fails");
    const after = await ask("GET", "/api/v1/search?q=fails");
    expect(after.status).toBe(200);
    expect(ran.filter((q) => q === "fails")).toHaveLength(2);
  });

  it("says at once that the database is out of reach when the mark cannot be read for that reason (503, Retry-After), as the route says it", async () => {
    const res = await ask("GET", "/api/v1/search?q=down");
    expect(ran.filter((q) => q === "down")).toHaveLength(0);
    expect(res.status).toBe(503);
    expect(res.headers["retry-after"]).toBe("5");
    expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(JSON.parse(res.body.toString())).toMatchObject({ status: 503, instance: "/api/v1/search" });
    // Counted, and it says so, as every answer after the count does.
    expect(res.headers.ratelimit).toMatch(/^"api";r=\d+;t=\d+$/);
    expect(res.headers["ratelimit-policy"]).toMatch(/^"api";q=\d+;w=\d+$/);
  });

  it("never sends bytes the route has not sent itself, and only for the search (not its suggestions)", async () => {
    kept.set("unsent", Buffer.from('{"q":"unsent"}'));
    await ask("GET", "/api/v1/search?q=unsent");
    expect(ran.filter((q) => q === "unsent")).toHaveLength(1);
    await ask("GET", "/api/v1/search/suggest?q=again");
    await ask("GET", "/api/v1/search/suggest?q=again");
    expect(ran.filter((q) => q === "again")).toHaveLength(3);
  });
});

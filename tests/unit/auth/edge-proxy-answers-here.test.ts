import http from "node:http";
import { gunzipSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

// The search routes answered by the front server itself (lib/http/front-routes.ts), here stand-ins
// that echo what they were given, so that what the front server hands a route handler is visible.
const seen: Request[] = [];
const echo = async (req: Request) => {
  seen.push(req);
  const q = new URL(req.url).searchParams.get("q") ?? "";
  if (q === "throw") throw new Error("a fault in the handler");
  if (q === "unchanged") return new Response(null, { status: 304, headers: { etag: '"e1"', "cache-control": "public, max-age=60" } });
  if (q === "bad")
    return new Response(JSON.stringify({ title: "q is bad" }), { status: 400, headers: { "content-type": "application/problem+json" } });
  return new Response(JSON.stringify({ q, padding: "x".repeat(q === "long" ? 5000 : 10) }), {
    headers: { "content-type": "application/json", etag: '"e1"', "cache-control": "public, max-age=60" },
  });
};
vi.mock("@/app/api/v1/search/route", () => ({ GET: echo }));
vi.mock("@/app/api/v1/search/suggest/route", () => ({ GET: echo }));
// No answer is kept here (tests/unit/auth/edge-proxy-kept-answers.test.ts sends kept ones): every request runs the route.
vi.mock("@/lib/search", () => ({ keptSearchAnswerBytes: async () => null }));

import { CLIENT_ADDRESS_HEADER, EDGE_KEY_HEADER } from "@/lib/auth/client-address";
import { FRONT_ROUTE_PATHS, frontRoute } from "@/lib/http/front-routes";
import { askFront, startFrontBefore, TEST_EDGE_KEY } from "./front-server";

let app: http.Server;
let front: { port: number; close: () => Promise<void> };
const reachedApp: string[] = [];

beforeAll(async () => {
  app = http.createServer((req, res) => {
    reachedApp.push(`${req.method} ${req.url}`);
    req.resume();
    req.on("end", () => res.end("from the app"));
  });
  front = await startFrontBefore(app, { answersHere: true });
});

afterAll(async () => {
  await front.close();
  await new Promise((resolve) => app.close(resolve));
});

const ask = (method: string, path: string, headers: http.OutgoingHttpHeaders = {}) => askFront(front.port, method, path, headers);

describe("which requests the front server answers itself", () => {
  it("GET and HEAD of the search and its suggestions, whatever the query; nothing else", () => {
    expect(FRONT_ROUTE_PATHS).toEqual(["/api/v1/search", "/api/v1/search/suggest"]);
    expect(frontRoute("GET", "/api/v1/search?q=OH")).not.toBeNull();
    expect(frontRoute("HEAD", "/api/v1/search")).not.toBeNull();
    expect(frontRoute("GET", "/api/v1/search/suggest?q=me")).not.toBeNull();
    expect(frontRoute("POST", "/api/v1/search")).toBeNull();
    expect(frontRoute("GET", "/api/v1/search/export?q=OH")).toBeNull();
    expect(frontRoute("GET", "/api/v1/searchx")).toBeNull();
    expect(frontRoute("GET", "/search?q=OH")).toBeNull();
    expect(frontRoute("GET", "/api/v1/search/")).toBeNull();
    // Dot segments are resolved as Next resolves them: the same search, answered (and counted) here.
    expect(frontRoute("GET", "/api/v1/./search?q=OH")).not.toBeNull();
    expect(frontRoute("GET", "/api/v1/x/../search")).not.toBeNull();
    expect(frontRoute("GET", "/api/v1/%2e/search")).not.toBeNull();
    expect(frontRoute("GET", "//api/v1/search")).toBeNull();
    // An inherited property name is not a route.
    expect(frontRoute("GET", "constructor")).toBeNull();
  });
});

describe("a search answered by the front server", () => {
  it("runs the route's handler with the headers the app would get, never reaching the app", async () => {
    seen.length = 0;
    reachedApp.length = 0;
    const res = await ask("GET", "/api/v1/search?q=OH", { "x-forwarded-for": "203.0.113.9", [CLIENT_ADDRESS_HEADER]: "198.51.100.1" });
    expect(res.status).toBe(200);
    expect(JSON.parse(res.body.toString())).toMatchObject({ q: "OH" });
    expect(res.headers.etag).toBe('"e1"');
    expect(res.headers["cache-control"]).toBe("public, max-age=60");
    expect(Number(res.headers["content-length"])).toBe(res.body.length);
    expect(reachedApp).toEqual([]);
    const req = seen[0];
    expect(req.url).toBe("http://127.0.0.1/api/v1/search?q=OH");
    // The client's address comes from the socket (no proxy is trusted), never from its own headers.
    expect(req.headers.get(CLIENT_ADDRESS_HEADER)).toBe("127.0.0.1");
    expect(req.headers.get(EDGE_KEY_HEADER)).toBe(TEST_EDGE_KEY);
  });

  it("sends a long answer gzipped to a client that accepts it, and plain to one that does not", async () => {
    const zipped = await ask("GET", "/api/v1/search?q=long", { "accept-encoding": "gzip, deflate" });
    expect(zipped.headers["content-encoding"]).toBe("gzip");
    expect(zipped.headers.vary).toContain("Accept-Encoding");
    expect(JSON.parse(gunzipSync(zipped.body).toString()).q).toBe("long");
    const plain = await ask("GET", "/api/v1/search?q=long");
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(JSON.parse(plain.body.toString()).q).toBe("long");
    // A short answer is sent as it is.
    expect((await ask("GET", "/api/v1/search?q=s", { "accept-encoding": "gzip" })).headers["content-encoding"]).toBeUndefined();
  });

  it("names the answer with a weak tag to a client that takes gzip (other bytes than the strong tag names), a strong one otherwise", async () => {
    expect((await ask("GET", "/api/v1/search?q=long", { "accept-encoding": "gzip" })).headers.etag).toBe('W/"e1"');
    expect((await ask("GET", "/api/v1/search?q=long")).headers.etag).toBe('"e1"');
    expect((await ask("GET", "/api/v1/search?q=unchanged", { "accept-encoding": "gzip", "if-none-match": 'W/"e1"' })).headers.etag).toBe(
      'W/"e1"',
    );
  });

  it("answers HEAD with the headers and no body, and passes a problem's status through", async () => {
    const head = await ask("HEAD", "/api/v1/search/suggest?q=me");
    expect(head.status).toBe(200);
    expect(head.body.length).toBe(0);
    const bad = await ask("GET", "/api/v1/search?q=bad");
    expect(bad.status).toBe(400);
    expect(bad.headers["content-type"]).toBe("application/problem+json");
  });

  it("a 304 states no length and says, as its 200 does, that the answer varies with Accept-Encoding", async () => {
    const res = await ask("GET", "/api/v1/search?q=unchanged", { "if-none-match": '"e1"' });
    expect(res.status).toBe(304);
    expect(res.headers["content-length"]).toBeUndefined();
    expect(res.headers.vary).toContain("Accept-Encoding");
    expect(res.headers.etag).toBe('"e1"');
    expect((await ask("GET", "/api/v1/search?q=s")).headers.vary).toContain("Accept-Encoding");
  });

  it("a fault in the handler is a 500 problem, and the front server goes on serving", async () => {
    const spy = vi.spyOn(console, "error").mockImplementation(() => {});
    const failed = await ask("GET", "/api/v1/search?q=throw");
    spy.mockRestore();
    expect(failed.status).toBe(500);
    expect(JSON.parse(failed.body.toString()).code).toBe("internal");
    expect((await ask("GET", "/api/v1/search?q=OH")).status).toBe(200);
  });

  it("passes everything else on to the app: other paths and other methods", async () => {
    reachedApp.length = 0;
    expect((await ask("GET", "/search?q=OH")).body.toString()).toBe("from the app");
    expect((await ask("POST", "/api/v1/search")).body.toString()).toBe("from the app");
    expect(reachedApp).toEqual(["GET /search?q=OH", "POST /api/v1/search"]);
  });
});

import { NextRequest } from "next/server";
import { describe, expect, it } from "vitest";
import { EDGE_KEY_HEADER } from "@/lib/auth/client-address";
import { proxy } from "@/proxy";

// Next's own port is loopback-only but reachable by any local process; proxy.ts makes it answer
// only what came through the front server (the end-to-end suite checks the real port).
describe("Next answers only requests that carry the front server's key", () => {
  const key = process.env.ARRHENIA_EDGE_KEY!;
  const request = (headers: Record<string, string>, method = "GET", path = "/api/health") =>
    new NextRequest(`http://127.0.0.1:3999${path}`, { method, headers });

  it.each([
    ["no key", {}],
    ["a wrong key", { [EDGE_KEY_HEADER]: "guessed" }],
    ["a key one character short", { [EDGE_KEY_HEADER]: key.slice(0, -1) }],
  ])("%s: 403 before any route, action or static file", async (_label, headers) => {
    for (const [method, path] of [
      ["GET", "/api/health"],
      ["POST", "/deposits/new"],
      ["GET", "/_next/static/chunks/main.js"],
    ]) {
      const res = proxy(request(headers, method, path));
      expect(res.status, `${method} ${path}`).toBe(403);
      expect(await res.json()).toMatchObject({ code: "forbidden" });
    }
  });

  it("the front server's key: passed on to the route", () => {
    const res = proxy(request({ [EDGE_KEY_HEADER]: key }));
    expect(res.status).toBe(200);
    expect(res.headers.get("x-middleware-next")).toBe("1");
  });
});

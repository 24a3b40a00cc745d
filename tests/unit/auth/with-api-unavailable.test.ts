import { describe, expect, it } from "vitest";
import { withApi } from "@/lib/auth/api";

// An endpoint whose read finds the database out of reach answers 503 problem+json with Retry-After,
// and, the call having been counted, says what is left of the client's budget as every answer does.
describe("withApi while the database is out of reach", () => {
  it("answers 503 with Retry-After and the budget's fields", async () => {
    const route = withApi(
      async () => {
        throw Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" });
      },
      { scope: null, cache: { maxAge: 60 } },
    );
    const res = await route(new Request("http://127.0.0.1/api/v1/reactions"), { params: Promise.resolve({}) });
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBe("5");
    expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    expect(res.headers.get("ratelimit")).toMatch(/^"api";r=\d+;t=\d+$/);
    expect(res.headers.get("ratelimit-policy")).toMatch(/^"api";q=\d+;w=\d+$/);
  });
});

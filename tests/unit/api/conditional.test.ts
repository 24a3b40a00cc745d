import { describe, expect, it } from "vitest";
import { entityTag, noneMatch, withValidators } from "@/lib/http/conditional";

describe("If-None-Match (RFC 9110 §13.1.2: weak comparison, lists, *)", () => {
  const tag = '"abc"';
  it.each([
    [null, true],
    ['"abc"', false],
    ['W/"abc"', false],
    ['"x", "abc"', false],
    ["*", false],
    ['"abd"', true],
    ['"ABC"', true],
  ])("If-None-Match %s → proceed %s", (header, proceed) => {
    expect(noneMatch(header, tag)).toBe(proceed);
  });
});

describe("withValidators", () => {
  const body = JSON.stringify({ data: [1, 2, 3] });
  const answer = () => new Response(body, { headers: { "content-type": "application/json" } });

  it("tags the exact bytes (a SHA-256, quoted), sets Cache-Control and keeps the body", async () => {
    const res = await withValidators(new Request("http://x/a"), answer(), { maxAge: 60 });
    expect(res.headers.get("etag")).toBe(entityTag(new TextEncoder().encode(body)));
    expect(res.headers.get("cache-control")).toBe("public, max-age=60");
    expect(res.headers.get("content-type")).toBe("application/json");
    expect(await res.text()).toBe(body);
  });

  it("answers 304 without a body to a matching If-None-Match, and leaves errors and writes alone", async () => {
    const etag = entityTag(new TextEncoder().encode(body));
    const res = await withValidators(new Request("http://x/a", { headers: { "if-none-match": etag } }), answer(), { maxAge: 60 });
    expect(res.status).toBe(304);
    expect(await res.text()).toBe("");
    expect(res.headers.get("etag")).toBe(etag);
    const missing = new Response("{}", { status: 404 });
    expect(await withValidators(new Request("http://x/a"), missing, { maxAge: 60 })).toBe(missing);
    const post = answer();
    expect(await withValidators(new Request("http://x/a", { method: "POST", body: "{}" }), post, { maxAge: 60 })).toBe(post);
  });
});

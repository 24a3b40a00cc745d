import { describe, expect, it } from "vitest";
import { ActionBodyGuard, isActionRequest, isApiPath, MAX_ACTION_NESTING, pagePath } from "@/lib/auth/action-body-guard";

/** Feeds `body` to a fresh guard in chunks of `size` bytes; the first refusal, or null. */
function scan(body: string, contentType = "text/plain;charset=UTF-8", size = Infinity): string | null {
  const guard = new ActionBodyGuard(contentType);
  const bytes = Buffer.from(body);
  const step = Math.min(size, bytes.length || 1);
  for (let i = 0; i < bytes.length; i += step) {
    const problem = guard.write(bytes.subarray(i, i + step));
    if (problem) return problem;
  }
  return null;
}

const boundary = "----formdata-xyz";
const multipart = `multipart/form-data; boundary=${boundary}`;
const body = (...parts: string[]) => parts.map((p) => `--${boundary}\r\n${p}\r\n`).join("") + `--${boundary}--\r\n`;
const field = (name: string, value: string) => `Content-Disposition: form-data; name="${name}"\r\n\r\n${value}`;
const file = (value: string) => `Content-Disposition: form-data; name="1"; filename="blob"\r\nContent-Type: text/plain\r\n\r\n${value}`;

describe("ActionBodyGuard", () => {
  it("allows nesting up to the limit and refuses one level more, however the body is cut into chunks", () => {
    const ok = "[".repeat(MAX_ACTION_NESTING) + "]".repeat(MAX_ACTION_NESTING);
    const deep = "{".repeat(MAX_ACTION_NESTING + 1);
    for (const size of [1, 7, 4096, Infinity]) {
      expect(scan(ok, undefined, size)).toBeNull();
      expect(scan(deep, undefined, size)).toMatch(/nested more than 128 levels/);
    }
  });

  it("counts depth, not brackets: many shallow arrays pass", () => {
    expect(scan(JSON.stringify(Array.from({ length: 10_000 }, (_, i) => [i, { a: [i] }])))).toBeNull();
  });

  it("brackets inside strings (with escaped quotes) are not nesting", () => {
    const text = JSON.stringify(['\\"' + "[".repeat(1000) + '"' + "{".repeat(1000)]);
    expect(scan(text, undefined, 3)).toBeNull();
  });

  it("multipart: text fields are scanned, each on its own; files are skipped; boundaries may straddle chunks", () => {
    const deepField = body(field("0", '["$K1"]'), field("1_a", "[".repeat(5000)));
    const deepFile = body(field("0", '["$K1"]'), file("[".repeat(5000)));
    const manyFields = body(...Array.from({ length: 50 }, (_, i) => field(String(i), "[".repeat(100))));
    for (const size of [1, 5, 64, Infinity]) {
      expect(scan(deepField, multipart, size)).toMatch(/nested/);
      expect(scan(deepFile, multipart, size)).toBeNull();
      expect(scan(manyFields, multipart, size)).toBeNull();
    }
  });

  it("multipart: only parts Next's parser treats as files are skipped; a mere mention of filename is scanned", () => {
    const deep = "[".repeat(5000) + "]".repeat(5000);
    const notFiles = [
      `Content-Disposition: form-data; name="0"\r\nX-Note: filename=x`,
      `Content-Disposition: form-data; name="0"; x="filename="`,
      `Content-Disposition: form-data; name="0"; filename*=`,
      `Content-Disposition: form-data; name="0"; filename=""`,
      `X-Filename: filename="a"\r\nContent-Disposition: form-data; name="0"`,
    ];
    for (const headers of notFiles) {
      for (const size of [1, 64, Infinity]) expect(scan(body(`${headers}\r\n\r\n${deep}`), multipart, size), headers).toMatch(/nested/);
    }
    const files = [
      `Content-Disposition: form-data; name="1"; filename="data.json"`,
      `Content-Disposition: form-data; name="1"; filename*=utf-8''d%C3%A9p%C3%B4t.json`,
      `Content-Disposition: form-data; name="1"\r\nContent-Type: application/octet-stream`,
    ];
    for (const headers of files) expect(scan(body(`${headers}\r\n\r\n${deep}`), multipart, 7), headers).toBeNull();
  });

  it("a quoted boundary parameter is understood", () => {
    const deep = body(field("0", "[".repeat(500)));
    expect(scan(deep, `multipart/form-data; boundary="${boundary}"`)).toMatch(/nested/);
  });
});

describe("isActionRequest", () => {
  it.each<[string, string, Record<string, string>, boolean]>([
    ["POST", "/deposits/new", { "next-action": "abc" }, true],
    ["POST", "/api/v1/x", { "next-action": "abc" }, true],
    ["POST", "/settings", { "content-type": "multipart/form-data; boundary=x" }, true],
    ["POST", "/api/v1/versions/1/files", { "content-type": "multipart/form-data; boundary=x" }, false],
    ["POST", "/api/v1/analyses", { "content-type": "application/json" }, false],
    ["GET", "/settings", { "next-action": "abc" }, false],
    // Paths Next resolves to a page are pages, whatever they start with.
    ...[
      "/api/%2e%2e/admin/people",
      "/api/%2E./admin",
      "/api/../admin",
      "/api/./x",
      "/api\\..\\admin",
      "/api//../admin",
      "/api/..%2fadmin",
      "/api/x%5c..%5cy",
    ].map((url): [string, string, Record<string, string>, boolean] => [
      "POST",
      url,
      { "content-type": "multipart/form-data; boundary=x" },
      true,
    ]),
  ])("%s %s %j → %s", (method, url, headers, expected) => {
    expect(isActionRequest(method, url, headers)).toBe(expected);
  });
});

describe("isApiPath / pagePath", () => {
  it("the API is a plain /api/ path; a dot segment or encoded separator makes it a page", () => {
    expect(isApiPath("/api/v1/analyses?x=../y")).toBe(true);
    expect(isApiPath("/api/v1/versions/a.b")).toBe(true);
    expect(isApiPath("/api/%2e%2e/admin/people")).toBe(false);
    expect(isApiPath("/apix")).toBe(false);
    // OAI-PMH's route handler (public, read-only) is one too, by its exact path.
    expect(isApiPath("/oai")).toBe(true);
    expect(isApiPath("/oai?verb=Identify")).toBe(true);
    expect(isApiPath("/oai/x")).toBe(false);
  });
  it("pagePath resolves dot segments as Next routes them", () => {
    expect(pagePath("/api/%2e%2e/deposits/new")).toBe("/deposits/new");
    expect(pagePath("//evil/api/x")).toBe("//evil/api/x");
  });
});

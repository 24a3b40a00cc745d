import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { cursorPositionOrThrow, signCursor, verifyCursor } from "@/lib/search/cursor";
import { DEFAULT_REQUEST, EMPTY_FILTERS } from "@/lib/search/params";
import type { SearchRequest } from "@/lib/search/types";

const request: SearchRequest = { ...DEFAULT_REQUEST, q: "OH", sort: "newest" };
const saved = process.env.SEARCH_CURSOR_SECRET;

beforeEach(() => {
  process.env.SEARCH_CURSOR_SECRET = "a-test-key-of-enough-length";
});
afterEach(() => {
  if (saved === undefined) delete process.env.SEARCH_CURSOR_SECRET;
  else process.env.SEARCH_CURSOR_SECRET = saved;
});

describe("search cursors", () => {
  it("give back the position they were made with", () => {
    const cursor = signCursor('["2026-01-01 00:00:00+00",12]', request);
    expect(verifyCursor(cursor, request)).toBe('["2026-01-01 00:00:00+00",12]');
    expect(cursorPositionOrThrow({ ...request, cursor })).toBe('["2026-01-01 00:00:00+00",12]');
  });

  it("refuse a changed position, a changed signature and another key", () => {
    const cursor = signCursor('["x",12]', request);
    const [body, mac] = cursor.split(".");
    const forged = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(body, "base64url").toString()), a: '["x",1]' })).toString(
      "base64url",
    );
    expect(verifyCursor(`${forged}.${mac}`, request)).toBeNull();
    expect(verifyCursor(`${body}.${mac.slice(0, -2)}AA`, request)).toBeNull();
    expect(verifyCursor(`${body}`, request)).toBeNull();
    expect(verifyCursor("garbage", request)).toBeNull();
    process.env.SEARCH_CURSOR_SECRET = "another-key-of-enough-length";
    expect(verifyCursor(cursor, request)).toBeNull();
  });

  it("belong to one search: another text, sort or filter refuses them", () => {
    const cursor = signCursor('["x",12]', request);
    expect(verifyCursor(cursor, { ...request, q: "CH4" })).toBeNull();
    expect(verifyCursor(cursor, { ...request, sort: "points" })).toBeNull();
    expect(verifyCursor(cursor, { ...request, filters: { ...EMPTY_FILTERS, tMin: 200 } })).toBeNull();
    // The page size is not part of the search.
    const largerPages: SearchRequest = { ...request, limit: 50 };
    expect(verifyCursor(cursor, largerPages)).toBe('["x",12]');
  });

  it("a tampered cursor is a 400 naming the cursor", () => {
    expect(() => cursorPositionOrThrow({ ...request, cursor: "e30.AAAA" })).toThrow(
      expect.objectContaining({ status: 400, errors: [expect.objectContaining({ parameter: "cursor" })] }),
    );
  });
});

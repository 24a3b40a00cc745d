import { describe, expect, it } from "vitest";
import { safeCallbackPath } from "@/lib/auth/callback-url";

const origin = "https://arrhenia.example";

describe("safeCallbackPath: where sign-in may send people", () => {
  // Each of these, taken at face value by a router or browser, leaves the site (or is not a path).
  const refused: [string, unknown][] = [
    ["backslash after the slash", "/\\evil.example/phish"],
    ["encoded backslash", "/%5Cevil.example/phish"],
    ["lower-case encoded backslash", "/%5cevil.example"],
    ["double-encoded backslash", "/%255Cevil.example"],
    ["protocol-relative", "//evil.example/phish"],
    ["protocol-relative, three slashes", "///evil.example"],
    ["encoded second slash", "/%2Fevil.example"],
    ["double-encoded second slash", "/%252F%252Fevil.example"],
    ["slash then backslash then slash", "/\\/evil.example"],
    ["tab inside the double slash (browsers drop it)", "/\t/evil.example"],
    ["newline inside the double slash", "/\n/evil.example"],
    ["encoded tab", "/%09/evil.example"],
    ["encoded NUL", "/%00"],
    ["raw NUL", "/a\u0000b"],
    ["DEL", "/\u007f/evil.example"],
    ["line separator", "/\u2028/evil.example"],
    ["absolute other origin", "https://evil.example/phish"],
    ["same host, other scheme", "http://arrhenia.example/deposits"],
    ["same host, other port", "https://arrhenia.example:8443/deposits"],
    ["userinfo trick", "https://arrhenia.example@evil.example/"],
    ["javascript scheme", "javascript:alert(1)"],
    ["data scheme", "data:text/html,<script>alert(1)</script>"],
    ["scheme with leading space", " https://evil.example"],
    ["relative without slash", "evil.example"],
    ["dot-dot climbing to a double slash", "/..//evil.example"],
    ["dot-dot with backslash", "/..\\evil.example"],
    ["malformed escape", "/%E0%A4%A"],
    ["absolute same origin whose path starts with //", "https://arrhenia.example//evil.example"],
    ["empty", ""],
    ["not a string", 42],
    ["undefined", undefined],
    ["very long", `/${"a".repeat(3000)}`],
  ];
  it.each(refused)("refuses %s", (_label, value) => {
    expect(safeCallbackPath(value, origin)).toBe("/");
  });

  const accepted: [string, unknown, string][] = [
    ["a plain path", "/deposits", "/deposits"],
    ["path, query and fragment", "/review?sort=age&page=2#top", "/review?sort=age&page=2#top"],
    ["an encoded space in the query", "/search?q=OH%20%2B%20CH4", "/search?q=OH%20%2B%20CH4"],
    ["dot segments, normalised", "/datasets/./12/../13", "/datasets/13"],
    ["absolute URL on this origin, reduced to its path", "https://arrhenia.example/settings?tab=tokens", "/settings?tab=tokens"],
    ["the first of repeated query values", ["/deposits", "//evil.example"], "/deposits"],
  ];
  it.each(accepted)("keeps %s", (_label, value, expected) => {
    expect(safeCallbackPath(value, origin)).toBe(expected);
  });
});

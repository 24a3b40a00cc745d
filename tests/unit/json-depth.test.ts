import { describe, expect, it } from "vitest";
import { findNumberTooLarge, findTooDeep } from "@/lib/json-depth";

describe("walking a parsed JSON document without recursion", () => {
  it("names the first place nested deeper than the limit, and nothing within it", () => {
    const deep = JSON.parse(`{"title":"t","description":${"[".repeat(70)}${"]".repeat(70)}}`);
    // Level 1 is the document, level 2 the array under /description: level 65 is 63 steps further.
    expect(findTooDeep(deep)).toBe(`/description${"/0".repeat(63)}`);
    expect(findTooDeep({ a: [[1]] })).toBeNull();
  });

  it("names the first number beyond the largest double (JSON.parse makes it Infinity), escaping the pointer", () => {
    const doc = JSON.parse('{"title":"t","a/b":[1, 2],"points":[{"T":300,"k":1e-12},{"T":310,"k":1e400}],"x":-1e999}');
    expect(findNumberTooLarge(doc)).toBe("/points/1/k");
    expect(findNumberTooLarge({ "a/b": [1, JSON.parse("-1e999")] })).toBe("/a~1b/1");
    expect(findNumberTooLarge({ ok: [1.7976931348623157e308, 5e-324, 0] })).toBeNull();
  });
});

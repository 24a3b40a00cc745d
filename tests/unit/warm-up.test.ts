import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { samplePath, warmUpRequests } from "../../scripts/warm-up";

describe("warm-up requests before the front server opens", () => {
  it("turns route patterns into concrete paths", () => {
    expect(samplePath("/deposits/[id]/page")).toBe("/deposits/1");
    expect(samplePath("/api/auth/[...nextauth]/route")).toBe("/api/auth/session");
    expect(samplePath("/(public)/datasets/[id]/[version]/page")).toBe("/datasets/1/1");
    expect(samplePath("/page")).toBe("/");
  });

  it("sends OPTIONS to every route handler, one argument-less call per file of actions, and a GET of each page holding actions", () => {
    const dist = mkdtempSync(path.join(tmpdir(), "arrhenia-warm-"));
    mkdirSync(path.join(dist, "server"));
    writeFileSync(
      path.join(dist, "server/app-paths-manifest.json"),
      JSON.stringify({ "/api/v1/datasets/route": "x", "/deposits/[id]/page": "y", "/api/health/route": "z" }),
    );
    writeFileSync(
      path.join(dist, "server/server-reference-manifest.json"),
      JSON.stringify({
        node: {
          a1: { workers: { "app/deposits/[id]/page": {} }, filename: "app/deposits/actions.ts" },
          a2: { workers: { "app/deposits/[id]/page": {} }, filename: "app/deposits/actions.ts" },
          b1: { workers: { "app/settings/page": {} }, filename: "app/settings/actions.ts" },
        },
      }),
    );
    expect(warmUpRequests(dist)).toEqual([
      ["OPTIONS", "/api/v1/datasets", {}, undefined],
      ["OPTIONS", "/api/health", {}, undefined],
      ["POST", "/deposits/1", { "next-action": "a1", "content-type": "text/plain;charset=UTF-8" }, "[]"],
      ["POST", "/settings", { "next-action": "b1", "content-type": "text/plain;charset=UTF-8" }, "[]"],
      ["GET", "/deposits/1", {}, undefined],
      ["GET", "/settings", {}, undefined],
    ]);
  });
});

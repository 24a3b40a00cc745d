import { describe, expect, it } from "vitest";
import { drawableFit } from "@/lib/datasets/version-json";
import { analyseDataset } from "@/lib/kinetics";

describe("drawableFit: pages draw a stored analysis only when it holds a fit and its band", () => {
  it("keeps a full result of the engine", () => {
    // Invented points following E/R = 1500 K.
    const points = [250, 300, 350, 400].map((T) => ({ T, k: 1e-11 * Math.exp(-1500 / T) }));
    const result = analyseDataset({ points, order: 2 });
    expect(drawableFit(JSON.parse(JSON.stringify(result)))).not.toBeNull();
  });

  it.each([
    ["nothing", null],
    ["an empty object", {}],
    ["flags only", { flags: [] }],
    ["a fit without its band", { arrhenius: { params: { A: 1, Ea: 1 } } }],
  ])("refuses %s", (_what, stored) => {
    expect(drawableFit(stored)).toBeNull();
  });
});

/**
 * Two measured sets that agree and one computed set far off both (invented data, as on the demo
 * reaction): the measured sets agree with "the others" only because the others disagree with each
 * other, and their verdicts must say so and name the computed set, not call it agreement.
 */
import { describe, expect, it } from "vitest";
import { consensus } from "@/lib/kinetics/consensus";
import { evaluateRateExpression } from "@/lib/kinetics/evaluate-expression";
import type { ConsensusDataset } from "@/lib/kinetics/consensus";
import type { RatePoint } from "@/lib/kinetics/types";

function makeNormal(seed: number): () => number {
  let s = seed;
  const u = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

const TRUE = { A: 2.0e-12, Ea: 15000 };

function set(
  id: string,
  normal: () => number,
  n: number,
  T1: number,
  T2: number,
  sd: number,
  factor: (T: number) => number,
): ConsensusDataset {
  const points: RatePoint[] = Array.from({ length: n }, (_, i) => {
    const T = i === n - 1 ? T2 : 1 / (1 / T1 + ((1 / T2 - 1 / T1) * i) / (n - 1));
    return { T, k: evaluateRateExpression(TRUE, T) * factor(T) * Math.exp(sd * normal()), sigmaLnK: sd };
  });
  return { id, order: 2, points, label: id };
}

/** ×1/5 at 220 K to ×4.5 at 420 K, linear in 1/T: a computed set with a much higher activation energy. */
const tilted = (T: number) => Math.exp(Math.log(1 / 5) + (Math.log(4.5) - Math.log(1 / 5)) * ((1 / T - 1 / 220) / (1 / 420 - 1 / 220)));

describe("consensus words when the others disagree with each other", () => {
  const normal = makeNormal(11);
  const sets = [
    set("measured 1", normal, 10, 220, 420, 0.05, () => 1),
    set("measured 2", normal, 8, 230, 410, 0.05, () => 1),
    set("computed", normal, 12, 200, 500, 0.02, tilted),
  ];
  const c = consensus(sets);
  const m = (id: string) => c.members.find((x) => x.id === id)!;

  it("finds the computed set off and the measured sets not off", () => {
    expect(m("computed").disagreement!.off).toBe(true);
    expect(m("measured 1").disagreement!.off).toBe(false);
    expect(m("measured 2").disagreement!.off).toBe(false);
    expect(c.flags.filter((f) => f.code === "off_consensus").map((f) => f.datasetIds)).toEqual([["computed"]]);
  });

  it("says each measured set agrees only within the spread between the others, and names the computed set", () => {
    for (const id of ["measured 1", "measured 2"]) {
      const d = m(id).disagreement!;
      expect(d.agreesOnlyWithinSpread).toBe(true);
      // The spread between the others outweighs both fits' own variances at the comparison temperatures.
      expect(d.points.some((p) => d.tau2 > p.seOwn ** 2 + p.seOthers ** 2)).toBe(true);
      expect(m(id).verdict).toMatch(
        new RegExp(
          `^${id} agrees with the consensus of the other 2 at .* only within the wide spread between the others \\(τ² of the others = [0-9.]+ in \\(ln k\\)², a factor [0-9.]+ per standard deviation\\): they disagree with each other, and computed is off the consensus of the rest\\.`,
        ),
      );
      expect(m(id).verdict).not.toMatch(/within its uncertainty/);
      // Compared with the others' consensus, never with "the others'" as if they agreed.
      expect(m(id).verdict).not.toMatch(/than the others'(?! consensus)/);
    }
  });

  it("keeps the plain wording when the others agree with each other", () => {
    const agreeing = consensus([...sets.slice(0, 2), set("measured 3", makeNormal(12), 9, 225, 400, 0.05, () => 1)]);
    for (const x of agreeing.members) {
      expect(x.disagreement!.agreesOnlyWithinSpread).toBe(false);
      expect(x.verdict).toMatch(/agrees with the consensus of the other 2 within its uncertainty/);
    }
  });
});

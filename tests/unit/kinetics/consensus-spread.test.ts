/**
 * Two measured sets that agree and one computed set far off both (invented data, as on the demo
 * reaction): the computed set is off the consensus of the others and set aside (largest consistent
 * subset), so the measured sets shape the curve and agree with each other within their uncertainty
 * instead of agreeing only within a spread the computed set creates. The words for a spread between
 * the others are checked in consensus-words.test.ts.
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

describe("consensus words when one set is far off the two others", () => {
  const normal = makeNormal(11);
  const sets = [
    set("measured 1", normal, 10, 220, 420, 0.05, () => 1),
    set("measured 2", normal, 8, 230, 410, 0.05, () => 1),
    set("computed", normal, 12, 200, 500, 0.02, tilted),
  ];
  const c = consensus(sets);
  const m = (id: string) => c.members.find((x) => x.id === id)!;

  it("finds the computed set off, sets it aside, and the measured sets shape the curve", () => {
    expect(m("computed").disagreement!.off).toBe(true);
    expect(m("computed").setAside).toBe(true);
    expect(m("measured 1").disagreement!.off).toBe(false);
    expect(m("measured 2").disagreement!.off).toBe(false);
    expect(c.curveFrom).toEqual(["measured 1", "measured 2"]);
    expect(c.flags.filter((f) => f.code === "off_consensus").map((f) => f.datasetIds)).toEqual([["computed"]]);
    expect(m("computed").verdict).toMatch(/^computed is off the consensus of the other 2: .* Off the consensus — not used for the curve\./);
  });

  it("with the computed set out of the curve, each measured set agrees with the other within its uncertainty", () => {
    for (const id of ["measured 1", "measured 2"]) {
      const d = m(id).disagreement!;
      expect(d.agreesOnlyWithinSpread).toBe(false);
      expect(m(id).verdict).toMatch(new RegExp(`^${id} agrees with the only other dataset within its uncertainty`));
    }
  });

  it("keeps the plain wording when the others agree with each other", () => {
    // Its own stream from a seed spread over the generator's range: seeds 11 and 12 would each start
    // with a deviate beyond 3.5σ (Park–Miller's first uniform from a small seed is tiny), giving both
    // sets the same extreme cold-end point.
    const agreeing = consensus([...sets.slice(0, 2), set("measured 3", makeNormal(1013904223 + 12 * 48271), 9, 225, 400, 0.05, () => 1)]);
    for (const x of agreeing.members) {
      expect(x.disagreement!.agreesOnlyWithinSpread).toBe(false);
      expect(x.verdict).toMatch(/agrees with the consensus of the other 2( \(which rests \d+ % on [^)]+\))? within its uncertainty/);
    }
  });
});

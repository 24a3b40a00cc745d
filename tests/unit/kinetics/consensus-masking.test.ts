/**
 * Two datasets off in different ways hide each other (masking): while both are in, the spread τ²
 * between the datasets is so wide that neither is off the consensus of the others, and the curve is
 * pulled away from the datasets that agree. The consensus looks for the one pair whose removal leaves
 * the rest agreeing, with each of the two grossly off that rest, and sets both aside. All data are
 * invented (a made-up Arrhenius expression with seeded scatter, as the demo's).
 */
import { describe, expect, it } from "vitest";
import { consensus, MASKING_FACTOR, type ConsensusDataset } from "@/lib/kinetics/consensus";
import { seededRandom } from "@/lib/seeded-random";

/** The demo's generator (scripts/seed/seed-datasets.ts), sums of three uniforms as noise. */
const rng = seededRandom;

const EoverR = 1760;
/** (T/T0)^2.4 · exp(2.4 (1 − T0/T)): 1 at 298.15 K, about ×1/5 at 220 K and ×4.6 at 420 K. */
const curved = (T: number) => Math.pow(T / 298.15, 2.4) * Math.exp(2.4 * (1 - 298.15 / T));

function set(
  id: string,
  seed: number,
  n: number,
  Tmin: number,
  Tmax: number,
  scatter: number,
  factor: (T: number) => number = () => 1,
): ConsensusDataset {
  const rand = rng(seed);
  const points = Array.from({ length: n }, (_, i) => {
    const T = 1 / (1 / Tmin - (i / (n - 1)) * (1 / Tmin - 1 / Tmax));
    const k = 2.3e-12 * factor(T) * Math.exp(-EoverR / T) * Math.exp(scatter * (rand() + rand() + rand() - 1.5) * 2);
    return { T: Math.round(T * 10) / 10, k: Number(k.toPrecision(3)), sigmaLnK: scatter };
  });
  return { id, order: 2, points, label: id };
}

const member = (c: ReturnType<typeof consensus>, id: string) => c.members.find((m) => m.id === id)!;

describe("two discordant datasets that hide each other", () => {
  it("four datasets: two measured sets agree, a computed set bends away and a fourth is ×8.57 — both odd ones are set aside", () => {
    const sets = [
      set("measured 1", 1000, 10, 220, 420, 0.05),
      set("measured 2", 1001, 8, 250, 400, 0.06),
      set("computed", 1002, 16, 200, 2000, 0.02, curved),
      set("times 8.57", 1050, 6, 300, 500, 0.05, () => 8.57),
    ];
    // Without the pair search nobody is off: each odd set is judged against a consensus the other widens.
    const c = consensus(sets);
    expect(c.curveFrom).toEqual(["measured 1", "measured 2"]);
    for (const id of ["computed", "times 8.57"]) {
      expect(member(c, id).setAside).toBe(true);
      expect(member(c, id).disagreement!.off).toBe(true);
    }
    for (const id of ["measured 1", "measured 2"]) {
      expect(member(c, id).disagreement!.off).toBe(false);
      expect(member(c, id).disagreement!.agreesOnlyWithinSpread).toBe(false);
    }
    // The curve is the measured sets' own: E/R within 5 % of the invented 1760 K.
    expect(c.arrhenius.params.Ea / 8.314462618 / EoverR).toBeCloseTo(1, 1);
    const flagged = c.flags.filter((f) => f.code === "off_consensus").flatMap((f) => f.datasetIds ?? []);
    expect(flagged.sort()).toEqual(["computed", "times 8.57"]);
  });

  it("five datasets: three agree, one reads ×6 high and one ×1/6 low over a shifted range — both set aside", () => {
    const c = consensus([
      set("a", 2001, 9, 230, 400, 0.05),
      set("b", 2002, 8, 250, 420, 0.05),
      set("c", 2003, 7, 240, 380, 0.05),
      set("high", 2004, 6, 300, 450, 0.04, () => 6),
      set("low", 2005, 6, 220, 320, 0.04, () => 1 / 6),
    ]);
    expect(c.curveFrom).toEqual(["a", "b", "c"]);
    expect(member(c, "high").setAside).toBe(true);
    expect(member(c, "low").setAside).toBe(true);
  });

  it("leaves both halves in when two pairs each agree within themselves: the data cannot tell which is right", () => {
    const c = consensus([
      set("a", 3001, 8, 230, 400, 0.05),
      set("b", 3002, 8, 240, 410, 0.05),
      set("a ×8.57", 3003, 8, 230, 400, 0.05, () => 8.57),
      set("b ×8.57", 3004, 8, 240, 410, 0.05, () => 8.57),
    ]);
    expect(c.members.filter((m) => m.setAside)).toEqual([]);
    // Each is said to agree only within the wide spread between the others, never within its uncertainty.
    for (const m of c.members) expect(m.disagreement!.agreesOnlyWithinSpread).toBe(true);
  });

  it("does not set a pair aside for a spread of tens of per cent (each must be off by a factor of 2 or more)", () => {
    const c = consensus([
      set("a", 4001, 8, 230, 400, 0.05, () => 1.3),
      set("b", 4002, 8, 240, 410, 0.05, () => 1.25),
      set("c", 4003, 8, 230, 400, 0.05, () => 1 / 1.3),
      set("d", 4004, 8, 240, 410, 0.05, () => 1 / 1.25),
    ]);
    expect(MASKING_FACTOR).toBe(2);
    expect(c.members.filter((m) => m.setAside)).toEqual([]);
  });
});

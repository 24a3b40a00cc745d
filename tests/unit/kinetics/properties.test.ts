import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { analyseDataset, convertRateConstant, evaluateRateExpression, type RatePoint } from "@/lib/kinetics";

const RUNS = { numRuns: 150, seed: 20240611 };

/** |a − b| small against the scale of the quantity and its standard error. */
function expectClose(a: number, b: number, scale: number, tol = 1e-8) {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(tol * (Math.abs(a) + Math.abs(b) + scale));
}

/** Deterministic Fisher–Yates shuffle driven by a seed. */
function permutation(n: number, seed: number): number[] {
  const idx = Array.from({ length: n }, (_, i) => i);
  let s = seed >>> 0 || 1;
  for (let i = n - 1; i > 0; i--) {
    s = (Math.imul(s, 1103515245) + 12345) >>> 0;
    const j = s % (i + 1);
    [idx[i], idx[j]] = [idx[j], idx[i]];
  }
  return idx;
}

/** Noisy Arrhenius-like datasets: temperatures 150–3000 K, at least 2 distinct. */
const datasetArb = fc
  .record({
    lnA: fc.double({ min: -40, max: 5, noNaN: true }),
    EaOverR: fc.double({ min: -2000, max: 30000, noNaN: true }),
    Ts: fc.uniqueArray(fc.integer({ min: 150, max: 3000 }), { minLength: 4, maxLength: 25 }),
    // Scatter is either absent or at least 1e-3 in ln k: residuals a few ulps above rounding would
    // make residual-based diagnostics differ in their 6th digit between orderings, legitimately.
    noise: fc.array(
      fc.oneof(fc.constant(0), fc.double({ min: 1e-3, max: 0.5, noNaN: true }), fc.double({ min: -0.5, max: -1e-3, noNaN: true })),
      { minLength: 25, maxLength: 25 },
    ),
    weighted: fc.boolean(),
  })
  .map(({ lnA, EaOverR, Ts, noise, weighted }) =>
    Ts.map((T, i): RatePoint => {
      const k = Math.exp(lnA - EaOverR / T + noise[i]);
      return weighted ? { T, k, sigmaLnK: 0.05 + Math.abs(noise[(i + 7) % 25]) } : { T, k };
    }),
  );

describe("analyseDataset properties (fast-check)", () => {
  it("is invariant under permutation of the points", () => {
    fc.assert(
      fc.property(datasetArb, fc.integer(), (points, seed) => {
        const perm = permutation(points.length, seed);
        const a = analyseDataset({ points, order: 2 });
        const b = analyseDataset({ points: perm.map((i) => points[i]), order: 2 });
        expectClose(b.arrhenius.params.Ea, a.arrhenius.params.Ea, (a.arrhenius.se.Ea ?? 0) + 1);
        expectClose(b.arrhenius.params.lnA, a.arrhenius.params.lnA, (a.arrhenius.se.lnA ?? 0) + 1e-4);
        expectClose(b.arrhenius.rss, a.arrhenius.rss, 1e-14); // RSS below ~1e-20 is rounding noise
        if (a.modifiedArrhenius)
          expectClose(b.modifiedArrhenius!.params.n, a.modifiedArrhenius.params.n, (a.modifiedArrhenius.se.n ?? 0) + 1e-6, 1e-6);
        perm.forEach((from, to) => {
          expectClose(b.diagnostics!.leverage[to], a.diagnostics!.leverage[from], 1e-12);
          expectClose(b.diagnostics!.cooksDistance[to], a.diagnostics!.cooksDistance[from], 1e-12, 1e-6);
        });
        expect(b.flags.map((f) => f.code).sort()).toEqual(a.flags.map((f) => f.code).sort());
      }),
      RUNS,
    );
  });

  it("converting k to another unit leaves Ea unchanged and shifts ln A by the log of the factor", () => {
    fc.assert(
      fc.property(datasetArb, fc.constantFrom("L mol-1 s-1", "m3 mol-1 s-1", "cm3 mol-1 s-1"), (points, unit) => {
        const converted = points.map((p) => ({ ...p, k: convertRateConstant(p.k, "cm3 molecule-1 s-1", unit) }));
        const a = analyseDataset({ points, order: 2 });
        const b = analyseDataset({ points: converted, order: 2 });
        const lnFactor = Math.log(convertRateConstant(1, "cm3 molecule-1 s-1", unit));
        expectClose(b.arrhenius.params.Ea, a.arrhenius.params.Ea, (a.arrhenius.se.Ea ?? 0) + 1);
        expectClose(b.arrhenius.params.lnA - lnFactor, a.arrhenius.params.lnA, (a.arrhenius.se.lnA ?? 0) + 1e-4 + Math.abs(lnFactor));
      }),
      RUNS,
    );
  });

  it("scaling every k by c shifts ln A by ln c and changes nothing else", () => {
    fc.assert(
      fc.property(datasetArb, fc.double({ min: -30, max: 30, noNaN: true }), (points, lnC) => {
        const scaled = points.map((p) => ({ ...p, k: p.k * Math.exp(lnC) }));
        const a = analyseDataset({ points, order: 1 });
        const b = analyseDataset({ points: scaled, order: 1 });
        const lnCexact = Math.log(Math.exp(lnC));
        expectClose(b.arrhenius.params.lnA - lnCexact, a.arrhenius.params.lnA, (a.arrhenius.se.lnA ?? 0) + 1e-4 + Math.abs(lnC));
        expectClose(b.arrhenius.params.Ea, a.arrhenius.params.Ea, (a.arrhenius.se.Ea ?? 0) + 1);
        expectClose(b.arrhenius.se.Ea!, a.arrhenius.se.Ea!, 1e-3, 1e-6);
        expectClose(b.eyring!.params.dH, a.eyring!.params.dH, (a.eyring!.se.dH ?? 0) + 1);
        if (a.modifiedArrhenius) {
          expectClose(b.modifiedArrhenius!.params.n, a.modifiedArrhenius.params.n, (a.modifiedArrhenius.se.n ?? 0) + 1e-6, 1e-6);
        }
      }),
      RUNS,
    );
  });

  it("recovers ln A, n and Ea exactly from noise-free modified Arrhenius data", () => {
    fc.assert(
      fc.property(
        fc.record({
          lnA: fc.double({ min: -40, max: 10, noNaN: true }),
          n: fc.double({ min: -3, max: 4, noNaN: true }),
          Ea: fc.double({ min: -10_000, max: 250_000, noNaN: true }),
          T1: fc.double({ min: 200, max: 1000, noNaN: true }),
          ratio: fc.double({ min: 1.5, max: 5, noNaN: true }),
          count: fc.integer({ min: 4, max: 20 }),
        }),
        ({ lnA, n, Ea, T1, ratio, count }) => {
          const points = Array.from({ length: count }, (_, i) => {
            const T = T1 * ratio ** (i / (count - 1));
            return { T, k: evaluateRateExpression({ A: Math.exp(lnA), n, Ea }, T) };
          });
          const m = analyseDataset({ points, order: 2 }).modifiedArrhenius!;
          expect(Math.abs(m.params.n - n)).toBeLessThan(1e-7);
          expect(Math.abs(m.params.Ea - Ea)).toBeLessThan(1e-7 * (Math.abs(Ea) + 1e4));
          expect(Math.abs(m.params.lnA - lnA)).toBeLessThan(1e-8 * (Math.abs(lnA) + 10));
        },
      ),
      RUNS,
    );
  });

  it("flags a far outlier added to otherwise tidy data", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 8, max: 30 }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }),
        fc.constantFrom(-1, 1),
        fc.integer({ min: 0, max: 1000 }),
        (count, where, sign, seed) => {
          const points: RatePoint[] = Array.from({ length: count }, (_, i) => {
            const T = 250 + (400 * i) / (count - 1);
            const jitter = 0.02 * Math.sin(seed + 17.3 * i);
            return { T, k: evaluateRateExpression({ A: 1e-11, Ea: 20_000 }, T) * Math.exp(jitter) };
          });
          const T = 250 + 400 * where;
          const at = Math.floor(where * count);
          points.splice(at, 0, { T, k: evaluateRateExpression({ A: 1e-11, Ea: 20_000 }, T) * Math.exp(sign * 3) });
          const r = analyseDataset({ points, order: 2 });
          const flag = r.flags.find((f) => f.code === "outlier");
          expect(flag?.points).toContain(at);
        },
      ),
      RUNS,
    );
  });
});

import { describe, expect, it } from "vitest";
import { createDatasetDraft, type StoredPoint } from "@/lib/datasets/queries";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// Points are written as one JSON text per chunk (lib/datasets/queries.ts writePointsAndAnalysis):
// every double must come back bit for bit, every optional field as given.
describe("storing a version's points", () => {
  it("keeps every number exactly (extremes, subnormals, 17 significant digits) and every field, in order, past one chunk", async () => {
    const owner = await createUser({ email: uniqueEmail("points"), name: "Points", passwordHash: "x", verified: true });
    const awkward = [5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, 0.1 + 0.2, 1 / 3, 298.15, 1e-45, 6.02214076e23];
    const n = 10_050; // two statements
    const points: StoredPoint[] = Array.from({ length: n }, (_, i) => ({
      T: i < awkward.length ? awkward[i] : 200 + i / 7,
      k: i < awkward.length ? awkward[awkward.length - 1 - i] : Math.exp(-i / 3) * 1e-11,
      sigmaLnK: i % 3 === 0 ? undefined : 0.05 + i / 1e6,
      pressurePa: i % 5 === 0 ? 101325 : undefined,
      bathGas: i % 4 === 0 ? "He" : undefined,
      note: i === 1 ? 'quote " backslash \\ unicode ≈ émission' : undefined,
      original: { T: String(i), k: i, unitT: "K", unitK: "cm3 molecule-1 s-1" },
    }));
    const v = await createDatasetDraft({
      ownerId: owner.id,
      title: "Exact points",
      payload: {},
      points,
      analysis: { engineVersion: "t", result: null, checks: [] },
    });
    const rows = await sql<
      { idx: number; t: number; k: number; s: number | null; p: number | null; g: string | null; n: string | null; o: unknown }[]
    >`select idx, temperature_k as t, rate_constant as k, sigma_ln_k as s, pressure_pa as p, bath_gas as g, note as n, original as o
      from version_points where version_id = ${v.id} order by idx`;
    expect(rows).toHaveLength(n);
    rows.forEach((r, i) => {
      const p = points[i];
      expect(r.idx).toBe(i);
      expect(Object.is(r.t, p.T) && Object.is(r.k, p.k), `row ${i}: ${r.t} ${r.k}`).toBe(true);
      expect(r.s).toBe(p.sigmaLnK ?? null);
      expect(r.p).toBe(p.pressurePa ?? null);
      expect(r.g).toBe(p.bathGas ?? null);
      expect(r.n).toBe(p.note ?? null);
      expect(r.o).toEqual(p.original);
    });
  });
});

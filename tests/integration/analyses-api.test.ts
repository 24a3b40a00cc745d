import { describe, expect, it } from "vitest";
import { POST } from "@/app/api/v1/analyses/route";
import { MAX_POINTS } from "@/lib/analyses/analyse-request";
import { fromAddress, uniqueIp } from "./helpers";

function post(body: unknown, ip = uniqueIp(), raw?: string) {
  return POST(
    new Request("http://127.0.0.1/api/v1/analyses", {
      method: "POST",
      headers: { "content-type": "application/json", ...fromAddress(ip) },
      body: raw ?? JSON.stringify(body),
    }),
    { params: Promise.resolve({}) },
  );
}

// Noise-free points of k = 2.45e-12 exp(−1775/T) cm³ molecule⁻¹ s⁻¹ (an OH + CH4 expression
// recalled from memory; here only a convenient exact curve).
const points = [220, 250, 280, 300, 330, 360, 400].map((T) => ({ T, k: 2.45e-12 * Math.exp(-1775 / T) }));

describe("POST /api/v1/analyses", () => {
  it("fits canonical points without sign-in and returns the analysis with the caution", async () => {
    const res = await post({ points, order: 2 });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.analysis.arrhenius.params.A).toBeCloseTo(2.45e-12, 20);
    expect(body.analysis.arrhenius.params.Ea / 8.31446261815324).toBeCloseTo(1775, 6);
    expect(body.analysis.band.T).toHaveLength(50);
    expect(body.caution).toMatch(/Extrapolation outside the measured temperature range is unreliable/);
  });

  it("answers with the residual fields, k at mid-range, the extrapolation of k(298.15 K) and flag quantities", async () => {
    // The same exact curve at 1000–1500 K with one point pushed up by a factor e (invented).
    const hot = [1000, 1050, 1100, 1150, 1200, 1300, 1400, 1500].map((T, i) => ({
      T,
      k: 2.45e-12 * Math.exp(-1775 / T + (i === 3 ? 1 : 0.01 * Math.sin(i))),
    }));
    const res = await post({ points: hot, order: 2 });
    expect(res.status).toBe(200);
    const { analysis } = await res.json();
    expect(analysis.arrhenius.k298).toMatchObject({ extrapolated: true, extrapolation: { side: "below" } });
    expect(analysis.arrhenius.k298.extrapolation.kelvin).toBeCloseTo(701.85, 9);
    expect(analysis.arrhenius.kMid.T).toBeCloseTo(2 / (1 / 1000 + 1 / 1500), 9);
    expect(analysis.arrhenius.scaleFactor).toBeNull();
    expect(analysis.arrhenius.residualSDLnK).toBe(analysis.arrhenius.residualSD);
    expect(analysis.arrhenius.residuals).toHaveLength(8);
    expect(analysis.arrhenius.fitted).toHaveLength(8);
    // 7 widths of the data in 1/T below them: k(298.15 K) without limits, and saying so.
    expect(analysis.arrhenius.k298).toMatchObject({ intervalOmitted: true, lower: null, upper: null });
    // With a factor-e point in 1000–1500 K the data do not fix n (se(n) > 5): no modified fit, no curvature test.
    expect(analysis.modifiedArrhenius).toBeNull();
    expect(analysis.curvature).toBeNull();
    const undetermined = analysis.flags.find((f: { code: string }) => f.code === "modified_fit_undetermined");
    expect(undetermined.quantities.seN.value).toBeGreaterThan(5);
    const outlier = analysis.flags.find((f: { code: string }) => f.code === "outlier");
    expect(outlier.points).toEqual([3]);
    expect(outlier.quantities.dof).toEqual({ kind: "count", value: 5 });
  });

  it("converts posted units: L mol⁻¹ s⁻¹ and °C give the same Ea", async () => {
    const NA = 6.02214076e23; // CODATA 2018
    const converted = points.map((p) => ({ T: p.T - 273.15, k: p.k * NA * 1e-3 }));
    const res = await post({ points: converted, order: 2, units: { k: "L mol-1 s-1", T: "degC" } });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.analysis.arrhenius.params.Ea / 8.31446261815324).toBeCloseTo(1775, 6);
    expect(body.analysis.arrhenius.params.A).toBeCloseTo(2.45e-12, 20);
  });

  const bad: [string, unknown, string | RegExp, string?][] = [
    [
      "a non-positive k",
      {
        points: [
          { T: 300, k: 1e-12 },
          { T: 350, k: -1 },
        ],
        order: 2,
      },
      "/points/1",
      undefined,
    ],
    [
      "T below absolute zero in °C",
      {
        points: [
          { T: 20, k: 1 },
          { T: -300, k: 2 },
        ],
        order: 1,
        units: { T: "degC" },
      },
      "/points/1/T",
      undefined,
    ],
    ["an unknown unit", { points, order: 2, units: { k: "furlongs per fortnight" } }, "/units/k", undefined],
    ["a k unit of the wrong order", { points, order: 1, units: { k: "cm3 molecule-1 s-1" } }, "/units/k", undefined],
    ["an order of 4", { points, order: 4 }, "/order", undefined],
    [
      "a string where a number belongs",
      {
        points: [
          { T: "300", k: 1 },
          { T: 310, k: 2 },
        ],
        order: 1,
      },
      "/points/0/T",
      undefined,
    ],
    ["a single point", { points: [{ T: 300, k: 1 }], order: 1 }, "/points", undefined],
    [
      "one temperature only",
      {
        points: [
          { T: 300, k: 1 },
          { T: 300, k: 2 },
        ],
        order: 1,
      },
      "/points",
      undefined,
    ],
    ["an unexpected field", { points, order: 2, colour: "red" }, "/colour", undefined],
  ];
  for (const [what, body, pointer] of bad) {
    it(`answers 422 problem+json for ${what}`, async () => {
      const res = await post(body);
      expect(res.status).toBe(422);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
      const problem = await res.json();
      expect(problem.title.length).toBeGreaterThan(10);
      expect(problem.errors.map((e: { pointer: string }) => e.pointer)).toContain(pointer);
    });
  }

  it("answers 422 for malformed JSON", async () => {
    const res = await post(null, uniqueIp(), "{ points: [");
    expect(res.status).toBe(422);
    expect((await res.json()).title).toBe("The request body is not valid JSON");
  });

  it(`refuses more than ${MAX_POINTS} points`, async () => {
    const many = Array.from({ length: MAX_POINTS + 1 }, (_, i) => ({ T: 300 + (i % 500) * 0.1, k: 1e-12 }));
    const res = await post({ points: many, order: 2 });
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0]).toMatchObject({ pointer: "/points", message: "at most 100,000 points per request" });
  });

  it("refuses an oversized body with 413 before parsing it", async () => {
    const res = await post(null, uniqueIp(), `{"pad":"${"x".repeat(13 * 1024 * 1024)}"}`);
    expect(res.status).toBe(413);
  });

  it("is rate limited per address", async () => {
    const ip = uniqueIp();
    const statuses: number[] = [];
    for (let i = 0; i < 122; i++) statuses.push((await post({ points: points.slice(0, 3), order: 2 }, ip)).status);
    expect(statuses.slice(0, 120).every((s) => s === 200)).toBe(true);
    expect(statuses.slice(120)).toEqual([429, 429]);
  });
});

import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import Papa from "papaparse";
import { GET as getCsv } from "@/app/api/v1/versions/[id]/points.csv/route";
import { GET as getJson } from "@/app/api/v1/versions/[id]/points.json/route";
import { getCurrentUser } from "@/lib/auth/session";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import type { UserDto } from "@/lib/users/queries";
import { createRolePeople, depositInState, uniqueEmail, type WalkState } from "./helpers";

// N_A, CODATA 2018 (exact by the 2019 SI definition): k deposited per mole converts to per molecule.
const AVOGADRO = 6.02214076e23;

let owner: UserDto, other: UserDto, curator: UserDto, admin: UserDto;
beforeAll(async () => {
  ({ owner, other, curator, admin } = await createRolePeople("points"));
});

/** The example deposit with k in cm³ mol⁻¹ s⁻¹ (absolute uncertainties likewise), so deposited and canonical columns differ. */
function perMoleDocument(title: string) {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as typeof EXAMPLE_DEPOSIT;
  doc.title = title;
  doc.units = { ...doc.units, k: "cm3 mol-1 s-1" };
  for (const p of doc.points) {
    p.k = Number((p.k * AVOGADRO).toPrecision(6));
    if (p.uncertainty?.kind === "absolute")
      p.uncertainty = { ...p.uncertainty, value: Number((p.uncertainty.value * AVOGADRO).toPrecision(6)) };
  }
  delete doc.reportedFit;
  return doc;
}

function versionIn(state: WalkState) {
  return depositInState({ owner, curator, document: perMoleDocument(`Points download test (${state}) ${uniqueEmail("t")}`), state });
}

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = (id: number | string) => ({ params: Promise.resolve({ id: String(id) }) });
const csv = (id: number | string) => getCsv(new Request(`http://127.0.0.1/api/v1/versions/${id}/points.csv`), ctx(id));
const json = (id: number | string) => getJson(new Request(`http://127.0.0.1/api/v1/versions/${id}/points.json`), ctx(id));

describe("downloads of a version's points", () => {
  let published: { id: number };
  beforeAll(async () => {
    published = await versionIn("published");
  }, 60_000);

  it("CSV: text/csv attachment named by the identifier, # header with identifier, title, licence, citation and caution, deposited and converted columns, each unit named", async () => {
    as(null);
    const res = await csv(published.id);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv; charset=utf-8/);
    const disposition = res.headers.get("content-disposition")!;
    expect(disposition).toMatch(/^attachment; filename="ARH-[0-9A-Z]{4}-[0-9A-Z]{4}-1-points\.csv"$/);
    const text = await res.text();
    // The unit is named, never "canonical".
    expect(text).not.toMatch(/canonical/i);
    // Each header line is one quoted cell (RFC 4180, read by papaparse) starting with "#".
    const comments = text
      .split("\r\n")
      .filter((l) => l.startsWith('"#'))
      .map((l) => Papa.parse<string[]>(l, { delimiter: "," }).data[0][0]);
    expect(comments.find((l) => l.startsWith("# version identifier: doi:10.5072/ARH-"))).toMatch(/\/1$/);
    expect(comments).toContain(`# caution: ${FIT_CAUTION}`);
    expect(comments).toContain("# licence: CC-BY-4.0");
    expect(comments.find((l) => l.startsWith("# title: "))).toMatch(/Points download test \(published\)/);
    expect(comments.find((l) => l.startsWith("# cite as: "))).toMatch(
      /^# cite as: Okafor, Maren.* \(\d{4}\)\. Points download test .* Version 1\. Arrhenia\. doi:10\.5072\/ARH-/,
    );
    const table = Papa.parse<Record<string, string>>(
      text
        .split("\r\n")
        .filter((l) => !l.startsWith('"#'))
        .join("\n"),
      {
        header: true,
        skipEmptyLines: true,
      },
    );
    expect(table.errors).toEqual([]);
    expect(table.data).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    const first = table.data[0];
    expect(first).toMatchObject({ row: "1", T_deposited: "250", T_deposited_unit: "K", k_deposited_unit: "cm3 mol-1 s-1", T_K: "250" });
    expect(first.k_unit).toBe("cm3 molecule-1 s-1");
    expect(Number(first["k_cm3_molecule-1_s-1"])).toBeCloseTo(Number(first.k_deposited) / AVOGADRO, 25);
    expect(Number(first["k_cm3_molecule-1_s-1"]) / 2.09e-15).toBeCloseTo(1, 5);
    expect(first).toMatchObject({
      uncertainty_kind: "absolute",
      uncertainty_confidence: "2sigma",
      pressure_deposited: "50",
      pressure_deposited_unit: "Torr",
    });
    // 50 Torr = 50 × 101325/760 Pa (Torr defined as 1/760 atm).
    expect(Number(first.pressure_Pa)).toBeCloseTo((50 * 101325) / 760, 6);
    // Point 8 states its own pressure, point 10 its own bath gas, point 9 an uncertainty factor.
    expect(table.data[7].pressure_deposited).toBe("100");
    expect(table.data[7].note).toBe("Measured at 100 Torr to check for pressure dependence.");
    expect(table.data[9].bath_gas).toBe("N2");
    expect(table.data[8]).toMatchObject({ uncertainty_kind: "factor", uncertainty_value: "1.1", uncertainty_confidence: "1sigma" });
    // The fit is weighted: every point has a residual, and the residual in σ is residual / σ(ln k).
    for (const r of table.data) {
      expect(Number.isFinite(Number(r.residual_ln_k))).toBe(true);
      expect(Number(r.residual_in_sigma)).toBeCloseTo(Number(r.residual_ln_k) / Number(r.sigma_ln_k), 10);
    }
  });

  it("JSON: the same points under an 'about' object, as an attachment", async () => {
    as(null);
    const res = await json(published.id);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^application\/json/);
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="ARH-[0-9A-Z-]+-1-points\.json"$/);
    const body = await res.json();
    expect(JSON.stringify(body)).not.toMatch(/canonical/i);
    expect(body.about).toMatchObject({
      title: expect.stringMatching(/Points download test/),
      version: 1,
      state: "published",
      retraction: null,
      licence: "CC-BY-4.0",
      caution: FIT_CAUTION,
      units: { T: "K", k: "cm3 molecule-1 s-1", pressure: "Pa" },
      residuals: { model: expect.stringMatching(/arrhenius/), weighted: true },
    });
    expect(body.about.versionIdentifier).toMatch(/^10\.5072\/ARH-.*\/1$/);
    expect(body.about.citation).toContain(`doi:${body.about.versionIdentifier}`);
    expect(body.points).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    expect(body.points[0].deposited).toMatchObject({ T: 250, TUnit: "K", kUnit: "cm3 mol-1 s-1", pressure: 50, pressureUnit: "Torr" });
    expect(body.points[0].converted.k / 2.09e-15).toBeCloseTo(1, 5);
    expect(body.points[9].bathGas).toBe("N2");
  });

  it("a retracted version downloads with its notice in the header", async () => {
    const v = await versionIn("retracted");
    as(null);
    const text = await (await csv(v.id)).text();
    expect(text).toMatch(/^"# version: 1 \(retracted\)"\r$/m);
    expect(text).toMatch(/^"# retracted: \d{4}-\d\d-\d\dT.*: Retracted for the test: a calibration error\."\r$/m);
    const body = await (await json(v.id)).json();
    expect(body.about.retraction.notice).toBe("Retracted for the test: a calibration error.");
  });

  const roles = { anonymous: () => null, owner: () => owner, "other researcher": () => other, curator: () => curator, admin: () => admin };
  for (const state of ["draft", "submitted", "in_review", "returned", "declined"] as const) {
    it(`a version in state ${state} is 404 to everyone, its owner included (both formats), with nothing of it in the answer`, async () => {
      const v = await versionIn(state);
      for (const [role, who] of Object.entries(roles)) {
        as(who());
        for (const get of [csv, json]) {
          const res = await get(v.id);
          expect(res.status, `${role}, ${state}`).toBe(404);
          expect(res.headers.get("content-type")).toBe("application/problem+json");
          expect(await res.text()).not.toContain("Points download test");
        }
      }
    });
  }

  it("a published version is 200 to every role; an id that is not a version id is 404", async () => {
    for (const who of Object.values(roles)) {
      as(who());
      expect((await csv(published.id)).status).toBe(200);
    }
    as(null);
    for (const bad of ["0", "abc", "99999999", "2147483648"]) expect((await csv(bad)).status).toBe(404);
  });
});

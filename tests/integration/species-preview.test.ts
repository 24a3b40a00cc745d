import { describe, expect, it } from "vitest";
import { GET } from "@/app/api/v1/species/preview/route";
import { fromAddress, uniqueIp } from "./helpers";

const get = (q: string) =>
  GET(new Request(`http://127.0.0.1/api/v1/species/preview?${q}`, { headers: fromAddress(uniqueIp()) }), { params: Promise.resolve({}) });

describe("GET /api/v1/species/preview", () => {
  it("describes a radical and draws it", async () => {
    const res = await get("smiles=%5BOH%5D");
    expect(res.status).toBe(200);
    const { data } = await res.json();
    // Hydroxyl radical: formula HO, 17.007 g/mol from standard atomic weights (H 1.008, O 15.999).
    expect(data).toMatchObject({ formula: "HO", radicalElectrons: 1, charge: 0 });
    expect(data.molarMass).toBeCloseTo(17.007, 2);
    expect(data.svg).toMatch(/^<svg[\s\S]*<\/svg>\s*$/);
  });

  it("answers 422 with a pointer for an unreadable SMILES", async () => {
    const res = await get("smiles=C1CC");
    expect(res.status).toBe(422);
    const problem = await res.json();
    expect(problem.errors[0].pointer).toBe("/smiles");
    expect(problem.title).toMatch(/Could not read the SMILES "C1CC"/);
  });

  it("asks for a structure when given none", async () => {
    expect((await get("")).status).toBe(422);
  });
});

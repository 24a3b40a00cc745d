import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { speciesDrawings } from "@/db/chemistry";
import { forgetDrawingsInMemory } from "@/lib/chem/render-species-svg";
import { drawMissingSpeciesDrawings, REACTION_PAGE_DRAWING, speciesDrawing, SPECIES_PAGE_DRAWING } from "@/lib/species/drawings";

// lib/species/drawings.ts: a species is drawn by RDKit once per size and toolkit version, then read back.
const rowsOf = (smiles: string) =>
  getDb()
    .select()
    .from(speciesDrawings)
    .where(and(eq(speciesDrawings.smiles, smiles), eq(speciesDrawings.width, REACTION_PAGE_DRAWING.width)));

describe("species drawings kept in the database", () => {
  it("draws a species once, keeps it, and reads it back afterwards (another process, or after a restart)", async () => {
    const smiles = "OCC(F)(F)F"; // 2,2,2-trifluoroethanol, a molecule no other test draws
    const first = await speciesDrawing(smiles, REACTION_PAGE_DRAWING);
    expect(first).toMatch(/^<svg[\s\S]*<\/svg>$/);
    const [row] = await rowsOf(smiles);
    expect(row).toMatchObject({ smiles, width: 140, height: 100, svg: first });
    expect(row.drawer).toMatch(/^rdkit \d/);
    // Read back from the table, not drawn again: a marker written there is what comes back.
    await getDb().update(speciesDrawings).set({ svg: "<svg>kept</svg>" }).where(eq(speciesDrawings.smiles, smiles));
    forgetDrawingsInMemory();
    expect(await speciesDrawing(smiles, REACTION_PAGE_DRAWING)).toBe("<svg>kept</svg>");
  });

  it("keeps nothing for a SMILES RDKit cannot draw", async () => {
    await expect(speciesDrawing("C1CC", REACTION_PAGE_DRAWING)).rejects.toThrow();
    expect(await rowsOf("C1CC")).toEqual([]);
  });

  it("a drawing by another toolkit version is not used: the species is drawn anew", async () => {
    const smiles = "OCC(Cl)(Cl)Cl";
    await getDb()
      .insert(speciesDrawings)
      .values({ smiles, ...REACTION_PAGE_DRAWING, drawer: "rdkit 0.0.0", svg: "<svg>old</svg>" })
      .onConflictDoNothing();
    forgetDrawingsInMemory();
    const svg = await speciesDrawing(smiles, REACTION_PAGE_DRAWING);
    expect(svg).not.toBe("<svg>old</svg>");
    const drawers = (await rowsOf(smiles)).map((r) => r.drawer);
    expect(drawers).toHaveLength(2);
    expect(drawers).toContain("rdkit 0.0.0");
    expect(drawers.find((d) => d !== "rdkit 0.0.0")).toMatch(/^rdkit \d/);
  });

  it("drawMissingSpeciesDrawings draws the species already recorded at both page sizes", async () => {
    const [{ before }] = await getDb().execute<{ before: number }>(`select max(id) as before from species` as never);
    await drawMissingSpeciesDrawings();
    // Species recorded meanwhile by other tests may still wait for their drawing; those recorded before may not.
    for (const size of [REACTION_PAGE_DRAWING, SPECIES_PAGE_DRAWING]) {
      const [{ missing }] = await getDb().execute<{ missing: number }>(
        `select count(*)::int as missing from species s where s.id <= ${Number(before)} and not exists (select 1 from species_drawings d
          where d.smiles = s.canonical_smiles and d.width = ${size.width} and d.height = ${size.height})` as never,
      );
      expect(missing).toBe(0);
    }
  });
});

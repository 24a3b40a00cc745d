import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { species, speciesDrawings } from "@/db/chemistry";
import { drawingInMemory, getRdkit, keepDrawingInMemory, renderSpeciesSvg } from "@/lib/chem";

/** The sizes the public pages draw species at (px): a reaction's participants, a species page. */
export const REACTION_PAGE_DRAWING = { width: 140, height: 100 } as const;
export const SPECIES_PAGE_DRAWING = { width: 240, height: 180 } as const;
const PAGE_SIZES = [REACTION_PAGE_DRAWING, SPECIES_PAGE_DRAWING];

let drawerVersion: Promise<string> | null = null;
/** The drawing toolkit's own version: drawings of another version are not reused. */
function drawer(): Promise<string> {
  drawerVersion ??= getRdkit().then((rdkit) => `rdkit ${rdkit.version()}`);
  return drawerVersion;
}

/**
 * The depiction of `smiles` at `size`: from this process's memory (renderSpeciesSvg keeps the last
 * thousand), else as kept in `species_drawings`, else drawn by RDKit and kept there. A SMILES RDKit
 * cannot draw is refused as renderSpeciesSvg refuses it (a ChemError), and nothing is kept.
 */
export async function speciesDrawing(smiles: string, size: { width: number; height: number }): Promise<string> {
  const inMemory = drawingInMemory(smiles, size);
  if (inMemory !== undefined) return inMemory;
  const version = await drawer();
  const [kept] = await getDb()
    .select({ svg: speciesDrawings.svg })
    .from(speciesDrawings)
    .where(
      and(
        eq(speciesDrawings.smiles, smiles),
        eq(speciesDrawings.width, size.width),
        eq(speciesDrawings.height, size.height),
        eq(speciesDrawings.drawer, version),
      ),
    )
    .limit(1);
  if (kept) {
    keepDrawingInMemory(smiles, size, kept.svg);
    return kept.svg;
  }
  const svg = await renderSpeciesSvg(smiles, size);
  await getDb()
    .insert(speciesDrawings)
    .values({ smiles, width: size.width, height: size.height, drawer: version, svg })
    .onConflictDoNothing();
  return svg;
}

/**
 * Draws every species not yet drawn at the pages' sizes by this toolkit version (run by
 * scripts/migrate.ts, so that no reader's page waits for RDKit). A SMILES RDKit cannot draw is
 * skipped (its pages show no drawing, as before). Returns how many drawings were made.
 */
export async function drawMissingSpeciesDrawings({
  onProgress,
}: { onProgress?: (done: number, total: number) => void } = {}): Promise<number> {
  const version = await drawer();
  let made = 0;
  for (const size of PAGE_SIZES) {
    const missing = await getDb()
      .select({ smiles: species.canonicalSmiles })
      .from(species)
      .where(
        sql`not exists (select 1 from ${speciesDrawings} d where d.smiles = ${species.canonicalSmiles}
          and d.width = ${size.width} and d.height = ${size.height} and d.drawer = ${version})`,
      )
      .groupBy(species.canonicalSmiles);
    for (const [i, { smiles }] of missing.entries()) {
      const svg = await renderSpeciesSvg(smiles, size).catch(() => null);
      if (svg !== null) {
        await getDb()
          .insert(speciesDrawings)
          .values({ smiles, width: size.width, height: size.height, drawer: version, svg })
          .onConflictDoNothing();
        made++;
      }
      onProgress?.(i + 1, missing.length);
    }
  }
  return made;
}

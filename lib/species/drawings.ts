import "server-only";
import { drawingInMemory, getRdkit, keepDrawingInMemory, renderSpeciesSvg } from "@/lib/chem";
import { keepDrawing, listUndrawnSmiles, readKeptDrawing } from "./queries";

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
  const key = { smiles, width: size.width, height: size.height, drawer: await drawer() };
  const kept = await readKeptDrawing(key);
  if (kept !== null) {
    keepDrawingInMemory(smiles, size, kept);
    return kept;
  }
  const svg = await renderSpeciesSvg(smiles, size);
  await keepDrawing(key, svg);
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
    const missing = await listUndrawnSmiles({ ...size, drawer: version });
    for (const [i, smiles] of missing.entries()) {
      const svg = await renderSpeciesSvg(smiles, size).catch(() => null);
      if (svg !== null) {
        await keepDrawing({ smiles, ...size, drawer: version }, svg);
        made++;
      }
      onProgress?.(i + 1, missing.length);
    }
  }
  return made;
}

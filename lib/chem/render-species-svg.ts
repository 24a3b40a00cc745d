/**
 * 2D depiction of a species as an SVG string that can be placed directly in a page.
 */
import { ChemError } from "./chem-error";
import { discardToolkitAfterTrap, parseSmilesOrThrow } from "./load-rdkit";

/** Size of a depiction, in CSS pixels. */
export interface DrawingSize {
  width?: number;
  height?: number;
}

/** Default depiction size, px. */
export const DEFAULT_DRAWING_SIZE = { width: 240, height: 180 } as const;
const MIN_SIDE = 16;
const MAX_SIDE = 2000;

// Anything that could run script or pull content in when the SVG is inlined into HTML.
const UNSAFE_SVG = /<script|<foreignObject|<iframe|\son[a-z]+\s*=|javascript:|<!ENTITY/i;

function checkSide(value: number, name: "width" | "height"): number {
  if (!Number.isInteger(value) || value < MIN_SIDE || value > MAX_SIDE) {
    throw new ChemError(
      "invalid_drawing_size",
      `The drawing ${name} must be a whole number of pixels from ${MIN_SIDE} to ${MAX_SIDE}, not ${value}.`,
      "size",
    );
  }
  return value;
}

/**
 * Drawings already made, by size and SMILES (a drawing depends on nothing else, so an entry is never
 * stale): a species is drawn on every page of each reaction it takes part in, and RDKit takes a few
 * ms a drawing. At most DRAWINGS_KEPT (a few KB each); the least recently used go first. Refusals
 * are not kept.
 */
const drawings = new Map<string, string>();
const DRAWINGS_KEPT = 1000;
export const drawingCacheStats = {
  hits: 0,
  misses: 0,
  get entries() {
    return drawings.size;
  },
};

/**
 * RDKit's depiction of the species in `smiles` as an inline-safe `<svg>` element (the XML
 * declaration is dropped; the drawing holds paths only, no text or script). Size in px.
 *
 * @example await renderSpeciesSvg("[O][N]=O", { width: 200, height: 150 }) // "<svg version='1.1' …</svg>"
 */
export async function renderSpeciesSvg(smiles: string, size: DrawingSize = {}): Promise<string> {
  const kept = drawingInMemory(smiles, size);
  if (kept !== undefined) return kept;
  const width = checkSide(size.width ?? DEFAULT_DRAWING_SIZE.width, "width");
  const height = checkSide(size.height ?? DEFAULT_DRAWING_SIZE.height, "height");
  const svg = await drawSvg(smiles, width, height);
  keepDrawingInMemory(smiles, { width, height }, svg);
  return svg;
}

const drawingKey = (smiles: string, size: DrawingSize) =>
  `${size.width ?? DEFAULT_DRAWING_SIZE.width}x${size.height ?? DEFAULT_DRAWING_SIZE.height}\n${smiles}`;

/** The drawing of `smiles` at `size` if this process has made or read it lately (counted as a hit or a miss). */
export function drawingInMemory(smiles: string, size: DrawingSize = {}): string | undefined {
  const key = drawingKey(smiles, size);
  const kept = drawings.get(key);
  if (kept === undefined) {
    drawingCacheStats.misses++;
    return undefined;
  }
  // Most recently used last: a Map keeps insertion order.
  drawings.delete(key);
  drawings.set(key, kept);
  drawingCacheStats.hits++;
  return kept;
}

/** Forgets every drawing this process keeps (tests: to read them back from where they are stored). */
export function forgetDrawingsInMemory(): void {
  drawings.clear();
}

/** Keeps a drawing (made here, or read from where drawings are stored) among the DRAWINGS_KEPT of this process. */
export function keepDrawingInMemory(smiles: string, size: DrawingSize, svg: string): void {
  const key = drawingKey(smiles, size);
  if (!drawings.has(key) && drawings.size >= DRAWINGS_KEPT) drawings.delete(drawings.keys().next().value!);
  drawings.set(key, svg);
}

async function drawSvg(smiles: string, width: number, height: number): Promise<string> {
  const mol = await parseSmilesOrThrow(smiles);
  try {
    const svg = mol
      .get_svg(width, height)
      .replace(/^\s*<\?xml[^>]*\?>\s*/, "") // an XML declaration is invalid inside an HTML body
      .replace(/<!--[\s\S]*?-->\s*/g, "")
      .trim();
    if (!svg.startsWith("<svg") || !svg.endsWith("</svg>") || UNSAFE_SVG.test(svg)) {
      throw new ChemError("unsupported_species", `RDKit could not draw the SMILES "${smiles.trim().slice(0, 80)}".`, "smiles");
    }
    return svg;
  } catch (err) {
    throw discardToolkitAfterTrap(err, `the SMILES "${smiles.trim().slice(0, 80)}"`, "smiles");
  } finally {
    try {
      mol.delete();
    } catch {
      // a trapped instance is already dropped
    }
  }
}

import "server-only";
import { perSearchGeneration } from "./per-generation";
import { listDisplayEquations, readSpeciesLexicon } from "./queries";

/**
 * What resolving search text and naming its rows read of the species and reactions, kept in memory
 * per generation of the search documents (drizzle/0025 moves the mark in every transaction that
 * changes them, which publication, retraction, re-fit and exclusion do, as do the species names
 * and display names that join at publication). A search then costs one read of the mark instead of
 * a species lookup, a name lookup and an equation lookup each.
 */
export interface SpeciesLexicon {
  generation: string;
  /** InChIKeys by lower-cased name. */
  byName: Map<string, string[]>;
  /** InChIKeys of public species by formula (Hill form, exact). */
  byFormula: Map<string, string[]>;
  /** Display name of each public species. */
  displayName: Map<string, string>;
  /** Display equations of reactions read so far under this generation, by reaction key. */
  equations: Map<string, string>;
}

function push(map: Map<string, string[]>, key: string, value: string) {
  const list = map.get(key);
  if (!list) map.set(key, [value]);
  else if (!list.includes(value)) list.push(value);
}

async function load(): Promise<SpeciesLexicon> {
  const rows = await readSpeciesLexicon();
  const lexicon: SpeciesLexicon = {
    generation: rows.generation,
    byName: new Map(),
    byFormula: new Map(),
    displayName: new Map(),
    equations: new Map(),
  };
  for (const r of rows.names) push(lexicon.byName, r.name, r.inchiKey);
  for (const r of rows.publicSpecies) {
    push(lexicon.byFormula, r.formula, r.inchiKey);
    lexicon.displayName.set(r.inchiKey, r.name);
  }
  preloadEquations(lexicon);
  return lexicon;
}

/**
 * The display equation of every reaction with public data read into the lexicon in the background,
 * once it is built (5 000 reactions: ~0.2 s of the database, too long to hold the first search after a
 * change for): until then, and for what it missed, each search reads the few its rows name. One read
 * at a time in the process: a lexicon built while one runs waits for it, and only the newest waiting
 * is read for (a stream of changes, each a new lexicon, must not stack reads of every reaction). An
 * equation a search read first is kept, never overwritten; a failed read is left to those per-search reads.
 */
let preloading = false;
let waiting: SpeciesLexicon | null = null;
function preloadEquations(lexicon: SpeciesLexicon): void {
  waiting = lexicon;
  if (preloading) return;
  const target = waiting;
  waiting = null;
  preloading = true;
  listDisplayEquations({ reactionKeys: "public" })
    .then(
      (all) => {
        for (const [key, equation] of all) if (!target.equations.has(key)) target.equations.set(key, equation);
      },
      (error: unknown) =>
        console.error(`[search] could not read the display equations ahead: ${error instanceof Error ? error.message : String(error)}`),
    )
    .finally(() => {
      preloading = false;
      if (waiting) preloadEquations(waiting);
    });
}

/** The lexicon of the current generation (read again when the mark moved; one read at a time). */
export const speciesLexicon: () => Promise<SpeciesLexicon> = perSearchGeneration(load);

/** InChIKeys of species known by one of these names (case-insensitive) or formulas, keyed `name:…` / `formula:…`. */
export function findSpeciesKeysIn(lexicon: SpeciesLexicon, { names = [], formulas = [] }: { names?: string[]; formulas?: string[] }) {
  const found = new Map<string, string[]>();
  for (const n of names) {
    const keys = lexicon.byName.get(n.toLowerCase());
    if (keys) found.set(`name:${n}`, [...keys]);
  }
  for (const f of formulas) {
    const keys = lexicon.byFormula.get(f);
    if (keys) found.set(`formula:${f}`, [...keys]);
  }
  return found;
}

/** Display equations of these reactions (lib/reactions/display-names.ts), read once per generation. */
export async function displayEquations(reactionKeys: string[]): Promise<Map<string, string>> {
  const lexicon = await speciesLexicon();
  const missing = reactionKeys.filter((k) => !lexicon.equations.has(k));
  if (missing.length) for (const [k, e] of await listDisplayEquations({ reactionKeys: missing })) lexicon.equations.set(k, e);
  const out = new Map<string, string>();
  for (const k of reactionKeys) {
    const e = lexicon.equations.get(k);
    if (e !== undefined) out.set(k, e);
  }
  return out;
}

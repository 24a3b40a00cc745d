import type { ComparisonBasis } from "./judge";

/**
 * A reaction's comparison basis as kept in its search summary (search_reaction_summaries.comparison,
 * written with the summary by lib/search/documents.ts): with the engine version it was computed by.
 * A basis of another engine version, or one written before bases were kept, is not used: the check
 * then reads that reaction's data and judges it as before.
 */
export type StoredComparisonBasis = ComparisonBasis & { engine: string };

const finite = (x: unknown) => typeof x === "number" && Number.isFinite(x);
const numbers = (x: unknown) => Array.isArray(x) && x.every(finite);
const band = (b: unknown) => {
  const v = b as { T?: unknown; lnk?: unknown; upper?: unknown } | null;
  return !!v && numbers(v.T) && numbers(v.lnk) && numbers(v.upper);
};

/** The stored basis when it is of this engine version and whole; null otherwise. */
export function readStoredBasis(value: unknown, engine: string): ComparisonBasis | null {
  const b = value as Partial<StoredComparisonBasis> | null;
  if (!b || typeof b !== "object" || b.engine !== engine) return null;
  if (!(b.order === null || finite(b.order)) || !finite(b.versions) || !finite(b.published)) return null;
  if (b.basis !== "consensus" && b.basis !== "single_dataset") return null;
  if (!Array.isArray(b.compared) || !b.compared.every((r) => finite(r?.Tmin) && finite(r?.Tmax))) return null;
  const c = b.curve;
  if (c !== null) {
    if (!c || typeof c !== "object") return null;
    if (c.preferred !== "arrhenius" && c.preferred !== "modified_arrhenius") return null;
    if (!c.arrhenius || !finite(c.arrhenius.params?.lnA) || !finite(c.arrhenius.params?.Ea) || !band(c.arrhenius.band)) return null;
    const m = c.modifiedArrhenius;
    if (m !== null && (!m || !["lnA", "n", "T0", "Ea"].every((k) => finite((m.params as Record<string, unknown>)?.[k])) || !band(m.band)))
      return null;
    if (!finite(c.range?.Tmin) || !finite(c.range?.Tmax) || !finite(c.included)) return null;
  }
  const whole = b as StoredComparisonBasis;
  return {
    order: whole.order,
    versions: whole.versions,
    published: whole.published,
    basis: whole.basis,
    curve: whole.curve,
    compared: whole.compared,
  };
}

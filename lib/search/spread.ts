// PURE: the reactions view's spread of a reaction's datasets, from each dataset's own preferred fit.
import { GAS_CONSTANT, REFERENCE_TEMPERATURE } from "@/lib/kinetics/constants";

/** One dataset's own preferred fit, as the spread reads it: ln k = lnA + n ln(T/T0) − Ea/RT (n = 0 for a straight line). */
export interface PreferredFit {
  lnA: number;
  n: number;
  ea: number;
  t0: number;
  aUnit: string | null;
  tMin: number;
  tMax: number;
}

/**
 * The fit a version's own analysis prefers (band.model: the modified Arrhenius fit when its
 * curvature test is significant, else the Arrhenius fit), from a stored analysis result; null
 * without usable parameters.
 */
export function preferredFitOf(result: unknown): Pick<PreferredFit, "lnA" | "n" | "ea" | "t0"> | null {
  const r = result as {
    band?: { model?: string };
    arrhenius?: { params?: { lnA?: number; Ea?: number } };
    modifiedArrhenius?: { params?: { lnA?: number; n?: number; Ea?: number; T0?: number } } | null;
  } | null;
  const modified = r?.band?.model === "modified_arrhenius" ? r.modifiedArrhenius?.params : undefined;
  const fit = modified ?? r?.arrhenius?.params;
  if (!fit || !Number.isFinite(fit.lnA) || !Number.isFinite(fit.Ea)) return null;
  const n = modified?.n ?? 0;
  const t0 = modified?.T0 ?? REFERENCE_TEMPERATURE;
  if (!Number.isFinite(n) || !(t0 > 0)) return null;
  return { lnA: fit.lnA!, n, ea: fit.Ea!, t0 };
}

/**
 * Spread of a reaction's datasets: largest over smallest k of each dataset's own preferred fit
 * (the model its analysis prefers) at the middle, in 1/T, of the range they cover together; null
 * with fewer than two fits of one unit.
 */
export function datasetSpread(fits: (PreferredFit | null)[]): number | null {
  const first = fits.find((f) => f !== null);
  const usable = fits.filter((f): f is PreferredFit => f !== null && f.aUnit === first?.aUnit);
  if (usable.length < 2) return null;
  const tMin = Math.min(...usable.map((f) => f.tMin));
  const tMax = Math.max(...usable.map((f) => f.tMax));
  const tMid = 2 / (1 / tMin + 1 / tMax);
  const lnk = usable.map((f) => f.lnA + f.n * Math.log(tMid / f.t0) - f.ea / (GAS_CONSTANT * tMid));
  const factor = Math.exp(Math.max(...lnk) - Math.min(...lnk));
  return Number.isFinite(factor) ? factor : null;
}

/**
 * The bound above which a point's Cook's distance counts as a large influence: the median of
 * F(p, n − p). A point beyond it moves the least-squares estimate to the edge of the 50 %
 * confidence region of the parameters (Cook 1977; Cook & Weisberg 1982, §3.5). Unlike the rule of
 * thumb 4/n it does not shrink with n, so the ends of a well-planned design, whose high leverage is
 * intended, are not reported unless their residuals also move the fit.
 */
import jStat from "jstat";

/**
 * Median of the F distribution with (p, n − p) degrees of freedom, the bound for Cook's distance
 * of a fit with p coefficients to n points. For p = 2 (the Arrhenius fit) the closed form
 * P(F > f) = (1 + 2f/m)^(−m/2) gives f = (m/2)(2^(2/m) − 1) exactly; other p use jstat's
 * inverse F distribution (relative accuracy about 1e-7, ample for a threshold).
 *
 * @param p number of coefficients (1 ≤ p)
 * @param n number of points (n > p)
 * @example cooksDistanceBound(2, 10) // 0.75683 = median of F(2, 8)
 */
export function cooksDistanceBound(p: number, n: number): number {
  const m = n - p;
  if (p === 2) return (m / 2) * Math.expm1((2 / m) * Math.LN2);
  // The inverse F costs more than the rest of a small analysis: kept per (p, n − p), as few pairs occur.
  const key = p * 65536 + m;
  let bound = boundCache.get(key);
  if (bound === undefined) {
    bound = jStat.centralF.inv(0.5, p, m);
    if (boundCache.size < 4096) boundCache.set(key, bound);
  }
  return bound;
}

const boundCache = new Map<number, number>();

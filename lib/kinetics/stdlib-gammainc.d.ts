// Typings for the pieces of @stdlib/math-base-special-gammainc 0.3.1 (a port of Boost.Math's
// gamma.hpp) that incomplete-gamma.ts calls directly; the package ships typings for its main entry only.
declare module "@stdlib/math-base-special-gammainc/lib/igamma_temme_large.js" {
  /** Temme's uniform asymptotic expansion: Q(a, x) when x ≥ a, P(a, x) when x < a. */
  const igammaTemmeLarge: (a: number, x: number) => number;
  export default igammaTemmeLarge;
}
declare module "@stdlib/math-base-special-gammainc/lib/regularised_gamma_prefix.js" {
  /** x^a e^(−x)/Γ(a), computed without overflow (Lanczos). */
  const regularisedGammaPrefix: (a: number, x: number) => number;
  export default regularisedGammaPrefix;
}
declare module "@stdlib/math-base-special-gammainc/lib/upper_gamma_fraction.js" {
  /** Legendre's continued fraction: Q(a, x) = prefix / fraction… as Boost's upper_gamma_fraction. */
  const upperGammaFraction: (a: number, x: number) => number;
  export default upperGammaFraction;
}
declare module "@stdlib/math-base-special-gammainc/lib/lower_gamma_series.js" {
  /** Σ x^k/((a+1)…(a+k)) from k = 0, plus initialValue (Boost's lower_gamma_series). */
  const lowerGammaSeries: (a: number, x: number, initialValue: number) => number;
  export default lowerGammaSeries;
}

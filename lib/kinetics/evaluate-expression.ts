/**
 * Evaluation of a (modified) Arrhenius expression.
 */
import { GAS_CONSTANT, REFERENCE_TEMPERATURE } from "./constants";

/** k = A (T/T0)^n exp(−Ea/RT); A in the unit wanted for k, Ea in J mol⁻¹, T and T0 in K. */
export interface RateExpression {
  A: number;
  n?: number;
  Ea: number;
  T0?: number;
}

/**
 * Rate constant from a modified Arrhenius expression (n = 0 gives plain Arrhenius), computed as
 * exp(ln A + n ln(T/T0) − Ea/RT) so that large exponents do not overflow early.
 *
 * @param T temperature, K
 * @returns k in the unit of A
 * @example evaluateRateExpression({ A: 2.45e-12, Ea: 14757.7 }, 298) // ≈ 6.34e-15
 */
export function evaluateRateExpression(expr: RateExpression, T: number): number {
  const n = expr.n ?? 0;
  const T0 = expr.T0 ?? REFERENCE_TEMPERATURE;
  return Math.exp(Math.log(expr.A) + n * Math.log(T / T0) - expr.Ea / (GAS_CONSTANT * T));
}

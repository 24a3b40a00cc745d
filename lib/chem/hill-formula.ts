/**
 * Molecular formula in Hill order with the net charge appended.
 *
 * Source: Hill system (E. A. Hill, J. Am. Chem. Soc. 22, 478 (1900)) — with carbon present: C,
 * then H, then the rest alphabetically; without carbon: every element alphabetically, H included.
 * Counts of 1 are omitted; the charge follows as "+", "-", "+2", "-3".
 *
 * @example formatHillFormula({ O: 1, H: 1 }, 0) // "HO"; formatHillFormula({ N: 1, H: 4 }, 1) // "H4N+"
 */
export function formatHillFormula(elements: Readonly<Record<string, number>>, charge = 0): string {
  const symbols = sortHill(Object.keys(elements).filter((symbol) => elements[symbol] !== 0));
  const body = symbols.map((symbol) => (elements[symbol] === 1 ? symbol : `${symbol}${elements[symbol]}`)).join("");
  return body + formatCharge(charge);
}

/** Element symbols in Hill order (C, H first when carbon is present, otherwise alphabetical). */
export function sortHill(symbols: readonly string[]): string[] {
  const hasCarbon = symbols.includes("C");
  const rank = (symbol: string) => (hasCarbon && symbol === "C" ? 0 : hasCarbon && symbol === "H" ? 1 : 2);
  // Plain code-point comparison keeps the order identical on every runtime and locale.
  return [...symbols].sort((a, b) => rank(a) - rank(b) || (a < b ? -1 : a > b ? 1 : 0));
}

/** The same counts with keys in Hill order, so stored and compared objects read alike. */
export function orderHill(elements: Readonly<Record<string, number>>): Record<string, number> {
  return Object.fromEntries(sortHill(Object.keys(elements)).map((symbol) => [symbol, elements[symbol]]));
}

/** "+", "-", "+2", "-3" for a net charge; "" when neutral. */
export function formatCharge(charge: number): string {
  if (charge === 0) return "";
  const sign = charge > 0 ? "+" : "-";
  const size = Math.abs(charge);
  return size === 1 ? sign : `${sign}${size}`;
}

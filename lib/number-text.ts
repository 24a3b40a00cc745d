/**
 * THE reading of a number a person typed or pasted: the deposit editor's cells, the table import's
 * cells and the columns pasted into /analyse all go through {@link readNumberText}, so a spelling one
 * of them reads, all of them read.
 *
 * Accepted: 1.2e-11, 1.2E-11, +3, .5, the Unicode minus (−) of typeset tables, Fortran's 1.2D-11, and
 * a decimal comma as spreadsheets write it in many locales (1,5e-12, 298,15, 0,125).
 * Refused, with the reason in words: text that is no number, more than one separator (2,1,5 or
 * 1.234,5: thousands groups), and a comma that could as well group thousands (1,025 without an
 * exponent: 1.025 or 1025?), which a reader of either habit would take differently.
 */

export type NumberReading = { ok: true; value: number } | { ok: false; problem: string };

const PLAIN = /^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/;
const COMMA = /^[+-]?(\d*),(\d+)([eEdD][+-]?\d+)?$/;
/** "1,025" or "12,500": a comma then exactly three digits, no exponent, a non-zero whole part. */
const THOUSANDS_LIKE = /^[+-]?[1-9]\d{0,2},\d{3}$/;

/** Reads `text` (surrounding spaces ignored) as a number, or says in words why it is not one. */
export function readNumberText(text: string): NumberReading {
  const t = text.trim().replace(/\u2212/g, "-");
  if (PLAIN.test(t)) return { ok: true, value: Number(t.replace(/[dD]/, "e")) };
  if (COMMA.test(t)) {
    if (THOUSANDS_LIKE.test(t)) {
      const [whole, part] = t.replace(/^[+-]/, "").split(",");
      return {
        ok: false,
        problem: `"${text.trim()}" could be ${whole}.${part} or ${whole}${part}; write a decimal point (${whole}.${part}) or no separator (${whole}${part})`,
      };
    }
    return { ok: true, value: Number(t.replace(",", ".").replace(/[dD]/, "e")) };
  }
  if (/^[+-]?[\d.,]+([eEdD][+-]?\d+)?$/.test(t) && /\d/.test(t))
    return {
      ok: false,
      problem: `"${text.trim()}" has more than one separator; write one decimal point or comma and no thousands separators`,
    };
  return { ok: false, problem: `"${text.trim()}" is not a number` };
}

/** The number `text` spells, or null when it spells none (see {@link readNumberText}). */
export function parseNumberText(text: string): number | null {
  const r = readNumberText(text);
  return r.ok ? r.value : null;
}

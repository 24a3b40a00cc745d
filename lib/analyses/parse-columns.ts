/** One row that could not be read, numbered from 1 as people count lines. */
export interface RowError {
  line: number;
  message: string;
}

export interface ParsedColumns {
  points: { T: number; k: number; sigmaLnK?: number }[];
  /** Line number (from 1) of each point, to map API errors back to the pasted text. */
  lines: number[];
  errors: RowError[];
}

import { readNumberText } from "@/lib/number-text";

/**
 * Reads pasted columns — T, k and optionally σ(ln k) — separated by tabs, commas, semicolons or
 * spaces (as copied from a spreadsheet). Blank lines and `#` comments are skipped; a first line
 * without numbers is taken as a header. When tabs or semicolons separate the columns, a comma can
 * only be a decimal comma (as spreadsheets in many locales write them); each cell is read by
 * lib/number-text.ts, as the deposit editor and the table import read theirs.
 * Line numbers count every line the person sees, blank, comment and header lines included.
 */
export function parseColumns(text: string): ParsedColumns {
  const out: ParsedColumns = { points: [], lines: [], errors: [] };
  const rows = text.split(/\r\n|\r|\n/);
  rows.forEach((raw, index) => {
    const line = index + 1;
    const trimmed = raw.trim();
    // "#…" or, as this product's CSVs write their header lines, one quoted cell "#…".
    if (!trimmed || trimmed.startsWith("#") || trimmed.startsWith('"#')) return;
    // Tabs or semicolons, when present, separate the columns; then a comma can only be a decimal comma.
    const delimiter = trimmed.includes("\t") ? /\t+/ : trimmed.includes(";") ? /\s*;\s*/ : /[\s,]+/;
    const cells = trimmed
      .split(delimiter)
      .map((c) => c.trim())
      .filter(Boolean);
    const read = cells.map(readNumberText);
    if (out.points.length === 0 && out.errors.length === 0 && !read.some((r) => r.ok)) return; // header
    if (cells.length < 2) {
      out.errors.push({ line, message: `line ${line}: expected two columns (T and k), found ${cells.length}` });
      return;
    }
    if (cells.length > 3) {
      out.errors.push({ line, message: `line ${line}: expected two or three columns (T, k, σ(ln k)), found ${cells.length}` });
      return;
    }
    const bad = read.findIndex((r) => !r.ok);
    if (bad >= 0) {
      const r = read[bad];
      const message =
        !r.ok && !r.problem.endsWith("is not a number")
          ? `line ${line}, column ${bad + 1}: ${r.problem}`
          : `line ${line}: “${cells[bad]}” in column ${bad + 1} is not a number`;
      out.errors.push({ line, message });
      return;
    }
    const [T, k, s] = read.map((r) => (r.ok ? r.value : NaN));
    out.points.push(s === undefined ? { T, k } : { T, k, sigmaLnK: s });
    out.lines.push(line);
  });
  return out;
}

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

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
/** One comma between digits, as in "2,09e-15" or "298,15". */
const DECIMAL_COMMA = /^[+-]?\d*,\d+([eE][+-]?\d+)?$/;

/**
 * Reads pasted columns — T, k and optionally σ(ln k) — separated by tabs, commas, semicolons or
 * spaces (as copied from a spreadsheet). Blank lines and `#` comments are skipped; a first line
 * without numbers is taken as a header. When tabs or semicolons separate the columns, a comma can
 * only be a decimal comma (as spreadsheets in many locales write them) and is read as a point.
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
    const decimalComma = trimmed.includes("\t") || trimmed.includes(";");
    const delimiter = trimmed.includes("\t") ? /\t+/ : trimmed.includes(";") ? /\s*;\s*/ : /[\s,]+/;
    const cells = trimmed
      .split(delimiter)
      .map((c) => c.trim())
      .filter(Boolean)
      .map((c) => (decimalComma && DECIMAL_COMMA.test(c) ? c.replace(",", ".") : c));
    if (out.points.length === 0 && out.errors.length === 0 && !cells.some((c) => NUMBER.test(c))) return; // header
    if (cells.length < 2) {
      out.errors.push({ line, message: `line ${line}: expected two columns (T and k), found ${cells.length}` });
      return;
    }
    if (cells.length > 3) {
      out.errors.push({ line, message: `line ${line}: expected two or three columns (T, k, σ(ln k)), found ${cells.length}` });
      return;
    }
    const bad = cells.findIndex((c) => !NUMBER.test(c));
    if (bad >= 0) {
      out.errors.push({ line, message: `line ${line}: “${cells[bad]}” in column ${bad + 1} is not a number` });
      return;
    }
    const [T, k, s] = cells.map(Number);
    out.points.push(s === undefined ? { T, k } : { T, k, sigmaLnK: s });
    out.lines.push(line);
  });
  return out;
}

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

/**
 * Reads pasted columns — T, k and optionally σ(ln k) — separated by tabs, commas, semicolons or
 * spaces (as copied from a spreadsheet). Blank lines and `#` comments are skipped; a first line
 * without numbers is taken as a header.
 */
export function parseColumns(text: string): ParsedColumns {
  const out: ParsedColumns = { points: [], lines: [], errors: [] };
  const rows = text.split(/\r?\n/);
  rows.forEach((raw, index) => {
    const line = index + 1;
    const trimmed = raw.trim();
    if (!trimmed || trimmed.startsWith("#")) return;
    // Tabs or semicolons, when present, separate the columns; then a comma can only be a decimal
    // comma, which is refused rather than silently split into two numbers.
    const delimiter = trimmed.includes("\t") ? /\t+/ : trimmed.includes(";") ? /\s*;\s*/ : /[\s,]+/;
    const cells = trimmed
      .split(delimiter)
      .map((c) => c.trim())
      .filter(Boolean);
    const comma = cells.find((c) => /^[+-]?\d+,\d/.test(c));
    if (comma) {
      out.errors.push({
        line,
        message: `line ${line}: “${comma}” has a decimal comma; write it with a point (${comma.replace(",", ".")})`,
      });
      return;
    }
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

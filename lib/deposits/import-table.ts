/**
 * Importing a table of points from a CSV, TSV or JSON file: read it (papaparse for delimited text),
 * guess which column holds what from the header, then turn the rows into deposit points with an
 * error per unreadable cell (`Row 7, column "k": "1.2e-1x" is not a number`).
 *
 * Rows are numbered from 1 in messages and from 0 in pointers (`/rows/6/k`), counting data rows
 * only (the header row is not a data row).
 */
import Papa from "papaparse";
import { AppError, type FieldError } from "@/lib/errors";
import { parsePressureUnit, parseRateConstantUnit, parseTemperatureUnit } from "@/lib/kinetics";
import { utf8ByteLength } from "./byte-length";
import { findJsonSyntaxProblem } from "./json-syntax";
import { aboveAbsoluteZeroWords, formatCount } from "./messages";
import { readNumberText, parseNumberText } from "@/lib/number-text";
import { escapePointerSegment } from "./schema";
import type { ConfidenceLevel, DepositPoint, UncertaintyKind } from "./types";
import { MAX_POINTS } from "./vocabulary";

/** Largest file accepted for import, bytes (25 MiB, called "25 MB" on screen). */
export const MAX_UPLOAD_BYTES = 25 * 1024 * 1024;

/** Rows shown in the preview. */
export const PREVIEW_ROWS = 10;

/** Most row errors returned by applyMapping (one summary error follows when there are more). */
export const MAX_IMPORT_ERRORS = 200;

/** Which column (zero-based) holds each quantity. */
export interface ColumnMapping {
  T?: number;
  k?: number;
  uncertainty?: number;
  pressure?: number;
  bathGas?: number;
  note?: number;
}

export interface InspectedTable {
  format: "csv" | "tsv" | "json";
  /** Column names: the header row, or "Column 1", "Column 2", … when the file has none. */
  columns: string[];
  /** Every data row, cells as text (ragged rows are kept as they are). */
  rows: string[][];
  /** The first ten rows. */
  preview: string[][];
  /** The delimiter found ("," "\t" ";" "|"), or "" for JSON. */
  delimiter: string;
  hasHeader: boolean;
  guessedMapping: ColumnMapping;
  /** Units read from header text such as "T/K" or "k / cm3 molecule-1 s-1", as unit ids. */
  guessedUnits: { T?: string; k?: string; pressure?: string };
  /** "relative" when the uncertainty header mentions % , "factor" when it says factor. */
  guessedUncertaintyKind?: UncertaintyKind;
  /**
   * What the reader should know before using the rows, in plain words: a unit named in a header that
   * is not read (the column is then taken in the unit chosen for the dataset), rows with more cells
   * than the header (often a decimal comma in a comma-separated file).
   */
  notices: string[];
}

export interface ApplyMappingOptions {
  /** How the uncertainty column is stated; "absolute" (same unit as k) when not given. */
  uncertaintyKind?: UncertaintyKind;
  /** "1sigma" when not given. */
  confidence?: ConfidenceLevel;
  /** The unit the temperature column is read in ("K" when not given): a row at or below absolute zero is refused. */
  temperatureUnit?: string;
}

const MIB = 1024 * 1024;

/** The size check of an upload, before reading it: a FieldError when over 25 MB, else null. */
export function checkUploadSize(bytes: number): FieldError | null {
  if (bytes <= MAX_UPLOAD_BYTES) return null;
  return { pointer: "", value: bytes, message: `The file is ${(bytes / MIB).toFixed(1)} MB; the limit is ${MAX_UPLOAD_BYTES / MIB} MB.` };
}

/**
 * Refuse an upload over 25 MB before parsing it.
 *
 * @throws AppError `payload_too_large` (HTTP 413) carrying the FieldError of {@link checkUploadSize}.
 */
export function assertUploadSize(bytes: number): void {
  const error = checkUploadSize(bytes);
  if (error) throw new AppError("payload_too_large", error.message, [error]);
}

function isNumeric(cell: string): boolean {
  return parseNumberText(cell) !== null;
}

type Role = keyof ColumnMapping;

/** The quantity a header names: the part before any unit ("T/K" → "t"). */
function headerName(header: string): string {
  return header
    .toLowerCase()
    .replace(/[([{].*$/, "")
    .replace(/\s*[/,].*$/, "")
    .trim();
}

/** Guess what a column holds from its header text. */
export function guessColumnRole(header: string): Role | undefined {
  const full = header.toLowerCase().trim();
  // Uncertainty first: "k error" or "σ(k)" also start like a rate constant.
  if (/±|\+\/-|\+-|sigma|σ|\berr|\bunc|stdev|std\.? ?dev|standard deviation/.test(full) || /^(sd|s\.d\.|dk|δk|u|u\(k\))$/.test(full))
    return "uncertainty";
  const name = headerName(header);
  if (/^(t|temp|temperature)([ _-]?(k|c|degc|°c))?$/.test(name)) return "T";
  if (/^(k|kobs|k_obs|k\(t\)|k_[a-z0-9]+|k[0-9]|rate|rate (constant|coefficient))$/.test(name) || /^k\(t\)/.test(full)) return "k";
  if (/^(p|pressure|p_?tot(al)?|total pressure)$/.test(name)) return "pressure";
  if (/^(bath ?gas|bath|buffer ?gas|buffer|diluent|carrier ?gas|collider|third body)$/.test(name)) return "bathGas";
  if (/^(notes?|comments?|remarks?)$/.test(name)) return "note";
  return undefined;
}

/** The unit part of a header: after the first "/", or inside trailing brackets. */
function headerUnitText(header: string): string | undefined {
  const bracket = /[([]\s*([^()[\]]+?)\s*[)\]]\s*$/.exec(header);
  if (bracket) return bracket[1];
  const slash = header.indexOf("/");
  if (slash >= 0) return header.slice(slash + 1).trim();
  return undefined;
}

function tryParse(text: string | undefined, parse: (t: string) => { id: string }): string | undefined {
  if (!text) return undefined;
  try {
    return parse(text).id;
  } catch {
    return undefined;
  }
}

const QUANTITY_WORDS = { T: "temperature", k: "rate constant", pressure: "pressure" } as const;

/** Row numbers (ascending) with runs of three or more shortened: [1, 2, 4, 5, 6, 9] → "1, 2, 4–6, 9". */
export function rowRuns(rows: number[]): string {
  const runs: string[] = [];
  for (let i = 0; i < rows.length;) {
    let j = i;
    while (j + 1 < rows.length && rows[j + 1] === rows[j] + 1) j++;
    runs.push(j - i >= 2 ? `${rows[i]}–${rows[j]}` : rows.slice(i, j + 1).join(", "));
    i = j + 1;
  }
  return runs.join(", ");
}

/** Rows (numbered from 1, as the preview numbers them) with more cells than the header: every one of them named. */
function widerRowsNotice(headerWidth: number, rows: string[][], delimiter: string): string | null {
  const wider: number[] = [];
  rows.forEach((r, i) => {
    if (r.length > headerWidth && r.slice(headerWidth).some((c) => c.trim() !== "")) wider.push(i + 1);
  });
  if (!wider.length) return null;
  const count = wider.length;
  const which = `${count === 1 ? "Row" : "Rows"} ${rowRuns(wider)}`;
  const comma =
    delimiter === ","
      ? " In a comma-separated table a decimal comma splits a number in two (1,025e-14 becomes 1 and 025e-14): write decimal points, or separate the columns with tabs or semicolons."
      : "";
  return `${which} ${count === 1 ? "has" : "have"} more cells than the header has columns (${headerWidth}); the extra cells are not used.${comma}`;
}

function guessMapping(
  columns: string[],
  hasHeader: boolean,
  rows: string[][],
): Pick<InspectedTable, "guessedMapping" | "guessedUnits" | "guessedUncertaintyKind" | "notices"> {
  const mapping: ColumnMapping = {};
  const units: InspectedTable["guessedUnits"] = {};
  const notices: string[] = [];
  let kind: UncertaintyKind | undefined;
  if (!hasHeader) {
    // Without a header the usual order is T, k, then an uncertainty.
    const width = Math.max(0, ...rows.slice(0, PREVIEW_ROWS).map((r) => r.length));
    if (width >= 2) Object.assign(mapping, { T: 0, k: 1 });
    if (width >= 3) mapping.uncertainty = 2;
    return { guessedMapping: mapping, guessedUnits: units, notices };
  }
  columns.forEach((header, index) => {
    const role = guessColumnRole(header);
    if (!role || mapping[role] !== undefined) return;
    mapping[role] = index;
    const unitText = headerUnitText(header);
    if (role === "T") units.T = tryParse(unitText, parseTemperatureUnit);
    if (role === "k") units.k = tryParse(unitText, (t) => parseRateConstantUnit(t));
    if (role === "pressure") units.pressure = tryParse(unitText, parsePressureUnit);
    if ((role === "T" || role === "k" || role === "pressure") && unitText && units[role] === undefined)
      notices.push(
        `The header “${header}” names the unit “${unitText}”, which is not a ${QUANTITY_WORDS[role]} unit this form knows: the column will be read in the unit chosen for the dataset. Check that unit, or convert the column first.`,
      );
    if (role === "uncertainty") {
      if (/%|percent|rel/i.test(header)) kind = "relative";
      else if (/factor|\bf\b/i.test(header)) kind = "factor";
    }
  });
  for (const key of Object.keys(units) as (keyof typeof units)[]) if (units[key] === undefined) delete units[key];
  return { guessedMapping: mapping, guessedUnits: units, notices, ...(kind ? { guessedUncertaintyKind: kind } : {}) };
}

function cellText(value: unknown): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "string") return value;
  if (typeof value === "number" || typeof value === "boolean") return String(value);
  return JSON.stringify(value);
}

function unreadable(message: string): AppError {
  return new AppError("validation_failed", message, [{ pointer: "", message }]);
}

function readJsonTable(text: string): { header: string[] | null; rows: string[][] } {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    const problem = findJsonSyntaxProblem(text);
    throw unreadable(
      `The file is not valid JSON${problem ? `: ${problem.problem} (line ${problem.line}, column ${problem.column})` : ""}.`,
    );
  }
  const shapeMessage = "A JSON table must be a list of rows: either objects with the same fields (one per point) or lists of cells.";
  if (!Array.isArray(data) || data.length === 0) throw unreadable(shapeMessage);
  if (data.every((r) => typeof r === "object" && r !== null && !Array.isArray(r))) {
    const header: string[] = [];
    const seen = new Set<string>();
    for (const r of data as Record<string, unknown>[]) {
      for (const key of Object.keys(r)) {
        if (seen.has(key)) continue;
        seen.add(key);
        header.push(key);
      }
    }
    return { header, rows: (data as Record<string, unknown>[]).map((r) => header.map((h) => cellText(r[h]))) };
  }
  if (data.every((r) => Array.isArray(r))) return { header: null, rows: (data as unknown[][]).map((r) => r.map(cellText)) };
  throw unreadable(shapeMessage);
}

/** True when a first row names columns rather than holding numbers. */
function looksLikeHeader(row: string[]): boolean {
  return row.some((c) => c.trim() !== "" && !isNumeric(c));
}

/**
 * Read a table from the text of a CSV, TSV or JSON file. The format comes from the file name's
 * extension, else from the content (a leading "[" means JSON). Lines starting with # are comments.
 *
 * @throws AppError `payload_too_large` over 25 MB; `validation_failed` when the file holds no table.
 */
export function inspectTable(text: string, options: { filename?: string } = {}): InspectedTable {
  assertUploadSize(text.length > MAX_UPLOAD_BYTES ? text.length : utf8ByteLength(text));
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const ext = /\.([a-z]+)$/i.exec(options.filename ?? "")?.[1]?.toLowerCase();
  const isJson = ext === "json" || (ext === undefined && /^\s*\[/.test(body));
  if (body.trim() === "") throw unreadable("The file is empty.");

  let format: InspectedTable["format"];
  let delimiter = "";
  let raw: string[][];
  let header: string[] | null = null;
  if (isJson) {
    format = "json";
    const table = readJsonTable(body);
    header = table.header;
    raw = table.rows;
  } else {
    // A line that is one quoted cell starting with "#" (the header lines of this product's own CSVs) is a comment too.
    const parsed = Papa.parse<string[]>(body.replace(/^"#[^\r\n]*/gm, "#"), {
      delimiter: ext === "tsv" || ext === "tab" ? "\t" : "",
      delimitersToGuess: [",", "\t", ";", "|"],
      skipEmptyLines: "greedy",
      comments: "#",
    });
    const quoteError = parsed.errors.find((e) => e.type === "Quotes");
    if (quoteError)
      throw unreadable(`Row ${(quoteError.row ?? 0) + 1} has an unclosed quote ("); every quoted cell must end with a quote.`);
    delimiter = parsed.meta.delimiter;
    format = delimiter === "\t" ? "tsv" : "csv";
    raw = parsed.data;
  }
  if (!header && raw.length > 0 && looksLikeHeader(raw[0])) {
    header = raw[0];
    raw = raw.slice(1);
  }
  const width = Math.max(header?.length ?? 0, ...raw.slice(0, 1000).map((r) => r.length));
  const columns = Array.from({ length: width }, (_, i) => header?.[i]?.trim() || `Column ${i + 1}`);
  const guessed = guessMapping(columns, header !== null, raw);
  const wider = header ? widerRowsNotice(header.length, raw, delimiter) : null;
  return {
    format,
    columns,
    rows: raw,
    preview: raw.slice(0, PREVIEW_ROWS),
    delimiter,
    hasHeader: header !== null,
    ...guessed,
    notices: wider ? [...guessed.notices, wider] : guessed.notices,
  };
}

/**
 * Turn table rows into deposit points using `mapping`. `points` holds the rows that could be read;
 * `errors` one entry per unreadable cell, pointer `/rows/<i>/<column name>`. A table of more than
 * 100 000 rows is refused as a whole.
 */
export function applyMapping(
  table: Pick<InspectedTable, "columns" | "rows">,
  mapping: ColumnMapping,
  options: ApplyMappingOptions = {},
): { points: DepositPoint[]; errors: FieldError[] } {
  if (table.rows.length > MAX_POINTS) {
    return {
      points: [],
      errors: [
        {
          pointer: "/rows",
          value: table.rows.length,
          message: `The table has ${formatCount(table.rows.length)} rows; a dataset can hold at most ${formatCount(MAX_POINTS)} points. Split the file into several datasets, for example by temperature range or bath gas.`,
        },
      ],
    };
  }
  const errors: FieldError[] = [];
  for (const role of ["T", "k"] as const) {
    const col = mapping[role];
    if (col === undefined || col < 0 || col >= table.columns.length) {
      errors.push({
        pointer: `/mapping/${role}`,
        message: `Choose the column that holds ${role === "T" ? "the temperature" : "the rate constant"}.`,
      });
    }
  }
  if (errors.length) return { points: [], errors };

  const kind = options.uncertaintyKind ?? "absolute";
  const confidence = options.confidence;
  let total = 0;
  const report = (i: number, col: number, message: string, value?: string) => {
    total++;
    if (errors.length < MAX_IMPORT_ERRORS) {
      errors.push({
        pointer: `/rows/${i}/${escapePointerSegment(table.columns[col])}`,
        message,
        ...(value !== undefined ? { value } : {}),
      });
    }
  };
  const where = (i: number, col: number) => `Row ${i + 1}, column "${table.columns[col]}"`;

  /** A required or optional numeric cell; undefined when empty (optional) or unreadable. */
  const readNumber = (row: string[], i: number, col: number | undefined, required: boolean, strip?: RegExp): number | undefined | null => {
    if (col === undefined) return undefined;
    const cell = (row[col] ?? "").trim();
    if (cell === "") {
      if (required) report(i, col, `${where(i, col)} is empty.`, cell);
      return required ? null : undefined;
    }
    const read = readNumberText(strip ? cell.replace(strip, "") : cell);
    if (!read.ok) {
      report(i, col, `${where(i, col)}: ${read.problem}.`, cell);
      return null;
    }
    return read.value;
  };
  /** One wording for every value out of its range: "Row 3, column "k": a rate constant must be greater than 0 (got -1)." */
  const outOfRange = (row: string[], i: number, col: number, rule: string, got?: string) => {
    const cell = (row[col] ?? "").trim();
    report(i, col, `${where(i, col)}: ${rule} (got ${got ?? cell}).`, row[col]);
  };
  let tUnit: { factor: number; offset?: number; label: string } | undefined;
  try {
    tUnit = parseTemperatureUnit(options.temperatureUnit ?? "K");
  } catch {
    tUnit = undefined;
  }

  const points: DepositPoint[] = [];
  table.rows.forEach((row, i) => {
    const T = readNumber(row, i, mapping.T, true);
    const k = readNumber(row, i, mapping.k, true);
    // "±0.3" and, for relative uncertainties, "8 %" are common ways of writing the cell.
    const u = readNumber(row, i, mapping.uncertainty, false, kind === "relative" ? /^(±|\+\/-)\s*|\s*%$/g : /^(±|\+\/-)\s*/);
    const p = readNumber(row, i, mapping.pressure, false);
    let ok = T !== null && k !== null && u !== null && p !== null;
    if (typeof T === "number" && tUnit) {
      const kelvin = T * tUnit.factor + (tUnit.offset ?? 0);
      if (!(kelvin > 0)) {
        report(
          i,
          mapping.T!,
          `${where(i, mapping.T!)}: a temperature ${aboveAbsoluteZeroWords((row[mapping.T!] ?? "").trim(), tUnit, kelvin)}.`,
          row[mapping.T!],
        );
        ok = false;
      }
    }
    if (typeof k === "number" && !(k > 0)) {
      outOfRange(row, i, mapping.k!, "a rate constant must be greater than 0");
      ok = false;
    }
    if (typeof u === "number" && (kind === "factor" ? !(u > 1) : !(u > 0))) {
      outOfRange(
        row,
        i,
        mapping.uncertainty!,
        kind === "factor" ? "an uncertainty factor must be greater than 1" : "an uncertainty must be greater than 0",
      );
      ok = false;
    }
    if (typeof p === "number" && !(p > 0)) {
      outOfRange(row, i, mapping.pressure!, "a pressure must be greater than 0");
      ok = false;
    }
    if (!ok) return;
    const point: DepositPoint = { T: T as number, k: k as number };
    if (typeof u === "number") point.uncertainty = confidence ? { kind, value: u, confidence } : { kind, value: u };
    if (typeof p === "number") point.pressure = p;
    const bath = mapping.bathGas !== undefined ? (row[mapping.bathGas] ?? "").trim() : "";
    if (bath) point.bathGas = bath;
    const note = mapping.note !== undefined ? (row[mapping.note] ?? "").trim() : "";
    if (note) point.note = note;
    points.push(point);
  });
  if (total > errors.length) {
    errors.push({
      pointer: "",
      message: `Showing the first ${formatCount(errors.length)} of ${formatCount(total)} problems in the table.`,
    });
  }
  return { points, errors };
}

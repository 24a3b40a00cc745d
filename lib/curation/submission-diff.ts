/**
 * What changed between two deposit documents, for a curator: every field that was added, removed
 * or changed (old → new), and the points row by row. Points are aligned with Myers' difference
 * algorithm (jsdiff's diffArrays), so deleting one row shows one removed row, not a shifted table;
 * a removed run followed by an added run pairs up as changed rows with the values that differ.
 * Pure: no I/O.
 */
import canonicalize from "canonicalize";
import { diffArrays } from "diff";
import { CONFIDENCE_LEVELS } from "@/lib/deposits/vocabulary";
import { unitLabel } from "@/lib/unit-labels";

export type ChangeKind = "added" | "removed" | "changed";

export interface FieldChange {
  kind: ChangeKind;
  /** Readable path, e.g. "reaction › class", "creators › 2 › name" (list positions from 1). */
  path: string;
  before?: string;
  after?: string;
}

export interface PointChange {
  kind: ChangeKind;
  /** Row numbers from 1, in the earlier and the later document. */
  rowBefore?: number;
  rowAfter?: number;
  /** The values that differ (changed) or all of the row's values (added, removed): column → old / new. */
  values: { column: string; before?: string; after?: string }[];
}

export interface SubmissionDiff {
  fields: FieldChange[];
  points: PointChange[];
  pointsBefore: number;
  pointsAfter: number;
}

/** Alignment beyond this many edits falls back to row-by-row comparison (bounded time on huge tables). */
const MAX_EDIT_LENGTH = 5000;

const show = (v: unknown): string => (typeof v === "string" ? v : (canonicalize(v) ?? String(v)));

/** Leaves of a JSON value, keyed by path segments (arrays by position from 1). */
function leaves(value: unknown, path: string[] = [], out = new Map<string, unknown>()): Map<string, unknown> {
  if (Array.isArray(value)) {
    if (value.length === 0) out.set(path.join(" › "), "(empty list)");
    value.forEach((v, i) => leaves(v, [...path, String(i + 1)], out));
  } else if (value !== null && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>);
    if (entries.length === 0 && path.length) out.set(path.join(" › "), "(empty)");
    for (const [k, v] of entries) leaves(v, [...path, k], out);
  } else {
    out.set(path.join(" › "), value);
  }
  return out;
}

/** Field-by-field changes between two flat leaf maps, in the order the later document has them. */
function compareLeaves(before: Map<string, unknown>, after: Map<string, unknown>): FieldChange[] {
  const out: FieldChange[] = [];
  for (const [path, a] of after) {
    if (!before.has(path)) out.push({ kind: "added", path, after: show(a) });
    else if (show(before.get(path)) !== show(a)) out.push({ kind: "changed", path, before: show(before.get(path)), after: show(a) });
  }
  for (const [path, b] of before) if (!after.has(path)) out.push({ kind: "removed", path, before: show(b) });
  return out;
}

/** The units a document states (its `units`), for writing point values with them. */
type DocumentUnits = { T?: string; k?: string; pressure?: string };

function unitsOf(doc: Record<string, unknown>): DocumentUnits {
  const u = doc.units;
  return u !== null && typeof u === "object" ? (u as DocumentUnits) : {};
}

/**
 * The row's leaves, each number written with its unit as the document states it: T, k and pressure in
 * the document's units; an uncertainty by its kind (absolute: k's unit, relative: %, factor: no unit).
 */
function rowValues(row: unknown, units: DocumentUnits = {}): Map<string, unknown> {
  const out = leaves(row);
  const point = (row ?? {}) as { uncertainty?: { kind?: string } };
  const withUnit = (column: string, label: string) => {
    const v = out.get(column);
    if (typeof v === "number" && label) out.set(column, `${show(v)} ${label}`);
  };
  withUnit("T", unitLabel("temperature", units.T));
  withUnit("k", unitLabel("rateConstant", units.k));
  withUnit("pressure", unitLabel("pressure", units.pressure));
  const kind = point.uncertainty?.kind;
  withUnit("uncertainty › value", kind === "relative" ? "%" : kind === "factor" ? "" : unitLabel("rateConstant", units.k));
  // The coverage as the editor names it (1σ, 2σ), never its stored code.
  const confidence = CONFIDENCE_LEVELS.find((c) => c.id === out.get("uncertainty › confidence"));
  if (confidence) out.set("uncertainty › confidence", confidence.label);
  return out;
}

/**
 * The fields' leaves, the pressure condition written with its unit (as a point's pressure is): a
 * change of units.pressure then shows on the pressure itself ("100 Torr → 100 bar"), not only as a
 * separate change of the unit.
 */
function fieldValues(rest: Record<string, unknown>, units: DocumentUnits): Map<string, unknown> {
  const out = leaves(rest);
  const label = unitLabel("pressure", units.pressure);
  for (const end of ["value", "min", "max"]) {
    const path = `conditions › pressure › ${end}`;
    const v = out.get(path);
    if (typeof v === "number" && label) out.set(path, `${show(v)} ${label}`);
  }
  return out;
}

type Side = { row: number; value: unknown; units?: DocumentUnits };

function pointChange(kind: ChangeKind, before?: Side, after?: Side): PointChange {
  if (kind === "changed") {
    const values = compareLeaves(rowValues(before!.value, before!.units), rowValues(after!.value, after!.units)).map((c) => ({
      column: c.path,
      before: c.before,
      after: c.after,
    }));
    return { kind, rowBefore: before!.row, rowAfter: after!.row, values };
  }
  const side = (before ?? after)!;
  const values = [...rowValues(side.value, side.units)].map(([column, v]) =>
    before ? { column, before: show(v) } : { column, after: show(v) },
  );
  return { kind, rowBefore: before?.row, rowAfter: after?.row, values };
}

/** Points row by row: Myers alignment of the rows, removed+added runs paired as changes. */
export function diffPoints(
  before: unknown[],
  after: unknown[],
  units: { before?: DocumentUnits; after?: DocumentUnits } = {},
): PointChange[] {
  const b = (row: number, value: unknown): Side => ({ row, value, units: units.before });
  const a = (row: number, value: unknown): Side => ({ row, value, units: units.after });
  const keysBefore = before.map((p) => canonicalize(p) ?? "");
  const keysAfter = after.map((p) => canonicalize(p) ?? "");
  const parts = diffArrays(keysBefore, keysAfter, { maxEditLength: MAX_EDIT_LENGTH });
  const out: PointChange[] = [];
  if (!parts) {
    // Too different to align within the bound: compare position by position.
    for (let i = 0; i < Math.max(before.length, after.length); i++) {
      if (i >= after.length) out.push(pointChange("removed", b(i + 1, before[i])));
      else if (i >= before.length) out.push(pointChange("added", undefined, a(i + 1, after[i])));
      else if (keysBefore[i] !== keysAfter[i]) out.push(pointChange("changed", b(i + 1, before[i]), a(i + 1, after[i])));
    }
    return out;
  }
  let i = 0; // position in before
  let j = 0; // position in after
  for (let p = 0; p < parts.length; p++) {
    const part = parts[p];
    const n = part.value.length;
    if (!part.added && !part.removed) {
      i += n;
      j += n;
      continue;
    }
    if (part.removed && parts[p + 1]?.added) {
      const m = parts[p + 1].value.length;
      const paired = Math.min(n, m);
      for (let k = 0; k < paired; k++) out.push(pointChange("changed", b(i + k + 1, before[i + k]), a(j + k + 1, after[j + k])));
      for (let k = paired; k < n; k++) out.push(pointChange("removed", b(i + k + 1, before[i + k])));
      for (let k = paired; k < m; k++) out.push(pointChange("added", undefined, a(j + k + 1, after[j + k])));
      i += n;
      j += m;
      p++;
      continue;
    }
    if (part.removed) {
      for (let k = 0; k < n; k++) out.push(pointChange("removed", b(i + k + 1, before[i + k])));
      i += n;
    } else {
      for (let k = 0; k < n; k++) out.push(pointChange("added", undefined, a(j + k + 1, after[j + k])));
      j += n;
    }
  }
  return out;
}

/**
 * Changes from `before` to `after` (two deposit documents): the fields outside the points, and
 * the points row by row.
 *
 * @example diffSubmissions({ title: "a", points: [] }, { title: "b", points: [] }).fields // [{ kind: "changed", path: "title", before: "a", after: "b" }]
 */
export function diffSubmissions(before: Record<string, unknown>, after: Record<string, unknown>): SubmissionDiff {
  const { points: pb, ...restBefore } = before;
  const { points: pa, ...restAfter } = after;
  const pointsBefore = Array.isArray(pb) ? pb : [];
  const pointsAfter = Array.isArray(pa) ? pa : [];
  return {
    fields: compareLeaves(fieldValues(restBefore, unitsOf(before)), fieldValues(restAfter, unitsOf(after))),
    points: diffPoints(pointsBefore, pointsAfter, { before: unitsOf(before), after: unitsOf(after) }),
    pointsBefore: pointsBefore.length,
    pointsAfter: pointsAfter.length,
  };
}

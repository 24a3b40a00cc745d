/**
 * From an inspected table and a column mapping to editor rows. applyMapping reads the cells and
 * reports each unreadable one ("Row 7, column "k": …"); rows it could not read are kept as their
 * text, in place, so the person corrects them in the table instead of losing them.
 */
import { applyMapping, type ApplyMappingOptions, type ColumnMapping, type InspectedTable } from "@/lib/deposits/import-table";
import type { DepositPoint } from "@/lib/deposits/types";
import type { FieldError } from "@/lib/errors";
import { pointToRow, type PointRow } from "./form-model";

export interface ImportedRows {
  rows: PointRow[];
  /** applyMapping's problems: pointers /rows/<i>/<column>, /mapping/<role>, "/rows" or "". */
  errors: FieldError[];
  /** Rows left out: only when there were too many problems to keep track of every unreadable row. */
  dropped: number;
}

function rawRow(cells: string[], mapping: ColumnMapping, options: ApplyMappingOptions): PointRow {
  const cell = (col: number | undefined) => (col === undefined ? "" : (cells[col] ?? "").trim());
  return {
    T: cell(mapping.T),
    k: cell(mapping.k),
    u: cell(mapping.uncertainty).replace(/^(±|\+\/-)\s*/, ""),
    uKind: options.uncertaintyKind ?? "absolute",
    uConfidence: options.confidence ?? "",
    pressure: cell(mapping.pressure),
    bathGas: cell(mapping.bathGas),
    note: cell(mapping.note),
  };
}

export function importRows(
  table: Pick<InspectedTable, "columns" | "rows">,
  mapping: ColumnMapping,
  options: ApplyMappingOptions = {},
): ImportedRows {
  const { points, errors } = applyMapping(table, mapping, options);
  // Rows without an uncertainty still carry the chosen kind, for values typed in later.
  const toRow = (p: DepositPoint): PointRow =>
    p.uncertainty
      ? pointToRow(p)
      : { ...pointToRow(p), uKind: options.uncertaintyKind ?? "absolute", uConfidence: options.confidence ?? "" };
  const refused = errors.some((e) => e.pointer === "/rows" || e.pointer.startsWith("/mapping/"));
  if (refused) return { rows: [], errors, dropped: 0 };
  const bad = new Set<number>();
  for (const e of errors) {
    const m = /^\/rows\/(\d+)\//.exec(e.pointer);
    if (m) bad.add(Number(m[1]));
  }
  // Every bad row is known only when applyMapping listed every problem (no summary line at "").
  const complete = !errors.some((e) => e.pointer === "") && bad.size + points.length === table.rows.length;
  if (!complete) return { rows: points.map(toRow), errors, dropped: table.rows.length - points.length };
  const rows: PointRow[] = [];
  let next = 0;
  table.rows.forEach((cells, i) => {
    rows.push(bad.has(i) ? rawRow(cells, mapping, options) : toRow(points[next++]));
  });
  return { rows, errors, dropped: 0 };
}

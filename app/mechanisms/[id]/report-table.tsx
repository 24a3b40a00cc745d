"use client";

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnFiltersState,
  type SortingState,
} from "@tanstack/react-table";
import Link from "next/link";
import { useState } from "react";
import { ScrollRegion } from "@/components/scroll-region";
import { SortableHeaderCell } from "@/components/sortable-header-cell";

export interface ReportRow {
  index: number;
  line: number;
  equation: string;
  verdict: string;
  verdictWords: string;
  extrapolated: string;
  worstRatio: number | null;
  worstT: number | null;
  /** The consensus uncertainty factor f at the worst point: how wide "agrees" is there. */
  worstF: number | null;
  datasets: number;
  note: string;
  reactionPath: string | null;
  plotHref: string | null;
}

const col = createColumnHelper<ReportRow>();
const VERDICT_RANK: Record<string, number> = { disagrees: 0, extrapolated: 1, no_data: 2, not_checked: 3, agrees: 4 };
const ratioText = (r: number | null) => (r === null ? "" : r >= 100 || r < 0.01 ? r.toExponential(1) : r.toPrecision(2));

const columns = [
  col.accessor("line", { header: "Line" }),
  col.accessor("equation", {
    header: "Reaction",
    cell: (c) =>
      c.row.original.reactionPath ? (
        <Link className="underline" href={c.row.original.reactionPath}>
          {c.getValue()}
        </Link>
      ) : (
        c.getValue()
      ),
  }),
  col.accessor("verdictWords", {
    id: "verdict",
    header: "Verdict",
    // Problems first when sorted: disagrees, extrapolated, no data, not checked, agrees.
    sortingFn: (a, b) => VERDICT_RANK[a.original.verdict] - VERDICT_RANK[b.original.verdict],
    // "extrapolated" also finds the reactions that agree or disagree but are used beyond the data.
    filterFn: (row, _id, value: string) =>
      !value || row.original.verdict === value || (value === "extrapolated" && row.original.extrapolated !== ""),
  }),
  col.accessor("worstRatio", { header: "k mechanism / k consensus (worst)", cell: (c) => ratioText(c.getValue()), sortUndefined: "last" }),
  col.accessor("worstT", { header: "at T (K)", cell: (c) => (c.getValue() === null ? "" : Math.round(c.getValue() as number)) }),
  col.accessor("worstF", {
    header: "Uncertainty factor f there",
    cell: (c) => (c.getValue() === null ? "" : (c.getValue() as number).toPrecision(2)),
    sortUndefined: "last",
  }),
  col.accessor("extrapolated", { header: "Extrapolated (K)" }),
  col.accessor("datasets", { header: "Datasets published" }),
  col.accessor("note", { header: "Note", enableSorting: false }),
  col.display({
    id: "plot",
    header: "Plot",
    cell: (c) =>
      c.row.original.plotHref ? (
        <Link className="underline" href={c.row.original.plotHref} scroll={false}>
          Plot
        </Link>
      ) : null,
  }),
];

const VERDICT_FILTERS = [
  ["", "Every reaction"],
  ["disagrees", "Disagrees"],
  ["extrapolated", "Extrapolated"],
  ["no_data", "No data"],
  ["agrees", "Agrees"],
  ["not_checked", "Not checked yet"],
] as const;

/** Every reaction of the check with its verdict: sortable, filterable by verdict and text, 50 a page. */
export function ReportTable({ rows }: { rows: ReportRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [filters, setFilters] = useState<ColumnFiltersState>([]);
  const [text, setText] = useState("");
  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table v8 is not compiler-memoizable; this component is not memoized.
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, columnFilters: filters, globalFilter: text },
    onSortingChange: setSorting,
    onColumnFiltersChange: setFilters,
    onGlobalFilterChange: setText,
    globalFilterFn: (row, _id, value: string) => row.original.equation.toLowerCase().includes(value.toLowerCase()),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageSize: 50 } },
  });
  const verdict = (filters.find((f) => f.id === "verdict")?.value as string) ?? "";
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-4">
        <label className="text-sm">
          Show{" "}
          <select
            className="field-input"
            value={verdict}
            onChange={(e) => setFilters(e.target.value ? [{ id: "verdict", value: e.target.value }] : [])}
            name="verdict"
          >
            {VERDICT_FILTERS.map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          Reaction contains <input className="field-input" value={text} onChange={(e) => setText(e.target.value)} name="equation" />
        </label>
        <span className="text-sm text-muted" role="status">
          {table.getFilteredRowModel().rows.length} of {rows.length} reactions
        </span>
      </div>
      <ScrollRegion label="Reactions and verdicts">
        <table className="w-full text-sm">
          <thead>
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <SortableHeaderCell key={h.id} header={h} className="px-2 py-1 text-left" />
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-2 py-3 text-muted">
                  No reaction matches these filters; clear them to see every reaction.
                </td>
              </tr>
            )}
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-t" data-verdict={r.original.verdict}>
                {r.getVisibleCells().map((c) => (
                  // The note and the reaction get room to read (the table scrolls sideways on a phone instead of growing tall).
                  <td
                    key={c.id}
                    className={`px-2 py-1 align-top ${c.column.id === "note" ? "min-w-64" : c.column.id === "equation" ? "min-w-40" : ""}`}
                  >
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      {table.getPageCount() > 1 && (
        <div className="flex gap-2 text-sm">
          <button type="button" className="btn-secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
            Previous
          </button>
          <span>
            Page {table.getState().pagination.pageIndex + 1} of {table.getPageCount()}
          </span>
          <button type="button" className="btn-secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
            Next
          </button>
        </div>
      )}
    </div>
  );
}

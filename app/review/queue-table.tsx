"use client";

import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { CheckSummaryCell } from "@/components/check-summary";
import { StateLabel } from "@/components/state-label";
import type { CheckSummary } from "@/lib/curation/check-summary";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { ScrollRegion } from "@/components/scroll-region";
import { SortableHeaderCell } from "@/components/sortable-header-cell";
import { formatRange } from "@/lib/format";

export interface QueueRow {
  versionId: number;
  number: number;
  title: string;
  state: string;
  submittedAt: string | null;
  worstFlag: string | null;
  flagCodes: string[] | null;
  reactionClass: string | null;
  pointCount: number;
  tMin: number | null;
  tMax: number | null;
  owner: string;
  /** Who took it into review (in review) or returned it (returned), when that is on record. */
  handledBy: string | null;
  /** How long it has waited since it was submitted, in words ("2 d 4 h"), worked out on the server. */
  waiting: string;
  /** How long it has been with its authors since it was returned, in words (returned versions only). */
  withAuthorsFor: string | null;
  /** Its findings in words, from its newest analysis. */
  checks: CheckSummary | undefined;
}

const col = createColumnHelper<QueueRow>();
const sortKeyOf: Record<string, string> = { title: "title", submittedAt: "submitted", worstFlag: "severity", pointCount: "points" };

const utcMinute = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

const columnsFor = (withAuthors: boolean) => [
  col.accessor("title", {
    header: "Dataset",
    cell: (c) => <Link href={`/review/${c.row.original.versionId}`}>{c.getValue()}</Link>,
    enableSorting: true,
  }),
  col.accessor("number", { header: "Version", cell: (c) => `v${c.getValue()}`, enableSorting: false }),
  col.accessor("owner", { header: "Owner", enableSorting: false }),
  col.accessor("state", { header: "State", cell: (c) => <StateLabel state={c.getValue()} />, enableSorting: false }),
  col.accessor("handledBy", {
    header: "Curator",
    cell: (c) =>
      c.getValue()
        ? `${c.row.original.state === "returned" ? "returned by" : "taken by"} ${c.getValue()}`
        : c.row.original.state === "submitted"
          ? "nobody yet"
          : "—",
    enableSorting: false,
  }),
  col.accessor("reactionClass", {
    header: "Class",
    cell: (c) => reactionClassFor(c.getValue())?.label ?? c.getValue() ?? "—",
    enableSorting: false,
  }),
  col.accessor("worstFlag", {
    header: "Checks",
    cell: (c) => <CheckSummaryCell summary={c.row.original.checks} href={`/review/${c.row.original.versionId}#report-heading`} />,
    enableSorting: true,
  }),
  col.accessor("pointCount", { header: "Points", enableSorting: true }),
  col.display({
    id: "range",
    header: "T range (K)",
    // One line: "260–380" never breaks at its dash.
    cell: (c) => <span className="whitespace-nowrap">{formatRange(c.row.original.tMin, c.row.original.tMax, "")}</span>,
  }),
  col.accessor("submittedAt", {
    header: withAuthors ? "With the authors since the return" : "Waiting since submission",
    cell: (c) => {
      const iso = c.getValue();
      const shown = withAuthors ? c.row.original.withAuthorsFor : c.row.original.waiting;
      return iso && shown ? (
        <time dateTime={iso} title={`Submitted ${utcMinute(iso)}`}>
          {shown}
        </time>
      ) : (
        "—"
      );
    },
    enableSorting: true,
  }),
];

/** The review queue: sorting and paging happen on the server; the table only reflects the URL. */
export function QueueTable({
  rows,
  total,
  page,
  pageSize,
  sort,
  direction,
  withAuthors,
}: {
  rows: QueueRow[];
  total: number;
  page: number;
  pageSize: number;
  sort: string;
  direction: "asc" | "desc";
  /** The returned versions (waiting for their authors) rather than those waiting for a curator. */
  withAuthors: boolean;
}) {
  const columns = columnsFor(withAuthors);
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const sortingColumn = Object.entries(sortKeyOf).find(([, v]) => v === sort)?.[0] ?? "submittedAt";
  const sorting: SortingState = [{ id: sortingColumn, desc: direction === "desc" }];

  function go(changes: Record<string, string>) {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(changes)) next.set(k, v);
    router.push(`${pathname}?${next.toString()}`);
  }

  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table v8 is not compiler-memoizable; this component is not memoized.
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    manualSorting: true,
    enableSortingRemoval: false,
    manualPagination: true,
    pageCount: Math.max(1, Math.ceil(total / pageSize)),
    getCoreRowModel: getCoreRowModel(),
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (first) go({ sort: sortKeyOf[first.id] ?? "submitted", dir: first.desc ? "desc" : "asc", page: "1" });
    },
  });
  const pages = Math.max(1, Math.ceil(total / pageSize));

  return (
    <div className="space-y-3">
      <ScrollRegion label="Review queue" className="card p-0">
        <table className="table">
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => (
                  <SortableHeaderCell key={h.id} header={h} />
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="text-muted">
                  {withAuthors
                    ? "No returned version is with its authors with these filters."
                    : "Nothing waits for a curator with these filters."}
                </td>
              </tr>
            ) : (
              table.getRowModel().rows.map((r) => (
                <tr key={r.id}>
                  {r.getVisibleCells().map((c) => (
                    <td key={c.id}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </ScrollRegion>
      <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
        <button type="button" className="btn-secondary py-1" disabled={page <= 1} onClick={() => go({ page: String(page - 1) })}>
          Previous
        </button>
        <span>
          Page {page} of {pages} · {total} version{total === 1 ? "" : "s"}
        </span>
        <button type="button" className="btn-secondary py-1" disabled={page >= pages} onClick={() => go({ page: String(page + 1) })}>
          Next
        </button>
      </nav>
    </div>
  );
}

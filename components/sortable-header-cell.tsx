"use client";

import { flexRender, type Header } from "@tanstack/react-table";

/**
 * A TanStack Table column header: a button that sorts when the column can be sorted, with the
 * direction shown (▲ ▼, hidden from screen readers, which read aria-sort instead).
 */
export function SortableHeaderCell<Row>({ header, className }: { header: Header<Row, unknown>; className?: string }) {
  const sorted = header.column.getIsSorted();
  const label = flexRender(header.column.columnDef.header, header.getContext());
  return (
    <th scope="col" className={className} aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}>
      {header.column.getCanSort() ? (
        <button type="button" className="font-semibold hover:underline" onClick={header.column.getToggleSortingHandler()}>
          {label}
          <span aria-hidden="true">{sorted === "asc" ? " ▲" : sorted === "desc" ? " ▼" : ""}</span>
        </button>
      ) : (
        label
      )}
    </th>
  );
}

"use client";

import type { Ref } from "react";
import type { FieldError } from "@/lib/errors";
import { SECTIONS, sectionAnchor, sectionOf, type GroupedErrors, type SectionId } from "./pointers";

interface Props {
  message: string;
  /** Every problem of the last save. */
  errors: FieldError[];
  grouped: GroupedErrors;
  /** Zero-based rows with problems that are not in the window of rows on screen. */
  hiddenRows: number[];
  onShowRow: (row: number) => void;
  /** Announce at once (a save the person asked for), rather than quietly (autosave). */
  announce: boolean;
  ref?: Ref<HTMLDivElement>;
}

const titleOf = (section: SectionId | null) => SECTIONS.find((s) => s.id === section)?.title ?? "The document as a whole";

/**
 * The problems of a refused save: how many each section has (with a link to it), every problem
 * that no single field shows, and rows with problems that are scrolled out of the table's window.
 */
export function ErrorSummary({ message, errors, grouped, hiddenRows, onShowRow, announce, ref }: Props) {
  const perSection = new Map<SectionId, number>();
  for (const e of errors) {
    const s = sectionOf(e.pointer);
    if (s && !grouped.unplaced.some((u) => u.error === e)) perSection.set(s, (perSection.get(s) ?? 0) + 1);
  }
  return (
    <div
      ref={ref}
      tabIndex={-1}
      role={announce ? "alert" : undefined}
      aria-labelledby="error-summary-heading"
      className="space-y-3 rounded-lg border-2 border-error/60 bg-panel p-4 text-sm"
    >
      <h2 id="error-summary-heading" className="font-serif text-lg font-semibold text-error">
        The draft was not saved: {errors.length === 1 ? "1 problem" : `${errors.length} problems`} to correct
      </h2>
      <p>{message}</p>
      {perSection.size > 0 && (
        <div>
          <p className="font-medium">Shown beside their fields:</p>
          <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
            {SECTIONS.filter((s) => perSection.has(s.id)).map((s) => (
              <li key={s.id}>
                <a href={`#${sectionAnchor(s.id)}`}>
                  {s.title} ({perSection.get(s.id)})
                </a>
              </li>
            ))}
          </ul>
        </div>
      )}
      {grouped.unplaced.length > 0 && (
        <div>
          <p className="font-medium">Not tied to one field:</p>
          <ul className="mt-1 list-disc space-y-1 pl-5">
            {grouped.unplaced.map(({ error, section }, i) => (
              <li key={i}>
                {section ? <a href={`#${sectionAnchor(section)}`}>{titleOf(section)}</a> : titleOf(null)}: {error.message}
              </li>
            ))}
          </ul>
        </div>
      )}
      {hiddenRows.length > 0 && (
        <div>
          <p className="font-medium">Rows with problems outside the rows on screen:</p>
          <ul className="mt-1 flex flex-wrap gap-2">
            {hiddenRows.slice(0, 12).map((row) => (
              <li key={row}>
                <button type="button" className="btn-secondary px-2 py-1" onClick={() => onShowRow(row)}>
                  Show row {row + 1}
                </button>
              </li>
            ))}
            {hiddenRows.length > 12 && <li className="self-center text-muted">and {hiddenRows.length - 12} more</li>}
          </ul>
        </div>
      )}
    </div>
  );
}

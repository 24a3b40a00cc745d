"use client";

import type { Ref } from "react";
import type { ReadinessItem } from "./readiness";

interface Props {
  items: ReadinessItem[];
  /** Bring a data row into the table's window before focusing its input. */
  onShowRow: (row: number) => void;
  ref?: Ref<HTMLDivElement>;
}

/** Focus (and scroll to) the input of a problem; a row outside the table's window is brought in first. */
function goTo(item: ReadinessItem, onShowRow: (row: number) => void) {
  if (!item.targetId) return;
  const focus = () => {
    const el = document.getElementById(item.targetId!);
    if (!el) return false;
    el.scrollIntoView({ block: "center" });
    (el as HTMLElement).focus({ preventScroll: true });
    return true;
  };
  if (focus()) return;
  if (item.row !== null) {
    onShowRow(item.row);
    requestAnimationFrame(() => requestAnimationFrame(() => void focus()));
  }
}

/**
 * "Not ready to submit": what a draft still lacks or has wrong, each a link to its input. A draft
 * is saved whatever this says; only submission needs the list empty.
 */
export function ReadinessPanel({ items, onShowRow, ref }: Props) {
  const shown = items.slice(0, 50);
  return (
    <div
      ref={ref}
      id="readiness"
      tabIndex={-1}
      aria-labelledby="readiness-heading"
      className="scroll-mt-28 space-y-2 rounded-lg border border-warn/60 bg-panel p-4 text-sm"
    >
      <h2 id="readiness-heading" className="font-serif text-lg font-semibold">
        Not ready to submit: {items.length === 1 ? "1 thing" : `${items.length} things`} to complete or correct
      </h2>
      <p className="text-muted">The draft is saved as it is; only submission needs every item below resolved.</p>
      <ol className="list-decimal space-y-1 pl-5">
        {shown.map((item, i) => (
          <li key={`${item.pointer}-${i}`}>
            {item.targetId ? (
              <a
                href={`#${item.targetId}`}
                onClick={(e) => {
                  e.preventDefault();
                  goTo(item, onShowRow);
                }}
              >
                {item.where}
              </a>
            ) : (
              <span className="font-medium">{item.where}</span>
            )}
            : {item.message}
          </li>
        ))}
      </ol>
      {items.length > shown.length && <p className="text-muted">and {items.length - shown.length} more, listed beside their fields.</p>}
    </div>
  );
}

"use client";

import type { ReactNode } from "react";
import { useEditorContext } from "./editor-context";
import { GroupMessages, SubGroup } from "./fields";
import { removeAt, replaceAt } from "./section-props";

interface Props<T> {
  legend: string;
  /** JSON pointer of the list: its own problems are shown above it, and removing an item clears them. */
  pointer: string;
  rows: T[];
  /** Changes the list inside the form (the section knows where it lives). */
  updateRows: (change: (rows: T[]) => T[]) => void;
  blank: () => T;
  /** "person": the removal button says "Remove person 2" to screen readers. */
  noun: string;
  addLabel: string;
  /** Said above the list (`intro`) or in place of an empty one (`empty`). */
  intro?: ReactNode;
  empty?: ReactNode;
  /** Items that must stay: the last `minRows` cannot be removed. */
  minRows?: number;
  /** Tailwind grid columns of a row on wide screens, with a last `auto` column for the removal button. */
  columns: string;
  /** The inputs of one item; `set` merges a change into it. */
  renderRow: (row: T, index: number, set: (patch: Partial<T>) => void) => ReactNode;
  /** Shown under an item across the whole row (e.g. a species' drawing). */
  renderBelow?: (row: T, index: number) => ReactNode;
}

/**
 * One editable list of the deposit (people, grants, linked records, reactants, products): a
 * numbered item per row with its inputs, a removal button per item and an add button, all in one
 * column on narrow screens.
 */
export function ListEditor<T>({
  legend,
  pointer,
  rows,
  updateRows,
  blank,
  noun,
  addLabel,
  intro,
  empty,
  minRows = 0,
  columns,
  renderRow,
  renderBelow,
}: Props<T>) {
  const { readOnly, clearErrors } = useEditorContext();
  const set = (i: number) => (patch: Partial<T>) => updateRows((list) => replaceAt(list, i, (item) => ({ ...item, ...patch })));
  return (
    <SubGroup legend={legend}>
      {intro}
      <GroupMessages pointer={pointer} />
      {rows.length === 0 && empty}
      <ol className="space-y-3">
        {rows.map((row, i) => (
          <li key={i} className={`grid min-w-0 items-start gap-3 ${columns}`}>
            {renderRow(row, i, set(i))}
            {!readOnly && rows.length > minRows && (
              <button
                type="button"
                className="btn-secondary justify-self-start md:mt-6"
                onClick={() => {
                  clearErrors(pointer);
                  updateRows((list) => removeAt(list, i));
                }}
              >
                Remove
                <span className="sr-only">
                  {" "}
                  {noun} {i + 1}
                </span>
              </button>
            )}
            {renderBelow && <div className="md:col-span-full">{renderBelow(row, i)}</div>}
          </li>
        ))}
      </ol>
      {!readOnly && (
        <button type="button" className="btn-secondary" onClick={() => updateRows((list) => [...list, blank()])}>
          {addLabel}
        </button>
      )}
    </SubGroup>
  );
}

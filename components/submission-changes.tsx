import type { SubmissionDiff } from "@/lib/curation/submission-diff";
import { whereInSection } from "./deposit-editor/editor-messages";
import { describeWhere } from "./deposit-editor/readiness";
import { ScrollRegion } from "./scroll-region";

/** A readable diff path ("creators › 2 › name", positions from 1) in the editor's words ("People, grants and links, person 2, name"). */
export function fieldLabel(path: string): string {
  if (path === "") return describeWhere("");
  const pointer = path
    .split(" › ")
    .map((s) => (/^\d+$/.test(s) ? String(Number(s) - 1) : s.replace(/~/g, "~0").replace(/\//g, "~1")))
    .join("/");
  return describeWhere(`/${pointer}`);
}

/** A point's column in a diff ("uncertainty › kind") in the table's words ("uncertainty stated as"). */
export function pointColumnLabel(column: string): string {
  const pointer = column
    .split(" › ")
    .map((s) => (/^\d+$/.test(s) ? String(Number(s) - 1) : s.replace(/~/g, "~0").replace(/\//g, "~1")))
    .join("/");
  return whereInSection(`/points/0/${pointer}`).replace(/^row 1, /, "");
}

/** At most this many field and point rows are listed; the count of the rest is said. */
const LIMIT = 300;

const KIND_WORDS = { added: "added", removed: "removed", changed: "changed" } as const;
const KIND_CLASS = { added: "text-ok", removed: "text-error", changed: "text-warn" } as const;

/** A before → after pair, each side marked for screen readers and by position and strike-through. */
function OldNew({ before, after }: { before?: string; after?: string }) {
  return (
    <>
      {before !== undefined && (
        <del className="break-words">
          <span className="sr-only">was </span>
          {before}
        </del>
      )}
      {before !== undefined && after !== undefined && <span aria-hidden="true"> → </span>}
      {after !== undefined && (
        <ins className="break-words no-underline">
          <span className="sr-only">{before !== undefined ? ", now " : "now "}</span>
          {after}
        </ins>
      )}
    </>
  );
}

/** Field-by-field and point-by-point changes between two deposit documents. */
export function SubmissionChanges({ diff, label }: { diff: SubmissionDiff; label: string }) {
  const fields = diff.fields.slice(0, LIMIT);
  const points = diff.points.slice(0, LIMIT);
  if (diff.fields.length === 0 && diff.points.length === 0) return <p className="text-sm text-muted">No changes.</p>;
  return (
    <div className="space-y-4">
      {diff.fields.length > 0 && (
        <div className="space-y-1">
          <h4 className="text-sm font-semibold">
            Fields: {diff.fields.length} change{diff.fields.length === 1 ? "" : "s"}
          </h4>
          <ScrollRegion label={`${label}: fields`}>
            <table className="table text-sm">
              <thead>
                <tr>
                  <th scope="col">Field</th>
                  <th scope="col">Change</th>
                  <th scope="col">Before → after</th>
                </tr>
              </thead>
              <tbody>
                {fields.map((c, i) => (
                  <tr key={i}>
                    <th scope="row" className="font-normal">
                      {fieldLabel(c.path)}
                    </th>
                    <td className={KIND_CLASS[c.kind]}>{KIND_WORDS[c.kind]}</td>
                    <td className="max-w-md">
                      <OldNew before={c.before} after={c.after} />
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
          {diff.fields.length > LIMIT && <p className="text-xs text-muted">and {diff.fields.length - LIMIT} more fields.</p>}
        </div>
      )}
      <div className="space-y-1">
        <h4 className="text-sm font-semibold">
          Points: {diff.pointsBefore} before, {diff.pointsAfter} now
          {diff.points.length > 0
            ? `; ${diff.points.filter((p) => p.kind === "added").length} added, ${diff.points.filter((p) => p.kind === "removed").length} removed, ${diff.points.filter((p) => p.kind === "changed").length} changed`
            : "; none changed"}
        </h4>
        {points.length > 0 && (
          <ScrollRegion label={`${label}: points`}>
            <table className="table text-sm">
              <thead>
                <tr>
                  <th scope="col">Row before</th>
                  <th scope="col">Row now</th>
                  <th scope="col">Change</th>
                  <th scope="col">Values</th>
                </tr>
              </thead>
              <tbody>
                {points.map((p, i) => (
                  <tr key={i}>
                    <td>{p.rowBefore ?? "—"}</td>
                    <td>{p.rowAfter ?? "—"}</td>
                    <td className={KIND_CLASS[p.kind]}>{KIND_WORDS[p.kind]}</td>
                    <td>
                      <ul className="space-y-0.5">
                        {p.values.map((v) => (
                          <li key={v.column}>
                            <span className="font-medium">{pointColumnLabel(v.column)}</span>: <OldNew before={v.before} after={v.after} />
                          </li>
                        ))}
                      </ul>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        )}
        {diff.points.length > LIMIT && <p className="text-xs text-muted">and {diff.points.length - LIMIT} more rows.</p>}
      </div>
    </div>
  );
}

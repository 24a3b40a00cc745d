import { findingsOnly, passedCheckWords } from "@/lib/curation/check-summary";
import { severityWords, type StoredCheck } from "./words";

const tone: Record<string, string> = {
  error: "border-error/50 text-error",
  warn: "border-warn/50 text-warn",
  info: "border-line text-ink",
};

/**
 * Stored findings, each labelled with its severity in words (colour is a second signal only). A
 * check that passed is no finding: it is said plainly above them ("Balanced: elements and charge").
 */
export function CheckList({ checks }: { checks: StoredCheck[] }) {
  const findings = findingsOnly(checks);
  const passed = passedCheckWords(checks);
  return (
    <>
      {passed.map((words) => (
        <p key={words} className="text-sm text-ok" data-testid="passed-check">
          {words}.
        </p>
      ))}
      {findings.length > 0 && (
        <ul className="space-y-2">
          {findings.map((c, i) => (
            <li key={`${c.code}-${i}`} className={`rounded-md border bg-panel px-3 py-2 text-sm ${tone[c.severity] ?? tone.info}`}>
              <span className="mr-2 rounded-sm bg-paper px-1.5 py-0.5 text-xs font-semibold">{severityWords(c.severity)}</span> {c.message}
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

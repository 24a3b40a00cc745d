import { severityNoun } from "@/lib/curation/check-summary";
import { stateWords } from "./deposit-editor/words";

const tone: Record<string, string> = {
  published: "border-ok/50 text-ok",
  declined: "border-error/40 text-error",
  retracted: "border-error/40 text-error",
  returned: "border-warn/50 text-warn",
};

/** A version's lifecycle state in plain words (text, not colour alone, carries the meaning). */
export function StateLabel({ state }: { state: string }) {
  return (
    <span className={`inline-block rounded-sm border bg-panel px-1.5 py-0.5 text-xs font-medium ${tone[state] ?? "border-line text-ink"}`}>
      {stateWords(state)}
    </span>
  );
}

/** A finding's severity as a plain word (problem, warning, note); colour only repeats it. */
export function SeverityLabel({ severity }: { severity: string | null }) {
  if (!severity || severity === "none") return <span className="text-xs text-muted">no findings</span>;
  const style =
    severity === "error" ? "border-error/50 text-error" : severity === "warn" ? "border-warn/50 text-warn" : "border-line text-ink";
  return (
    <span className={`inline-block rounded-sm border bg-panel px-1.5 py-0.5 text-xs font-medium ${style}`}>{severityNoun(severity)}</span>
  );
}

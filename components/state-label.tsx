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

/** Worst check severity as a word. */
export function SeverityLabel({ severity }: { severity: string | null }) {
  if (!severity || severity === "none") return <span className="text-xs text-muted">no findings</span>;
  const style = severity === "error" ? "text-error" : severity === "warn" ? "text-warn" : "text-muted";
  return <span className={`text-xs font-semibold uppercase ${style}`}>{severity === "warn" ? "warning" : severity}</span>;
}

import { severityWords, type StoredCheck } from "./words";

const tone: Record<string, string> = {
  error: "border-error/50 text-error",
  warn: "border-warn/50 text-warn",
  info: "border-line text-ink",
};

/** Stored findings, each labelled with its severity in words (colour is a second signal only). */
export function CheckList({ checks }: { checks: StoredCheck[] }) {
  return (
    <ul className="space-y-2">
      {checks.map((c, i) => (
        <li key={`${c.code}-${i}`} className={`rounded-md border bg-panel px-3 py-2 text-sm ${tone[c.severity] ?? tone.info}`}>
          <span className="mr-2 rounded-sm bg-paper px-1.5 py-0.5 text-xs font-semibold">{severityWords(c.severity)}</span>
          {c.message}
        </li>
      ))}
    </ul>
  );
}

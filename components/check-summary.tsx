import Link from "next/link";
import { severityNoun, type CheckSummary } from "@/lib/curation/check-summary";

const tone: Record<string, string> = { error: "text-error", warn: "text-warn", info: "text-ink", none: "text-muted" };

/**
 * A version's findings in a list cell: the counts in words ("2 warnings, 1 note") linking to the
 * full list, and the first finding of the most severe kind, whole in its tooltip. Words carry the
 * meaning; colour only repeats it.
 */
export function CheckSummaryCell({ summary, href }: { summary: CheckSummary | undefined; href: string }) {
  if (!summary) return <span className="text-xs text-muted">not checked yet</span>;
  if (summary.worst === "none") return <span className="text-xs text-muted">no findings</span>;
  const first = summary.first;
  return (
    <div className="max-w-[18rem] space-y-0.5 text-xs">
      <Link href={href} className={`font-medium ${tone[summary.worst]}`}>
        {summary.words}
      </Link>
      {first && (
        <p className="line-clamp-2 text-muted" title={first.message}>
          <span className="font-medium text-ink">First {severityNoun(first.severity)}:</span> {first.message}
        </p>
      )}
    </div>
  );
}

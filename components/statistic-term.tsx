import { STATISTIC_WORDS, type StatisticId } from "@/lib/statistic-words";

/** A statistic's plain words, then its technical name, small, with what it means on hover. */
export function StatisticTerm({ id, plain }: { id: StatisticId; plain?: string }) {
  const w = STATISTIC_WORDS[id];
  return (
    <>
      {plain ?? w.plain}{" "}
      <span className="text-xs font-normal text-muted" title={w.explain}>
        ({w.term})
      </span>
    </>
  );
}

/** "What these numbers mean": the statistics a page shows, each in one sentence. */
export function StatisticGlossary({ ids, className = "" }: { ids: StatisticId[]; className?: string }) {
  return (
    <details className={`text-sm ${className}`}>
      <summary className="cursor-pointer text-muted">What these numbers mean</summary>
      <dl className="mt-2 space-y-1">
        {ids.map((id) => (
          <div key={id}>
            <dt className="inline font-medium">
              {STATISTIC_WORDS[id].plain} ({STATISTIC_WORDS[id].term}):{" "}
            </dt>
            <dd className="inline">{STATISTIC_WORDS[id].explain}</dd>
          </div>
        ))}
      </dl>
    </details>
  );
}

import Link from "next/link";
import { versionPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";
import { formatRange, formatSignificant } from "@/lib/format";
import { GAS_CONSTANT, REFERENCE_TEMPERATURE } from "@/lib/kinetics/constants";
import type { DatasetHit, ReactionHit } from "@/lib/search/types";
import { unitLabel } from "@/lib/unit-labels";
import { FLAG_LABELS } from "./search-words";
import { useState, type ReactNode } from "react";
import { AddToCollectionForm } from "@/app/collections/collection-forms";
import { StatisticGlossary, StatisticTerm } from "@/components/statistic-term";

const sig = (v: number | null | undefined, digits = 3) => formatSignificant(v, digits);

/** A signed-in reader's draft collections, which chosen results can be added to. */
export interface Collecting {
  drafts: { id: number; title: string }[];
}

/** One row per dataset: what a modeller checks before opening it. Signed in, rows can be chosen for a collection. */
export function DatasetRows({ hits, collecting = null }: { hits: DatasetHit[]; collecting?: Collecting | null }) {
  // Chosen versions stay chosen from one page of results to the next.
  const [chosen, setChosen] = useState<number[]>([]);
  const toggle = (id: number, on: boolean) => setChosen((c) => (on ? [...c.filter((x) => x !== id), id] : c.filter((x) => x !== id)));
  return (
    <>
      <ul className="card divide-y divide-line p-0" aria-label="Datasets found">
        {hits.map((h) => (
          <li key={h.versionId} className="space-y-2 px-4 py-3 sm:px-6">
            <div className="space-y-0.5">
              <p className="flex flex-wrap items-baseline gap-x-3 gap-y-1 font-medium">
                {collecting && !h.retracted && (
                  <input
                    type="checkbox"
                    className="h-4 w-4 self-center"
                    checked={chosen.includes(h.versionId)}
                    onChange={(e) => toggle(h.versionId, e.target.checked)}
                    aria-label={`Choose version ${h.versionNumber} of “${h.title}” for a collection`}
                  />
                )}
                <span className="min-w-0 break-words">{h.equation}</span>
                {h.retracted && (
                  <span className="rounded-sm border border-error/40 bg-panel px-1.5 py-0.5 text-xs font-medium text-error">Retracted</span>
                )}
              </p>
              <Link href={versionPath(h.datasetId, h.versionNumber)} className="block break-words text-sm">
                {h.title}
              </Link>
            </div>
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm sm:grid-cols-[auto_1fr_auto_1fr] lg:flex lg:flex-wrap lg:gap-x-2">
              <Pair term="Temperatures" value={formatRange(h.tMin, h.tMax, "K")} />
              <Pair term="Points" value={String(h.pointCount)} />
              <Pair
                term={<StatisticTerm id="refit" plain="Ea, straight-line Arrhenius fit" />}
                value={h.ea === null ? "not fitted" : `${sig(h.ea / 1000)} kJ mol⁻¹`}
              />
              <Pair
                term={<StatisticTerm id="refit" plain="A, straight-line Arrhenius fit" />}
                value={h.a === null ? "not fitted" : `${sig(h.a)} ${unitLabel("rateConstant", h.aUnit)}`.trim()}
              />
              <Pair term="Checks raised" value={h.flags.length === 0 ? "none" : h.flags.map((f) => FLAG_LABELS[f] ?? f).join("; ")} />
              <Pair
                term="Version"
                value={h.versionIdentifier ? `v${h.versionNumber}, doi:${h.versionIdentifier}` : `v${h.versionNumber}`}
                mono
              />
            </dl>
            {/* Spaced items, no separator characters: a wrapped line never ends or starts with one. */}
            <p className="flex flex-wrap gap-x-4 text-xs text-muted">
              {h.creators.length > 0 && (
                <span>
                  {h.creators.slice(0, 3).join("; ")}
                  {h.creators.length > 3 ? ` and ${h.creators.length - 3} more` : ""}
                </span>
              )}
              <span>published {h.publishedAt.slice(0, 10)}</span>
              <Link href={reactionPath(h.reactionKey)}>every dataset of this reaction</Link>
            </p>
          </li>
        ))}
      </ul>
      {collecting && (
        <section aria-label="Chosen for a collection" className="card space-y-2 text-sm">
          {chosen.length === 0 ? (
            <p className="text-muted">Tick results to add them to a collection of your own.</p>
          ) : (
            <>
              <p>
                {chosen.length} {chosen.length === 1 ? "version" : "versions"} chosen{" "}
                <button type="button" className="underline" onClick={() => setChosen([])}>
                  clear
                </button>
              </p>
              <AddToCollectionForm
                versionIds={chosen}
                drafts={collecting.drafts}
                what={chosen.length === 1 ? "the chosen version" : `the ${chosen.length} chosen versions`}
              />
            </>
          )}
        </section>
      )}
      <StatisticGlossary ids={["refit"]} className="px-1" />
    </>
  );
}

/** One row per reaction: how many datasets, what they agree on, how far apart they are. */
export function ReactionRows({ hits }: { hits: ReactionHit[] }) {
  return (
    <>
      <ul className="card divide-y divide-line p-0" aria-label="Reactions found">
        {hits.map((h) => (
          <li key={h.reactionId} className="space-y-2 px-4 py-3 sm:px-6">
            <Link href={reactionPath(h.reactionKey)} className="block break-words font-medium">
              {h.equation}
            </Link>
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-sm sm:grid-cols-[auto_1fr_auto_1fr] lg:flex lg:flex-wrap lg:gap-x-2">
              <Pair
                term="Datasets"
                value={`${h.datasetCount}${h.retractedCount ? ` (and ${h.retractedCount} retracted, not counted)` : ""}`}
              />
              <Pair
                term="Temperatures"
                value={h.tMin === null || h.tMax === null ? "none counted (every match is retracted)" : formatRange(h.tMin, h.tMax, "K")}
              />
              <Pair
                term={<StatisticTerm id="spread" />}
                value={
                  h.spread === null
                    ? "needs two datasets"
                    : `within a factor of ${sig(h.spread, 3)} of each other in the middle of their range`
                }
              />
            </dl>
            <p className="text-sm">
              <span className="text-muted">
                <StatisticTerm id="consensus" />:{" "}
              </span>
              {h.consensus ? <ConsensusExpression c={h.consensus} /> : "none (fewer than two counted datasets)"}
            </p>
          </li>
        ))}
      </ul>
      <StatisticGlossary ids={["spread", "consensus"]} className="px-1" />
    </>
  );
}

function ConsensusExpression({ c }: { c: NonNullable<ReactionHit["consensus"]> }) {
  const modified = c.model === "modified_arrhenius";
  return (
    <span className="break-words">
      k = {sig(c.a)}{" "}
      {modified && (
        <>
          (T/{formatSignificant(REFERENCE_TEMPERATURE, 5)} K)<sup>{sig(c.n)}</sup>{" "}
        </>
      )}
      exp({c.ea >= 0 ? "−" : "+"}
      {sig(Math.abs(c.ea) / GAS_CONSTANT, 4)} K / T) {unitLabel("rateConstant", c.aUnit)}, for {formatRange(c.tMin, c.tMax, "K")}
    </span>
  );
}

function Pair({ term, value, mono = false }: { term: ReactNode; value: string; mono?: boolean }) {
  return (
    <div className="contents lg:flex lg:gap-1 lg:after:pl-1 lg:after:text-line lg:after:content-['·'] lg:last:after:content-none">
      <dt className="text-muted">{term}</dt>
      <dd className={`min-w-0 break-words ${mono ? "font-mono text-xs leading-5" : ""}`}>{value}</dd>
    </div>
  );
}

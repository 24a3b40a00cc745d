import type { Metadata } from "next";
import Link from "next/link";
import { ScrollRegion } from "@/components/scroll-region";
import { ForgetChoiceButton } from "./forget-choice";
import { notFound } from "next/navigation";
import { ConsensusPlot, type SeriesPoints } from "@/components/consensus-plot";
import { getCurrentUser } from "@/lib/auth/session";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { parseIdOrNull } from "@/lib/ids";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";
import { getCanonicalRateConstantUnit, SUPPORTED_UNITS } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { readableMechanismCheckOrThrow } from "@/lib/mechanisms/access";
import type { MechanismReport, ReportReaction } from "@/lib/mechanisms/run-check";
import { VERDICT_WORDS } from "@/lib/mechanisms/verdicts";
import { DEFAULT_CONSENSUS_CHOICE, plotPoints } from "@/lib/reactions/consensus-selection";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { findPublicReaction } from "@/lib/reactions/public-queries";
import { describeProgress } from "@/lib/mechanisms/progress";
import { CheckProgress } from "./check-progress";
import { RerunButton } from "./rerun-button";
import { ReportTable, type ReportRow } from "./report-table";
import { SpeciesChooser } from "./species-chooser";
import { MappingUpload } from "./mapping-upload";
import { ShareToggle } from "./share-toggle";

export const metadata: Metadata = { title: "Mechanism check", robots: { index: false } };

type Params = { id: string };
type Search = { share?: string; reaction?: string };

async function readCheck(idText: string, share: string | undefined) {
  const id = parseIdOrNull(idText);
  if (id === null) notFound();
  const user = await getCurrentUser();
  try {
    return { user, check: await readableMechanismCheckOrThrow({ id, user, share: share ?? null }) };
  } catch (err) {
    if (err instanceof AppError && err.status === 404) notFound();
    throw err;
  }
}

export default async function MechanismCheckPage({ params, searchParams }: { params: Promise<Params>; searchParams?: Promise<Search> }) {
  const [{ id }, search] = await Promise.all([params, searchParams ?? Promise.resolve({} as Search)]);
  const { user, check } = await readCheck(id, search.share);
  const report = check.report as unknown as MechanismReport | null;
  const shareQuery = search.share ? `share=${encodeURIComponent(search.share)}` : "";
  const here = (extra: string) => `/mechanisms/${check.id}?${[shareQuery, extra].filter(Boolean).join("&")}`;
  const api = (format: string) => `/api/v1/mechanism-checks/${check.id}?format=${format}${shareQuery ? `&${shareQuery}` : ""}`;
  const rows: ReportRow[] =
    report?.reactions.map((r) => ({
      index: r.index,
      line: r.line,
      equation: r.equation,
      verdict: r.verdict,
      verdictWords: VERDICT_WORDS[r.verdict],
      extrapolated: r.extrapolated.map((g) => `${Math.round(g.Tmin)}–${Math.round(g.Tmax)}`).join(", "),
      worstRatio: r.comparison?.worst.ratio ?? null,
      worstF: r.comparison?.worst.f ?? null,
      worstT: r.comparison?.worst.T ?? null,
      datasets: r.datasets,
      note: r.note,
      reactionPath: r.reaction?.path ?? r.reverse?.path ?? null,
      plotHref: r.reaction && r.rate ? here(`reaction=${r.index}#plot`) : null,
    })) ?? [];
  const isOwner = user?.id === check.ownerId;
  const running = check.state === "queued" || check.state === "running";
  const unsettled = (report?.species ?? []).filter(
    (s): s is typeof s & { by: "ambiguous" | "none" } => s.by === "ambiguous" || s.by === "none",
  );
  const chosen = report?.reactions.find((r) => String(r.index) === search.reaction && r.reaction && r.rate);
  return (
    <div className="mx-auto max-w-6xl space-y-6 p-4">
      <h1 className="text-2xl font-semibold">Mechanism check: {check.name}</h1>
      <p className="text-sm text-muted">
        Use window {check.windowTmin}–{check.windowTmax} K · {check.state}
        {report ? ` · ${report.about.format === "cantera-yaml" ? "Cantera YAML" : "plain-text layout"}` : ""}
      </p>
      <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>
      {isOwner && <ShareToggle id={check.id} initialUrl={check.shareToken ? `/mechanisms/${check.id}?share=${check.shareToken}` : null} />}
      {check.state === "failed" && (
        <div role="alert" className="card space-y-2">
          <p>The check failed: {check.error}</p>
          {isOwner && <RerunButton id={check.id} />}
        </div>
      )}
      {running && (
        <CheckProgress
          id={check.id}
          share={search.share ?? null}
          initial={{ state: check.state as "queued", progress: check.progress, total: check.total, progressText: describeProgress(check) }}
        />
      )}
      {report && !running && (
        <>
          <section aria-labelledby="summary-heading" className="card">
            <h2 id="summary-heading" className="text-lg font-semibold">
              Summary
            </h2>
            <dl className="grid grid-cols-2 gap-2 text-sm sm:grid-cols-4" data-testid="summary">
              {(
                [
                  ["Reactions", report.summary.reactions],
                  ["Agrees", report.summary.agrees],
                  ["Disagrees", report.summary.disagrees],
                  ["Extrapolated (in part or whole)", report.summary.extrapolatedAny],
                  ["No data", report.summary.no_data],
                  ["Not checked yet", report.summary.not_checked],
                  ["Species not matched", report.summary.speciesUnmatched],
                  ["Lines with problems", report.summary.problems],
                ] as const
              ).map(([label, value]) => (
                <div key={label}>
                  <dt className="text-muted">{label}</dt>
                  <dd className="text-lg font-semibold">{value}</dd>
                </div>
              ))}
            </dl>
            <p className="mt-2 text-sm">
              Download the report: <a href={api("csv")}>CSV</a> · <a href={api("json")}>JSON</a>
            </p>
            {user?.id === check.ownerId && report.reactions.some((r) => r.reaction) && (
              <p className="mt-2 text-sm">
                <Link href={`/collections/new?check=${check.id}`}>
                  Use these: make a collection of the data behind the matched reactions
                </Link>
                <span className="text-muted"> (you review the list first)</span>
              </p>
            )}
          </section>
          {chosen && <ReactionPlot reaction={chosen} window={{ Tmin: check.windowTmin, Tmax: check.windowTmax }} />}
          <section aria-labelledby="reactions-heading" className="space-y-2">
            <h2 id="reactions-heading" className="text-lg font-semibold">
              Reactions
            </h2>
            <ReportTable rows={rows} />
          </section>
          <section aria-labelledby="species-heading" className="space-y-2">
            <h2 id="species-heading" className="text-lg font-semibold">
              Species
            </h2>
            <p className="text-sm">
              Names with several candidates or none are not compared: choose them below, or download the mapping, fill in the InChIKey of
              each species you mean, and upload it. Your choices are remembered for your next checks.{" "}
              <a href={api("mapping")}>Download the species mapping (CSV)</a>
            </p>
            {isOwner && unsettled.length > 0 && <SpeciesChooser checkId={check.id} rows={unsettled} />}
            {isOwner && <MappingUpload />}
            <ScrollRegion label="Species of the mechanism and their matches">
              <table className="text-sm">
                <thead>
                  <tr>
                    <th className="px-2 text-left">Name in the mechanism</th>
                    <th className="px-2 text-left">Matched by</th>
                    <th className="px-2 text-left">Species</th>
                  </tr>
                </thead>
                <tbody>
                  {report.species.map((s) => (
                    <tr key={s.name} className="border-t">
                      <td className="px-2">{s.name}</td>
                      <td className="px-2">
                        {SPECIES_MATCH_WORDS[s.by]}
                        {isOwner && s.by === "choice" && (
                          <>
                            {" "}
                            <ForgetChoiceButton checkId={check.id} name={s.name} />
                          </>
                        )}
                      </td>
                      <td className="px-2">
                        {s.inchiKey ? (
                          <Link className="underline" href={`/species/${s.inchiKey}`}>
                            {s.candidates[0]?.name ?? s.inchiKey}
                          </Link>
                        ) : (
                          s.candidates.map((c) => `${c.name} (${c.formula})`).join(", ")
                        )}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </ScrollRegion>
          </section>
          {report.problems.length > 0 && (
            <section aria-labelledby="problems-heading">
              <h2 id="problems-heading" className="text-lg font-semibold">
                Lines that could not be read ({report.summary.problems})
              </h2>
              <ul className="list-disc pl-5 text-sm">
                {report.problems.map((p, i) => (
                  <li key={i}>{p.message}</li>
                ))}
              </ul>
            </section>
          )}
        </>
      )}
    </div>
  );
}

const SPECIES_MATCH_WORDS = {
  choice: "your choice",
  name: "name",
  composition: "composition",
  ambiguous: "several candidates",
  none: "nothing found",
} as const;

/** One reaction: the published datasets and the consensus band of its reaction page, with the mechanism's k(T) over the window. */
async function ReactionPlot({ reaction, window }: { reaction: ReportReaction; window: { Tmin: number; Tmax: number } }) {
  const found = await findPublicReaction({ key: reaction.reaction!.key });
  if (!found) return null;
  const { versions, selection, result } = await loadReactionConsensus({ reactionId: found.id, choice: DEFAULT_CONSENSUS_CHOICE });
  const order = (result?.order ?? Math.min(3, Math.max(1, Math.round(reaction.order)))) as ReactionOrder;
  const kLabel = SUPPORTED_UNITS.rateConstant[order].find((u) => u.id === getCanonicalRateConstantUnit(order))?.label ?? "";
  const preferred = result ? ((result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : null) ?? result.arrhenius) : null;
  const rate = reaction.rate!;
  const mechanismLine = Array.from({ length: 40 }, (_, i) => {
    const T = 1 / (1 / window.Tmax + ((1 / window.Tmin - 1 / window.Tmax) * i) / 39);
    return { T, lnk: Math.log(rate.A) + rate.b * Math.log(T) - rate.Ea / (GAS_CONSTANT * T) };
  });
  const series: SeriesPoints[] = [
    { label: `Mechanism, line ${reaction.line}`, points: mechanismLine, note: "the mechanism's k(T) over the use window" },
    ...versions
      .filter((v) => v.state === "published")
      .map((v) => ({
        label: `${v.title}, version ${v.number}`,
        ...plotPoints(
          v,
          selection.inputs.find((d) => d.id === String(v.versionId)),
          result?.members.find((m) => m.id === String(v.versionId)),
        ),
      })),
  ];
  return (
    <section id="plot" aria-labelledby="plot-heading" className="card space-y-2">
      <h2 id="plot-heading" className="text-lg font-semibold">
        {reaction.equation} (line {reaction.line}): {VERDICT_WORDS[reaction.verdict]}
      </h2>
      <p className="text-sm">{reaction.note}</p>
      <ConsensusPlot series={series} band={preferred ? preferred.band : null} kUnitLabel={kLabel} />
      <p className="text-xs text-muted">{FIT_CAUTION}</p>
    </section>
  );
}

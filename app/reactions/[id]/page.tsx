import { classPath, speciesPath, versionPath } from "@/lib/identifiers/paths";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound, permanentRedirect } from "next/navigation";
import { ConsensusPlot, type SeriesPoint, type SeriesPoints } from "@/components/consensus-plot";
import { StatisticGlossary } from "@/components/statistic-term";
import { ConsensusComparisons, ConsensusSummary, comparisonCell } from "@/components/consensus-report";
import { StateLabel } from "@/components/state-label";
import { REACTION_PAGE_DRAWING, speciesDrawing } from "@/lib/species/drawings";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { getCurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { versionCapabilities } from "@/lib/curation/capabilities";
import type { VersionState } from "@/lib/curation/lifecycle";
import { GAS_CONSTANT, getCanonicalRateConstantUnit, type ReactionOrder } from "@/lib/kinetics";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { consensusChoiceQuery, consensusLabel, parseConsensusChoice, plotPoints } from "@/lib/reactions/consensus-selection";
import { MechanismDownload } from "@/components/exports/mechanism-download";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { listDatasetRolesOf } from "@/lib/reactions/queries";
import { cachedConsensusReaders, getPublicReactionCached, getReactionCached } from "@/lib/reactions/cached";
import { decodePathSegment, reactionPath, reactionSegment, readReactionPathSegment } from "@/lib/reactions/paths";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { formatRange, formatSignificant } from "@/lib/format";
import { ConsensusChoiceForm, WhatWentIn, type ExclusionRow } from "./consensus-selection";
import { ScrollRegion } from "@/components/scroll-region";
import { energyQuantityLabel } from "@/lib/unit-labels";
import { ChemicalFormula } from "@/components/chemical-formula";
import { readWatchState } from "@/app/watches/watch-control";
import { WatchToggle } from "@/app/watches/watch-forms";
import { AddToCollectionForm } from "@/app/collections/collection-forms";
import { readDraftCollections } from "@/app/collections/collection-page";

/** Where a `/reactions/<id or key>` path leads: the public reaction, or null. */
async function reactionOf(segment: string) {
  const named = readReactionPathSegment(segment);
  return named ? getPublicReactionCached(named) : null;
}

/** The reaction's equation in the browser tab, its canonical address by key, and a link preview. */
export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const reaction = await reactionOf((await params).id);
  if (!reaction) return NOT_FOUND_METADATA;
  return publicPageMetadata({
    title: reaction.equation,
    description: `Every published dataset of ${reaction.equation} on one Arrhenius plot, with the consensus of the datasets and how each compares with it.`,
    path: reactionPath(reaction.key),
    feedPath: `${reactionPath(reaction.key)}/feed.xml`,
  });
}
export const dynamic = "force-dynamic";

const sig = (v: number | null | undefined, digits = 3) => formatSignificant(v, digits);

/** Datasets per part of the page's lists (the table, the comparisons, what went in). */
const DATASETS_PER_PART = 50;
/** Most points the plot draws in all; above it each dataset is thinned (thinForPlot). */
const PLOT_POINTS = 3000;

/**
 * The rule for drawing a reaction with very many points: up to PLOT_POINTS every point is drawn;
 * above, each dataset draws at most max(2, floor(PLOT_POINTS / datasets)) of its points — its
 * lowest and highest temperatures and points evenly spaced between — so every dataset stays on
 * the plot and the page stays small. Only the drawing: the consensus uses every point.
 */
function thinForPlot(counts: number[]) {
  const total = counts.reduce((a, b) => a + b, 0);
  if (total <= PLOT_POINTS) return { thinned: false, perDataset: Infinity, total, drawn: total };
  const perDataset = Math.max(2, Math.floor(PLOT_POINTS / Math.max(1, counts.length)));
  return { thinned: true, perDataset, total, drawn: counts.reduce((a, n) => a + Math.min(n, perDataset), 0) };
}

/** At most `most` points of a series (used and unused together), in temperature order, ends kept; ln k to 6 decimals, σ(ln k) to 4. */
function thinned<S extends { points: SeriesPoint[]; unused?: SeriesPoint[] }>(series: S, most: number): S {
  const round = (p: SeriesPoint): SeriesPoint => ({
    ...p,
    lnk: Math.round(p.lnk * 1e6) / 1e6,
    // An error bar's half-length, drawn, not computed with: four decimals of ln k (0.01 %).
    ...(p.sigmaLnK ? { sigmaLnK: Math.round(p.sigmaLnK * 1e4) / 1e4 } : {}),
  });
  const all = [...series.points.map((p) => ({ p, used: true })), ...(series.unused ?? []).map((p) => ({ p, used: false }))];
  if (all.length <= most) return { ...series, points: series.points.map(round), unused: series.unused?.map(round) };
  all.sort((a, b) => a.p.T - b.p.T);
  const keep = new Set(Array.from({ length: most }, (_, i) => Math.round((i * (all.length - 1)) / (most - 1))));
  const kept = all.filter((_, i) => keep.has(i));
  return {
    ...series,
    points: kept.filter((x) => x.used).map((x) => round(x.p)),
    unused: kept.filter((x) => !x.used).map((x) => round(x.p)),
  };
}

/** A series without the fields at their defaults (no flag, no unused points, no note): the page sends every series to the browser. */
function withoutDefaults(s: SeriesPoints): SeriesPoints {
  const { unused, unusedWhy, excluded, off, note, ...rest } = s;
  return {
    ...rest,
    ...(unused?.length ? { unused, unusedWhy } : {}),
    ...(excluded ? { excluded } : {}),
    ...(off ? { off } : {}),
    ...(note ? { note } : {}),
  };
}

/**
 * Every public dataset of one reaction, compared on one plot, with the consensus expression. The
 * address is the reaction key (lib/reactions/paths.ts); the numeric id and the key written with
 * ">>" redirect (308) there, keeping the reader's choice of data.
 */
export default async function ReactionPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams?: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { id: segment } = await params;
  const found = await reactionOf(segment);
  if (!found) notFound();
  // The reader's choice of data lives in the URL; a choice that cannot be read falls back to the default, saying so.
  const query = (await searchParams) ?? {};
  const pagePath = reactionPath(found.key);
  const [watch, collecting] = await Promise.all([readWatchState({ kind: "reaction", id: found.id }), readDraftCollections()]);
  if (decodePathSegment(segment) !== reactionSegment(found.key)) {
    const search = new URLSearchParams(Object.entries(query).flatMap(([k, v]) => [v ?? []].flat().map((x) => [k, x]))).toString();
    permanentRedirect(search ? `${pagePath}?${search}` : pagePath);
  }
  const reaction = await getReactionCached({ id: found.id });
  if (!reaction) notFound();
  const chosen = parseConsensusChoice(query);
  const raw = (name: string) => [query[name]].flat()[0] ?? "";
  const { versions, selection, result, unavailable } = await loadReactionConsensus({
    reactionId: reaction.id,
    choice: chosen.choice,
    read: cachedConsensusReaders,
  });
  const order = (selection.order ??
    (versions[0]?.payload as { reaction?: { order?: ReactionOrder } })?.reaction?.order ??
    2) as ReactionOrder;
  const published = versions.filter((v) => v.state === "published" && new Set(v.points.map((p) => p.T)).size >= 2);
  // A reaction with many datasets lists them DATASETS_PER_PART at a time (?datasets=2 …); the plot and the consensus take them all.
  const parts = Math.max(1, Math.ceil(versions.length / DATASETS_PER_PART));
  const part = Math.min(parts, Math.max(1, Math.trunc(Number(raw("datasets")) || 1)));
  const listed = versions.slice((part - 1) * DATASETS_PER_PART, part * DATASETS_PER_PART);
  const shownVersions = parts > 1 ? new Set(listed.map((v) => v.versionId)) : undefined;
  const shownIds = shownVersions ? new Set([...shownVersions].map(String)) : undefined;
  const partHref = (n: number) => {
    const keep = new URLSearchParams(
      Object.entries(query).flatMap(([k, v]) => (k === "datasets" ? [] : [v ?? []].flat().map((x) => [k, x]))),
    );
    if (n > 1) keep.set("datasets", String(n));
    const search = keep.toString();
    return `${pagePath}${search ? `?${search}` : ""}#list-heading`;
  };
  const plotted = thinForPlot(published.map((v) => v.points.length));
  const used = new Set(selection.used.map((d) => d.versionId));
  const curatorRows = await exclusionRowsFor(versions, selection.curatorExclusions);
  // How the words of the consensus name each dataset.
  const labels = new Map(versions.map((v) => [String(v.versionId), consensusLabel(v)]));
  const member = (versionId: number) => result?.members.find((m) => m.id === String(versionId));
  // A dataset the consensus did not take says why (left out by a curator, evaluated, other order…), never a bare dash.
  const againstOthers = (versionId: number) => {
    const cell = comparisonCell(member(versionId));
    const why = selection.notUsed.find((d) => d.versionId === versionId)?.reasons.map((r) => r.message);
    if (cell !== "—" || !why?.length) return cell;
    return why.join(" ");
  };
  const pictures = await Promise.all(
    reaction.participants.map((p) => (p.smiles ? speciesDrawing(p.smiles, REACTION_PAGE_DRAWING).catch(() => null) : null)),
  );
  const kLabel = SUPPORTED_UNITS.rateConstant[order].find((u) => u.id === getCanonicalRateConstantUnit(order))?.label ?? "";
  const preferred = result ? ((result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : null) ?? result.arrhenius) : null;

  return (
    <div className="space-y-6">
      <header className="space-y-3">
        <p className="text-sm text-muted">Reaction</p>
        <h1 className="text-3xl font-semibold">{reaction.equation}</h1>
        {found.classes.length > 0 && (
          <p className="text-sm">
            Reaction class:{" "}
            {found.classes.map((c, i) => (
              <span key={c}>
                {i > 0 ? ", " : ""}
                <Link href={classPath(c)}>{reactionClassFor(c)?.label ?? c}</Link>
              </span>
            ))}
          </p>
        )}
        <ul className="flex flex-wrap gap-4" aria-label="Species">
          {reaction.participants.map((p, i) => (
            <li key={`${p.side}-${p.speciesId}`} className="card flex items-center gap-3 p-3 text-xs">
              {/* SVG drawn by RDKit on our server. */}
              {pictures[i] && (
                <div
                  role="img"
                  aria-label={`Structure of ${p.name}`}
                  className="h-[70px] w-[98px] [&>svg]:h-full [&>svg]:w-full"
                  dangerouslySetInnerHTML={{ __html: pictures[i]! }}
                />
              )}
              <div>
                <p className="font-medium text-ink">
                  {p.side === "reactant" ? "Reactant" : "Product"}: <Link href={speciesPath(p.inchiKey)}>{p.name}</Link>
                  {p.coefficient !== 1 ? ` ×${p.coefficient}` : ""}
                </p>
                {p.names.some((n) => n.toLowerCase() !== p.name.toLowerCase()) && (
                  <p>Also named here: {p.names.filter((n) => n.toLowerCase() !== p.name.toLowerCase()).join(", ")}</p>
                )}
                <p>
                  <ChemicalFormula formula={p.formula} />, {p.molarMass.toFixed(3)} g mol⁻¹
                </p>
                <p className="font-mono">{p.inchiKey}</p>
              </div>
            </li>
          ))}
        </ul>
        <WatchToggle subject={{ kind: "reaction", id: found.id }} what="this reaction" backPath={pagePath} {...watch} />
        {collecting.signedIn && selection.used.length > 0 && (
          <AddToCollectionForm
            versionIds={selection.used.map((d) => d.versionId)}
            drafts={collecting.drafts}
            what={
              selection.used.length === 1 ? "the version the consensus uses" : `the ${selection.used.length} versions the consensus uses`
            }
          />
        )}
      </header>

      {versions.length === 0 ? (
        <p className="card text-sm">No published datasets of this reaction yet.</p>
      ) : (
        <>
          <ConsensusChoiceForm
            pagePath={pagePath}
            values={{ include: raw("include"), Tmin: raw("Tmin"), Tmax: raw("Tmax") }}
            errors={chosen.ok ? [] : chosen.errors}
          />
          <section className="card space-y-3" aria-labelledby="compare-heading">
            <h2 id="compare-heading" className="text-xl font-semibold">
              All published datasets
            </h2>
            <ConsensusPlot
              tableHref="#list-heading"
              kUnitLabel={kLabel}
              band={preferred ? preferred.band : null}
              series={published.map((v) =>
                withoutDefaults({
                  // Named as the consensus's words and the list name it.
                  label: labels.get(String(v.versionId)) ?? consensusLabel(v),
                  shortLabel: `dataset ${v.datasetId}`,
                  ...thinned(
                    plotPoints(
                      v,
                      selection.inputs.find((d) => d.id === String(v.versionId)),
                      member(v.versionId),
                    ),
                    plotted.perDataset,
                  ),
                  excluded: !used.has(v.versionId) || member(v.versionId)?.included === false,
                  off: member(v.versionId)?.disagreement?.off === true,
                  note: againstOthers(v.versionId) === "—" ? undefined : `Against the others: ${againstOthers(v.versionId)}`,
                }),
              )}
            />
            {published.length < 2 && (
              <p className="text-sm">
                {published.length === 1
                  ? "Only one dataset of this reaction is published, so there is no consensus to draw: the plot shows its points, and its own fit is on its page."
                  : "No published dataset of this reaction has points at two or more temperatures, so nothing can be fitted."}
              </p>
            )}
            {plotted.thinned && (
              <p className="text-xs text-muted">
                {`With ${plotted.total} points in all, the plot draws at most ${plotted.perDataset} of each dataset (its lowest and highest temperatures and points evenly spaced between): ${plotted.drawn} points. Every dataset is drawn; the consensus uses every point; each dataset's page shows all of its own.`}
              </p>
            )}
            <p className="text-xs text-muted">{FIT_CAUTION}</p>
          </section>

          {result && <ConsensusSummary result={result} kUnitLabel={kLabel} labels={labels} caution={FIT_CAUTION} shown={shownIds} />}
          {result && (
            <section className="card space-y-2" aria-labelledby="mechanism-heading">
              <h2 id="mechanism-heading" className="text-lg font-semibold">
                The consensus for a mechanism
              </h2>
              <p className="text-sm">
                A, n and Ea of the consensus over the data chosen above, in the units you choose, with T0, its temperature range, the
                reaction, the datasets it rests on and the caution: as a plain table, or as a YAML block that Cantera reads.
              </p>
              <MechanismDownload
                endpoint={`/api/v1/reactions/${reactionSegment(found.key)}/parameters`}
                order={result.order}
                initialKUnit={getCanonicalRateConstantUnit(result.order)}
                initialEnergyUnit="kJ mol-1"
                fits={result.modifiedArrhenius ? ["arrhenius", "modified_arrhenius"] : ["arrhenius"]}
                extraQuery={chosen.ok ? consensusChoiceQuery(chosen.choice).replace(/^\?/, "") : ""}
              />
            </section>
          )}
          {result && <StatisticGlossary className="card" ids={["consensus", "uncertaintyFactor", "betweenDatasets", "band"]} />}
          {result && <ConsensusComparisons result={result} labels={labels} shown={shownIds} />}

          <WhatWentIn selection={selection} unavailable={unavailable} curatorRows={curatorRows} shown={shownVersions} />

          <section className="card p-0" aria-labelledby="list-heading">
            <h2 id="list-heading" className="px-6 pt-5 text-xl font-semibold">
              Datasets
            </h2>
            <ScrollRegion label="Datasets of this reaction" className="mt-2">
              <table className="table">
                <thead>
                  <tr>
                    <th scope="col">Dataset</th>
                    <th scope="col">State</th>
                    <th scope="col">Identifier</th>
                    <th scope="col">T (K)</th>
                    <th scope="col">Points</th>
                    <th scope="col">{energyQuantityLabel("Ea", "K")}</th>
                    <th scope="col">Against the others</th>
                  </tr>
                </thead>
                <tbody>
                  {listed.map((v) => {
                    return (
                      <tr key={v.versionId}>
                        <td>
                          <Link href={versionPath(v.datasetId, v.number)}>{v.title}</Link> <span className="text-muted">v{v.number}</span>
                        </td>
                        <td>
                          <StateLabel state={v.state} />
                        </td>
                        <td className="font-mono text-xs">{v.versionIdentifier ?? "—"}</td>
                        <td className="whitespace-nowrap">{formatRange(v.tMin, v.tMax, "")}</td>
                        <td>{v.pointCount}</td>
                        <td>{v.ea !== null ? sig(v.ea / GAS_CONSTANT, 4) : "—"}</td>
                        <td className="min-w-56">{againstOthers(v.versionId)}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </ScrollRegion>
            {parts > 1 && (
              <nav aria-label="Parts of the list of datasets" className="flex flex-wrap items-center gap-3 px-6 pb-5 pt-3 text-sm">
                <span>
                  Datasets {(part - 1) * DATASETS_PER_PART + 1}–{(part - 1) * DATASETS_PER_PART + listed.length} of {versions.length} (the
                  comparisons and lists above are of these datasets too):
                </span>
                {part > 1 && <Link href={partHref(part - 1)}>Previous {DATASETS_PER_PART}</Link>}
                {part < parts && <Link href={partHref(part + 1)}>Next {DATASETS_PER_PART}</Link>}
              </nav>
            )}
          </section>
        </>
      )}
      <p className="flex flex-wrap gap-4 text-sm">
        <Link href="/reactions">All reactions</Link>
        <Link href="/classes">Reaction classes</Link>
        {/* A plain link, not Next's: the feed is XML for a feed reader, not a page. */}
        <a href={`${pagePath}/feed.xml`} type="application/atom+xml">
          Atom feed of new and retracted versions
        </a>
      </p>
    </div>
  );
}

/** The published versions the viewer may leave out of the consensus (curators who do not co-edit them), or null. */
async function exclusionRowsFor(
  versions: { versionId: number; datasetId: number; number: number; title: string; state: string }[],
  exclusions: { versionId: number; reason: string }[],
): Promise<ExclusionRow[] | null> {
  const viewer = await getCurrentUser();
  if (!viewer || !can(viewer.role, "dataset.review")) return null;
  const roles = await listDatasetRolesOf({ userId: viewer.id, datasetIds: versions.map((v) => v.datasetId) });
  return versions
    .filter(
      (v) =>
        versionCapabilities({ state: v.state as VersionState, siteRole: viewer.role, datasetRole: roles.get(v.datasetId) ?? null })
          .exclude_from_consensus,
    )
    .map((v) => ({
      versionId: v.versionId,
      number: v.number,
      title: v.title,
      currentReason: exclusions.find((e) => e.versionId === v.versionId)?.reason ?? null,
    }));
}

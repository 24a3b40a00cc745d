import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ConsensusPlot } from "@/components/consensus-plot";
import { ConsensusComparisons, ConsensusSummary, comparisonCell } from "@/components/consensus-report";
import { StateLabel } from "@/components/state-label";
import { renderSpeciesSvg } from "@/lib/chem";
import { drawableFit, FIT_CAUTION } from "@/lib/datasets/version-json";
import { GAS_CONSTANT, consensus, getCanonicalRateConstantUnit, type ConsensusResult, type ReactionOrder } from "@/lib/kinetics";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { getReaction, listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { formatSignificant } from "@/lib/format";
import { parseIdOrNull } from "@/lib/ids";

export const metadata: Metadata = { title: "Reaction" };
export const dynamic = "force-dynamic";

const sig = (v: number | null | undefined, digits = 3) => formatSignificant(v, digits);

/** Every public dataset of one reaction, compared on one plot, with the consensus expression. */
export default async function ReactionPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const reactionId = parseIdOrNull(id);
  const reaction = reactionId !== null ? await getReaction({ id: reactionId }) : null;
  if (!reaction) notFound();
  const versions = await listPublicVersionsOfReaction({ reactionId: reaction.id });
  const order = ((versions[0]?.payload as { reaction?: { order?: ReactionOrder } })?.reaction?.order ?? 2) as ReactionOrder;
  const published = versions.filter((v) => v.state === "published" && new Set(v.points.map((p) => p.T)).size >= 2);
  // How the words of the consensus name each dataset.
  const labels = new Map(
    published.map((v) => [String(v.versionId), `“${v.title.split(":").pop()?.trim() ?? v.title}” (dataset ${v.datasetId})`]),
  );
  let result: ConsensusResult | null = null;
  if (published.length >= 2) {
    result = consensus(
      published.map((v) => ({ id: String(v.versionId), points: v.points, order, label: labels.get(String(v.versionId)) })),
    );
  }
  const member = (versionId: number) => result?.members.find((m) => m.id === String(versionId));
  const pictures = await Promise.all(
    reaction.participants.map((p) => (p.smiles ? renderSpeciesSvg(p.smiles, { width: 140, height: 100 }).catch(() => null) : null)),
  );
  const kLabel = SUPPORTED_UNITS.rateConstant[order].find((u) => u.id === getCanonicalRateConstantUnit(order))?.label ?? "";
  const preferred = result ? ((result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : null) ?? result.arrhenius) : null;

  return (
    <div className="space-y-6">
      <header className="space-y-3">
        <p className="text-sm text-muted">Reaction</p>
        <h1 className="text-3xl font-semibold">{reaction.equation}</h1>
        <ul className="flex flex-wrap gap-4" aria-label="Species">
          {reaction.participants.map((p, i) => (
            <li key={`${p.side}-${p.speciesId}`} className="card flex items-center gap-3 p-3 text-xs">
              {/* SVG drawn by RDKit on our server. */}
              {pictures[i] && (
                <div
                  role="img"
                  aria-label={`Structure of ${p.names[0] ?? p.formula}`}
                  className="h-[70px] w-[98px] [&>svg]:h-full [&>svg]:w-full"
                  dangerouslySetInnerHTML={{ __html: pictures[i]! }}
                />
              )}
              <div>
                <p className="font-medium text-ink">
                  {p.side === "reactant" ? "Reactant" : "Product"}: {p.names[0] ?? p.formula}
                  {p.coefficient !== 1 ? ` ×${p.coefficient}` : ""}
                </p>
                <p>
                  {p.formula}, {p.molarMass.toFixed(3)} g mol⁻¹
                </p>
                <p className="font-mono">{p.inchiKey}</p>
              </div>
            </li>
          ))}
        </ul>
      </header>

      {versions.length === 0 ? (
        <p className="card text-sm">No published datasets of this reaction yet.</p>
      ) : (
        <>
          <section className="card space-y-3" aria-labelledby="compare-heading">
            <h2 id="compare-heading" className="text-xl font-semibold">
              All published datasets
            </h2>
            <ConsensusPlot
              kUnitLabel={kLabel}
              band={preferred ? preferred.band : null}
              series={published.map((v) => ({
                label: `v${v.number} · ${v.title.split(":").pop()?.trim() ?? v.title}`,
                points: v.points.map((p) => ({ T: p.T, lnk: Math.log(p.k) })),
                excluded: member(v.versionId)?.included === false,
                off: member(v.versionId)?.disagreement?.off === true,
              }))}
            />
            <p className="text-xs text-muted">{FIT_CAUTION}</p>
          </section>

          {result && <ConsensusSummary result={result} kUnitLabel={kLabel} labels={labels} caution={FIT_CAUTION} />}
          {result && <ConsensusComparisons result={result} labels={labels} />}

          <section className="card overflow-x-auto p-0" aria-labelledby="list-heading">
            <h2 id="list-heading" className="px-6 pt-5 text-xl font-semibold">
              Datasets
            </h2>
            <table className="table mt-2">
              <thead>
                <tr>
                  <th scope="col">Dataset</th>
                  <th scope="col">State</th>
                  <th scope="col">Identifier</th>
                  <th scope="col">T range (K)</th>
                  <th scope="col">Points</th>
                  <th scope="col">E/R (K)</th>
                  <th scope="col">Against the others</th>
                </tr>
              </thead>
              <tbody>
                {versions.map((v) => {
                  const a = drawableFit(v.analysis);
                  const m = member(v.versionId);
                  return (
                    <tr key={v.versionId}>
                      <td>
                        <Link href={`/datasets/${v.datasetId}/v${v.number}`}>{v.title}</Link>{" "}
                        <span className="text-muted">v{v.number}</span>
                      </td>
                      <td>
                        <StateLabel state={v.state} />
                      </td>
                      <td className="font-mono text-xs">{v.versionIdentifier ?? "—"}</td>
                      <td>
                        {Math.round(v.tMin ?? 0)}–{Math.round(v.tMax ?? 0)}
                      </td>
                      <td>{v.pointCount}</td>
                      <td>{a?.arrhenius ? sig(a.arrhenius.params.Ea / GAS_CONSTANT, 4) : "—"}</td>
                      <td>{comparisonCell(m)}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </section>
        </>
      )}
      <p className="text-sm">
        <Link href="/reactions">All reactions</Link>
      </p>
    </div>
  );
}

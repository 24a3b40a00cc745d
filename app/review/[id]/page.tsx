import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import jsonPatch from "fast-json-patch";
import { ArrheniusPlot } from "@/components/arrhenius-plot";
import { MarkdownText } from "@/components/markdown-text";
import { SeverityLabel, StateLabel } from "@/components/state-label";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { findPossibleDuplicates, getPreviousVersion } from "@/lib/curation/queries";
import { getVisibleVersionOrThrow } from "@/lib/datasets/deposits";
import { getLatestAnalysis, getVersionPoints, listDecisions } from "@/lib/datasets/queries";
import { drawableFit, FIT_CAUTION } from "@/lib/datasets/version-json";
import { toAnalysisInput, validateDeposit } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { parseIdOrNull, parseIdOrThrow } from "@/lib/ids";
import { getCurrentUser } from "@/lib/auth/session";
import { describeExtrapolation, formatFlagMessage, GAS_CONSTANT, REFERENCE_TEMPERATURE, type Flag } from "@/lib/kinetics";
import { DecisionForm } from "./decision-form";
import { formatRange, formatSignificant } from "@/lib/format";
import { ScrollRegion } from "@/components/scroll-region";

/** "Review of <title>" in the browser tab, for a reader who may see the version. */
export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const versionId = parseIdOrNull((await params).id);
  const user = await getCurrentUser();
  if (!user || versionId === null) return { title: user ? "Not found" : "Review" };
  try {
    const { version } = await getVisibleVersionOrThrow({ versionId, viewer: user });
    return { title: `Review of ${version.title || "an untitled deposit"}` };
  } catch {
    return { title: "Not found" };
  }
}

const sig = (v: number | null | undefined, digits = 4) => formatSignificant(v, digits);

function CheckList({ items }: { items: { code: string; severity: string; message: string }[] }) {
  if (!items.length) return <p className="text-sm text-ok">No findings.</p>;
  return (
    <ul className="space-y-2">
      {items.map((f, i) => (
        <li key={i} className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
          <SeverityLabel severity={f.severity} /> <span className="ml-1">{f.message}</span>
        </li>
      ))}
    </ul>
  );
}

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const curator = await requirePagePermission("dataset.review", `/review/${id}`);
  let found;
  try {
    found = await getVisibleVersionOrThrow({ versionId: parseIdOrThrow(id, "dataset version"), viewer: curator });
  } catch (err) {
    if (err instanceof AppError) notFound();
    throw err;
  }
  const { version, datasetRole, capabilities } = found;
  const [analysis, points, duplicates, previous, decisions] = await Promise.all([
    getLatestAnalysis({ versionId: version.id }),
    getVersionPoints({ versionId: version.id }),
    findPossibleDuplicates({ versionId: version.id }),
    getPreviousVersion({ datasetId: version.datasetId, number: version.number }),
    listDecisions({ versionId: version.id }),
  ]);
  const schema = validateDeposit(version.payload);
  const result = drawableFit(analysis?.result);
  const flags: Flag[] = (result?.flags ?? []).map((f) => ({ ...f, message: formatFlagMessage(f) }));
  const outliers = new Set(flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  // The authors' expression in canonical units (A) and J/mol (Ea), comparable with the re-fit.
  const reported = schema.ok ? toAnalysisInput(schema.value).reportedFit : undefined;
  // The reported expression at a temperature, K → canonical units.
  const reportedK = (T: number) =>
    reported ? reported.A * Math.pow(T / reported.T0, reported.n) * Math.exp(-reported.Ea / (GAS_CONSTANT * T)) : null;
  const diff = previous ? jsonPatch.compare(previous.payload, version.payload) : null;

  return (
    <div className="space-y-6">
      <p className="flex gap-4 text-sm">
        <Link href="/review">← Review queue</Link>
        <Link href={`/deposits/${version.id}`}>The full record (reaction, data table, method, source, files)</Link>
      </p>
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">{version.title}</h1>
        <p className="flex flex-wrap items-center gap-3 text-sm text-muted">
          <StateLabel state={version.state} /> <span>version {version.number}</span> <span>{version.pointCount} points</span>
          {version.tMin !== null && <span>{formatRange(version.tMin, version.tMax ?? version.tMin, "K")}</span>}
          {version.versionIdentifier && <span>identifier {version.versionIdentifier}</span>}
        </p>
      </header>

      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <div className="space-y-6">
          {typeof (version.payload as { description?: unknown }).description === "string" && (
            <section className="card space-y-2" aria-labelledby="about-heading">
              <h2 id="about-heading" className="text-xl font-semibold">
                What the authors say
              </h2>
              <MarkdownText text={(version.payload as { description: string }).description} />
            </section>
          )}
          <section className="card space-y-3" aria-labelledby="report-heading">
            <h2 id="report-heading" className="text-xl font-semibold">
              Check report
            </h2>
            <h3 className="font-semibold">Deposit format</h3>
            {schema.ok ? (
              <p className="text-sm text-ok">Valid against deposit format v1.</p>
            ) : (
              <CheckList items={schema.errors.map((e) => ({ code: "schema", severity: "error", message: `${e.pointer}: ${e.message}` }))} />
            )}
            <h3 className="font-semibold">Reaction and units</h3>
            <CheckList items={analysis?.checks ?? []} />
            <h3 className="font-semibold">Fit diagnostics</h3>
            <CheckList items={flags} />
            {result && (
              <>
                <h3 className="font-semibold">Reported versus re-fitted</h3>
                <ScrollRegion label="Reported versus re-fitted parameters">
                  <table className="table">
                    <thead>
                      <tr>
                        <th scope="col">Parameter</th>
                        <th scope="col">Reported by the authors</th>
                        <th scope="col">Re-fitted here (Arrhenius)</th>
                      </tr>
                    </thead>
                    <tbody>
                      <tr>
                        <td>A (canonical units)</td>
                        <td>{reported ? sig(reported.A) : "not reported"}</td>
                        <td>{sig(result.arrhenius.params.A)}</td>
                      </tr>
                      <tr>
                        <td>Ea</td>
                        <td>
                          {reported ? `${sig(reported.Ea / 1000)} kJ mol⁻¹ (E/R = ${sig(reported.Ea / GAS_CONSTANT)} K)` : "not reported"}
                        </td>
                        <td>
                          {sig(result.arrhenius.params.Ea / 1000)} kJ mol⁻¹ (E/R = {sig(result.arrhenius.params.Ea / GAS_CONSTANT)} K)
                        </td>
                      </tr>
                      <tr>
                        <td>Temperature range</td>
                        <td>
                          {reported?.Tmin !== undefined || reported?.Tmax !== undefined
                            ? reported.Tmin !== undefined && reported.Tmax !== undefined
                              ? formatRange(reported.Tmin, reported.Tmax, "K")
                              : `${reported.Tmin !== undefined ? `from ${sig(reported.Tmin)}` : `up to ${sig(reported.Tmax)}`} K`
                            : "not stated"}
                        </td>
                        <td>{formatRange(result.band.T[0], result.band.T[result.band.T.length - 1], "K")} (the data)</td>
                      </tr>
                      <tr>
                        <td>k({sig(result.arrhenius.kMid.T)} K), middle of the data in 1/T</td>
                        <td>{reported ? sig(reportedK(result.arrhenius.kMid.T)) : "—"}</td>
                        <td>
                          {sig(result.arrhenius.kMid.value)} (95 %: {sig(result.arrhenius.kMid.lower, 3)} …{" "}
                          {sig(result.arrhenius.kMid.upper, 3)})
                        </td>
                      </tr>
                      <tr>
                        <td>k(298.15 K)</td>
                        <td>{reported ? sig(reportedK(REFERENCE_TEMPERATURE)) : "—"}</td>
                        <td>
                          {sig(result.arrhenius.k298.value)} (95 %: {sig(result.arrhenius.k298.lower, 3)} …{" "}
                          {sig(result.arrhenius.k298.upper, 3)})
                          {result.arrhenius.k298.extrapolation && (
                            <span className="block text-xs text-warn">{describeExtrapolation(result.arrhenius.k298.extrapolation)}</span>
                          )}
                        </td>
                      </tr>
                      {result.modifiedArrhenius && (
                        <tr>
                          <td>n (modified Arrhenius)</td>
                          <td>{reported?.n !== undefined ? sig(reported.n) : "—"}</td>
                          <td>{sig(result.modifiedArrhenius.params.n)}</td>
                        </tr>
                      )}
                    </tbody>
                  </table>
                </ScrollRegion>
              </>
            )}
          </section>

          {result && points.length > 0 && (
            <section className="card space-y-2" aria-labelledby="plot-heading">
              <h2 id="plot-heading" className="text-xl font-semibold">
                Arrhenius plot
              </h2>
              <ArrheniusPlot
                points={points.map((p, i) => ({ T: p.T, lnk: Math.log(p.k), outlier: outliers.has(i) }))}
                band={result.band}
                kUnitLabel="canonical units"
              />
              <p className="text-xs text-muted">{FIT_CAUTION}</p>
            </section>
          )}

          <section className="card space-y-2" aria-labelledby="dup-heading">
            <h2 id="dup-heading" className="text-xl font-semibold">
              Possible duplicates
            </h2>
            {duplicates.length === 0 ? (
              <p className="text-sm text-muted">No other dataset of this reaction overlaps in temperature or cites the same source.</p>
            ) : (
              <ul className="list-disc space-y-1 pl-5 text-sm">
                {duplicates.map((d) => (
                  <li key={d.versionId}>
                    <Link href={`/review/${d.versionId}`}>{d.title}</Link> (v{d.number}, {d.state.replace("_", " ")},{" "}
                    {formatRange(d.tMin, d.tMax, "K")}){d.sameDoi ? " — same source DOI" : ""}
                  </li>
                ))}
              </ul>
            )}
          </section>

          <section className="card space-y-2" aria-labelledby="diff-heading">
            <h2 id="diff-heading" className="text-xl font-semibold">
              Changes since the previous version
            </h2>
            {!diff ? (
              <p className="text-sm text-muted">This is the first version.</p>
            ) : diff.length === 0 ? (
              <p className="text-sm text-muted">No changes to version {previous!.number}.</p>
            ) : (
              <ul className="space-y-1 font-mono text-xs">
                {diff.slice(0, 200).map((op, i) => (
                  <li key={i}>
                    <span className="font-semibold">{op.op}</span> {op.path}
                    {"value" in op ? ` → ${JSON.stringify(op.value).slice(0, 120)}` : ""}
                  </li>
                ))}
              </ul>
            )}
          </section>
        </div>

        <aside className="space-y-6">
          <section className="card space-y-3" aria-labelledby="decide-heading">
            <h2 id="decide-heading" className="text-xl font-semibold">
              Decision
            </h2>
            <DecisionForm versionId={version.id} coEditing={datasetRole !== null} capabilities={capabilities} />
          </section>
          <section className="card space-y-2" aria-labelledby="history-heading">
            <h2 id="history-heading" className="text-xl font-semibold">
              Earlier decisions
            </h2>
            {decisions.length === 0 ? (
              <p className="text-sm text-muted">None yet.</p>
            ) : (
              <ul className="space-y-2 text-sm">
                {decisions.map((d) => (
                  <li key={d.id}>
                    <span className="font-medium">{d.decision.replace("_", " ")}</span> by {d.curator},{" "}
                    {d.createdAt.toISOString().slice(0, 10)}: {d.reason}
                  </li>
                ))}
              </ul>
            )}
          </section>
        </aside>
      </div>
    </div>
  );
}

"use client";

import type { AnalysisResult, Flag, ReactionOrder } from "@/lib/kinetics/types";
import { describeExtrapolation, describeWeightedErrors } from "@/lib/kinetics/flag-text";
import { readerFlagMessage, technicalFlagNote } from "@/lib/flag-words";
import { formatSignificant } from "@/lib/format";
import { convertEntropy, energyQuantityLabel, entropyQuantityLabel } from "@/lib/unit-labels";
import { displayConversion } from "@/lib/kinetics/units";
import { severityNoun } from "@/lib/curation/check-summary";
import { ScrollRegion } from "./scroll-region";
import { StatisticTerm } from "@/components/statistic-term";

interface Props {
  analysis: AnalysisResult;
  order: ReactionOrder;
  kUnit: string;
  kLabel: string;
  /** Energy unit id; every energy and entropy label is written from it (lib/unit-labels.ts). */
  energyUnit: string;
  convertK: (k: number) => number;
  convertE: (joulesPerMole: number) => number;
  /** Unit id temperatures in the checks are written in ("K" unless given). */
  temperatureUnit?: string;
  /** Pasted line (or table row) of a zero-based point index. */
  lineOf: (index: number) => number | undefined;
  /** What lineOf numbers are called on screen; "Pasted line" when not given. */
  pointWord?: string;
}

const sig = (v: number | null | undefined, digits = 4) => formatSignificant(v, digits);

/** The one sentence on how a weighted fit's standard errors were made (nothing for an unweighted fit). */
function WeightedErrorsRow({ weighted, scaleFactor, testId }: { weighted: boolean; scaleFactor: number | null; testId: string }) {
  const words = weighted ? describeWeightedErrors(scaleFactor) : null;
  if (!words) return null;
  return (
    <tr>
      <td colSpan={3} className="whitespace-normal! text-xs text-muted" data-testid={testId}>
        {words}
      </td>
    </tr>
  );
}

/** Why the errors read "—" when the fit has exactly as many temperatures as parameters. */
function NoFreedomRow({ dof, parameters, testId }: { dof: number; parameters: "two" | "three"; testId: string }) {
  if (dof !== 0) return null;
  return (
    <tr>
      <td colSpan={3} className="whitespace-normal! text-xs text-muted" data-testid={testId}>
        No standard errors or intervals (—): the {parameters} parameters are fitted to {parameters} points, so the curve passes through
        every point and nothing is left to measure their scatter. Add a point to get them.
      </td>
    </tr>
  );
}

const severityStyle: Record<Flag["severity"], string> = {
  error: "border-error/50 text-error",
  warn: "border-warn/50 text-warn",
  info: "border-line text-muted",
};

/** Fitted parameters in the units the person chose, and the flags in plain words. */
export function ResultTables({
  analysis,
  kLabel,
  energyUnit,
  convertK,
  convertE,
  temperatureUnit = "K",
  lineOf,
  pointWord = "Pasted line",
}: Props) {
  const a = analysis.arrhenius;
  const m = analysis.modifiedArrhenius;
  const e = analysis.eyring;
  const c = analysis.curvature;
  // A's uncertainty is multiplicative: A ×/÷ exp(se(ln A)).
  const factor = (se: number | null) => (se === null ? "—" : `×/÷ ${sig(Math.exp(se), 3)}`);
  const k = (v: number | null) => sig(v === null ? null : convertK(v));
  const energy = (symbol: string) => energyQuantityLabel(symbol, energyUnit);
  const entropy = (v: number | null) => (v === null ? null : displayConversion(() => convertEntropy(v, energyUnit)));
  const interval = (lower: number | null, upper: number | null) =>
    `95 %: ${sig(lower === null ? null : convertK(lower), 3)} … ${sig(upper === null ? null : convertK(upper), 3)}`;
  return (
    // The parameters take the width their numbers need; the checks sit below them until the screen
    // is wide enough for both side by side (at 1366 px a half-width table clipped its values).
    <div className="grid gap-6 2xl:grid-cols-[auto_minmax(18rem,1fr)]">
      <section aria-labelledby="params-heading" className="card min-w-0 space-y-3">
        <h3 id="params-heading" className="text-lg font-semibold">
          Fitted parameters
        </h3>
        <ScrollRegion label="Fitted parameters (scrollable table)">
          {/* Numbers stay on one line; the quantities' names wrap, so that on a phone the values are in view, not off to the side. */}
          <table className="table [&_td]:whitespace-nowrap [&_td:first-child]:min-w-[8.5rem] [&_td:first-child]:whitespace-normal">
            <caption className="sr-only">Parameters of each model with standard errors</caption>
            <thead>
              <tr>
                <th scope="col">Quantity</th>
                <th scope="col">Value</th>
                <th scope="col">
                  <StatisticTerm id="standardError" />
                </th>
              </tr>
            </thead>
            <tbody>
              <tr>
                <th scope="row" colSpan={3} className="bg-paper">
                  Arrhenius k = A exp(−Ea/RT){analysis.weighted ? " — weighted by stated uncertainties" : ""}
                </th>
              </tr>
              <tr>
                <td>A ({kLabel})</td>
                <td>{sig(a.params.A === null ? null : convertK(a.params.A))}</td>
                <td>{factor(a.se.lnA)}</td>
              </tr>
              <tr>
                <td>{energy("Ea")}</td>
                <td>{sig(convertE(a.params.Ea))}</td>
                <td>{a.se.Ea === null ? "—" : sig(convertE(a.se.Ea), 2)}</td>
              </tr>
              <tr>
                <td>
                  k(298.15 K) ({kLabel})
                  {a.k298.extrapolation && (
                    <span className="block whitespace-normal text-xs text-warn">{describeExtrapolation(a.k298.extrapolation)}</span>
                  )}
                </td>
                <td>
                  {k(a.k298.value)}
                  {a.k298.extrapolated && <span className="text-warn"> (extrapolated)</span>}
                </td>
                <td>{interval(a.k298.lower, a.k298.upper)}</td>
              </tr>
              <tr>
                <td className="whitespace-normal!">
                  k({sig(a.kMid.T)} K), middle of the range in 1/T ({kLabel})
                </td>
                <td>{k(a.kMid.value)}</td>
                <td>{interval(a.kMid.lower, a.kMid.upper)}</td>
              </tr>
              <tr>
                <td className="whitespace-normal!">
                  <StatisticTerm id="r2" /> / <StatisticTerm id="dof" />
                </td>
                <td colSpan={2}>
                  {sig(a.r2, 5)} / {a.dof}
                </td>
              </tr>
              {/* Two different quantities: the weighted one is dimensionless and never called an SD of ln k. */}
              <tr>
                <td className="whitespace-normal!">
                  <StatisticTerm
                    id="residualSD"
                    plain={`Typical distance of a point from the line${analysis.weighted ? ", unweighted" : ""}`}
                  />
                </td>
                <td colSpan={2}>{sig(a.residualSDLnK, 3)}</td>
              </tr>
              {analysis.weighted && (
                <tr>
                  <td className="whitespace-normal!">
                    <StatisticTerm id="scatterRatio" />
                    <span className="block whitespace-normal text-xs text-muted">
                      dimensionless: the typical residual in units of the stated uncertainties (1 when the points scatter as stated)
                    </span>
                  </td>
                  <td colSpan={2} data-testid="scale-factor">
                    {sig(a.scaleFactor, 3)}
                  </td>
                </tr>
              )}
              <WeightedErrorsRow weighted={analysis.weighted} scaleFactor={a.scaleFactor} testId="weighted-errors" />
              <NoFreedomRow dof={a.dof} parameters="two" testId="no-freedom" />
              {m && (
                <>
                  <tr>
                    <th scope="row" colSpan={3} className="bg-paper">
                      Modified Arrhenius k = A (T/{m.params.T0} K)ⁿ exp(−Ea/RT)
                    </th>
                  </tr>
                  <tr>
                    <td>A ({kLabel})</td>
                    <td>{sig(m.params.A === null ? null : convertK(m.params.A))}</td>
                    <td>{factor(m.se.lnA)}</td>
                  </tr>
                  <tr>
                    <td>n</td>
                    <td>{sig(m.params.n)}</td>
                    <td>{sig(m.se.n, 2)}</td>
                  </tr>
                  <tr>
                    <td>{energy("Ea")}</td>
                    <td>{sig(convertE(m.params.Ea))}</td>
                    <td>{m.se.Ea === null ? "—" : sig(convertE(m.se.Ea), 2)}</td>
                  </tr>
                  <WeightedErrorsRow weighted={analysis.weighted} scaleFactor={m.scaleFactor} testId="weighted-errors-modified" />
                  <NoFreedomRow dof={m.dof} parameters="three" testId="no-freedom-modified" />
                </>
              )}
              {e && (
                <>
                  <tr>
                    <th scope="row" colSpan={3} className="bg-paper">
                      Eyring (κ = 1)
                    </th>
                  </tr>
                  <tr>
                    <td>{energy("ΔH‡")}</td>
                    <td>{sig(convertE(e.params.dH))}</td>
                    <td>{e.se.dH === null ? "—" : sig(convertE(e.se.dH), 2)}</td>
                  </tr>
                  <tr>
                    <td>{entropyQuantityLabel("ΔS‡", energyUnit)}</td>
                    <td>{sig(entropy(e.params.dS))}</td>
                    <td>{sig(entropy(e.se.dS), 2)}</td>
                  </tr>
                  <tr>
                    <td colSpan={3} className="whitespace-normal! text-xs text-muted">
                      {e.convention}
                    </td>
                  </tr>
                </>
              )}
              {c && (
                <>
                  <tr>
                    <th scope="row" colSpan={3} className="bg-paper">
                      Curvature test (modified against plain Arrhenius)
                    </th>
                  </tr>
                  <tr>
                    <td>
                      F ({c.dfNum}, {c.dfDenom}) / p
                    </td>
                    <td colSpan={2} className="whitespace-normal!">
                      {c.exact || c.F === null
                        ? "curved exactly, within the arithmetic (p below any printable bound)"
                        : `${sig(c.F, 3)} / ${sig(c.p, 2)}`}
                    </td>
                  </tr>
                  <tr>
                    <td>ΔAICc (modified − plain)</td>
                    <td colSpan={2}>{sig(c.deltaAICc, 3)}</td>
                  </tr>
                </>
              )}
            </tbody>
          </table>
        </ScrollRegion>
      </section>
      <section aria-labelledby="flags-heading" className="card space-y-3">
        <h3 id="flags-heading" className="text-lg font-semibold">
          Checks
        </h3>
        {analysis.flags.length === 0 ? (
          <p className="text-sm text-ok">No findings: no outliers, no significant curvature, range and scatter as expected.</p>
        ) : (
          <ul className="space-y-2">
            {analysis.flags.map((f, i) => {
              const units = { energy: energyUnit, temperature: temperatureUnit };
              const technical = technicalFlagNote(f, units);
              return (
                <li key={i} className={`rounded-md border bg-panel px-3 py-2 text-sm ${severityStyle[f.severity]}`}>
                  <span className="mr-2 rounded-sm bg-paper px-1.5 py-0.5 text-xs font-semibold">{severityNoun(f.severity)}</span>{" "}
                  {readerFlagMessage(f, units)}
                  {technical && (
                    <details className="mt-1 text-xs text-muted">
                      <summary className="cursor-pointer">How this is found</summary>
                      <p className="mt-1">{technical}</p>
                    </details>
                  )}
                  {f.points && f.points.length > 0 && (
                    <span className="block text-xs text-muted">
                      {pointWord}
                      {f.points.length > 1 ? "s" : ""}: {f.points.map((p) => lineOf(p) ?? p + 1).join(", ")}
                    </span>
                  )}
                </li>
              );
            })}
          </ul>
        )}
      </section>
    </div>
  );
}

import { GAS_CONSTANT, type ConsensusMember, type ConsensusResult } from "@/lib/kinetics";
import { factorRoundsToOne, factorSize } from "@/lib/kinetics/consensus-words";
import { formatFixed, formatRange, formatSignificant, formatTenTo } from "@/lib/format";
import { ScrollRegion } from "./scroll-region";
import { StatisticTerm } from "@/components/statistic-term";

const sig = (v: number | null | undefined, digits = 3) => formatSignificant(v, digits);

/** "×4.80 above" from a log10 ratio (the engine's factorSize); "the same to three digits" when the factor rounds to 1.00. */
function factorWords(log10: number): string {
  if (factorRoundsToOne(log10)) return "the same to three digits";
  return `×${factorSize(log10)} ${log10 >= 0 ? "above" : "below"}`;
}

/** The consensus expression, what went in, f(T) over the covered range, and the engine's flags. */
export function ConsensusSummary({
  result,
  kUnitLabel,
  labels,
  caution,
  shown,
}: {
  result: ConsensusResult;
  kUnitLabel: string;
  labels: Map<string, string>;
  caution: string;
  /** The datasets of the page's part of a long list (ids); every one when absent. */
  shown?: ReadonlySet<string>;
}) {
  const modified = result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : null;
  const fit = modified ?? result.arrhenius;
  const leftOut = result.members.filter((m) => !m.included);
  const { Tmin, Tmax } = result.range;
  return (
    <section className="card space-y-3" aria-labelledby="consensus-heading">
      <h2 id="consensus-heading" className="text-xl font-semibold">
        Consensus of {result.included} datasets
      </h2>
      <p className="text-sm">
        k = {sig(fit.params.A)}{" "}
        {modified && (
          <>
            (T/{formatSignificant(modified.params.T0, 5)} K)<sup>{sig(modified.params.n)}</sup>{" "}
          </>
        )}
        exp(
        {fit.params.Ea >= 0 ? "−" : "+"}
        {sig(Math.abs(fit.params.Ea) / GAS_CONSTANT, 4)} K / T) {kUnitLabel}, for {formatRange(Tmin, Tmax, "K")} (
        {modified ? "modified Arrhenius: the temperature exponent n is significant" : "Arrhenius"}).
      </p>
      <p className="text-sm text-muted">
        What went in: {result.included} of {result.datasets} datasets, {result.points} points, summarised by {fit.supportValues} fitted
        values of ln k inside each dataset&apos;s own range
        {result.window.Tmin !== null || result.window.Tmax !== null
          ? `; only points between ${result.window.Tmin ?? 0} and ${result.window.Tmax ?? "∞"} K`
          : ""}
        . The curve comes from {result.curveFrom.map((id) => labels.get(id) ?? id).join(", ")}.
        {leftOut.length > 0 && (
          <>
            {" "}
            Left out:{" "}
            {leftOut.map((m, i) => (
              <span key={m.id}>
                {i > 0 ? "; " : ""}
                {labels.get(m.id) ?? m.id} ({m.leftOut})
              </span>
            ))}
            .
          </>
        )}
      </p>
      <ScrollRegion label="Uncertainty factor of the consensus (table)">
        <table className="table" aria-label="Uncertainty factor of the consensus">
          <caption className="text-left text-sm text-muted">
            <StatisticTerm id="uncertaintyFactor" plain="Within a factor of f of the combined value" />: from the consensus k divided by f
            to the consensus k times f covers 95 %, the disagreement between datasets included. Outside {formatRange(Tmin, Tmax, "K")} the
            consensus is an extrapolation and no uncertainty is given.
          </caption>
          <thead>
            <tr>
              <th scope="col">T (K)</th>
              <th scope="col">f</th>
              <th scope="col">Datasets covering T</th>
            </tr>
          </thead>
          <tbody>
            {fit.uncertaintyFactor.map((u) => (
              <tr key={u.T}>
                <td>{Math.round(u.T * 10) / 10}</td>
                <td>{u.f === null ? "—" : sig(u.f)}</td>
                <td>{u.datasets}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <SharesTable result={result} labels={labels} shown={shown} />
      <p className="text-sm text-muted">{betweenDatasetWords(fit)}</p>
      <p className="text-xs text-muted" data-testid="consensus-method">
        {CONSENSUS_METHOD_WORDS}
      </p>
      <details className="text-xs text-muted" data-testid="consensus-computation">
        <summary className="cursor-pointer">How this is computed</summary>
        <p className="mt-1">{CONSENSUS_COMPUTATION_WORDS}</p>
        <p className="mt-1">
          Between-dataset variance τ² = {sig(fit.tau2)} (ln k)², I² = {Math.round(fit.i2 * 100)} % (Q = {sig(fit.q)} on {fit.dof} dof).
        </p>
      </details>
      {result.flags.length > 0 && (
        <ul className="space-y-2" aria-label="Consensus findings">
          {result.flags.map((f, i) => (
            <li
              key={i}
              className={`rounded-md border bg-panel px-3 py-2 text-sm ${f.severity === "warn" ? "border-warn/40 text-warn" : "border-line"}`}
            >
              {f.message}
            </li>
          ))}
        </ul>
      )}
      <p className="text-xs text-muted">{caution}</p>
    </section>
  );
}

/**
 * The between-dataset spread for a reader: how far apart the datasets are beyond their own
 * uncertainties, as a factor (exp τ: one standard deviation of ln k between datasets), and how much
 * of their disagreement that spread is (I², in words). The technical figures go in "How this is computed".
 */
export function betweenDatasetWords(fit: { tau2: number; i2: number }): string {
  if (!(fit.tau2 > 0))
    return "Between-dataset spread: none beyond their own uncertainties; the datasets agree as well as their uncertainties say they should.";
  const factor = Math.exp(Math.sqrt(fit.tau2));
  return `Between-dataset spread: the datasets differ from one another by about a factor ${sig(factor)} (one standard deviation) beyond their own uncertainties; ${Math.round(fit.i2 * 100)} % of their disagreement comes from this spread rather than from the uncertainties they state.`;
}

/**
 * How the consensus is made, in plain words (the API's `method` keeps the terse technical sentence;
 * the technical names are in {@link CONSENSUS_COMPUTATION_WORDS}). Kept true to lib/kinetics/consensus.ts.
 */
export const CONSENSUS_METHOD_WORDS =
  "How the consensus is made: each dataset's own fit gives its values of k at a few temperatures inside its own range, with their uncertainties. One curve is then fitted through all of them, allowing the datasets to disagree with one another by more than their own uncertainties (the between-dataset spread). Each dataset is compared with the curve of the others along its range; while one is off, the dataset whose removal leaves the others agreeing best is set aside and the curve fitted again, until none is off or two remain. The curve bends (modified Arrhenius) only when the bend does not rest on one dataset alone. The band and the factor f are 95 % ranges that include the disagreement between datasets.";

/** The same method with its technical names, for the specialist's "How this is computed" note. */
export const CONSENSUS_COMPUTATION_WORDS =
  "Each dataset's values of k at a few temperatures inside its range are its support values. The curve is a generalised least-squares fit with a between-dataset variance τ², estimated by the DerSimonian–Laird method; I² is the share of the total disagreement (Cochran's Q) that τ² explains. Datasets are set aside by the largest consistent subset (Cox 2007).";

/**
 * Who carries the consensus: each included dataset's share in the consensus k at the temperatures of f(T). The
 * shares add up to 1 at each temperature (not across a row: a dataset's share changes along T).
 */
function SharesTable({ result, labels, shown }: { result: ConsensusResult; labels: Map<string, string>; shown?: ReadonlySet<string> }) {
  const rows = result.shares;
  if (rows.length === 0 || rows[0].shares.length < 2) return null;
  const ids = rows[0].shares.map((s) => s.id).filter((id) => !shown || shown.has(id));
  if (!ids.length) return null;
  return (
    <ScrollRegion label="Share of each dataset in the consensus (table)">
      <table className="table" aria-label="Share of each dataset in the consensus">
        <caption className="text-left text-sm text-muted">
          Share of each dataset in the consensus k at each temperature, in %: the shares at one temperature add up to 100 % (a negative
          share tilts the curve away from that dataset&apos;s values).
        </caption>
        <thead>
          <tr>
            <th scope="col">T (K)</th>
            {ids.map((id) => (
              <th scope="col" key={id}>
                {labels.get(id) ?? id}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.T}>
              <td>{Math.round(r.T * 10) / 10}</td>
              {r.shares
                .filter((s) => !shown || shown.has(s.id))
                .map((s) => (
                  <td key={s.id}>{formatFixed(s.share * 100, 0)}</td>
                ))}
            </tr>
          ))}
        </tbody>
      </table>
    </ScrollRegion>
  );
}

/** Each dataset against the consensus of the others: the verdict in words and per comparison temperature. */
export function ConsensusComparisons({
  result,
  labels,
  shown,
}: {
  result: ConsensusResult;
  labels: Map<string, string>;
  /** The datasets of the page's part of a long list (ids); every one when absent. */
  shown?: ReadonlySet<string>;
}) {
  return (
    <section className="card space-y-4" aria-labelledby="comparison-heading">
      <h2 id="comparison-heading" className="text-xl font-semibold">
        How each dataset compares with the others
      </h2>
      <p className="text-sm text-muted">
        Each dataset is compared with the consensus of the other datasets, over the part of its range they cover. z includes the
        dataset&apos;s own uncertainty, that of the others&apos; consensus and the spread between datasets; a dataset is off when any |z|
        exceeds the bound for its number of temperatures (family level 5 %).
      </p>
      {result.members
        .filter((m) => !shown || shown.has(m.id))
        .map((m) => (
          <MemberComparison key={m.id} member={m} label={labels.get(m.id) ?? m.id} otherSide={otherSideOf(result, m, labels)} />
        ))}
    </section>
  );
}

/**
 * The engine's verdict as a reader reads it: the spread of the others as a factor only ("a factor 1.5
 * per standard deviation"), without the τ² figure the engine writes beside it for the API.
 */
export function readerVerdict(verdict: string): string {
  return verdict.replace(/τ² of the others = [^,()]+ in \(ln k\)², (a factor [^()]+ per standard deviation)/g, "$1");
}

/**
 * What a dataset's k is divided by in its table: the consensus of the other datasets, or — when
 * there is one other — that dataset's own fit (a comparison of two datasets, not with a consensus).
 */
export function otherSideOf(result: ConsensusResult, m: ConsensusMember, labels: Map<string, string>): { single: string | null } {
  if (m.disagreement?.comparedWith !== 1) return { single: null };
  const other = result.members.find((x) => x.included && x.id !== m.id);
  return { single: other ? (labels.get(other.id) ?? other.id) : null };
}

function MemberComparison({
  member: m,
  label,
  otherSide,
}: {
  member: ConsensusMember;
  label: string;
  otherSide: { single: string | null };
}) {
  const d = m.disagreement;
  // "Agrees" only within a wide spread between the others is no agreement a reader can lean on: say so in the heading.
  const compared =
    !d || !d.range
      ? "not compared"
      : d.off
        ? "off the consensus"
        : d.agreesOnlyWithinSpread
          ? "agrees only within a wide spread"
          : "agrees";
  // A dataset left out by a curator is still compared with the consensus.
  const status = !m.included ? (d?.range ? `left out; ${compared}` : "left out") : compared;
  return (
    <article className="space-y-2 border-t border-line pt-3" aria-label={`${label}: ${status}`}>
      <h3 className="font-medium">
        {label} <span className={`text-sm ${d?.off || d?.agreesOnlyWithinSpread ? "text-warn" : "text-muted"}`}>— {status}</span>
      </h3>
      <p className="text-sm">{readerVerdict(m.verdict)}</p>
      <p className="text-xs text-muted">
        {pointsUsedWords(m)}, {m.Tmin !== null ? formatRange(m.Tmin, m.Tmax, "K") : "no temperatures"}; summarised by its{" "}
        {m.model === "modified_arrhenius"
          ? "modified Arrhenius"
          : m.model === "single_temperature"
            ? "mean at one temperature"
            : "Arrhenius"}{" "}
        fit
        {m.share !== null && m.shareT !== null
          ? `; its share in the consensus k at ${Math.round(m.shareT)} K (the middle of its range) ${formatFixed(m.share * 100, 0)} %`
          : ""}
        .
      </p>
      {uncheckedWords(m) && <p className="text-xs text-muted">{uncheckedWords(m)}</p>}
      {d && d.points.length > 0 && (
        <p className="text-xs text-muted">
          {d.comparedWith === 1
            ? `Only one other dataset is in the consensus, so there is no consensus of the others: the ratio compares this dataset's own fit with ${otherSide.single ?? "the other dataset"}'s own fit, and z counts no spread between datasets.`
            : d.tau2 > 0
              ? `Without this dataset, the others differ from one another by about a factor ${sig(Math.exp(Math.sqrt(d.tau2)))} (one standard deviation) beyond their own uncertainties; every z counts that spread beside this dataset's and the others' uncertainty.`
              : "Without this dataset, the others agree with one another within their own uncertainties, so z counts only this dataset's and the others' uncertainty."}
        </p>
      )}
      {d && d.points.length > 0 && (
        <ScrollRegion label={`${label} against the others (table)`}>
          <table className="table" aria-label={`${label} against the others`}>
            <thead>
              <tr>
                <th scope="col">T (K)</th>
                <th scope="col">{otherSide.single ? `k / k of ${otherSide.single} (its own fit)` : "k / k of the others' consensus"}</th>
                <th scope="col">z</th>
                <th scope="col">|z| ≤ {formatFixed(d.bound, 2)}?</th>
              </tr>
            </thead>
            <tbody>
              {d.points.map((p) => (
                <tr key={p.T}>
                  <td>{Math.round(p.T)}</td>
                  <td>
                    {p.ratio !== null && Math.abs(p.log10Ratio) < 3 ? sig(p.ratio) : formatTenTo(p.log10Ratio, 3)} (
                    {factorWords(p.log10Ratio)})
                  </td>
                  <td>{formatFixed(p.z, 1)}</td>
                  <td className={p.agrees ? "" : "font-medium text-warn"}>{p.agrees ? "agrees" : "off"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
    </article>
  );
}

/** "12 points", or "12 of 14 points (2 outliers of its own fit left out)" when the summary leaves some out. */
export function pointsUsedWords(m: Pick<ConsensusMember, "n" | "pointsGiven" | "outliers">): string {
  if (m.pointsGiven <= m.n) return `${m.n} ${m.n === 1 ? "point" : "points"}`;
  const outliers = m.outliers.length;
  const outside = m.pointsGiven - m.n - outliers;
  const why = [
    outliers > 0 ? `${outliers} ${outliers === 1 ? "outlier" : "outliers"} of its own fit` : null,
    outside > 0 ? `${outside} outside the temperatures chosen` : null,
  ].filter(Boolean);
  return `${m.n} of ${m.pointsGiven} points used (${why.join(" and ")} left out)`;
}

/**
 * When the others cover only part of a dataset's range, the rest of it is checked against nothing:
 * say which part, so "agrees" or "off" is not read as a verdict on the whole range.
 */
export function uncheckedWords(m: Pick<ConsensusMember, "Tmin" | "Tmax" | "disagreement">): string | null {
  const r = m.disagreement?.range;
  if (!r || m.Tmin === null || m.Tmax === null) return null;
  // Half a kelvin: ranges that differ only by rounding are the same range.
  const parts = [
    m.Tmin < r.Tmin - 0.5 ? formatRange(m.Tmin, r.Tmin, "K") : null,
    m.Tmax > r.Tmax + 0.5 ? formatRange(r.Tmax, m.Tmax, "K") : null,
  ].filter(Boolean);
  if (parts.length === 0) return null;
  return `Compared only over ${formatRange(r.Tmin, r.Tmax, "K")}, where the others have data: its part over ${parts.join(" and ")} is checked against nothing.`;
}

/** One short cell for the datasets table. */
export function comparisonCell(m: ConsensusMember | undefined): string {
  if (!m) return "—";
  const d = m.disagreement;
  const out = !m.included && m.leftOut ? `left out: ${m.leftOut}` : null;
  if (!d || !d.range) return out ?? (d ? "not compared (no overlap)" : "—");
  const worst = d.points.reduce((a, b) => (Math.abs(b.z) > Math.abs(a.z) ? b : a));
  const verdict = d.off
    ? `off: ${factorWords(worst.log10Ratio)} at ${Math.round(worst.T)} K`
    : d.agreesOnlyWithinSpread
      ? `only within a wide spread: ${factorWords(worst.log10Ratio)} at ${Math.round(worst.T)} K`
      : "agrees";
  return out ? `${out}; compared: ${verdict}` : verdict;
}

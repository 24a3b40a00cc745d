import { AnalysisError, consensus, type ConsensusDataset, type ConsensusResult, type RatePoint, type ReactionOrder } from "@/lib/kinetics";

/**
 * Which datasets of a reaction enter its consensus, and why the others do not. Pure: the reaction
 * page and GET /api/v1/reactions/:id/consensus read the versions and the curators' exclusions,
 * then both call these functions, so the two always say the same thing. The rules are
 * CONSENSUS_SELECTION_RULES below (published on /docs/api).
 */

/** The selection rules in words, as /docs/api publishes them; keep them true to the code below. */
export const CONSENSUS_SELECTION_RULES: readonly string[] = [
  "Each dataset counts once, by its newest public version: older versions are superseded. A dataset whose newest version is retracted stays out (its earlier versions are not used in its place).",
  "Measured (method category `experiment`) and calculated (`theory`) datasets may enter. Evaluated datasets (`evaluation`) never do: they are recommended values derived from other work, often the very datasets here, so counting them beside those would count the same data twice. `include=all` (the default) therefore means measured and calculated; `include=measured` and `include=calculated` keep one kind.",
  "A curator may leave a published version out with a reason; it is listed with that reason whatever else is chosen, and the deposit and the published version stay untouched. A new version of the dataset is judged afresh. When nothing else keeps it out, it is still compared with the consensus (its verdict and comparison table are shown) but never enters the fit, nor counts towards the datasets a consensus needs.",
  "The temperature window `Tmin` … `Tmax` (K, both inclusive, either may be left out) drops the points outside it before the fit. A dataset left with fewer than 2 distinct temperatures cannot be fitted and is listed as not used, with how many of its points fell inside.",
  "All datasets of one consensus share one reaction order (the unit of k): the order most of them have; the others are listed as not used.",
  "A dataset the consensus itself leaves out as a likely unit mistake (its rate constants off the others by a unit-conversion factor; see the consensus conventions) moves from used to not used, with that reason (`unit_suspect`).",
  "A dataset the consensus sets aside as off the consensus of the others (the largest consistent subset; see the consensus conventions) moves from used to not used, with that reason (`off_consensus`); it is still compared with the final consensus, and consensus.curveFrom lists the datasets that shaped the curve.",
  "A consensus needs at least 2 datasets; with fewer, or input the engine refuses, `consensus` is null and `unavailable` says why.",
];

export type ConsensusInclude = "all" | "measured" | "calculated";
export const CONSENSUS_INCLUDES: readonly ConsensusInclude[] = ["all", "measured", "calculated"];

/** What the reader chose: kinds of data and a temperature window (K; null = open). */
export interface ConsensusChoice {
  include: ConsensusInclude;
  Tmin: number | null;
  Tmax: number | null;
}

export const DEFAULT_CONSENSUS_CHOICE: ConsensusChoice = { include: "all", Tmin: null, Tmax: null };

/** How the consensus's sentences name a dataset: the last part of its title and its number. */
export function consensusLabel(v: { title: string; datasetId: number }): string {
  return `“${v.title.split(":").pop()?.trim() || v.title}” (dataset ${v.datasetId})`;
}

/** A consensus needs this many datasets; with fewer there is nothing to compare. */
export const MIN_CONSENSUS_DATASETS = 2;

export const CONSENSUS_PARAMETERS = ["include", "Tmin", "Tmax"] as const;

export const includeLabels: Record<ConsensusInclude, string> = {
  all: "Measured and calculated",
  measured: "Measured only",
  calculated: "Calculated only",
};

/** How a dataset's numbers were obtained, in the words readers see. */
export type MethodKind = "measured" | "calculated" | "evaluated" | "unknown";

const kindByCategory: Record<string, MethodKind> = { experiment: "measured", theory: "calculated", evaluation: "evaluated" };

export interface ParameterError {
  parameter: string;
  message: string;
  value?: string;
}

type RawParams = URLSearchParams | Record<string, string | string[] | undefined>;

function entriesOf(params: RawParams): [string, string[]][] {
  if (params instanceof URLSearchParams) {
    const names = [...new Set(params.keys())];
    return names.map((n) => [n, params.getAll(n)]);
  }
  return Object.entries(params)
    .filter((e): e is [string, string | string[]] => e[1] !== undefined)
    .map(([n, v]) => [n, Array.isArray(v) ? v : [v]]);
}

// A plain decimal number, as a person or a form writes it: no hex, no "Infinity", no units.
const DECIMAL = /^\+?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function parseTemperature(parameter: "Tmin" | "Tmax", raw: string, errors: ParameterError[]): number | null {
  const text = raw.trim();
  if (text === "") return null;
  const value = DECIMAL.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(value) || value <= 0) {
    errors.push({
      parameter,
      value: raw,
      message: `${parameter} must be a temperature in kelvin above zero, written as a plain number such as 300 (got “${raw}”)`,
    });
    return null;
  }
  return value;
}

/**
 * Reads `include`, `Tmin` and `Tmax` from a query string. Empty values mean "not set" (a form sends
 * its blank fields). With `strict`, any other parameter is an error too (the API: a mistyped
 * `tmin` must not be ignored silently); pages ignore parameters they do not know.
 */
export function parseConsensusChoice(
  params: RawParams,
  { strict = false }: { strict?: boolean } = {},
): { ok: true; choice: ConsensusChoice } | { ok: false; errors: ParameterError[]; choice: ConsensusChoice } {
  const errors: ParameterError[] = [];
  const choice: ConsensusChoice = { ...DEFAULT_CONSENSUS_CHOICE };
  for (const [name, values] of entriesOf(params)) {
    if (!(CONSENSUS_PARAMETERS as readonly string[]).includes(name)) {
      if (strict)
        errors.push({
          parameter: name,
          message: `Unknown query parameter “${name}”: use include, Tmin or Tmax (the names are case-sensitive)`,
        });
      continue;
    }
    if (values.length > 1) {
      errors.push({ parameter: name, message: `Give ${name} once (it appears ${values.length} times)` });
      continue;
    }
    const raw = values[0];
    if (name === "include") {
      const text = raw.trim();
      if (text === "") continue;
      if ((CONSENSUS_INCLUDES as readonly string[]).includes(text)) choice.include = text as ConsensusInclude;
      else errors.push({ parameter: name, value: raw, message: `include must be measured, calculated or all (got “${raw}”)` });
    } else {
      choice[name as "Tmin" | "Tmax"] = parseTemperature(name as "Tmin" | "Tmax", raw, errors);
    }
  }
  if (choice.Tmin !== null && choice.Tmax !== null && choice.Tmin >= choice.Tmax) {
    errors.push({
      parameter: "Tmax",
      value: String(choice.Tmax),
      message: `Tmax (${choice.Tmax} K) must be above Tmin (${choice.Tmin} K)`,
    });
  }
  return errors.length ? { ok: false, errors, choice: DEFAULT_CONSENSUS_CHOICE } : { ok: true, choice };
}

/** The choice as query parameters (defaults left out), for links and the API. */
export function consensusChoiceQuery(choice: ConsensusChoice): string {
  const q = new URLSearchParams();
  if (choice.include !== "all") q.set("include", choice.include);
  if (choice.Tmin !== null) q.set("Tmin", String(choice.Tmin));
  if (choice.Tmax !== null) q.set("Tmax", String(choice.Tmax));
  const s = q.toString();
  return s ? `?${s}` : "";
}

const kelvin = (T: number) => `${Number(T.toPrecision(6))} K`;

/** The temperature window in words, or null when it is open on both sides. */
export function describeWindow({ Tmin, Tmax }: Pick<ConsensusChoice, "Tmin" | "Tmax">): string | null {
  if (Tmin !== null && Tmax !== null) return `${kelvin(Tmin)} to ${kelvin(Tmax)}`;
  if (Tmin !== null) return `${kelvin(Tmin)} and above`;
  if (Tmax !== null) return `up to ${kelvin(Tmax)}`;
  return null;
}

/** One sentence: what the reader chose. */
export function describeChoice(choice: ConsensusChoice): string {
  const kinds = { all: "Measured and calculated datasets", measured: "Measured datasets", calculated: "Calculated datasets" }[
    choice.include
  ];
  const window = describeWindow(choice);
  return `${kinds}, ${window ? `points from ${window}` : "every temperature"}; evaluated datasets never enter.`;
}

/** A version as the selection needs it (the reaction queries return this shape). */
export interface CandidateVersion {
  versionId: number;
  datasetId: number;
  number: number;
  title: string;
  state: string;
  versionIdentifier: string | null;
  payload: unknown;
  points: readonly RatePoint[];
  /** Its stored analysis (the engine's result over all its points), when there is one. */
  analysis?: unknown;
}

/** A curator's decision to leave a version out, as readers see it. */
export interface CuratorExclusion {
  versionId: number;
  reason: string;
  excludedAt: Date;
}

export type NotUsedCode =
  | "retracted"
  | "not_published"
  | "evaluated"
  | "unknown_method"
  | "not_chosen"
  | "excluded_by_curator"
  | "other_order"
  | "too_few_temperatures"
  | "outside_window"
  | "unit_suspect"
  | "off_consensus";

export interface SelectedDataset {
  versionId: number;
  datasetId: number;
  number: number;
  title: string;
  versionIdentifier: string | null;
  kind: MethodKind;
  /** Points in the dataset and points that enter (inside the window). */
  points: number;
  pointsUsed: number;
  /** Temperatures of the points that enter, K. */
  Tmin: number;
  Tmax: number;
}

export interface LeftOutDataset extends Omit<SelectedDataset, "pointsUsed" | "Tmin" | "Tmax"> {
  reasons: { code: NotUsedCode; message: string }[];
}

export interface ConsensusSelection {
  choice: ConsensusChoice;
  /** Reaction order of the datasets that enter (null when none does). */
  order: ReactionOrder | null;
  used: SelectedDataset[];
  notUsed: LeftOutDataset[];
  /** Every curator exclusion among the listed versions, whatever else keeps them out. */
  curatorExclusions: CuratorExclusion[];
  /**
   * The engine's input: id is the version id as a string, points inside the window (numbered as in
   * the dataset); versions left out by a curator and by nothing else come with excludedReason.
   */
  inputs: ConsensusDataset[];
}

function methodKind(payload: unknown): MethodKind {
  const category = (payload as { method?: { category?: unknown } } | null)?.method?.category;
  return typeof category === "string" ? (kindByCategory[category] ?? "unknown") : "unknown";
}

function reactionOrder(payload: unknown): ReactionOrder | null {
  const order = (payload as { reaction?: { order?: unknown } } | null)?.reaction?.order;
  return order === 1 || order === 2 || order === 3 ? order : null;
}

const distinctTemperatures = (points: readonly RatePoint[]) => new Set(points.map((p) => p.T)).size;

function rangeOf(points: readonly RatePoint[]) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const p of points) {
    if (p.T < lo) lo = p.T;
    if (p.T > hi) hi = p.T;
  }
  return { lo, hi };
}

/**
 * Splits a reaction's versions into those that enter its consensus (with the points inside the
 * window) and those that do not, each with every reason that keeps it out.
 */
export function selectConsensusDatasets({
  versions,
  exclusions,
  choice,
}: {
  versions: readonly CandidateVersion[];
  exclusions: readonly CuratorExclusion[];
  choice: ConsensusChoice;
}): ConsensusSelection {
  const excluded = new Map(exclusions.map((e) => [e.versionId, e]));
  const window = describeWindow(choice);
  const inWindow = (p: RatePoint) => (choice.Tmin === null || p.T >= choice.Tmin) && (choice.Tmax === null || p.T <= choice.Tmax);

  const judged = versions.map((v) => {
    const kind = methodKind(v.payload);
    const order = reactionOrder(v.payload);
    // Points inside the window, and the number each has in the dataset (for the engine's words).
    const keptNumbers = v.points.flatMap((p, i) => (inWindow(p) ? [i + 1] : []));
    const kept = keptNumbers.map((i) => v.points[i - 1]);
    const reasons: LeftOutDataset["reasons"] = [];
    if (v.state === "retracted")
      reasons.push({
        code: "retracted",
        message:
          v.number > 1
            ? `Version ${v.number} is retracted, and its earlier versions are superseded by it.`
            : `Version ${v.number} is retracted.`,
      });
    else if (v.state !== "published") reasons.push({ code: "not_published", message: `Version ${v.number} is not published.` });
    if (kind === "evaluated")
      reasons.push({
        code: "evaluated",
        message:
          "Evaluated: recommended values derived from other work, often the datasets here, so counting it beside them would count the same data twice.",
      });
    else if (kind === "unknown")
      reasons.push({ code: "unknown_method", message: "Its document does not say whether it is measured or calculated." });
    else if (choice.include !== "all" && choice.include !== kind)
      reasons.push({
        code: "not_chosen",
        message: `${kind === "measured" ? "Measured" : "Calculated"}; the choice is ${choice.include} datasets only.`,
      });
    const exclusion = excluded.get(v.versionId);
    if (exclusion) reasons.push({ code: "excluded_by_curator", message: `Left out by a curator: ${exclusion.reason}` });
    const all = distinctTemperatures(v.points);
    if (all < 2) {
      reasons.push({
        code: "too_few_temperatures",
        message: v.points.length
          ? `All its points are at one temperature (${kelvin(v.points[0].T)}); a fit needs at least two.`
          : "It has no points.",
      });
    } else if (window) {
      const left = distinctTemperatures(kept);
      if (left < 2) {
        const { lo, hi } = rangeOf(v.points);
        reasons.push({
          code: "outside_window",
          message: kept.length
            ? `Only ${kept.length} of its ${v.points.length} points lie within ${window}, at one temperature; a fit needs at least two.`
            : `None of its points (${kelvin(lo)} to ${kelvin(hi)}) lie within ${window}.`,
        });
      }
    }
    return { v, kind, order, kept, keptNumbers, reasons, exclusion };
  });

  // One order for the consensus: the most common among the datasets that could enter (ties: the lower).
  const counts = new Map<ReactionOrder, number>();
  for (const j of judged) if (!j.reasons.length && j.order !== null) counts.set(j.order, (counts.get(j.order) ?? 0) + 1);
  const order = [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]?.[0] ?? null;
  for (const j of judged) {
    if (j.reasons.length) continue;
    if (j.order === null) j.reasons.push({ code: "other_order", message: "Its document gives no reaction order." });
    else if (j.order !== order)
      j.reasons.push({
        code: "other_order",
        message: `Its rate constants are of order ${j.order}, the others’ of order ${order}; they cannot share one expression.`,
      });
  }

  const base = (j: (typeof judged)[number]) => ({
    versionId: j.v.versionId,
    datasetId: j.v.datasetId,
    number: j.v.number,
    title: j.v.title,
    versionIdentifier: j.v.versionIdentifier,
    kind: j.kind,
    points: j.v.points.length,
  });
  const used: SelectedDataset[] = [];
  const inputs: ConsensusDataset[] = [];
  const notUsed: LeftOutDataset[] = [];
  const input = (j: (typeof judged)[number]): ConsensusDataset => ({
    id: String(j.v.versionId),
    points: j.kept,
    order: j.order!,
    label: consensusLabel(j.v),
    pointNumbers: j.keptNumbers,
    // The stored analysis covers every point: its outliers hold only when the window keeps them all.
    ...(j.kept.length === j.v.points.length ? storedOutliers(j.v.analysis, j.v.points.length) : {}),
  });
  for (const j of judged) {
    if (j.reasons.length) {
      notUsed.push({ ...base(j), reasons: j.reasons });
      // Left out by a curator alone: still compared with the consensus, never part of it.
      if (j.exclusion && j.order === order && j.reasons.every((r) => r.code === "excluded_by_curator")) {
        inputs.push({ ...input(j), excludedReason: `by a curator (${j.exclusion.reason.trim().replace(/\.$/, "")})` });
      }
      continue;
    }
    const { lo, hi } = rangeOf(j.kept);
    used.push({ ...base(j), pointsUsed: j.kept.length, Tmin: lo, Tmax: hi });
    inputs.push(input(j));
  }
  const listed = new Set(versions.map((v) => v.versionId));
  return {
    choice,
    order: used.length ? order : null,
    used,
    notUsed,
    curatorExclusions: exclusions.filter((e) => listed.has(e.versionId)),
    inputs,
  };
}

/** The outliers a stored analysis flagged (zero-based point indices), when it has a readable list. */
function storedOutliers(analysis: unknown, points: number): { outliers: number[] } | Record<string, never> {
  const flags = (analysis as { flags?: unknown } | null | undefined)?.flags;
  if (!Array.isArray(flags)) return {};
  const flag = flags.find((f) => (f as { code?: unknown } | null)?.code === "outlier") as { points?: unknown } | undefined;
  if (!flag) return { outliers: [] };
  const list = flag.points;
  return Array.isArray(list) && list.every((i) => Number.isInteger(i) && i >= 0 && i < points) ? { outliers: list as number[] } : {};
}

/**
 * Runs the consensus engine on the selection. With fewer than MIN_CONSENSUS_DATASETS datasets, or
 * input the engine refuses, the result is null and `unavailable` says why in plain words.
 */
export function runSelectedConsensus(selection: ConsensusSelection): { result: ConsensusResult | null; unavailable: string | null } {
  const n = selection.inputs.filter((d) => !d.excludedReason).length;
  if (n < MIN_CONSENSUS_DATASETS) {
    return {
      result: null,
      unavailable: `A consensus needs at least ${MIN_CONSENSUS_DATASETS} datasets; ${n === 0 ? "none" : "only one"} of this choice can enter.`,
    };
  }
  try {
    return { result: consensus(selection.inputs), unavailable: null };
  } catch (err) {
    if (err instanceof AnalysisError) return { result: null, unavailable: `No consensus for this choice: ${err.message}` };
    throw err;
  }
}

/**
 * The selection after the engine has run: a used dataset the engine left out — as a likely unit
 * mistake, or set aside as off the consensus of the others — moves to the not-used list with that
 * reason, so the lists say what the fit rests on.
 */
export function withEngineLeftOut(selection: ConsensusSelection, result: ConsensusResult | null): ConsensusSelection {
  if (!result) return selection;
  const reasonOf = new Map<string, { code: "unit_suspect" | "off_consensus"; message: string }>();
  for (const m of result.members) {
    if (m.included) continue;
    if (m.unitSuspect && m.leftOut?.startsWith("a likely unit mistake")) {
      reasonOf.set(m.id, {
        code: "unit_suspect",
        message: `Left out by the consensus: its rate constants are off the others by about ${m.unitSuspect}, a likely unit mistake; check its units.`,
      });
    } else if (m.setAside) {
      reasonOf.set(m.id, {
        code: "off_consensus",
        message: "Left out by the consensus: off the consensus of the others — not used for the curve (it is still compared with it).",
      });
    }
  }
  const moved = selection.used.filter((d) => reasonOf.has(String(d.versionId)));
  if (!moved.length) return selection;
  return {
    ...selection,
    used: selection.used.filter((d) => !reasonOf.has(String(d.versionId))),
    notUsed: [
      ...selection.notUsed,
      ...moved.map((d) => ({
        versionId: d.versionId,
        datasetId: d.datasetId,
        number: d.number,
        title: d.title,
        versionIdentifier: d.versionIdentifier,
        kind: d.kind,
        points: d.points,
        reasons: [reasonOf.get(String(d.versionId))!],
      })),
    ],
  };
}

/** The selection as the API returns it (without the points, which the version endpoints serve). */
export function selectionToJson(selection: ConsensusSelection) {
  return {
    include: selection.choice.include,
    Tmin: selection.choice.Tmin,
    Tmax: selection.choice.Tmax,
    description: describeChoice(selection.choice),
    order: selection.order,
    used: selection.used,
    notUsed: selection.notUsed,
    curatorExclusions: selection.curatorExclusions.map((e) => ({
      versionId: e.versionId,
      reason: e.reason,
      excludedAt: e.excludedAt.toISOString(),
    })),
  };
}

/**
 * A dataset's points as the plot draws them: those its consensus summary uses, and those it does
 * not (outside the reader's window, or outliers of its own fit) with why.
 */
export function plotPoints(
  v: { points: readonly { T: number; k: number; sigmaLnK?: number }[] },
  input: { pointNumbers?: readonly number[] } | undefined,
  m: { outliers: number[] } | undefined,
) {
  // The stated uncertainty goes with its point, for the error bar.
  const toLnk = (p: { T: number; k: number; sigmaLnK?: number }) => ({
    T: p.T,
    lnk: Math.log(p.k),
    ...(p.sigmaLnK ? { sigmaLnK: p.sigmaLnK } : {}),
  });
  if (!input?.pointNumbers) return { points: v.points.map(toLnk), unused: [] };
  const kept = new Set(input.pointNumbers.map((n) => n - 1));
  const outliers = new Set((m?.outliers ?? []).map((i) => input.pointNumbers![i] - 1));
  const used = v.points.filter((_, i) => kept.has(i) && !outliers.has(i));
  const unused = v.points.filter((_, i) => !kept.has(i) || outliers.has(i));
  const why = [
    kept.size < v.points.length ? "outside the window" : null,
    outliers.size ? `${outliers.size === 1 ? "an outlier" : "outliers"} of its own fit` : null,
  ]
    .filter(Boolean)
    .join(" or ");
  return { points: used.map(toLnk), unused: unused.map(toLnk), unusedWhy: why };
}

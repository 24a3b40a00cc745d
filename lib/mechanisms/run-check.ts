import "server-only";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { analysisThreads } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { reactionPath } from "@/lib/reactions/paths";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { runAnalysisTask } from "@/lib/workers/pool";
import type { JudgeInput, JudgeOutput } from "./judge";
import { matchReaction, matchSpecies, mechanismReactionKeys, mechanismSpeciesNames, type SpeciesMatch } from "./match";
import {
  createMechanismCheck,
  failMechanismCheck,
  findReactionIdsByKeys,
  findSpeciesCatalogue,
  finishMechanismCheck,
  listSpeciesChoices,
} from "./queries";
import type { MechanismRequestInput } from "./request";
import type { MechanismProblem, ParsedMechanism } from "./types";
import type { MechanismVerdict, ReactionVerdict } from "./verdicts";

/** Problems kept in a report (the count says how many there were). */
export const MAX_REPORTED_PROBLEMS = 1000;
/** Matched reactions judged per worker task. */
const JUDGE_BATCH = 200;
/** Reactions whose data are read from the database at once. */
const READ_CONCURRENCY = 8;

export interface ReportReaction extends ReactionVerdict {
  index: number;
  line: number;
  equation: string;
  rateType: string;
  order: number;
  duplicate: boolean;
  rate: { A: number; b: number; Ea: number } | null;
  /** The stored reaction compared (forward direction), its key and page. */
  reaction: { key: string; path: string } | null;
  /** A stored reaction of the reverse direction, never compared. */
  reverse: { key: string; path: string } | null;
  datasets: number;
}

export interface MechanismReport {
  about: {
    caution: string;
    format: string;
    units: ParsedMechanism["units"];
    window: { Tmin: number; Tmax: number };
    units_of_rates: string;
  };
  summary: Record<MechanismVerdict | "reactions" | "extrapolatedAny" | "problems" | "speciesUnmatched", number>;
  problems: MechanismProblem[];
  species: SpeciesMatch[];
  reactions: ReportReaction[];
}

/**
 * Reads, matches and judges a mechanism for its owner, stores the check and returns its id and
 * report. Reading and judging run on the analysis worker threads; this function only queries.
 */
export async function runMechanismCheck({ ownerId, input }: { ownerId: number; input: MechanismRequestInput }) {
  const read = await runAnalysisTask("readMechanism", input, { transfer: [input.bytes.buffer as ArrayBuffer] });
  if (!read.ok) throw new AppError(read.code, read.message, read.errors);
  const id = await createMechanismCheck({
    ownerId,
    name: read.name,
    source: read.text,
    window: read.window,
    total: read.mechanism.reactions.length,
  });
  try {
    const report = await buildReport({ ownerId, mechanism: read.mechanism, window: read.window });
    await finishMechanismCheck({ id, report: report as unknown as Record<string, unknown> });
    return { id, report };
  } catch (err) {
    await failMechanismCheck({ id, error: err instanceof AppError ? err.message : "The check failed on our side; it has been logged." });
    throw err;
  }
}

export async function buildReport({
  ownerId,
  mechanism,
  window,
}: {
  ownerId: number;
  mechanism: ParsedMechanism;
  window: { Tmin: number; Tmax: number };
}): Promise<MechanismReport> {
  const names = mechanismSpeciesNames(mechanism);
  const [catalogue, choices] = await Promise.all([
    findSpeciesCatalogue({ names: names.map((n) => n.name), formulas: names.flatMap((n) => (n.formula ? [n.formula] : [])) }),
    listSpeciesChoices({ userId: ownerId }),
  ]);
  const species = matchSpecies({ names, choices, ...catalogue });
  const inchiKeyOf = new Map(species.map((s) => [s.name, s.inchiKey]));

  const keyed = mechanism.reactions.map((r) => ({ r, keyed: r.rate ? mechanismReactionKeys(r, inchiKeyOf) : null }));
  const keys = keyed.flatMap(({ keyed: k }) => (k && "keys" in k ? [k.keys.forward, k.keys.reverse] : []));
  const reactionIdOf = await findReactionIdsByKeys({ keys });
  const matches = keyed.map(({ r, keyed: k }) => ({ r, k, match: k && "keys" in k ? matchReaction(k.keys, reactionIdOf) : null }));

  // Every forward-matched reaction's versions and exclusions, a few reactions at a time.
  const toJudge = matches.filter((m) => m.match?.forward && m.r.rate);
  const inputs: JudgeInput[] = new Array(toJudge.length);
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(READ_CONCURRENCY, toJudge.length) }, async () => {
      while (next < toJudge.length) {
        const i = next++;
        const { r, match } = toJudge[i];
        const reactionId = match!.forward!.reactionId;
        const [versions, exclusions] = await Promise.all([
          listPublicVersionsOfReaction({ reactionId }),
          listConsensusExclusions({ reactionId }),
        ]);
        // DUPLICATE entries of one reaction act together: each is judged as the sum of them all.
        const duplicates = r.duplicate
          ? toJudge
              .filter((o) => o.r !== r && o.r.duplicate && o.match!.forward!.reactionId === reactionId && o.r.order === r.order)
              .map((o) => ({ line: o.r.line, rate: o.r.rate! }))
          : [];
        inputs[i] = { index: r.index, rate: r.rate!, ...(duplicates.length ? { duplicates } : {}), order: r.order, versions, exclusions };
      }
    }),
  );
  // Batches go to the analysis threads side by side, as many at once as there are threads (the rest of the
  // queue stays free for other requests).
  const judged = new Map<number, JudgeOutput>();
  const batches = Array.from({ length: Math.ceil(inputs.length / JUDGE_BATCH) }, (_, b) =>
    inputs.slice(b * JUDGE_BATCH, (b + 1) * JUDGE_BATCH),
  );
  let nextBatch = 0;
  await Promise.all(
    Array.from({ length: Math.min(analysisThreads(), batches.length) }, async () => {
      while (nextBatch < batches.length) {
        const batch = batches[nextBatch++];
        for (const out of await runAnalysisTask("judgeMechanism", { window, reactions: batch })) judged.set(out.index, out);
      }
    }),
  );

  const reactions: ReportReaction[] = matches.map(({ r, k, match }) => {
    const forward = match?.forward ? { key: match.forward.key, path: reactionPath(match.forward.key) } : null;
    const reverse = match?.reverse ? { key: match.reverse.key, path: reactionPath(match.reverse.key) } : null;
    let verdict: ReactionVerdict;
    const j = judged.get(r.index);
    if (r.notChecked) verdict = { verdict: "not_checked", extrapolated: [], comparison: null, note: capitalise(r.notChecked) + "." };
    else if (k && "unmatched" in k)
      verdict = {
        verdict: "no_data",
        extrapolated: [],
        comparison: null,
        note: `Species not matched: ${k.unmatched.join(", ")} (choose them in the mapping table).`,
      };
    else if (j) verdict = { verdict: j.verdict, extrapolated: j.extrapolated, comparison: j.comparison, note: j.note };
    else if (reverse)
      verdict = {
        verdict: "no_data",
        extrapolated: [],
        comparison: null,
        note: "Data are published for the reverse direction only; they are not compared with the mechanism's forward rate.",
      };
    else verdict = { verdict: "no_data", extrapolated: [], comparison: null, note: "No published data for this reaction." };
    return {
      index: r.index,
      line: r.line,
      equation: r.equation,
      rateType: r.rateType,
      order: r.order,
      duplicate: r.duplicate,
      rate: r.rate,
      reaction: forward,
      reverse,
      datasets: j?.datasets ?? 0,
      ...verdict,
    };
  });
  const count = (v: MechanismVerdict) => reactions.filter((r) => r.verdict === v).length;
  return {
    about: {
      caution: CAUTION,
      format: mechanism.format,
      units: mechanism.units,
      window,
      units_of_rates: "A in cm, molecule, s for the reaction's order (k = A T^b exp(−Ea/RT), T in K); Ea in J/mol",
    },
    summary: {
      reactions: reactions.length,
      agrees: count("agrees"),
      disagrees: count("disagrees"),
      extrapolated: count("extrapolated"),
      extrapolatedAny: reactions.filter((r) => r.extrapolated.length > 0).length,
      no_data: count("no_data"),
      not_checked: count("not_checked"),
      problems: mechanism.problems.length,
      speciesUnmatched: species.filter((s) => !s.inchiKey).length,
    },
    problems: mechanism.problems.slice(0, MAX_REPORTED_PROBLEMS),
    species,
    reactions,
  };
}

const capitalise = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

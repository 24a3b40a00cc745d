import "server-only";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { analysisThreads } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { reactionPath } from "@/lib/reactions/paths";
import { listConsensusExclusionsOfReactions, listPublicVersionsOfReactions } from "@/lib/reactions/queries";
import { runAnalysisTask } from "@/lib/workers/pool";
import { judgeWithBasis, type JudgeInput, type JudgeOutput } from "./judge";
import { matchReaction, matchSpecies, mechanismReactionKeys, mechanismSpeciesNames, type SpeciesMatch } from "./match";
import type { CheckProgress } from "./progress";
import {
  createQueuedMechanismCheck,
  findReactionIdsByKeys,
  findSpeciesCatalogue,
  listComparisonBases,
  listSpeciesChoices,
} from "./queries";
import type { MechanismRequestInput } from "./request";
import type { MechanismProblem, ParsedMechanism } from "./types";
import type { MechanismVerdict, ReactionVerdict } from "./verdicts";

/** Problems kept in a report (the count says how many there were). */
export const MAX_REPORTED_PROBLEMS = 1000;
/** The most DUPLICATE entries of one reaction judged together as their sum. */
export const MAX_DUPLICATE_TERMS = 20;
/** Matched reactions judged per worker task. */
const JUDGE_BATCH = 200;
/** Reactions whose data are read from the database in one statement. */
const READ_BATCH = 250;

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
 * Reads a mechanism sent by its owner (on a worker thread: a file that cannot be read is refused here, nothing stored)
 * and stores the check as queued with its run's job (./check-job.ts reads, matches and judges it in the background).
 */
export async function submitMechanismCheck({ ownerId, input }: { ownerId: number; input: MechanismRequestInput }) {
  const read = await runAnalysisTask("readMechanism", input, { transfer: [input.bytes.buffer as ArrayBuffer] });
  if (!read.ok) throw new AppError(read.code, read.message, read.errors);
  const id = await createQueuedMechanismCheck({
    ownerId,
    name: read.name,
    source: read.text,
    format: read.mechanism.format,
    window: read.window,
    total: read.mechanism.reactions.length,
  });
  return { id, reactions: read.mechanism.reactions.length, problems: read.mechanism.problems };
}

/** Called as the report is built; it may write the progress (it is awaited, so it should not take long). */
export type ProgressListener = (progress: CheckProgress) => void | Promise<void>;

export async function buildReport({
  ownerId,
  mechanism,
  window,
  onProgress = () => {},
}: {
  ownerId: number;
  mechanism: ParsedMechanism;
  window: { Tmin: number; Tmax: number };
  onProgress?: ProgressListener;
}): Promise<MechanismReport> {
  await onProgress({ stage: "matching", done: 0, total: mechanism.reactions.length });
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

  // Every forward-matched reaction's comparison basis as kept with its search summary; the reactions without a usable
  // one (written before bases were kept, or by another engine version) have their versions and exclusions read,
  // READ_BATCH reactions a statement, and are judged on the analysis threads as the summary's writer would.
  const toJudge = matches.filter((m) => m.match?.forward && m.r.rate);
  const reactionIds = [...new Set(toJudge.map((m) => m.match!.forward!.reactionId))];
  await onProgress({ stage: "data", done: 0, total: reactionIds.length });
  const bases = await listComparisonBases({ reactionIds });
  const unkept = reactionIds.filter((id) => !bases.has(id));
  await onProgress({ stage: "data", done: reactionIds.length - unkept.length, total: reactionIds.length });
  const versionsOf = new Map<number, JudgeInput["versions"]>();
  const exclusionsOf = new Map<number, JudgeInput["exclusions"]>();
  for (let i = 0; i < unkept.length; i += READ_BATCH) {
    const ids = unkept.slice(i, i + READ_BATCH);
    const [versions, exclusions] = await Promise.all([
      listPublicVersionsOfReactions({ reactionIds: ids }),
      listConsensusExclusionsOfReactions({ reactionIds: ids }),
    ]);
    for (const [id, list] of versions) versionsOf.set(id, list);
    for (const [id, list] of exclusions) exclusionsOf.set(id, list);
    await onProgress({
      stage: "data",
      done: reactionIds.length - unkept.length + Math.min(unkept.length, i + READ_BATCH),
      total: reactionIds.length,
    });
  }
  // DUPLICATE entries of one reaction act together: each is judged as the sum of them all — up to MAX_DUPLICATE_TERMS
  // of them (a real mechanism has two to four); a larger group is not summed (its entries are listed as not checked).
  const duplicatesOf = new Map<string, { line: number; rate: NonNullable<ParsedMechanism["reactions"][number]["rate"]> }[]>();
  for (const { r, match } of toJudge)
    if (r.duplicate) {
      const key = `${match!.forward!.reactionId}:${r.order}`;
      let group = duplicatesOf.get(key);
      if (!group) duplicatesOf.set(key, (group = []));
      group.push({ line: r.line, rate: r.rate! });
    }
  const judged = new Map<number, JudgeOutput>();
  const tooMany = new Map<number, number>();
  const inputs: JudgeInput[] = [];
  await onProgress({ stage: "judging", done: 0, total: toJudge.length });
  for (const { r, match } of toJudge) {
    const reactionId = match!.forward!.reactionId;
    const group = r.duplicate ? duplicatesOf.get(`${reactionId}:${r.order}`)! : [];
    if (group.length > MAX_DUPLICATE_TERMS) {
      tooMany.set(r.index, group.length);
      continue;
    }
    const duplicates = group.filter((d) => d.line !== r.line);
    const rate = { index: r.index, rate: r.rate!, ...(duplicates.length ? { duplicates } : {}), order: r.order };
    const basis = bases.get(reactionId);
    // A kept basis is judged here (a few dozen evaluations of two expressions); the others on the threads.
    if (basis) judged.set(r.index, judgeWithBasis(rate, basis, window));
    else inputs.push({ ...rate, versions: versionsOf.get(reactionId) ?? [], exclusions: exclusionsOf.get(reactionId) ?? [] });
  }
  // Batches go to the analysis threads side by side, as many at once as there are threads (the rest of the
  // queue stays free for other requests).
  const batches = Array.from({ length: Math.ceil(inputs.length / JUDGE_BATCH) }, (_, b) =>
    inputs.slice(b * JUDGE_BATCH, (b + 1) * JUDGE_BATCH),
  );
  await onProgress({ stage: "judging", done: judged.size, total: toJudge.length });
  let nextBatch = 0;
  await Promise.all(
    Array.from({ length: Math.min(analysisThreads(), batches.length) }, async () => {
      while (nextBatch < batches.length) {
        const batch = batches[nextBatch++];
        for (const out of await runAnalysisTask("judgeMechanism", { window, reactions: batch })) judged.set(out.index, out);
        await onProgress({ stage: "judging", done: judged.size, total: toJudge.length });
      }
    }),
  );

  const reactions: ReportReaction[] = matches.map(({ r, k, match }) => {
    const forward = match?.forward ? { key: match.forward.key, path: reactionPath(match.forward.key) } : null;
    const reverse = match?.reverse ? { key: match.reverse.key, path: reactionPath(match.reverse.key) } : null;
    let verdict: ReactionVerdict;
    const j = judged.get(r.index);
    if (r.notChecked) verdict = { verdict: "not_checked", extrapolated: [], comparison: null, note: capitalise(r.notChecked) + "." };
    else if (tooMany.has(r.index))
      verdict = {
        verdict: "not_checked",
        extrapolated: [],
        comparison: null,
        note: `One of ${tooMany.get(r.index)} DUPLICATE entries of this reaction; more than ${MAX_DUPLICATE_TERMS} terms are not summed, so none is checked.`,
      };
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

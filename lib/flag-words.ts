/**
 * A flag as a reader reads it: the sentence pages, check summaries and point marks show, in plain
 * words, and apart from it the technical account (the test, its statistic and bound) for a "how this
 * is found" note. The engine's stored message (lib/kinetics/flag-text.ts) stays the technical one, for
 * the API and the exports; only the flags whose message is made of statistics are reworded here.
 * Pure: pages and client components share it.
 */
import { formatFlagMessage, type FlagUnits } from "@/lib/kinetics/flag-text";
import type { Flag } from "@/lib/kinetics/types";

type FlagLike = Pick<Flag, "code" | "message" | "points" | "quantities">;

function listPoints(points: readonly number[]): string {
  const names = points.map((i) => `${i + 1}`);
  if (names.length === 0) return "Some points";
  return names.length === 1 ? `Point ${names[0]}` : `Points ${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}

function modelName(flag: FlagLike): string {
  return flag.quantities?.coefficients?.value === 3 ? "modified Arrhenius" : "Arrhenius";
}

/** The plain sentence of a flag whose engine message is statistics; null for the others. */
function plainSentence(flag: FlagLike): string | null {
  const points = flag.points ?? [];
  const one = points.length === 1;
  if (flag.code === "outlier")
    return `${listPoints(points)} ${one ? "lies" : "lie"} much farther from the ${modelName(flag)} fit than the scatter of the other points allows: check ${one ? "that row" : "those rows"} for a typing or unit mistake, or a different condition.`;
  if (flag.code === "influential_point")
    return `${listPoints(points)} ${one ? "pulls" : "pull"} the ${modelName(flag)} fit more than any other point should and ${one ? "lies" : "lie"} off the line of the others: without ${one ? "it" : "them"} the fitted parameters would change noticeably.`;
  return null;
}

/** What a reader reads of a flag: plain words, in the reader's units. */
export function readerFlagMessage(flag: FlagLike, units: FlagUnits = {}): string {
  return plainSentence(flag) ?? formatFlagMessage(flag, units);
}

/**
 * The technical account of a flag whose reader's sentence leaves it out (the test, its statistic and
 * bound: "externally studentized residual beyond ±3.2 …"), for a "how this is found" note; null when
 * the reader's sentence is already the engine's own.
 */
export function technicalFlagNote(flag: FlagLike, units: FlagUnits = {}): string | null {
  return plainSentence(flag) === null ? null : formatFlagMessage(flag, units);
}

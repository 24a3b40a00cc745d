/**
 * The findings of a version's checks in a few plain words, for lists (the review queue, My
 * deposits): how many of each severity, and the first finding of the most severe kind in full.
 * Pure: the pages hand it the stored checks and the fit's flags.
 */

export interface Finding {
  /** The check's code when it has one (stored checks and flags do). */
  code?: string;
  severity: string;
  message: string;
}

/**
 * Checks that passed. The analysis stores them beside the findings (the balance check writes
 * `balanced` when elements and charge balance), but a check that passed is not a finding: it is
 * never counted, listed as a note or made a version's worst severity.
 */
const PASSED: Record<string, string> = { balanced: "Balanced: elements and charge" };

/** Whether a stored check is a finding (anything but a passed check). */
export function isFinding(check: { code?: string }): boolean {
  return check.code === undefined || !(check.code in PASSED);
}

/** Only the findings of these checks, in their order. */
export function findingsOnly<T extends { code?: string }>(checks: readonly T[]): T[] {
  return checks.filter(isFinding);
}

/** The passed checks among these, each in plain words ("Balanced: elements and charge"). */
export function passedCheckWords(checks: readonly { code?: string }[]): string[] {
  return [...new Set(checks.flatMap((c) => (c.code !== undefined && c.code in PASSED ? [PASSED[c.code]] : [])))];
}

export interface CheckSummary {
  /** Findings per severity. */
  counts: { error: number; warn: number; info: number };
  /** "1 problem, 2 warnings, 3 notes", or "no findings". */
  words: string;
  /** The first finding of the most severe kind present (null when there is none). */
  first: Finding | null;
  /** The most severe kind present: "error", "warn", "info" or "none". */
  worst: "error" | "warn" | "info" | "none";
}

/** A severity's noun, singular or plural: error → problem, warn → warning, info → note. */
export function severityNoun(severity: string, n = 1): string {
  const one = severity === "error" ? "problem" : severity === "warn" ? "warning" : severity === "info" ? "note" : severity;
  return n === 1 ? one : `${one}s`;
}

const ORDER = ["error", "warn", "info"] as const;

/** The findings among these checks summarised; passed checks are left out. */
export function summariseFindings(checks: readonly Finding[]): CheckSummary {
  const findings = findingsOnly(checks);
  const counts = { error: 0, warn: 0, info: 0 };
  for (const f of findings) if (f.severity in counts) counts[f.severity as keyof typeof counts] += 1;
  const worst = ORDER.find((s) => counts[s] > 0) ?? "none";
  const words = ORDER.filter((s) => counts[s] > 0)
    .map((s) => `${counts[s]} ${severityNoun(s, counts[s])}`)
    .join(", ");
  return {
    counts,
    words: words || "no findings",
    first: worst === "none" ? null : (findings.find((f) => f.severity === worst) ?? null),
    worst,
  };
}

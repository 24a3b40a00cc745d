/**
 * What a running mechanism check is doing, for its progress bar: a stage and how much of it is done.
 * Pure: the job writes these to the check's row, the page and GET /api/v1/mechanism-checks/:id read them.
 */
export const CHECK_STAGES = ["reading", "matching", "data", "judging", "storing"] as const;
export type CheckStage = (typeof CHECK_STAGES)[number];

export interface CheckProgress {
  stage: CheckStage;
  done: number;
  total: number;
}

export const CHECK_STAGE_WORDS: Record<CheckStage, string> = {
  reading: "Reading the mechanism",
  matching: "Matching species and reactions",
  data: "Reading the published data of the matched reactions",
  judging: "Comparing each matched reaction with its consensus",
  storing: "Writing the report",
};

/** Seconds without a heartbeat after which a running check is taken as stopped (its server gone) and queued again. */
export const HEARTBEAT_STALE_SECONDS = 120;
/** Runs a check may start; one that stops beating after this many is failed with a worded message. */
export const MAX_CHECK_RUNS = 3;

/** The sentence a check that stopped too often is failed with. */
export const STOPPED_TOO_OFTEN = `The check was started ${MAX_CHECK_RUNS} times and each run stopped before it finished (the server restarted or ran out of resources); it has been given up. Try again later, or split the mechanism into smaller parts.`;

/** One line for a person: "Reading the published data … 120 of 2 500". */
export function describeProgress({
  state,
  stage,
  progress,
  total,
}: {
  state: string;
  stage: string | null;
  progress: number;
  total: number;
}) {
  if (state === "queued") return "Waiting for its turn";
  const words = stage && stage in CHECK_STAGE_WORDS ? CHECK_STAGE_WORDS[stage as CheckStage] : "Starting";
  return total > 0 ? `${words}: ${progress} of ${total}` : words;
}

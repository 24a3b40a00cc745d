import { z } from "zod";
import { idFor } from "@/lib/ids";

// The curator's consensus exclusion, shared by the form, its server action and the database check
// (drizzle/0010: 3 to 1000 characters).

export const EXCLUSION_REASON_MIN = 3;
export const EXCLUSION_REASON_MAX = 1000;

/** The reason readers will see beside the dataset ("left out by a curator: …"). */
export const exclusionReasonField = z
  .string({ error: "Give a reason: readers see it beside the dataset" })
  .trim()
  .min(EXCLUSION_REASON_MIN, `Give a reason of at least ${EXCLUSION_REASON_MIN} characters: readers see it beside the dataset`)
  .max(EXCLUSION_REASON_MAX, `Keep the reason under ${EXCLUSION_REASON_MAX} characters`);

export const excludeFromConsensusSchema = z.object({ versionId: idFor("dataset version"), reason: exclusionReasonField });
export const includeInConsensusSchema = z.object({ versionId: idFor("dataset version") });

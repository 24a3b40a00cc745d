import { z } from "zod";
import { REPLY_MAX } from "./capabilities";

/** The body of POST /api/v1/versions/:id/transitions (the route and the API document share it). */
export const transitionRequestSchema = z
  .object({
    transition: z.enum(["submit", "withdraw", "start_review", "return", "accept", "decline", "retract"]),
    reason: z.string().trim().max(5000).optional(),
    // Bounds and wording of the rule: checkReplyOrThrow (lib/curation/capabilities.ts).
    reply: z
      .string()
      .max(2 * REPLY_MAX)
      .optional(),
  })
  .strict();

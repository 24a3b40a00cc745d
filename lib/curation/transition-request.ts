import { z } from "zod";
import { describeCharacter, forbiddenCharacter } from "@/lib/text/clean";
import { REPLY_MAX } from "./capabilities";

/** A curator's reason or an author's reply: several lines allowed, control and invisible characters refused (they reach mails and feeds). */
export const decisionText = (schema: z.ZodString) =>
  schema.superRefine((text, ctx) => {
    const found = forbiddenCharacter(text, { lines: true });
    if (found)
      ctx.addIssue({
        code: "custom",
        message: `contains ${describeCharacter(found.character)} at character ${found.index + 1}; remove it`,
      });
  });

/** The body of POST /api/v1/versions/:id/transitions (the route and the API document share it). */
export const transitionRequestSchema = z
  .object({
    transition: z.enum(["submit", "withdraw", "start_review", "return", "accept", "decline", "retract"]),
    reason: decisionText(z.string().trim().max(5000)).optional(),
    // Bounds and wording of the rule: checkReplyOrThrow (lib/curation/capabilities.ts).
    reply: decisionText(z.string().max(2 * REPLY_MAX)).optional(),
  })
  .strict();

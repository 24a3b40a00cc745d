import "server-only";
import { AppError } from "@/lib/errors";
import { parseQueryText } from "./parse-query";
import { suggestSearch, type SuggestPattern } from "./queries";
import { resolveQuery } from "./resolve-query";

/**
 * The header box's suggestions for what has been typed so far (GET /api/v1/search/suggest). Text the
 * search page reads as a reaction pattern ("OH + CH4", "CH4 -> CH3", "CH4 → CH3", a reaction key) is
 * resolved exactly as the search page resolves it, so the reactions offered are those the search would
 * find; anything else is matched as names, formulas and equation text.
 */
export async function suggestForText({ q }: { q: string }): ReturnType<typeof suggestSearch> {
  const shape = parseQueryText(q);
  if (shape.kind !== "reaction" && shape.kind !== "reactionKey") return suggestSearch({ q });
  let pattern: SuggestPattern | null = null;
  try {
    const { parsed } = await resolveQuery(q);
    if (parsed.kind === "reaction" || parsed.kind === "reactionKey") pattern = parsed;
  } catch (err) {
    // Half-typed structures ("OH + C(") are not an error while typing: the search page says so on Enter.
    if (!(err instanceof AppError)) throw err;
  }
  return suggestSearch({ q, pattern });
}

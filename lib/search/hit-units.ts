import { unitText } from "@/lib/unit-labels";
import type { DatasetHit, ReactionHit } from "./types";

/**
 * A hit with its units in the files' ASCII spelling (lib/unit-labels.ts unitText), whatever an
 * engine's stored document holds (documents written before the spelling was fixed held the page
 * label, "cm³ molecule⁻¹ s⁻¹"). Pure.
 */
export function hitInFileUnits<H extends DatasetHit | ReactionHit>(hit: H): H {
  if ("aUnit" in hit) return { ...hit, aUnit: unitText("rateConstant", hit.aUnit) };
  if ("consensus" in hit && hit.consensus)
    return { ...hit, consensus: { ...hit.consensus, aUnit: unitText("rateConstant", hit.consensus.aUnit) } };
  return hit;
}

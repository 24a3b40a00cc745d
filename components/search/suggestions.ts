import { speciesPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";

/**
 * Suggestions of the header's search box (GET /api/v1/search/suggest?q=…): species and reactions
 * matching what has been typed so far, where choosing one leads, and how many there are in words
 * for screen readers.
 */

/** One line of the list: a species or a reaction. */
export interface Suggestion {
  kind: "species" | "reaction";
  /** What the list shows: a species' name, a reaction's equation. */
  label: string;
  /** A species' formula (and the synonym that matched), a reaction's dataset count, in words. */
  detail: string;
  /** The search text that finds it. */
  q: string;
  /** Its own page: the species page or the reaction page. */
  href: string;
}

/** What GET /api/v1/search/suggest answers (lib/search/suggest.ts suggestForText). */
export interface SuggestAnswer {
  species: { inchiKey: string; name: string; formula: string; matched: string; datasetCount: number }[];
  reactions: { reactionId: number; reactionKey: string; equation: string; datasetCount: number }[];
}

const datasetWords = (n: number) => `${n} dataset${n === 1 ? "" : "s"}`;

/** The answer as list lines: species first, then reactions. Counts are each item's own, whatever was typed. */
export function suggestionsOf(answer: SuggestAnswer): Suggestion[] {
  return [
    ...answer.species.map((s) => ({
      kind: "species" as const,
      label: s.name,
      detail: [
        s.formula !== s.name ? s.formula : "",
        s.matched !== s.name && s.matched !== s.formula ? `also “${s.matched}”` : "",
        datasetWords(s.datasetCount),
      ]
        .filter(Boolean)
        .join(", "),
      q: s.name,
      href: speciesPath(s.inchiKey),
    })),
    ...answer.reactions.map((r) => ({
      kind: "reaction" as const,
      label: r.equation,
      detail: datasetWords(r.datasetCount),
      // The equation reads better in the box than the key.
      q: r.equation,
      href: reactionPath(r.reactionKey),
    })),
  ];
}

/** Where a suggestion leads: its own page (free text typed without choosing one opens /search instead). */
export function suggestionHref(s: Suggestion): string {
  return s.href;
}

/** "3 suggestions: 2 species and 1 reaction. Up and down arrows to choose." */
export function suggestionCountWords(list: Suggestion[]): string {
  if (list.length === 0) return "No suggestions; press Enter to search for the text.";
  const species = list.filter((s) => s.kind === "species").length;
  const reactions = list.length - species;
  const parts = [species ? `${species} species` : "", reactions ? `${reactions} reaction${reactions === 1 ? "" : "s"}` : ""].filter(
    Boolean,
  );
  return `${list.length} suggestion${list.length === 1 ? "" : "s"}: ${parts.join(" and ")}. Up and down arrows to choose.`;
}

export async function fetchSuggestions(q: string, signal?: AbortSignal): Promise<Suggestion[]> {
  const res = await fetch(`/api/v1/search/suggest?${new URLSearchParams({ q }).toString()}`, {
    signal,
    headers: { accept: "application/json" },
  });
  if (!res.ok) throw new Error(`Suggestions answered with status ${res.status}`);
  return suggestionsOf((await res.json()) as SuggestAnswer);
}

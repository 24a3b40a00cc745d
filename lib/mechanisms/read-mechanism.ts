/**
 * A mechanism file → its reactions: the one-pass pre-check, the format (Cantera YAML or the classic
 * plain-text layout), the reader, and the reaction limit. Runs on an analysis worker thread.
 */
import { MAX_MECHANISM_REACTIONS, precheckMechanismText, type PrecheckFailure } from "./limits";
import { readCanteraYamlMechanism } from "./read-cantera-yaml";
import { readPlainTextMechanism } from "./read-plain-text";
import type { MechanismFormat, ParsedMechanism } from "./types";

export type ReadMechanismResult =
  | { ok: true; mechanism: ParsedMechanism }
  | {
      ok: false;
      failure:
        | PrecheckFailure
        | { code: "too_many_reactions" | "not_a_mechanism" | "no_reactions"; line: number; column: number; message: string };
    };

/** Which format the text is in: YAML keys at the start of a line, else the block keywords. */
export function detectMechanismFormat(text: string): MechanismFormat | null {
  if (/^(?:---|units\s*:|phases\s*:|species\s*:|reactions\s*:|description\s*:|generator\s*:)/m.test(text)) return "cantera-yaml";
  if (/^\s*(?:ELEM(?:ENTS)?|SPEC(?:IES)?|REAC(?:TIONS)?)\b/im.test(text)) return "plain-text";
  return null;
}

export function readMechanism(text: string, format: MechanismFormat | "auto" = "auto"): ReadMechanismResult {
  const failure = precheckMechanismText(text);
  if (failure) return { ok: false, failure };
  const chosen = format === "auto" ? detectMechanismFormat(text) : format;
  if (!chosen) {
    return {
      ok: false,
      failure: {
        code: "not_a_mechanism",
        line: 1,
        column: 1,
        message:
          "This does not look like a mechanism: neither Cantera YAML (`units:`, `species:`, `reactions:` keys) nor the plain-text layout (ELEMENTS / SPECIES / REACTIONS blocks).",
      },
    };
  }
  const mechanism = chosen === "cantera-yaml" ? readCanteraYamlMechanism(text) : readPlainTextMechanism(text);
  if (mechanism.reactions.length > MAX_MECHANISM_REACTIONS) {
    const over = mechanism.reactions[MAX_MECHANISM_REACTIONS];
    return {
      ok: false,
      failure: {
        code: "too_many_reactions",
        line: over.line,
        column: 1,
        message: `The mechanism has more than ${MAX_MECHANISM_REACTIONS} reactions; at most ${MAX_MECHANISM_REACTIONS} can be checked at once (the ${MAX_MECHANISM_REACTIONS + 1}th is on line ${over.line}).`,
      },
    };
  }
  // Nothing to check: refused at once with the first problem (or the plain fact), not queued.
  if (mechanism.reactions.length === 0) {
    const first = mechanism.problems[0];
    return {
      ok: false,
      failure: {
        code: "no_reactions",
        line: first?.line ?? 1,
        column: first?.column ?? 1,
        message: first
          ? `No reaction could be read. ${first.message}${mechanism.problems.length > 1 ? ` (and ${mechanism.problems.length - 1} more problems)` : ""}`
          : "The mechanism has no reactions to check.",
      },
    };
  }
  return { ok: true, mechanism: withUndeclaredDuplicates(mechanism) };
}

/**
 * The same reaction written twice (same species on each side, any order, same direction and rate type) with neither
 * marked as a duplicate, both checked: mechanism tools refuse such a file, and a modeller likely meant one of them. Each is still
 * judged on its own; the later line is listed as a problem naming the earlier one.
 */
function withUndeclaredDuplicates(mechanism: ParsedMechanism): ParsedMechanism {
  const side = (ps: { name: string; coefficient: number }[]) =>
    ps
      .map((p) => `${p.coefficient}*${p.name.toLowerCase()}`)
      .sort()
      .join("+");
  const first = new Map<string, { line: number; duplicate: boolean }>();
  const problems = [...mechanism.problems];
  for (const r of mechanism.reactions) {
    if (r.notChecked !== null) continue; // an unreadable line already has its problem
    const key = `${side(r.reactants)}|${r.reversible ? "<=>" : "=>"}|${side(r.products)}|${r.rateType}`;
    const earlier = first.get(key);
    if (!earlier) {
      first.set(key, { line: r.line, duplicate: r.duplicate });
      continue;
    }
    if (earlier.duplicate || r.duplicate) continue;
    problems.push({
      line: r.line,
      column: 1,
      message: `Line ${r.line}: the same reaction as line ${earlier.line}, and neither is marked as a duplicate (DUPLICATE, or \`duplicate: true\` in YAML); mechanism tools refuse this. Each is judged on its own here.`,
    });
  }
  if (problems.length === mechanism.problems.length) return mechanism;
  return { ...mechanism, problems: problems.sort((a, b) => a.line - b.line || a.column - b.column) };
}

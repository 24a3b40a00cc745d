/**
 * Reading a reaction equation as both mechanism formats write it: "H + O2 <=> O + OH",
 * "2OH(+M)=H2O2(+M)", "HCO+M=>H+CO+M", "CH3 + CH3 (+ AR) <=> C2H6 (+ AR)".
 */
import type { MechanismParticipant } from "./types";

export interface ReadEquation {
  reactants: MechanismParticipant[];
  products: MechanismParticipant[];
  reversible: boolean;
  /** "+ M" (or a named collider "+ AR" in Cantera's sense is an ordinary species): a third body. */
  thirdBody: boolean;
  /** "(+M)" or "(+AR)": a pressure-dependent reaction; the collider's name. */
  falloffCollider: string | null;
}

const ARROWS: readonly { text: string; reversible: boolean }[] = [
  { text: "<=>", reversible: true },
  { text: "=>", reversible: false },
  { text: "=", reversible: true },
];

/** The equation's parts, or the reason it cannot be read (with the 0-based offset of the trouble). */
export function readEquation(equation: string): { ok: true; value: ReadEquation } | { ok: false; message: string; offset: number } {
  let arrow: { text: string; reversible: boolean; at: number } | null = null;
  for (const a of ARROWS) {
    const at = equation.indexOf(a.text);
    if (at >= 0) {
      arrow = { ...a, at };
      break;
    }
  }
  if (!arrow) return { ok: false, message: `The equation "${equation}" has no "=", "=>" or "<=>".`, offset: 0 };
  const left = equation.slice(0, arrow.at);
  const right = equation.slice(arrow.at + arrow.text.length);
  if (/[<>=]/.test(right)) return { ok: false, message: `The equation "${equation}" has more than one arrow.`, offset: arrow.at };
  const l = readSide(left);
  const r = readSide(right);
  for (const [side, name, offset] of [
    [l, "left", 0],
    [r, "right", arrow.at + arrow.text.length],
  ] as const) {
    if ("error" in side) return { ok: false, message: `The ${name} side of "${equation}": ${side.error}`, offset };
  }
  if ("error" in l || "error" in r) throw new Error("unreachable");
  if (l.falloff !== r.falloff) {
    return {
      ok: false,
      message: `The equation "${equation}" names the pressure-dependence collider "(+…)" differently on its two sides.`,
      offset: 0,
    };
  }
  if (l.thirdBody !== r.thirdBody) {
    return { ok: false, message: `The equation "${equation}" has the third body "+ M" on one side only.`, offset: 0 };
  }
  return {
    ok: true,
    value: {
      reactants: l.participants,
      products: r.participants,
      reversible: arrow.reversible,
      thirdBody: l.thirdBody,
      falloffCollider: l.falloff,
    },
  };
}

interface Side {
  participants: MechanismParticipant[];
  thirdBody: boolean;
  falloff: string | null;
}

function readSide(text: string): Side | { error: string } {
  let rest = text;
  let falloff: string | null = null;
  const collider = /\(\s*\+\s*([^()\s]+)\s*\)/.exec(rest);
  if (collider) {
    falloff = collider[1];
    rest = rest.slice(0, collider.index) + rest.slice(collider.index + collider[0].length);
  }
  const terms = splitTerms(rest);
  const participants: MechanismParticipant[] = [];
  let thirdBody = false;
  for (const term of terms) {
    if (term === "") return { error: "an empty term (two '+' in a row or a '+' at an end)." };
    if (term === "M" || term === "m") {
      thirdBody = true;
      continue;
    }
    // A coefficient: "2 OH" or "2OH" (a name never starts with a digit in either format), or "0.5 O2".
    const m = /^(\d+(?:\.\d*)?|\.\d+)\s*(.*)$/.exec(term);
    let coefficient = 1;
    let name = term;
    if (m) {
      coefficient = Number(m[1]);
      name = m[2];
      if (!name) return { error: `"${term}" is a number without a species.` };
      if (!(coefficient > 0)) return { error: `"${term}" has a coefficient that is not positive.` };
    }
    if (/\s/.test(name)) return { error: `"${name}" is not one species name (a "+" missing?).` };
    const same = participants.find((p) => p.name === name);
    if (same) same.coefficient += coefficient;
    else participants.push({ name, coefficient });
  }
  if (participants.length === 0) return { error: "no species." };
  return { participants, thirdBody, falloff };
}

/**
 * Terms separated by "+". A "+" that ends a name (an ion, "H3O+") is kept with it: one followed by
 * another "+", by the end, or by nothing but spaces before the next "+".
 */
function splitTerms(text: string): string[] {
  const terms: string[] = [];
  let current = "";
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c !== "+") {
      current += c;
      continue;
    }
    const next = text.slice(i + 1).trimStart();
    const ownsPlus = current.trim() !== "" && !/\s$/.test(current) && (next === "" || next.startsWith("+"));
    if (ownsPlus) current += c;
    else {
      terms.push(current.trim());
      current = "";
    }
  }
  terms.push(current.trim());
  return terms;
}

/** Sum of the coefficients of a side: the order of an elementary reaction's forward rate. */
export function sideOrder(side: readonly MechanismParticipant[]): number {
  return side.reduce((sum, p) => sum + p.coefficient, 0);
}

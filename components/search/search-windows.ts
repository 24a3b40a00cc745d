/**
 * The window fields of the search page (temperature, pressure, year) and the checks made before
 * anything is sent: a bound that is not a plain non-negative number, a minimum above its maximum,
 * "over the whole window" without both ends. The search itself checks the same again (its 400
 * names the parameter); these only spare a round trip. Pure.
 */

export const WINDOW_FIELDS = [
  { name: "tMin", label: "From (K)", pair: "tMax", unit: "K", whole: false },
  { name: "tMax", label: "To (K)", pair: "tMin", unit: "K", whole: false },
  { name: "pMin", label: "From (Pa)", pair: "pMax", unit: "Pa", whole: false },
  { name: "pMax", label: "To (Pa)", pair: "pMin", unit: "Pa", whole: false },
  { name: "yearMin", label: "From (year)", pair: "yearMax", unit: "", whole: true },
  { name: "yearMax", label: "To (year)", pair: "yearMin", unit: "", whole: true },
] as const;

export type WindowParameter = (typeof WINDOW_FIELDS)[number]["name"];

const PLAIN = /^\+?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** The number a field holds, null when empty, NaN when it is not a plain non-negative number. */
export function windowValue(text: string): number | null {
  const t = text.trim();
  if (t === "") return null;
  return PLAIN.test(t) ? Number(t) : NaN;
}

/** Messages by field name; empty when the windows may be sent. */
export function checkWindows(values: Record<WindowParameter, string>, covers: boolean): Map<string, string[]> {
  const out = new Map<string, string[]>();
  const add = (name: string, message: string) => out.set(name, [...(out.get(name) ?? []), message]);
  for (const f of WINDOW_FIELDS) {
    const v = windowValue(values[f.name]);
    if (v !== null && !Number.isFinite(v))
      add(f.name, `Write a non-negative number${f.unit ? ` in ${f.unit}` : ""}, such as ${f.whole ? "1998" : "300"}.`);
    else if (v !== null && f.whole && !Number.isInteger(v)) add(f.name, "Write a whole year, such as 1998.");
  }
  for (const [lo, hi, unit] of [
    ["tMin", "tMax", " K"],
    ["pMin", "pMax", " Pa"],
    ["yearMin", "yearMax", ""],
  ] as const) {
    const a = windowValue(values[lo]);
    const b = windowValue(values[hi]);
    if (a !== null && b !== null && Number.isFinite(a) && Number.isFinite(b) && a > b) {
      add(hi, `The upper end (${values[hi]}${unit}) is below the lower end (${values[lo]}${unit}).`);
    }
  }
  if (covers && (windowValue(values.tMin) === null || windowValue(values.tMax) === null)) {
    add("tCovers", "Give both ends of the temperature window to ask for datasets measured over all of it.");
  }
  return out;
}

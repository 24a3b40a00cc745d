/**
 * When a co-editor saved first: the two documents compared field by field (a data row, a person,
 * a grant, a linked record each count as one field; so does every property of the reaction,
 * method, conditions, units, expression and source), and the person's choice of whose value to
 * keep for each, merged on top of the co-editor's document. fast-json-patch finds what differs.
 */
import { compare, getValueByPointer } from "fast-json-patch";
import { describeWhere } from "./readiness";

type Doc = Record<string, unknown>;
export type Side = "mine" | "theirs";

export interface ConflictField {
  /** "/title", "/points/3", "/reaction/reactants"… */
  pointer: string;
  where: string;
  mine: unknown;
  theirs: unknown;
  /** What the merge takes unless the person chooses otherwise: theirs where only they changed it, else mine. */
  proposed: Side;
  /**
   * Who changed it since the person's last successful save: "me" (the co-editor left it as it was,
   * so mine is always kept, whatever is chosen), "them", or "both" (the person chooses).
   */
  changedBy: "me" | "them" | "both";
}

const isObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === "object" && !Array.isArray(v);

/** Same JSON value (key order ignored). */
export function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, i) => sameValue(v, b[i]));
  if (isObject(a) && isObject(b)) {
    const ka = Object.keys(a).filter((k) => a[k] !== undefined);
    const kb = Object.keys(b).filter((k) => b[k] !== undefined);
    return ka.length === kb.length && ka.every((k) => sameValue(a[k], b[k]));
  }
  return false;
}

const escape = (key: string) => key.replace(/~/g, "~0").replace(/\//g, "~1");

function valueAt(doc: Doc, pointer: string): unknown {
  try {
    return getValueByPointer(doc, pointer);
  } catch {
    return undefined;
  }
}

/** The field a changed path belongs to: a list's item, an object's property, or a top-level value. */
function fieldsOfPath(path: string, docs: Doc[]): string[] {
  const [, top, second] = path.split("/");
  const values = docs.map((d) => d[top.replace(/~1/g, "/").replace(/~0/g, "~")]);
  const container = values.find((v) => Array.isArray(v) || isObject(v));
  if (container === undefined) return [`/${top}`];
  if (second !== undefined) return [`/${top}/${second}`];
  // The whole list or object was added or removed: every item or property of either side is a field.
  const keys = new Set<string>();
  for (const v of values) {
    if (Array.isArray(v)) v.forEach((_, i) => keys.add(String(i)));
    else if (isObject(v)) Object.keys(v).forEach((k) => keys.add(escape(k)));
  }
  return [...keys].map((k) => `/${top}/${k}`);
}

/** The fields where `mine` and `theirs` differ, in document order, with the side a merge would take. */
export function conflictFields(base: Doc, mine: Doc, theirs: Doc): ConflictField[] {
  const pointers = new Set<string>();
  for (const op of compare(theirs, mine)) for (const p of fieldsOfPath(op.path, [mine, theirs])) pointers.add(p);
  const order = (p: string) => {
    const [, top, second] = p.split("/");
    const keys = [...new Set([...Object.keys(mine), ...Object.keys(theirs)])];
    return [keys.indexOf(top), /^\d+$/.test(second ?? "") ? Number(second) : 0] as const;
  };
  return [...pointers]
    .map((pointer) => {
      const m = valueAt(mine, pointer);
      const t = valueAt(theirs, pointer);
      const b = valueAt(base, pointer);
      const changedBy = sameValue(m, b) ? "them" : sameValue(t, b) ? "me" : "both";
      return {
        pointer,
        where: describeWhere(pointer),
        mine: m,
        theirs: t,
        proposed: changedBy === "them" ? "theirs" : "mine",
        changedBy,
      } as ConflictField;
    })
    .filter((f) => !sameValue(f.mine, f.theirs))
    .sort((a, b) => {
      const [a1, a2] = order(a.pointer);
      const [b1, b2] = order(b.pointer);
      return a1 - b1 || a2 - b2 || a.pointer.localeCompare(b.pointer);
    });
}

/** The side a field is merged from: mine wherever only I changed it, else the choice or the proposal. */
export function sideOf(f: ConflictField, choices: Record<string, Side>): Side {
  return f.changedBy === "me" ? "mine" : (choices[f.pointer] ?? f.proposed);
}

/**
 * Their document with my value wherever I chose mine (and wherever only I changed it). A list item I chose to have removed (mine is
 * missing) is dropped; one I added is appended in its place.
 */
export function mergeDocuments(mine: Doc, theirs: Doc, fields: ConflictField[], choices: Record<string, Side>): Doc {
  const merged = structuredClone(theirs);
  const removed = new Map<unknown[], Set<number>>();
  for (const f of fields) {
    if (sideOf(f, choices) !== "mine") continue;
    const [, rawTop, rawKey] = f.pointer.split("/");
    const top = rawTop.replace(/~1/g, "/").replace(/~0/g, "~");
    if (rawKey === undefined) {
      if (f.mine === undefined) delete merged[top];
      else merged[top] = structuredClone(f.mine);
      continue;
    }
    const key = rawKey.replace(/~1/g, "/").replace(/~0/g, "~");
    const mineContainer = mine[top];
    if (merged[top] === undefined || typeof merged[top] !== "object") merged[top] = Array.isArray(mineContainer) ? [] : {};
    const container = merged[top] as Record<string, unknown> | unknown[];
    if (Array.isArray(container)) {
      const i = Number(key);
      if (f.mine === undefined) {
        const set = removed.get(container) ?? new Set<number>();
        set.add(i);
        removed.set(container, set);
      } else container[i] = structuredClone(f.mine);
    } else if (f.mine === undefined) delete container[key];
    else container[key] = structuredClone(f.mine);
  }
  for (const [list, rows] of removed) {
    const kept = list.filter((v, i) => !rows.has(i) && v !== undefined);
    list.length = 0;
    list.push(...kept);
  }
  // Holes left by items added on my side beyond the end of theirs are closed up.
  for (const [k, v] of Object.entries(merged)) if (Array.isArray(v)) merged[k] = v.filter((x) => x !== undefined);
  return merged;
}

/** A field's value in a line of text for the comparison table: "(none)" when a side does not have it. */
export function showValue(v: unknown): string {
  if (v === undefined || v === null || v === "") return "(none)";
  if (typeof v === "string") return v;
  if (typeof v === "number" || typeof v === "boolean") return String(v);
  if (isObject(v))
    return Object.entries(v)
      .map(([k, x]) => `${k}: ${isObject(x) || Array.isArray(x) ? JSON.stringify(x) : String(x)}`)
      .join("; ");
  return JSON.stringify(v);
}

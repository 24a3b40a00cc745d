import "server-only";
import { perSearchGeneration } from "../per-generation";
import { readListedDocuments, type ListedDocumentRow } from "../queries";
import type { DatasetHit, SearchFacet, SearchFilters } from "../types";

/**
 * The PostgreSQL engine's in-memory index: every listed document (`latest`) reduced to what
 * filters, facet counts and sorts need — facet values as small integer codes, the temperature and
 * pressure ranges, the sort keys, the reaction and its species keys. Text matching stays in
 * PostgreSQL (the tsvector and trigram indexes); everything after it is counted here, exactly,
 * in one pass over the candidates (at 100 000 documents a facet count in SQL cost hundreds of
 * milliseconds, here a few).
 *
 * Freshness: drizzle/0025 sets search_generation to the id of each transaction that changes
 * search_documents, inside it; each search reads that mark (one row) and reloads the index when
 * it moved, so a search never answers from documents older than the last committed
 * change it could see. One load at a time per process; searches during a reload wait for it.
 */

/** Facets with one value per document (null: none). */
export const SCALAR_FACETS = ["reactionClass", "phase", "methodCategory", "licence", "sourceYear"] as const;
/** Facets with a list of values per document (each occurrence counts, as unnest counts it). */
export const LIST_FACETS = ["bathGas", "flags", "creator"] as const;
type ScalarFacet = (typeof SCALAR_FACETS)[number];
type ListFacet = (typeof LIST_FACETS)[number];

/** Distinct strings numbered in the order first met. */
class Dictionary {
  readonly values: string[] = [];
  private readonly codes = new Map<string, number>();
  code(value: string): number {
    let c = this.codes.get(value);
    if (c === undefined) {
      c = this.values.length;
      this.values.push(value);
      this.codes.set(value, c);
    }
    return c;
  }
  find(value: string): number | undefined {
    return this.codes.get(value);
  }
  private byValue: Int32Array | null = null;
  /**
   * The codes in byte order of their values (the database's C collation; JavaScript compares
   * UTF-16 units, the same for these values), computed once: facet counts break ties by it.
   */
  inValueOrder(): Int32Array {
    if (this.byValue && this.byValue.length === this.values.length) return this.byValue;
    const order = Int32Array.from(this.values.keys());
    const v = this.values;
    order.sort((a, b) => (v[a] < v[b] ? -1 : v[a] > v[b] ? 1 : 0));
    this.byValue = order;
    return order;
  }
}

export interface MemoryIndex {
  generation: string;
  size: number;
  versionId: Int32Array;
  /** Position of each document's reaction in `reactions`. */
  reaction: Int32Array;
  tMin: Float64Array;
  tMax: Float64Array;
  /** NaN when the dataset states no pressure. */
  pMin: Float64Array;
  pMax: Float64Array;
  pointCount: Int32Array;
  /** 1 for a retracted version: listed and found, never counted as evidence in the reactions view. */
  retracted: Uint8Array;
  /** published_at in microseconds since 1970 (exact: PostgreSQL keeps microseconds). */
  publishedMicros: Float64Array;
  sourceYear: Float64Array;
  /** Per scalar facet, each document's value code (-1: none). */
  scalar: Record<ScalarFacet, { dictionary: Dictionary; codes: Int32Array }>;
  /** Per list facet, each document's value codes: values[offsets[i] .. offsets[i + 1]). */
  list: Record<ListFacet, { dictionary: Dictionary; offsets: Int32Array; values: Int32Array }>;
  /** Each document's reactant and product keys, as an index into `keySets` (documents share them). */
  reactantSet: Int32Array;
  productSet: Int32Array;
  keySets: string[][];
  reactions: { id: number; key: string; equation: string }[];
  /** Document position by version id. */
  byVersion: Map<number, number>;
  /**
   * What a row of the datasets view shows beyond the above (see `datasetHitAt`): a page of hits is
   * read from here, not from the database (a round trip, its parse and plan, were a third of a
   * species search that no answer had kept). ~150 bytes a document.
   */
  shown: {
    datasetId: Int32Array;
    versionNumber: Int32Array;
    versionIdentifier: (string | null)[];
    title: string[];
    /** The document's own reaction key and equation (the same strings shared by the documents that have them). */
    reactionKey: string[];
    equation: string[];
    /** NaN: none. */
    ea: Float64Array;
    a: Float64Array;
    aUnit: { dictionary: Dictionary; codes: Int32Array };
  };
}

type Row = ListedDocumentRow;

const LIST_COLUMN: Record<ListFacet, "bath_gases" | "flags" | "creators"> = { bathGas: "bath_gases", flags: "flags", creator: "creators" };

/** Builds the index of `n` documents from their rows, fed a slice at a time (`add`), then `done`. */
function builder(generation: string, n: number) {
  const scalar = Object.fromEntries(
    SCALAR_FACETS.map((f) => [f, { dictionary: new Dictionary(), codes: new Int32Array(n) }]),
  ) as MemoryIndex["scalar"];
  const lists = Object.fromEntries(
    LIST_FACETS.map((f) => [f, { dictionary: new Dictionary(), offsets: new Int32Array(n + 1), values: [] as number[] }]),
  ) as Record<ListFacet, { dictionary: Dictionary; offsets: Int32Array; values: number[] }>;
  const keySetOf = new Map<string, number>();
  const keySets: string[][] = [];
  // Arrays arrive as their text form ({a,b}): InChIKeys hold no comma, quote or brace.
  const keySet = (text: string) => {
    let k = keySetOf.get(text);
    if (k === undefined) {
      k = keySets.length;
      keySets.push(text.length > 2 ? text.slice(1, -1).split(",") : []);
      keySetOf.set(text, k);
    }
    return k;
  };
  const reactionOf = new Map<number, number>();
  const reactions: MemoryIndex["reactions"] = [];
  const index: MemoryIndex = {
    generation,
    size: n,
    versionId: new Int32Array(n),
    reaction: new Int32Array(n),
    tMin: new Float64Array(n),
    tMax: new Float64Array(n),
    pMin: new Float64Array(n),
    pMax: new Float64Array(n),
    pointCount: new Int32Array(n),
    retracted: new Uint8Array(n),
    publishedMicros: new Float64Array(n),
    sourceYear: new Float64Array(n),
    scalar,
    list: {} as MemoryIndex["list"],
    reactantSet: new Int32Array(n),
    productSet: new Int32Array(n),
    keySets,
    reactions,
    byVersion: new Map(),
    shown: {
      datasetId: new Int32Array(n),
      versionNumber: new Int32Array(n),
      versionIdentifier: new Array<string | null>(n).fill(null),
      title: new Array<string>(n).fill(""),
      reactionKey: new Array<string>(n).fill(""),
      equation: new Array<string>(n).fill(""),
      ea: new Float64Array(n),
      a: new Float64Array(n),
      aUnit: { dictionary: new Dictionary(), codes: new Int32Array(n) },
    },
  };
  // One string per distinct reaction key and equation, however many documents have it.
  const strings = new Map<string, string>();
  const shared = (value: string) => {
    const known = strings.get(value);
    if (known !== undefined) return known;
    strings.set(value, value);
    return value;
  };
  let i = 0;
  const add = (r: Row) => {
    if (i >= n) return;
    const id = Number(r.version_id);
    index.versionId[i] = id;
    index.byVersion.set(id, i);
    const reactionId = Number(r.reaction_id);
    let at = reactionOf.get(reactionId);
    if (at === undefined) {
      at = reactions.length;
      reactions.push({ id: reactionId, key: r.reaction_key, equation: r.equation });
      reactionOf.set(reactionId, at);
    } else {
      // The reactions view names a reaction by the smallest key and equation among its documents (as min() did).
      const known = reactions[at];
      if (r.reaction_key < known.key) known.key = r.reaction_key;
      if (r.equation < known.equation) known.equation = r.equation;
    }
    index.reaction[i] = at;
    index.tMin[i] = Number(r.t_min);
    index.tMax[i] = Number(r.t_max);
    index.pMin[i] = r.p_min === null ? NaN : Number(r.p_min);
    index.pMax[i] = r.p_max === null ? NaN : Number(r.p_max);
    index.pointCount[i] = Number(r.point_count);
    index.retracted[i] = r.retracted ? 1 : 0;
    index.publishedMicros[i] = Number(r.published_us);
    index.sourceYear[i] = r.source_year === null ? NaN : Number(r.source_year);
    scalar.reactionClass.codes[i] = scalar.reactionClass.dictionary.code(r.reaction_class);
    scalar.phase.codes[i] = scalar.phase.dictionary.code(r.phase);
    scalar.methodCategory.codes[i] = scalar.methodCategory.dictionary.code(r.method_category);
    scalar.licence.codes[i] = scalar.licence.dictionary.code(r.licence);
    scalar.sourceYear.codes[i] = r.source_year === null ? -1 : scalar.sourceYear.dictionary.code(String(r.source_year));
    for (const f of LIST_FACETS) {
      const l = lists[f];
      l.offsets[i] = l.values.length;
      for (const v of r[LIST_COLUMN[f]]) l.values.push(l.dictionary.code(v));
    }
    index.reactantSet[i] = keySet(r.reactant_keys);
    index.productSet[i] = keySet(r.product_keys);
    const shown = index.shown;
    shown.datasetId[i] = Number(r.dataset_id);
    shown.versionNumber[i] = Number(r.version_number);
    shown.versionIdentifier[i] = r.version_identifier;
    shown.title[i] = r.title;
    shown.reactionKey[i] = shared(r.reaction_key);
    shown.equation[i] = shared(r.equation);
    shown.ea[i] = r.ea === null ? NaN : Number(r.ea);
    shown.a[i] = r.a === null ? NaN : Number(r.a);
    shown.aUnit.codes[i] = r.a_unit === null ? -1 : shown.aUnit.dictionary.code(r.a_unit);
    i++;
  };
  const done = (): MemoryIndex => {
    // Fewer rows than counted cannot happen in one snapshot; shrink anyway rather than keep empty slots.
    if (i < n) return { ...finish(), size: i };
    return finish();
  };
  const finish = (): MemoryIndex => {
    for (const f of LIST_FACETS) {
      const l = lists[f];
      l.offsets[i] = l.values.length;
      index.list[f] = { dictionary: l.dictionary, offsets: l.offsets, values: Int32Array.from(l.values) };
    }
    return index;
  };
  return { add, done };
}

/** The values of a list facet of document `i`, in the order the document lists them. */
function listValues(index: MemoryIndex, facet: ListFacet, i: number): string[] {
  const { dictionary, offsets, values } = index.list[facet];
  const out: string[] = [];
  for (let k = offsets[i]; k < offsets[i + 1]; k++) out.push(dictionary.values[values[k]]);
  return out;
}

/** The row of the datasets view of the document at position `i`, as search_documents holds it. */
export function datasetHitAt(index: MemoryIndex, i: number): DatasetHit {
  const shown = index.shown;
  const unit = shown.aUnit.codes[i];
  const micros = index.publishedMicros[i];
  return {
    versionId: index.versionId[i],
    datasetId: shown.datasetId[i],
    versionNumber: shown.versionNumber[i],
    versionIdentifier: shown.versionIdentifier[i],
    retracted: index.retracted[i] === 1,
    title: shown.title[i],
    equation: shown.equation[i],
    reactionKey: shown.reactionKey[i],
    reactionClass: index.scalar.reactionClass.dictionary.values[index.scalar.reactionClass.codes[i]],
    methodCategory: index.scalar.methodCategory.dictionary.values[index.scalar.methodCategory.codes[i]],
    tMin: index.tMin[i],
    tMax: index.tMax[i],
    pointCount: index.pointCount[i],
    ea: Number.isNaN(shown.ea[i]) ? null : shown.ea[i],
    a: Number.isNaN(shown.a[i]) ? null : shown.a[i],
    aUnit: unit === -1 ? null : shown.aUnit.dictionary.values[unit],
    flags: listValues(index, "flags", i) as DatasetHit["flags"],
    creators: listValues(index, "creator", i),
    // Milliseconds, as a Date keeps them (the database keeps microseconds: the rest is cut, not rounded).
    publishedAt: new Date(Math.floor(micros / 1000)).toISOString(),
  };
}

const LOAD_SLICE = 20_000;

/** One snapshot of the listed documents and their generation mark (lib/search/queries.ts), built slice by slice. */
function load(): Promise<MemoryIndex> {
  return readListedDocuments({ slice: LOAD_SLICE, start: builder });
}

/** The index as of the last committed change to search_documents (reloaded when it moved). */
export const memoryIndex: () => Promise<MemoryIndex> = perSearchGeneration(load);

// ---------------------------------------------------------------------------------------------
// Filters and facet counts

/**
 * The positions among `positions` that pass the temperature and pressure windows (the filters
 * that are not facets), in order (`keep[k]` set for each kept one). A temperature window keeps
 * ranges overlapping it (or covering it: tCovers); a pressure window keeps datasets with a stated
 * pressure range overlapping it (NaN, no pressure, fails every comparison, as null does).
 */
export function filterWindows(index: MemoryIndex, positions: Int32Array, f: SearchFilters, keep?: Uint8Array): Int32Array {
  const covers = f.tCovers && f.tMin !== null && f.tMax !== null;
  const none = f.tMin === null && f.tMax === null && f.pMin === null && f.pMax === null;
  if (none) {
    keep?.fill(1);
    return positions;
  }
  // Each comparison only when its bound is given.
  const hasTMin = f.tMin !== null;
  const hasTMax = f.tMax !== null;
  const hasPMin = f.pMin !== null;
  const hasPMax = f.pMax !== null;
  const tMin = f.tMin ?? 0;
  const tMax = f.tMax ?? 0;
  const pLo = f.pMin ?? 0;
  const pHi = f.pMax ?? 0;
  const { tMin: lo, tMax: hi, pMin, pMax } = index;
  const out = new Int32Array(positions.length);
  let n = 0;
  for (let k = 0; k < positions.length; k++) {
    const i = positions[k];
    if (covers) {
      if (!(lo[i] <= tMin && hi[i] >= tMax)) continue;
    } else {
      if (hasTMin && !(hi[i] >= tMin)) continue;
      if (hasTMax && !(lo[i] <= tMax)) continue;
    }
    if (hasPMin && !(pMax[i] >= pLo)) continue;
    if (hasPMax && !(pMin[i] <= pHi)) continue;
    out[n++] = i;
    if (keep) keep[k] = 1;
  }
  return out.subarray(0, n);
}

/** A facet's column: scalar codes, or list offsets and values; its dictionary. */
interface FacetColumn {
  facet: SearchFacet;
  scalar: Int32Array | null;
  offsets: Int32Array | null;
  values: Int32Array | null;
  dictionary: Dictionary;
}

function facetColumn(index: MemoryIndex, facet: SearchFacet): FacetColumn {
  if ((SCALAR_FACETS as readonly string[]).includes(facet)) {
    const { dictionary, codes } = index.scalar[facet as ScalarFacet];
    return { facet, scalar: codes, offsets: null, values: null, dictionary };
  }
  const { dictionary, offsets, values } = index.list[facet as ListFacet];
  return { facet, scalar: null, offsets, values, dictionary };
}

/**
 * One facet's filter, or null when the reader chose none of its values: source years as a range
 * (a document without a year fails it), any other facet as the set of chosen value codes (a mask
 * over its dictionary; a list facet passes when any of the document's values is chosen).
 */
interface FacetFilter {
  column: FacetColumn;
  /** Position of the facet in the facets counted (-1: filtered, not counted). */
  at: number;
  mask: Uint8Array | null;
  yearMin: number;
  yearMax: number;
}

function facetFilter(index: MemoryIndex, column: FacetColumn, f: SearchFilters, at: number): FacetFilter | null {
  if (column.facet === "sourceYear") {
    if (f.yearMin === null && f.yearMax === null) return null;
    return { column, at, mask: null, yearMin: f.yearMin ?? -Infinity, yearMax: f.yearMax ?? Infinity };
  }
  const chosen = {
    reactionClass: f.reactionClass,
    phase: f.phase,
    methodCategory: f.methodCategory,
    bathGas: f.bathGas,
    licence: f.licence,
    flags: f.flags,
    creator: f.creator,
  }[column.facet as Exclude<SearchFacet, "sourceYear">] as readonly string[];
  if (!chosen.length) return null;
  const mask = new Uint8Array(column.dictionary.values.length);
  for (const v of chosen) {
    const code = column.dictionary.find(v);
    if (code !== undefined) mask[code] = 1;
  }
  return { column, at, mask, yearMin: 0, yearMax: 0 };
}

function passesFacet(index: MemoryIndex, t: FacetFilter, i: number): boolean {
  const { mask, column } = t;
  if (mask === null) {
    const y = index.sourceYear[i];
    return y >= t.yearMin && y <= t.yearMax;
  }
  if (column.scalar !== null) {
    const code = column.scalar[i];
    return code >= 0 && mask[code] === 1;
  }
  const offsets = column.offsets!;
  const values = column.values!;
  for (let j = offsets[i], end = offsets[i + 1]; j < end; j++) if (mask[values[j]] === 1) return true;
  return false;
}

/** Adds the values of `docs` (positions) in one facet's column to its counts: one tight loop per column. */
function addCounts(column: FacetColumn, counts: Int32Array, docs: Int32Array, n: number): void {
  if (column.scalar !== null) {
    const codes = column.scalar;
    for (let k = 0; k < n; k++) {
      const code = codes[docs[k]];
      if (code >= 0) counts[code]++;
    }
    return;
  }
  const offsets = column.offsets!;
  const values = column.values!;
  for (let k = 0; k < n; k++) {
    const i = docs[k];
    for (let j = offsets[i], end = offsets[i + 1]; j < end; j++) counts[values[j]]++;
  }
}

/** Most values listed per facet (bath gases and creators can be many). */
export const FACET_VALUES = 50;

/**
 * Which candidates match (every chosen facet filter passes), and each facet's counts over the
 * candidates with every other facet's filter applied: a document failing exactly one facet's
 * filter still counts in that facet. One pass over typed columns; counts ordered by count, then
 * value; 50 at most.
 */
export function countFacets(index: MemoryIndex, candidates: Int32Array, filters: SearchFilters, facets: readonly SearchFacet[]) {
  const columns = facets.map((facet) => facetColumn(index, facet));
  const counts = columns.map((c) => new Int32Array(c.dictionary.values.length));
  const tests: FacetFilter[] = [];
  columns.forEach((column, at) => {
    const t = facetFilter(index, column, filters, at);
    if (t) tests.push(t);
  });
  const matched = new Int32Array(candidates.length);
  let found = 0;
  // The documents failing exactly one filter, per filter.
  const failingOne = tests.map(() => ({ docs: new Int32Array(0), n: 0 }));
  for (let k = 0; k < candidates.length; k++) {
    const i = candidates[k];
    let failing = -1;
    let failures = 0;
    for (let t = 0; t < tests.length; t++) {
      if (!passesFacet(index, tests[t], i)) {
        failures++;
        failing = t;
        if (failures > 1) break;
      }
    }
    if (failures === 0) matched[found++] = i;
    else if (failures === 1) {
      const f = failingOne[failing];
      if (f.n === f.docs.length) {
        const grown = new Int32Array(Math.max(64, f.docs.length * 2));
        grown.set(f.docs);
        f.docs = grown;
      }
      f.docs[f.n++] = i;
    }
  }
  for (let c = 0; c < columns.length; c++) addCounts(columns[c], counts[c], matched, found);
  tests.forEach((t, k) => addCounts(t.column, counts[t.at], failingOne[k].docs, failingOne[k].n));
  const result = {} as Record<SearchFacet, { value: string; count: number }[]>;
  columns.forEach((column, at) => {
    result[column.facet] = topValues(column.dictionary, counts[at]);
  });
  return { matched: matched.subarray(0, found), facets: result };
}

/**
 * The FACET_VALUES values counted most, by count, then value in byte order: each counted value
 * as one number (count, then its place in value order) sorted natively, not objects compared.
 */
function topValues(dictionary: Dictionary, counts: Int32Array): { value: string; count: number }[] {
  const order = dictionary.inValueOrder();
  const n = order.length;
  const keys = new Float64Array(n);
  let m = 0;
  // Exact in a double: count × n + (n − 1 − place) < 2^53 for any count of documents.
  for (let place = 0; place < n; place++) {
    const count = counts[order[place]];
    if (count > 0) keys[m++] = count * n + (n - 1 - place);
  }
  const sorted = keys.subarray(0, m).sort();
  const listed: { value: string; count: number }[] = [];
  for (let k = m - 1; k >= 0 && listed.length < FACET_VALUES; k--) {
    const key = sorted[k];
    const code = order[n - 1 - (key % n)];
    listed.push({ value: dictionary.values[code], count: counts[code] });
  }
  return listed;
}

// ---------------------------------------------------------------------------------------------
// Species and reactions: which documents name them

/** The documents of each key set on one side, in order: docs[start[set] .. start[set + 1]). */
interface DocsBySet {
  start: Int32Array;
  docs: Int32Array;
}

/** Per index, the key sets holding each InChIKey, the documents of each set on each side, and the reaction positions of each reaction key (built at first use). */
const lookups = new WeakMap<
  MemoryIndex,
  { setsByKey: Map<string, number[]>; reactionsByKey: Map<string, number[]>; reactantDocs: DocsBySet; productDocs: DocsBySet }
>();

function docsBySet(sides: Int32Array, size: number, sets: number): DocsBySet {
  const start = new Int32Array(sets + 1);
  for (let i = 0; i < size; i++) start[sides[i] + 1]++;
  for (let k = 0; k < sets; k++) start[k + 1] += start[k];
  const docs = new Int32Array(size);
  const next = start.slice(0, sets);
  for (let i = 0; i < size; i++) docs[next[sides[i]]++] = i;
  return { start, docs };
}

function lookupsOf(index: MemoryIndex) {
  let found = lookups.get(index);
  if (!found) {
    const setsByKey = new Map<string, number[]>();
    index.keySets.forEach((set, at) => {
      for (const key of new Set(set)) {
        const list = setsByKey.get(key);
        if (list) list.push(at);
        else setsByKey.set(key, [at]);
      }
    });
    const reactionsByKey = new Map<string, number[]>();
    index.reactions.forEach((r, at) => {
      const list = reactionsByKey.get(r.key);
      if (list) list.push(at);
      else reactionsByKey.set(r.key, [at]);
    });
    const sets = index.keySets.length;
    found = {
      setsByKey,
      reactionsByKey,
      reactantDocs: docsBySet(index.reactantSet, index.size, sets),
      productDocs: docsBySet(index.productSet, index.size, sets),
    };
    lookups.set(index, found);
  }
  return found;
}

/**
 * The key sets (by position in `keySets`) that hold, for every group of `groups`, at least one of
 * its keys: 1 in the answer. No group: every set. A reactant or product term of a reaction pattern
 * is one group (the InChIKeys its text may mean); a species query is one group.
 */
export function setsHoldingEvery(index: MemoryIndex, groups: readonly (readonly string[])[]): Uint8Array {
  const sets = index.keySets.length;
  const ok = new Uint8Array(sets);
  if (groups.length === 0) return ok.fill(1);
  const { setsByKey } = lookupsOf(index);
  // How many groups each set satisfies; a group counts once per set, whichever of its keys it holds.
  const satisfied = new Uint16Array(sets);
  const seen = new Int32Array(sets).fill(-1);
  groups.forEach((keys, g) => {
    for (const key of keys)
      for (const at of setsByKey.get(key) ?? []) {
        if (seen[at] === g) continue;
        seen[at] = g;
        satisfied[at]++;
      }
  });
  for (let at = 0; at < sets; at++) if (satisfied[at] === groups.length) ok[at] = 1;
  return ok;
}

/**
 * Positions, in order, of the documents whose reactant set passes `reactants` and product set
 * `products` (both, or either). Read from the documents of the passing sets when those are few (a
 * species or a reaction pattern names a few sets of thousands), else by one pass over every document.
 */
export function positionsBySets(index: MemoryIndex, reactants: Uint8Array, products: Uint8Array, need: "both" | "either"): Int32Array {
  const { reactantSet, productSet, size } = index;
  const { reactantDocs, productDocs } = lookupsOf(index);
  const count = (ok: Uint8Array, by: DocsBySet) => {
    let n = 0;
    for (let k = 0; k < ok.length; k++) if (ok[k]) n += by.start[k + 1] - by.start[k];
    return n;
  };
  const fromReactants = count(reactants, reactantDocs);
  const fromProducts = count(products, productDocs);
  // Each side's candidates, gathered from its passing sets; "both" needs one side only (the smaller), "either" both sides.
  const gather = need === "both" ? Math.min(fromReactants, fromProducts) : fromReactants + fromProducts;
  if (gather * 8 < size) {
    const out: number[] = [];
    const take = (ok: Uint8Array, by: DocsBySet, test: (i: number) => boolean) => {
      for (let k = 0; k < ok.length; k++) {
        if (!ok[k]) continue;
        for (let j = by.start[k]; j < by.start[k + 1]; j++) if (test(by.docs[j])) out.push(by.docs[j]);
      }
    };
    if (need === "both") {
      if (fromReactants <= fromProducts) take(reactants, reactantDocs, (i) => products[productSet[i]] === 1);
      else take(products, productDocs, (i) => reactants[reactantSet[i]] === 1);
    } else {
      take(reactants, reactantDocs, () => true);
      // A document already taken for its reactants is not taken again for its products.
      take(products, productDocs, (i) => reactants[reactantSet[i]] !== 1);
    }
    return Int32Array.from(out).sort();
  }
  const out = new Int32Array(size);
  let n = 0;
  if (need === "both") {
    for (let i = 0; i < size; i++) if (reactants[reactantSet[i]] && products[productSet[i]]) out[n++] = i;
  } else {
    for (let i = 0; i < size; i++) if (reactants[reactantSet[i]] || products[productSet[i]]) out[n++] = i;
  }
  return out.subarray(0, n);
}

/** Positions, in order, of the documents of the reaction with this key. */
export function positionsOfReactionKey(index: MemoryIndex, key: string): Int32Array {
  const wanted = new Uint8Array(index.reactions.length);
  for (const at of lookupsOf(index).reactionsByKey.get(key) ?? []) wanted[at] = 1;
  const out = new Int32Array(index.size);
  let n = 0;
  for (let i = 0; i < index.size; i++) if (wanted[index.reaction[i]]) out[n++] = i;
  return out.subarray(0, n);
}

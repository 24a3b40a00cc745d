import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import type { SearchFacet, SearchFilters } from "../types";

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
}

type Row = {
  version_id: number;
  reaction_id: number;
  reaction_key: string;
  equation: string;
  reactant_keys: string;
  product_keys: string;
  reaction_class: string;
  phase: string;
  method_category: string;
  licence: string;
  source_year: number | null;
  bath_gases: string[];
  flags: string[];
  creators: string[];
  t_min: number;
  t_max: number;
  p_min: number | null;
  p_max: number | null;
  point_count: number;
  retracted: boolean;
  published_us: string;
};

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

async function currentGeneration(): Promise<string> {
  const [row] = await getDb().execute<{ g: string | null }>(sql`select (select generation::text from search_generation) as g`);
  return row?.g ?? "none";
}

const LOAD_SLICE = 20_000;

async function load(): Promise<MemoryIndex> {
  // One snapshot for the number and the rows: the index is never newer or older than its number.
  return getDb().transaction(
    async (tx) => {
      const [g] = await tx.execute<{ g: string | null }>(sql`select (select generation::text from search_generation) as g`);
      const [count] = await tx.execute<{ n: number }>(sql`select count(*)::int as n from search_documents where latest`);
      const index = builder(g?.g ?? "none", Number(count?.n ?? 0));
      // In slices of LOAD_SLICE documents by version id, so that few rows are held at once (the index itself is small).
      for (let after = 0; ;) {
        const slice = (await tx.execute<Row>(sql`
          select version_id, reaction_id, reaction_key, equation, reactant_keys::text as reactant_keys, product_keys::text as product_keys,
            reaction_class, phase, method_category, licence, source_year, bath_gases, flags, creators, t_min, t_max, p_min, p_max,
            point_count, retracted, (extract(epoch from published_at) * 1000000)::bigint::text as published_us
          from search_documents where latest and version_id > ${after} order by version_id limit ${LOAD_SLICE}`)) as unknown as Row[];
        for (const r of slice) index.add(r);
        if (slice.length < LOAD_SLICE) break;
        after = Number(slice[slice.length - 1].version_id);
      }
      return index.done();
    },
    { isolationLevel: "repeatable read", accessMode: "read only" },
  );
}

let current: MemoryIndex | null = null;
let loading: Promise<MemoryIndex> | null = null;

/** The index as of the last committed change to search_documents (reloaded when it moved). */
export async function memoryIndex(): Promise<MemoryIndex> {
  const generation = await currentGeneration();
  if (current && current.generation === generation) return current;
  // A load started now reads a snapshot taken after `generation` was read: never older than what
  // this search saw, even when more changes commit meanwhile (a stream of changes, a reindex,
  // costs a search one load at most, never a loop of them).
  const start = () =>
    (loading = load()
      .then((loaded) => (current = loaded))
      .finally(() => (loading = null)));
  if (!loading) return start();
  const index = await loading;
  if (index.generation === generation) return index;
  // That load may have begun before the change this search saw: then a load begun after it.
  return loading ?? start();
}

// ---------------------------------------------------------------------------------------------
// Filters and facet counts

/** Documents that pass the temperature and pressure windows (the filters that are not facets). */
export function passesWindows(index: MemoryIndex, i: number, f: SearchFilters): boolean {
  if (f.tCovers && f.tMin !== null && f.tMax !== null) {
    if (!(index.tMin[i] <= f.tMin && index.tMax[i] >= f.tMax)) return false;
  } else {
    if (f.tMin !== null && !(index.tMax[i] >= f.tMin)) return false;
    if (f.tMax !== null && !(index.tMin[i] <= f.tMax)) return false;
  }
  // A pressure window keeps datasets with a stated pressure range overlapping it (NaN fails every comparison, as null does).
  if (f.pMin !== null && !(index.pMax[i] >= f.pMin)) return false;
  if (f.pMax !== null && !(index.pMin[i] <= f.pMax)) return false;
  return true;
}

/** One facet's filter as a test of a document, or null when the reader chose none of its values. */
export function facetTest(index: MemoryIndex, facet: SearchFacet, f: SearchFilters): ((i: number) => boolean) | null {
  if (facet === "sourceYear") {
    if (f.yearMin === null && f.yearMax === null) return null;
    const { yearMin, yearMax } = f;
    return (i) => {
      const y = index.sourceYear[i];
      return (yearMin === null || y >= yearMin) && (yearMax === null || y <= yearMax);
    };
  }
  const chosen = {
    reactionClass: f.reactionClass,
    phase: f.phase,
    methodCategory: f.methodCategory,
    bathGas: f.bathGas,
    licence: f.licence,
    flags: f.flags,
    creator: f.creator,
  }[facet] as readonly string[];
  if (!chosen.length) return null;
  if ((SCALAR_FACETS as readonly string[]).includes(facet)) {
    const { dictionary, codes } = index.scalar[facet as ScalarFacet];
    const wanted = new Set(chosen.map((v) => dictionary.find(v)).filter((c) => c !== undefined));
    return (i) => wanted.has(codes[i]);
  }
  const { dictionary, offsets, values } = index.list[facet as ListFacet];
  const wanted = new Set(chosen.map((v) => dictionary.find(v)).filter((c) => c !== undefined));
  return (i) => {
    for (let j = offsets[i]; j < offsets[i + 1]; j++) if (wanted.has(values[j])) return true;
    return false;
  };
}

/** Most values listed per facet (bath gases and creators can be many). */
export const FACET_VALUES = 50;

/**
 * Which candidates match (every chosen facet filter passes), and each facet's counts over the
 * candidates with every other facet's filter applied: a document failing exactly one facet's
 * filter still counts in that facet. One pass; counts ordered by count, then value; 50 at most.
 */
export function countFacets(index: MemoryIndex, candidates: Int32Array, filters: SearchFilters, facets: readonly SearchFacet[]) {
  const tests = facets.map((facet) => ({ facet, test: facetTest(index, facet, filters) })).filter((t) => t.test !== null);
  const counts = new Map<SearchFacet, Int32Array>();
  for (const facet of facets) {
    const size = (SCALAR_FACETS as readonly string[]).includes(facet)
      ? index.scalar[facet as ScalarFacet].dictionary.values.length
      : index.list[facet as ListFacet].dictionary.values.length;
    counts.set(facet, new Int32Array(size));
  }
  const add = (facet: SearchFacet, i: number) => {
    const c = counts.get(facet)!;
    if ((SCALAR_FACETS as readonly string[]).includes(facet)) {
      const code = index.scalar[facet as ScalarFacet].codes[i];
      if (code >= 0) c[code]++;
    } else {
      const { offsets, values } = index.list[facet as ListFacet];
      for (let j = offsets[i]; j < offsets[i + 1]; j++) c[values[j]]++;
    }
  };
  const matched: number[] = [];
  for (let k = 0; k < candidates.length; k++) {
    const i = candidates[k];
    let failing: SearchFacet | null = null;
    let failures = 0;
    for (const t of tests) {
      if (!t.test!(i)) {
        failures++;
        failing = t.facet;
        if (failures > 1) break;
      }
    }
    if (failures === 0) {
      matched.push(i);
      for (const facet of facets) add(facet, i);
    } else if (failures === 1) add(failing!, i);
  }
  const result = {} as Record<SearchFacet, { value: string; count: number }[]>;
  for (const facet of facets) {
    const c = counts.get(facet)!;
    const dictionary = (SCALAR_FACETS as readonly string[]).includes(facet)
      ? index.scalar[facet as ScalarFacet].dictionary
      : index.list[facet as ListFacet].dictionary;
    const listed: { value: string; count: number }[] = [];
    for (let code = 0; code < c.length; code++) if (c[code] > 0) listed.push({ value: dictionary.values[code], count: c[code] });
    // Ties by value in byte order (the database's C collation; JavaScript compares UTF-16 units, the same for these values).
    listed.sort((a, b) => b.count - a.count || (a.value < b.value ? -1 : a.value > b.value ? 1 : 0));
    result[facet] = listed.slice(0, FACET_VALUES);
  }
  return { matched, facets: result };
}

/** True when any of `keys` is in the key set. */
export function overlaps(set: readonly string[], keys: readonly string[]): boolean {
  for (const k of keys) if (set.includes(k)) return true;
  return false;
}

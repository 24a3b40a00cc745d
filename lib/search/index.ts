import "server-only";
import { hitInFileUnits } from "./hit-units";
import { searchEngineName } from "@/lib/config";
import { cursorPositionOrThrow, signCursor } from "./cursor";
import { meilisearchEngine } from "./engines/meilisearch";
import { postgresEngine } from "./engines/postgres";
import { displayEquations } from "./lexicon";
import { resolveQuery } from "./resolve-query";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { answerCache, type AnswerCache } from "./answer-cache";
import { INNER_GATE_MARK } from "@/lib/auth/client-address";
import { entityTag } from "@/lib/http/conditional";
import { bytesResponse } from "@/lib/http/byte-body";
import { getSearchGeneration, withSearchGeneration } from "./queries";
import { parseSearchParamsOrThrow } from "./params";
import type { FacetCount, ParsedQuery, SearchAnswer, SearchEngine, SearchFacet, SearchRequest, SearchResult } from "./types";

/**
 * Search: the one entry point of pages and the API. Resolves the text (species, reaction patterns),
 * checks the cursor, asks the configured engine and signs the next cursor.
 */

/** Engines by name. */
const engines: Partial<Record<SearchEngine["name"], SearchEngine>> = { postgres: postgresEngine, meilisearch: meilisearchEngine };

export function registerSearchEngine(engine: SearchEngine): void {
  engines[engine.name] = engine;
}

/** The engine configuration chooses (SEARCH_ENGINE, else MEILISEARCH_URL → meilisearch, else postgres). */
export function currentSearchEngine(): SearchEngine {
  const name = searchEngineName();
  const engine = engines[name];
  if (!engine) throw new Error(`search engine “${name}” is configured but not available in this build`);
  return engine;
}

export interface SearchResponse {
  /** The request as understood (cursor included). */
  query: SearchRequest;
  /** What the text was understood as, in words, and as the engines take it. */
  parsed: { words: string; query: ParsedQuery };
  total: number;
  hits: SearchResult["hits"];
  facets: Record<SearchFacet, FacetCount[]>;
  /** Cursor of the next page, null on the last one. */
  nextCursor: string | null;
}

export async function search(request: SearchRequest, engine: SearchEngine = currentSearchEngine()): Promise<SearchResponse> {
  const after = cursorPositionOrThrow(request);
  const { parsed, words } = await resolveQuery(request.q);
  const result = await engine.search({
    parsed,
    view: request.view,
    filters: request.filters,
    sort: request.sort,
    after,
    limit: request.limit,
  });
  // Rows name species as every public page does (one display name each), whatever the engine stored.
  const equations = await displayEquations([...new Set(result.hits.map((h) => h.reactionKey))]);
  const hits = result.hits.map((h) =>
    hitInFileUnits({ ...h, equation: equations.get(h.reactionKey) ?? h.equation }),
  ) as SearchResult["hits"];
  return {
    query: request,
    parsed: { words, query: parsed },
    total: result.total,
    hits,
    facets: result.facets,
    nextCursor: result.nextAfter === null ? null : signCursor(result.nextAfter, request),
  };
}

/** The search in the shape GET /api/v1/search answers, with the caution sentence. */
async function answerOf(request: SearchRequest, engine?: SearchEngine): Promise<SearchAnswer> {
  const result = await search(request, engine);
  return {
    query: result.query,
    parsed: result.parsed.words,
    understood: result.parsed.query,
    total: result.total,
    hits: result.hits,
    facets: result.facets,
    nextCursor: result.nextCursor,
    caution: CAUTION,
  };
}

/** A search answer as GET /api/v1/search sends it: the JSON's UTF-8 bytes and their entity tag. */
export interface AnswerBody {
  bytes: Buffer;
  etag: string;
}

function answerBody(answer: SearchAnswer): AnswerBody {
  const text = JSON.stringify(answer);
  // A buffer of its own: a short one from Buffer.from shares an 8 KiB block, which a kept answer would hold whole.
  const bytes = Buffer.allocUnsafeSlow(Buffer.byteLength(text));
  bytes.write(text);
  return { bytes, etag: entityTag(bytes) };
}

/** What a kept answer holds besides its bytes: its entry, key object, tag, replayed headers (lib/http/front-routes.ts), gzip memo's entry. */
const ANSWER_OVERHEAD_BYTES = 1024;

/**
 * The answers' memory: 64 MiB in the front server, which answers search (~3 000 answers of 20 rows);
 * 32 MiB in Next's process (scripts/inner-server.ts marks it), which answers the datasets list.
 */
function answerBudgetBytes(): number {
  return (globalThis as Record<symbol, unknown>)[INNER_GATE_MARK] === true ? 32 * 2 ** 20 : 64 * 2 ** 20;
}

/**
 * The PostgreSQL engine's answers, kept per request as the bytes sent while the search documents'
 * generation mark stays (./answer-cache.ts): that engine reads the same database, so a kept answer
 * is never older than the last committed change to the documents, whoever made it. Meilisearch's
 * answers are not kept: its index catches up through the outbox after the change.
 */
let kept: AnswerCache<AnswerBody> | null = null;
/** Made at the first search, when the process knows which it is. */
const answers = (): AnswerCache<AnswerBody> =>
  (kept ??= answerCache<AnswerBody>(getSearchGeneration, {
    maxBytes: answerBudgetBytes(),
    maxEntryBytes: 2 * 2 ** 20,
    sizeOf: (a) => a.bytes.length + a.etag.length * 2 + ANSWER_OVERHEAD_BYTES,
  }));

/** The search as the bytes GET /api/v1/search answers (with the caution sentence); the same object while it is kept. */
export async function searchAnswerBody(request: SearchRequest, engine?: SearchEngine): Promise<AnswerBody> {
  const chosen = engine ?? currentSearchEngine();
  if (chosen !== postgresEngine) return answerBody(await answerOf(request, chosen));
  // The mark the cache just read is the one every read of this search uses (one query, not four).
  return answers().get(JSON.stringify(request), (mark) =>
    withSearchGeneration(mark, async () => answerBody(await answerOf(request, postgresEngine))),
  );
}

/**
 * The bytes of the answer kept for these query parameters under the current generation, or null
 * (nothing is computed, and parameters the route would refuse are never found): the front server
 * sends a kept answer without running the route (lib/http/front-routes.ts).
 */
export async function keptSearchAnswerBytes(params: URLSearchParams): Promise<Uint8Array | null> {
  if (currentSearchEngine() !== postgresEngine) return null;
  let request: SearchRequest;
  try {
    request = parseSearchParamsOrThrow(params, { strict: true });
  } catch {
    return null;
  }
  return (await answers().peek(JSON.stringify(request)))?.bytes ?? null;
}

/** The search as the JSON text GET /api/v1/search answers (with the caution sentence). */
export async function searchAnswerJson(request: SearchRequest, engine?: SearchEngine): Promise<string> {
  return (await searchAnswerBody(request, engine)).bytes.toString("utf8");
}

/** The search in the shape GET /api/v1/search answers, with the caution sentence: the page's first answer. */
export async function searchAnswer(request: SearchRequest, engine?: SearchEngine): Promise<SearchAnswer> {
  return JSON.parse(await searchAnswerJson(request, engine)) as SearchAnswer;
}

/** The answer of GET /api/v1/search (and the datasets list): its bytes, JSON, and the entity tag of those bytes. */
export function searchAnswerResponse({ bytes, etag }: AnswerBody): Response {
  return bytesResponse(bytes, { headers: { "content-type": "application/json", etag } });
}

export { parseSearchParams, parseSearchParamsOrThrow, toSearchParams } from "./params";

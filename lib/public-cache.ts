import "server-only";
import { revalidateTag, unstable_cache } from "next/cache";
import { clearHtmlCache, PUBLIC_CACHE_SECONDS } from "@/lib/html-cache";
import { movePublicPagesMark, readPublicPagesMark } from "@/db/public-pages-mark";
import { listOverdueInvalidations, settleOwedInvalidation } from "@/db/owed-invalidations";

/**
 * The data cache of the public pages (and search). Every page reads the session in the site
 * header, so pages render per request; what is cached is the public data they read, through
 * `cachedPublic`, tagged with what it shows, and (lib/html-cache.ts) the whole HTML of public pages
 * rendered for anonymous readers, which every invalidation empties. Publication, retraction, a re-fit and a
 * curator's consensus exclusion call `invalidatePublicCache` with the tags of what they changed.
 *
 * Tags:
 * - `public`: every listing and count (home, reactions, classes, sitemap, species lists);
 * - `search`: search results and suggestions;
 * - `dataset:<id>`, `reaction:<id>`, `species:<InChIKey>`, `class:<id>`: one page's data;
 * - `name:<species id>`: a species' display name changed (publication, retraction), which every page
 *   writing an equation with it shows (the pages kept in the database carry it, lib/kept-pages.ts).
 */
export const PUBLIC_TAG = "public";
export const SEARCH_TAG = "search";
export const datasetTag = (datasetId: number) => `dataset:${datasetId}`;
export const reactionTag = (reactionId: number) => `reaction:${reactionId}`;
export const speciesTag = (inchiKey: string) => `species:${inchiKey}`;
export const classTag = (classId: string) => `class:${classId}`;
export const nameTag = (speciesId: number) => `name:${speciesId}`;

// A cached entry is kept at most PUBLIC_CACHE_SECONDS even when no change invalidates it. The
// background workers of scripts/serve.ts do tell the server: see `forwardCacheInvalidations`.
export { PUBLIC_CACHE_SECONDS };

/**
 * `fn` cached under `key` (with its arguments) and `tags`. Only for data every visitor may see
 * (never anything read from the session). The result goes through JSON: return no Date objects.
 */
export function cachedPublic<A extends unknown[], R>(fn: (...args: A) => Promise<R>, key: string, tags: (...args: A) => string[]) {
  return async (...args: A): Promise<R> => {
    // Under the public pages' mark as well: an invalidation made where Next's cache cannot be reached
    // (a script: `npm run refit`, the seed) still moves the mark, and no page is then rendered from the old data.
    const mark = await currentMark();
    const cached = unstable_cache(() => fn(...args), [key, JSON.stringify(args), mark], {
      tags: tags(...args),
      revalidate: PUBLIC_CACHE_SECONDS,
    });
    // Outside the app's server (a page rendered by an integration test) there is no cache: read directly.
    return cached().catch((error: unknown) => {
      if (error instanceof Error && /incrementalCache missing/.test(error.message)) return fn(...args);
      throw error;
    });
  };
}

let lastMark = "none";
/** The public pages' mark; while it cannot be read (the database out of reach), the last one read, so that kept data still serve. */
async function currentMark(): Promise<string> {
  try {
    lastMark = await readPublicPagesMark();
  } catch {
    // The data read below fails the same way unless it is kept.
  }
  return lastMark;
}

/** Sends tags to the app's server, which invalidates them in its own cache (POST /api/cache-invalidations). */
export type CacheInvalidationForwarder = (tags: string[]) => Promise<void>;

let forwarder: CacheInvalidationForwarder | null = null;

/**
 * Where invalidations made outside a request go: scripts/serve.ts runs the job workers (the
 * background re-fit) in its own process, beside Next's, and forwards their tags to Next so that a
 * re-fit shows at once, as a publication does. Null: nowhere (scripts, the seed, tests).
 */
export function forwardCacheInvalidations(to: CacheInvalidationForwarder | null): void {
  forwarder = to;
}

/** Header of the per-start secret that POST /api/cache-invalidations requires (CACHE_KEY_ENV holds it in both processes). */
export const CACHE_KEY_HEADER = "x-arrhenia-cache-key";
export const CACHE_KEY_ENV = "ARRHENIA_CACHE_KEY";

/**
 * Marks the tagged data stale so the next request reads the database (`expire: 0`: a retraction
 * must show at once, so no stale copy is served while the new one is read; the 'max' profile
 * would serve the stale page once more). Called after the change committed. Outside a request of
 * the app's server (the job worker) the tags go to the forwarder, if one is set, else nowhere.
 * `forward: false` is for the receiving end, which must never send them back.
 */
export async function invalidatePublicCache(
  tags: Iterable<string>,
  { forward = true, owed = null }: { forward?: boolean; owed?: number | null } = {},
): Promise<void> {
  const unique = [...new Set(tags)];
  if (unique.length === 0) {
    if (owed !== null) await settleOwedInvalidation(owed);
    return;
  }
  // The page cache of this process (the front server's, when its job workers made the change) is emptied at once.
  clearHtmlCache();
  await dropTagged(unique, forward);
  // Then the mark every page cache checks moves (db/public-pages-mark.ts): after Next's data cache
  // dropped the tags, so that no page rendered under the new mark read the old data. The receiving
  // end of a forwarded invalidation leaves it to the sender, which moves it once Next has answered.
  // The invalidation the change owed (db/owed-invalidations.ts) is settled once its tags moved; if
  // they could not, its row stays for the front server's sweep (settleOverdueInvalidations).
  if (forward)
    await movePublicPagesMark(unique)
      .then(() => (owed === null ? undefined : settleOwedInvalidation(owed)))
      .catch((e: unknown) => console.error(`[cache] could not move the public pages' mark: ${e instanceof Error ? e.message : String(e)}`));
}

/** Seconds after its change before an owed invalidation is taken for lost and made by the sweep. */
export const OVERDUE_INVALIDATION_SECONDS = 10;

/**
 * Makes the invalidations still owed OVERDUE_INVALIDATION_SECONDS after their change (the process
 * that committed it ended before invalidating, or the move failed): run every few seconds by the
 * front server (scripts/serve.ts). Returns how many were made.
 */
export async function settleOverdueInvalidations(): Promise<number> {
  const overdue = await listOverdueInvalidations({ olderThanSeconds: OVERDUE_INVALIDATION_SECONDS });
  for (const { id, tags } of overdue) await invalidatePublicCache(tags, { owed: id });
  return overdue.length;
}

/** Next's data cache drops the tagged entries: here, inside the app's server, else through the forwarder. */
async function dropTagged(unique: string[], forward: boolean): Promise<void> {
  for (const tag of unique) {
    try {
      revalidateTag(tag, { expire: 0 });
    } catch (error) {
      if (!(error instanceof Error && /store missing/.test(error.message))) throw error;
      if (forward && forwarder) {
        // The change has committed already; a server that cannot be told serves the old data 60 s at most.
        await forwarder(unique).catch((e: unknown) =>
          console.error(`[cache] could not forward ${unique.length} invalidations: ${e instanceof Error ? e.message : String(e)}`),
        );
      }
      return;
    }
  }
}

/**
 * A forwarder to Next's private port (scripts/inner-server.ts): the front server's key opens the
 * port's gate, the cache key the endpoint itself.
 */
export function cacheInvalidationSender({
  port,
  edgeKeyHeader,
  edgeKey,
  cacheKey,
}: {
  port: number;
  edgeKeyHeader: string;
  edgeKey: string;
  cacheKey: string;
}): CacheInvalidationForwarder {
  return async (tags) => {
    const res = await fetch(`http://127.0.0.1:${port}/api/cache-invalidations`, {
      method: "POST",
      headers: { "content-type": "application/json", [edgeKeyHeader]: edgeKey, [CACHE_KEY_HEADER]: cacheKey },
      body: JSON.stringify({ tags }),
      signal: AbortSignal.timeout(10_000),
    });
    if (!res.ok) throw new Error(`POST /api/cache-invalidations answered ${res.status}`);
  };
}

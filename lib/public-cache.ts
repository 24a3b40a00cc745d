import "server-only";
import { revalidateTag, unstable_cache } from "next/cache";

/**
 * The data cache of the public pages (and search). Every page reads the session in the site
 * header, so pages themselves render per request; what is cached is the public data they read,
 * through `cachedPublic`, tagged with what it shows. Publication, retraction, a re-fit and a
 * curator's consensus exclusion call `invalidatePublicCache` with the tags of what they changed.
 *
 * Tags:
 * - `public`: every listing and count (home, reactions, classes, sitemap, species lists);
 * - `search`: search results and suggestions;
 * - `dataset:<id>`, `reaction:<id>`, `species:<InChIKey>`, `class:<id>`: one page's data.
 */
export const PUBLIC_TAG = "public";
export const SEARCH_TAG = "search";
export const datasetTag = (datasetId: number) => `dataset:${datasetId}`;
export const reactionTag = (reactionId: number) => `reaction:${reactionId}`;
export const speciesTag = (inchiKey: string) => `species:${inchiKey}`;
export const classTag = (classId: string) => `class:${classId}`;

/**
 * A cached entry is kept at most this long even when no change invalidates it: a change made
 * outside a request of the app's own server (the background re-fit worker, the seed) cannot reach
 * its cache, so this bounds how long such a change stays unseen.
 */
export const PUBLIC_CACHE_SECONDS = 60;

/**
 * `fn` cached under `key` (with its arguments) and `tags`. Only for data every visitor may see
 * (never anything read from the session). The result goes through JSON: return no Date objects.
 */
export function cachedPublic<A extends unknown[], R>(fn: (...args: A) => Promise<R>, key: string, tags: (...args: A) => string[]) {
  return (...args: A): Promise<R> =>
    unstable_cache(() => fn(...args), [key, JSON.stringify(args)], { tags: tags(...args), revalidate: PUBLIC_CACHE_SECONDS })();
}

/**
 * Marks the tagged data stale so the next request reads the database (`expire: 0`: a retraction
 * must show at once, so no stale copy is served while the new one is read; the 'max' profile
 * would serve the stale page once more). Called after the change committed. Outside a request of
 * the app's server (scripts, the job worker, integration tests) there is no cache to reach: a no-op.
 */
export function invalidatePublicCache(tags: Iterable<string>): void {
  for (const tag of new Set(tags)) {
    try {
      revalidateTag(tag, { expire: 0 });
    } catch (error) {
      if (error instanceof Error && /store missing/.test(error.message)) return;
      throw error;
    }
  }
}

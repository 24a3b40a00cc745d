import type http from "node:http";
import Negotiator from "negotiator";
import {
  deleteStaleKeptPages,
  publicVersionReaction,
  reactionParticipants,
  readKeptPageRow,
  speciesMetInReactions,
  writeKeptPageRow,
} from "@/db/kept-pages";
import { ALL_PAGES_TAG } from "@/db/public-pages-mark";
import { citationRewriteTarget } from "@/lib/http/content-negotiation";
import { reactionSegment, readReactionSegment } from "@/lib/reactions/paths";
import { nameTag } from "@/lib/public-cache";

/**
 * The public pages most readers arrive at — a dataset version, a reaction, a species — kept in the
 * database as the front server sent them to an anonymous reader (kept_pages, drizzle/0040), so that
 * a page once rendered is not rendered again after a restart, nor after a change that does not touch
 * it: the memory of lib/html-cache.ts empties at every change (its one mark), this store does not.
 *
 * What keeps a kept page right:
 * - its tags, the invalidation tags of what it shows (lib/public-cache.ts): a dataset version page
 *   `dataset:<id>` (every version of the dataset, re-fits, its creators' accounts) and `reaction:<id>`;
 *   a reaction page `reaction:<id>` (its datasets, fits, consensus and exclusions) and
 *   `name:<species id>` of each participant (moved when a publication or retraction changes that
 *   species' display name); a species page `species:<InChIKey>` (its names, its reactions and their
 *   counts) and `name:<species id>` of every species it meets in a reaction (the listed equations
 *   are written with their display names); and every page `all` (moved by the bulk rewrites of
 *   lib/search/documents.ts). An invalidation moves each of its
 *   tags to the mark's next value (db/public-pages-mark.ts), and a page is served only when none of
 *   its tags moved after the mark read when its request arrived (`rendered_at`), so a render that
 *   may have read the data before a change is never taken for one after it;
 * - the build and the public address (`build`): another build renders anew;
 * - a lifetime, `KEPT_PAGE_HOURS`: the changes to what pages show owe their invalidation from their own
 *   transaction (db/owed-invalidations.ts), but a few account changes (a creator's link or iD on a
 *   dataset page) invalidate after their commit only, and one lost in a crash between the two is outlived;
 * - the same rules as the memory cache for what is kept at all (lib/html-cache.ts: anonymous GETs
 *   of a 200 HTML answer without Set-Cookie), and here only the page's own canonical address, with no
 *   query (the default units and data choice), so the rows are bounded by the public pages: one per
 *   page and body encoding (gzip or none).
 */

/** How long a kept page is served at most, in hours. */
export const KEPT_PAGE_HOURS = 24;

const DATASET_VERSION = /^\/datasets\/([1-9]\d{0,9})\/v([1-9]\d{0,9})$/;
const REACTION = /^\/reactions\/([^/]+)$/;
const SPECIES = /^\/species\/([A-Z]{14}-[A-Z]{10}-[A-Z])$/;
/** Next compresses with gzip, deflate or not at all; a kept body is gzip or plain. */
const KEPT_ENCODINGS = ["gzip", "identity"];

/** The page a path is, when it is one this store keeps. */
type KeptKind =
  { kind: "dataset"; datasetId: number; number: number } | { kind: "reaction"; key: string } | { kind: "species"; inchiKey: string };

function keptKind(path: string): KeptKind | null {
  const d = DATASET_VERSION.exec(path);
  if (d) return { kind: "dataset", datasetId: Number(d[1]), number: Number(d[2]) };
  const s = SPECIES.exec(path);
  if (s) return { kind: "species", inchiKey: s[1] };
  const r = REACTION.exec(path);
  if (r) {
    const named = readReactionSegment(r[1]);
    // Only the canonical segment: an escaped or ">>" spelling is another address of the same page.
    if (named && "key" in named && reactionSegment(named.key) === r[1]) return { kind: "reaction", key: named.key };
  }
  return null;
}

/**
 * The key a request's page is kept under (its path and the body encoding it takes), or null when it
 * is not one this store keeps. Call only for a request the memory cache takes (lib/html-cache.ts htmlCacheKey).
 */
export function keptPageKey(req: Pick<http.IncomingMessage, "method" | "url" | "headers">): string | null {
  if (req.method !== "GET" || !req.url || req.url.includes("?")) return null;
  if (!keptKind(req.url)) return null;
  // A dataset page's address answers a citation format to some Accept headers (proxy.ts).
  if (citationRewriteTarget("GET", req.url, req.headers.accept ?? null) !== null) return null;
  const encoding = new Negotiator({ headers: { "accept-encoding": req.headers["accept-encoding"] ?? "" } }).encoding(KEPT_ENCODINGS);
  return encoding ? `${req.url}\n${encoding}` : null;
}

/** The encoding a kept key's body is in ("gzip" or "identity"). */
const encodingOf = (key: string) => key.slice(key.lastIndexOf("\n") + 1);

/** A kept page as sent: status, headers (no framing, no Date) and body. */
export interface KeptPage {
  status: number;
  headers: http.OutgoingHttpHeaders;
  body: Buffer;
  /** As read from the database: what the page shows (its tags) and the mark its render began under. */
  tags?: readonly string[];
  renderedAt?: string;
}

/** The kept pages of one build (lib/html-cache.ts reads them on a miss in memory and writes each page it keeps). */
export interface KeptPages {
  keyOf(req: Pick<http.IncomingMessage, "method" | "url" | "headers">): string | null;
  read(key: string): Promise<KeptPage | null>;
  /**
   * Keeps a page rendered under `mark` (its caller does not wait) and answers its tags (null when the
   * page shows nothing public or was not rendered under a mark); a failure is logged, never thrown.
   */
  keep(key: string, page: KeptPage, mark: string): Promise<readonly string[] | null>;
}

/** The tags of what the page at `path` shows (see the module comment), or null when it shows nothing public. */
export async function keptPageTags(path: string): Promise<string[] | null> {
  const kind = keptKind(path);
  if (!kind) return null;
  if (kind.kind === "dataset") {
    const version = await publicVersionReaction(kind);
    if (!version) return null;
    return [`dataset:${kind.datasetId}`, ...(version.reactionId === null ? [] : [`reaction:${version.reactionId}`]), ALL_PAGES_TAG];
  }
  if (kind.kind === "reaction") {
    const reaction = await reactionParticipants(kind);
    if (!reaction) return null;
    return [`reaction:${reaction.reactionId}`, ...reaction.speciesIds.map(nameTag), ALL_PAGES_TAG];
  }
  const met = await speciesMetInReactions(kind);
  if (met.length === 0) return null;
  return [`species:${kind.inchiKey}`, ...met.map(nameTag), ALL_PAGES_TAG];
}

/** Headers a kept page is not sent with again: framing and the answer's own date are the replay's. */
const NOT_KEPT_HEADERS = ["transfer-encoding", "content-length", "connection", "keep-alive", "date", "set-cookie"];

/** The kept pages of `build` (Next's build id and the public address) in PostgreSQL. */
export function keptPagesInPostgres({ build, hours = KEPT_PAGE_HOURS }: { build: string; hours?: number }): KeptPages {
  return {
    keyOf: keptPageKey,
    async read(key) {
      return readKeptPageRow({ key, build, hours });
    },
    async keep(key, page, mark) {
      if (page.status !== 200 || !/^\d+$/.test(mark)) return null;
      const encoding = String(page.headers["content-encoding"] ?? "identity").toLowerCase();
      const headers = Object.fromEntries(Object.entries(page.headers).filter(([name]) => !NOT_KEPT_HEADERS.includes(name.toLowerCase())));
      const path = key.slice(0, key.lastIndexOf("\n"));
      return (async () => {
        const tags = await keptPageTags(path);
        if (tags && encoding === encodingOf(key))
          await writeKeptPageRow({ key, build, tags, renderedAt: mark, status: page.status, headers, body: page.body });
        return tags;
      })().catch((e: unknown) => {
        console.error(`[pages] could not keep ${path}: ${e instanceof Error ? e.message : String(e)}`);
        return null;
      });
    },
  };
}

/** Deletes the kept pages of other builds and those past their lifetime (at start, then hourly); returns how many. */
export async function sweepKeptPages({ build, hours = KEPT_PAGE_HOURS }: { build: string; hours?: number }): Promise<number> {
  return deleteStaleKeptPages({ build, hours });
}

import "server-only";
import { cachedPublic, classTag, PUBLIC_TAG, reactionTag, speciesTag } from "@/lib/public-cache";
import type { ConsensusReaders } from "./consensus-view";
import {
  findPublicReaction,
  findPublicSpecies,
  listClassCounts,
  listPublicReactionKeys,
  listPublicSpeciesKeys,
  listPublicVersionPages,
  listReactionsOfClass,
  listReactionsOfSpecies,
} from "./public-queries";
import {
  countPublicData,
  getReaction,
  listConsensusExclusions,
  listPublicVersionsOfReaction,
  listReactionsWithPublicData,
  readKeptConsensus,
} from "./queries";

/**
 * The public pages' reads, cached (lib/public-cache.ts) under the tags that publication,
 * retraction, re-fits and consensus exclusions invalidate. Lookups by key carry `public`, since
 * the id (and so the specific tag) is known only after the lookup.
 */
export const getPublicReactionCached = cachedPublic(findPublicReaction, "public-reaction", () => [PUBLIC_TAG]);
export const getReactionCached = cachedPublic(getReaction, "reaction", ({ id }) => [reactionTag(id)]);
export const listReactionsCached = cachedPublic(listReactionsWithPublicData, "reactions", () => [PUBLIC_TAG]);
export const countPublicDataCached = cachedPublic(countPublicData, "public-counts", () => [PUBLIC_TAG]);
export const getPublicSpeciesCached = cachedPublic(findPublicSpecies, "public-species", ({ inchiKey }) => [
  speciesTag(inchiKey),
  PUBLIC_TAG,
]);
export const listReactionsOfSpeciesCached = cachedPublic(listReactionsOfSpecies, "species-reactions", ({ inchiKey }) => [
  speciesTag(inchiKey),
  PUBLIC_TAG,
]);
export const listClassCountsCached = cachedPublic(listClassCounts, "class-counts", () => [PUBLIC_TAG]);
export const listReactionsOfClassCached = cachedPublic(listReactionsOfClass, "class-reactions", ({ classId }) => [
  classTag(classId),
  PUBLIC_TAG,
]);
export const listPublicReactionKeysCached = cachedPublic(listPublicReactionKeys, "reaction-keys", () => [PUBLIC_TAG]);
export const listPublicSpeciesKeysCached = cachedPublic(listPublicSpeciesKeys, "species-keys", () => [PUBLIC_TAG]);
export const listPublicVersionPagesCached = cachedPublic(listPublicVersionPages, "version-pages", () => [PUBLIC_TAG]);

const cachedExclusions = cachedPublic(listConsensusExclusions, "consensus-exclusions", ({ reactionId }) => [reactionTag(reactionId)]);

/** The consensus's data, cached per reaction (the page's choice of data is applied to them afterwards). */
export const cachedConsensusReaders: ConsensusReaders = {
  versions: cachedPublic(listPublicVersionsOfReaction, "reaction-versions", ({ reactionId }) => [reactionTag(reactionId)]),
  // The cache keeps JSON: the time of an exclusion comes back as text.
  exclusions: async (args) =>
    (await cachedExclusions(args)).map((e) => ({ ...e, excludedAt: new Date(e.excludedAt as unknown as string) })),
  // Not through the data cache: one row by its key, used only when it matches the input read above.
  kept: readKeptConsensus,
};

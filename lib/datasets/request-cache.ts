import "server-only";
import { cache } from "react";
import { getDatasetSummary, getVersionWithRole, listPublicVersions } from "./queries";

/**
 * Reads a public version page makes more than once in one request (its metadata, the page, the
 * citation), asked once per request (React's `cache`: per server render; outside one, e.g. in a
 * route handler, each call reads). Keyed by plain numbers: `cache` compares arguments by identity.
 */
export const publicVersionsOf = cache((datasetId: number) => listPublicVersions({ datasetId }));
export const datasetSummaryOf = cache((datasetId: number) => getDatasetSummary({ datasetId }));
/** A version as anyone may see it (no membership role). */
export const versionForAnyoneOf = cache((versionId: number) => getVersionWithRole({ versionId, userId: null }));

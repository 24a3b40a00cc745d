import "server-only";
import { getLatestAnalysis } from "@/lib/datasets/queries";
import type { publicVersionOfPathOrThrow } from "./subjects";

/**
 * The JSON export of one public version (GET /api/v1/datasets/:id/versions/:n/export.json): the
 * deposit document as deposited, the newest re-fit (every fit, the diagnostics, the curvature test
 * and the flags) with the engine version that made it and the stored checks, under the same "about"
 * header as the point downloads (identifier, licence, citation, caution, units of converted values).
 */
export async function buildVersionExport(loaded: Awaited<ReturnType<typeof publicVersionOfPathOrThrow>>) {
  const { version, about } = loaded;
  const analysis = await getLatestAnalysis({ versionId: version.id });
  const result = analysis?.result as { flags?: unknown[] } | null | undefined;
  return {
    about: {
      versionIdentifier: about.versionIdentifier,
      title: about.title,
      version: about.versionNumber,
      state: about.state,
      retraction: about.retraction,
      publishedAt: version.publishedAt?.toISOString() ?? null,
      payloadSha256: version.payloadSha256,
      licence: about.licence,
      citation: about.citation,
      landingPage: about.landingPage,
      caution: about.caution,
      // What the analysis' numbers are in: T in K, k (and A) in this unit, energies in J mol⁻¹.
      units: { T: about.canonicalUnits.T, k: about.canonicalUnits.k, energy: "J mol-1", pressure: about.canonicalUnits.pressure },
    },
    document: version.payload,
    analysis: analysis
      ? {
          engineVersion: analysis.engineVersion,
          analysedAt: analysis.createdAt.toISOString(),
          error: analysis.error,
          result: analysis.result,
          flags: result?.flags ?? [],
          checks: analysis.checks,
        }
      : null,
  };
}

import "server-only";
import { AppError } from "@/lib/errors";
import { buildCanteraYaml, buildMechanismTable, mechanismFileName, type MechanismSubject } from "./mechanism";
import type { SpeciesNaming } from "./species-names";
import { mechanismUnitsOrThrow, type MECHANISM_FITS, type MECHANISM_FORMATS } from "./requests";

/**
 * The answer of both parameters endpoints: the table (text/plain) or the Cantera YAML
 * (application/yaml), as an attachment named after `fileBase`.
 */
export function mechanismResponse(
  subject: MechanismSubject,
  query: {
    format: (typeof MECHANISM_FORMATS)[number];
    k?: string;
    energy?: string;
    fit: (typeof MECHANISM_FITS)[number];
    names?: SpeciesNaming;
  },
  fileBase: string,
): Response {
  const units = mechanismUnitsOrThrow(subject.order, query);
  if (query.fit !== "preferred" && !subject.fits.some((f) => f.model === query.fit)) {
    const message = `fit “${query.fit}” was not made for this ${subject.kind === "version" ? "version" : "consensus"}: use preferred or ${subject.fits.map((f) => f.model).join(", ")}`;
    throw new AppError("bad_request", message, [{ pointer: "/fit", parameter: "fit", message }]);
  }
  const body = query.format === "table" ? buildMechanismTable(subject, units) : buildCanteraYaml(subject, units, query.fit, query.names);
  return new Response(body, {
    headers: {
      "content-type": query.format === "table" ? "text/plain; charset=utf-8" : "application/yaml; charset=utf-8",
      "content-disposition": `attachment; filename="${mechanismFileName(fileBase, query.format)}"`,
      "x-content-type-options": "nosniff",
    },
  });
}

/** A version's file names: the identifier's code and number ("ARH-4F7K-9QXM-2"), else "dataset-<id>-v<n>". */
export function versionFileBase(version: { versionIdentifier: string | null; datasetId: number; number: number }): string {
  const code = version.versionIdentifier?.split("/").slice(1).join("-");
  return code || `dataset-${version.datasetId}-v${version.number}`;
}

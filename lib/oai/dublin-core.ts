import { xmlBuilderText, type DataciteAttributes, type XmlNode } from "@/lib/identifiers/datacite";

/**
 * Unqualified Dublin Core (the `oai_dc` format every OAI-PMH repository offers, §2.5 and its
 * schema oai_dc.xsd) of one version, read off the DataCite metadata of lib/identifiers/datacite.ts:
 * one description of a version, two renderings. PURE.
 */

export const OAI_DC = {
  namespace: "http://www.openarchives.org/OAI/2.0/oai_dc/",
  schema: "http://www.openarchives.org/OAI/2.0/oai_dc.xsd",
} as const;
export const DC_NAMESPACE = "http://purl.org/dc/elements/1.1/";
const XSI_NS = "http://www.w3.org/2001/XMLSchema-instance";

export type DublinCoreElement =
  "title" | "creator" | "subject" | "description" | "publisher" | "date" | "type" | "identifier" | "relation" | "rights";

/** The fifteen-element set's fields this version fills, in a fixed order, each value one element. */
export function dublinCoreFields(a: DataciteAttributes): [DublinCoreElement, string][] {
  const fields: [DublinCoreElement, string][] = [];
  for (const t of a.titles) fields.push(["title", t.title]);
  for (const c of a.creators) fields.push(["creator", c.name]);
  for (const s of a.subjects ?? []) fields.push(["subject", s.subject]);
  for (const d of a.descriptions) fields.push(["description", d.description]);
  fields.push(["publisher", a.publisher]);
  const issued = a.dates?.filter((d) => d.dateType === "Issued").map((d) => d.date) ?? [];
  for (const date of issued.length ? issued : [String(a.publicationYear)]) fields.push(["date", date]);
  // DCMI Type Vocabulary term for data (common practice: "Dataset").
  fields.push(["type", "Dataset"]);
  fields.push(["identifier", `https://doi.org/${a.doi}`]);
  fields.push(["identifier", a.url]);
  for (const r of a.relatedIdentifiers)
    fields.push([
      "relation",
      r.relatedIdentifierType === "DOI"
        ? `https://doi.org/${r.relatedIdentifier}`
        : r.relatedIdentifierType === "ISBN"
          ? `urn:isbn:${r.relatedIdentifier}`
          : r.relatedIdentifier,
    ]);
  for (const r of a.rightsList) fields.push(["rights", `${r.rights} (${r.rightsUri})`]);
  return fields;
}

/** Appends `oai_dc:dc` with these attributes' Dublin Core under `parent` (an OAI-PMH record's `metadata`). */
export function appendDublinCore(parent: XmlNode, attributes: DataciteAttributes): XmlNode {
  const dc = parent
    .ele(OAI_DC.namespace, "oai_dc:dc")
    .att("xmlns:dc", DC_NAMESPACE)
    .att(XSI_NS, "xsi:schemaLocation", `${OAI_DC.namespace} ${OAI_DC.schema}`);
  for (const [name, value] of dublinCoreFields(attributes)) dc.ele(DC_NAMESPACE, `dc:${name}`).txt(xmlBuilderText(value));
  return dc;
}

import { XMLParser, XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { buildDataciteXml, buildDoiMetadata, type DoiMetadataInput } from "@/lib/identifiers/datacite";

// Invented deposit, with characters XML must escape in its title and description.
const payload = {
  title: "OH + CH4 <250–420 K> & more",
  description: 'Pulsed photolysis; "quoted" & <tagged>.',
  keywords: ["methane"],
  license: "CC-BY-4.0",
  creators: [{ name: "Okafor, Maren", orcid: "0000-0002-1825-0097", affiliation: "Example Institute" }, { name: "Lin Tao" }],
  reaction: {
    class: "hydrogen-abstraction",
    reactants: [{ name: "OH" }, { name: "methane" }],
    products: [{ name: "water" }, { name: "methyl" }],
  },
  funding: [{ funder: "Example Science Fund", awardId: "ESF-123" }],
  source: { doi: "10.5555/example.123" },
};
const input: DoiMetadataInput = {
  kind: "version",
  doi: "10.5072/ARH-4F7K-9QXM/2",
  datasetId: 7,
  versionNumber: 2,
  baseUrl: "https://arrhenia.test",
  payload,
  fallbackTitle: "row title",
  publishedAt: new Date("2026-03-05T10:00:00Z"),
  seriesIdentifier: "10.5072/ARH-4F7K-9QXM",
  previousVersionIdentifier: "10.5072/ARH-4F7K-9QXM/1",
  nextVersionIdentifier: "10.5072/ARH-4F7K-9QXM/3",
};
// Only an iD verified on the linked account is named (creator_people): the first creator's here.
const attributes = buildDoiMetadata({ ...input, verifiedCreatorIds: new Map([[0, "0000-0002-1825-0097"]]) }).data.attributes;
const xml = buildDataciteXml(attributes);
const parser = new XMLParser({
  ignoreAttributes: false,
  attributeNamePrefix: "@",
  isArray: (name) => ["creator", "title", "subject", "relatedIdentifier", "rights", "description", "date"].includes(name),
});
const resource = parser.parse(xml).resource;

describe("DataCite metadata (kernel 4)", () => {
  it("adds the reaction class and the species as subjects, and the next version as IsPreviousVersionOf", () => {
    expect(attributes.subjects).toEqual([
      { subject: "methane" },
      { subject: "H-atom abstraction", subjectScheme: "Arrhenia reaction class" },
      { subject: "OH", subjectScheme: "species" },
      { subject: "methane", subjectScheme: "species" },
      { subject: "water", subjectScheme: "species" },
      { subject: "methyl", subjectScheme: "species" },
    ]);
    expect(attributes.relatedIdentifiers.map((r) => `${r.relationType} ${r.relatedIdentifier}`)).toEqual([
      "IsVersionOf 10.5072/ARH-4F7K-9QXM",
      "IsNewVersionOf 10.5072/ARH-4F7K-9QXM/1",
      "IsPreviousVersionOf 10.5072/ARH-4F7K-9QXM/3",
      "IsSupplementTo 10.5555/example.123",
    ]);
  });

  it("XML is well-formed (fast-xml-parser's validator) with special characters escaped", () => {
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml).toContain("OH + CH4 &lt;250–420 K&gt; &amp; more");
    expect(resource.titles.title[0]).toBe("OH + CH4 <250–420 K> & more");
  });

  it("XML is in the kernel-4 namespace with its schema location", () => {
    expect(resource["@xmlns"]).toBe("http://datacite.org/schema/kernel-4");
    expect(resource["@xsi:schemaLocation"]).toBe(
      "http://datacite.org/schema/kernel-4 http://schema.datacite.org/meta/kernel-4/metadata.xsd",
    );
  });

  // DataCite Metadata Schema 4 documentation, "mandatory properties": Identifier (with identifierType),
  // Creator (creatorName), Title, Publisher, PublicationYear, ResourceType (resourceTypeGeneral).
  it("XML has every mandatory property of the kernel", () => {
    expect(resource.identifier).toEqual({ "#text": "10.5072/ARH-4F7K-9QXM/2", "@identifierType": "DOI" });
    expect(resource.creators.creator.length).toBe(2);
    for (const c of resource.creators.creator) expect(c.creatorName).toBeTruthy();
    expect(resource.titles.title.length).toBe(1);
    expect(resource.publisher).toBe("Arrhenia");
    expect(resource.publicationYear).toBe(2026);
    expect(resource.resourceType["@resourceTypeGeneral"]).toBe("Dataset");
  });

  it("XML carries the ORCID, version, rights, dates, subjects, relations and descriptions of the JSON", () => {
    const okafor = resource.creators.creator[0];
    expect(okafor.nameIdentifier).toEqual({
      "#text": "https://orcid.org/0000-0002-1825-0097",
      "@nameIdentifierScheme": "ORCID",
      "@schemeURI": "https://orcid.org",
    });
    expect(okafor.familyName).toBe("Okafor");
    expect(resource.version).toBe(2);
    expect(resource.rightsList.rights[0]["@rightsIdentifier"]).toBe("CC-BY-4.0");
    expect(resource.rightsList.rights[0]["@rightsIdentifierScheme"]).toBe("SPDX");
    expect(resource.dates.date[0]).toEqual({ "#text": "2026-03-05", "@dateType": "Issued" });
    expect(resource.subjects.subject.length).toBe(attributes.subjects!.length);
    expect(resource.relatedIdentifiers.relatedIdentifier.map((r: Record<string, string>) => r["@relationType"])).toEqual([
      "IsVersionOf",
      "IsNewVersionOf",
      "IsPreviousVersionOf",
      "IsSupplementTo",
    ]);
    expect(resource.descriptions.description[0]["#text"]).toBe(payload.description);
    expect(resource.fundingReferences.fundingReference.funderName).toBe("Example Science Fund");
  });
});

describe("text XML 1.0 cannot carry", () => {
  // XML 1.0 §2.2 (production Char): no C0 control character but tab, LF and CR, no U+FFFE / U+FFFF.
  const odd = {
    ...payload,
    title: "Line one\u0007\nline two \uFFFE",
    description: "Bell\u0001 and nul\u0000 here",
    creators: [{ name: "Ab\u0001, Cd" }],
  };
  const oddAttributes = buildDoiMetadata({ ...input, payload: odd }).data.attributes;
  const oddXml = buildDataciteXml(oddAttributes);

  it("is left out of the registration body and the XML, which stays well-formed", () => {
    expect(XMLValidator.validate(oddXml)).toBe(true);
    expect(JSON.stringify(oddAttributes)).not.toMatch(/\\u000[0-8]|\uFFFE/);
    expect(oddAttributes.titles[0].title).toMatch(/^Line one\nline two\s*$/);
    expect(oddXml).toContain("Bell and nul here");
  });
});

/**
 * Every "&" in a document starts a reference XML 1.0 defines without a DTD (§4.6: the five
 * predefined entities; §4.1: a character reference to a character of production Char, §2.2), so
 * a reader that refuses undefined entities (fast-xml-parser's validator does not check this) reads it.
 */
function referencesAreDefined(xml: string): boolean {
  for (const m of xml.matchAll(/&([^;]*);?/g)) {
    const [whole, name] = m;
    if (!whole.endsWith(";")) return false;
    if (["amp", "lt", "gt", "quot", "apos"].includes(name)) continue;
    const code = /^#x([0-9a-fA-F]+)$/.exec(name) ? parseInt(name.slice(2), 16) : /^#(\d+)$/.test(name) ? Number(name.slice(1)) : NaN;
    const isChar =
      code === 0x9 ||
      code === 0xa ||
      code === 0xd ||
      (code >= 0x20 && code <= 0xd7ff) ||
      (code >= 0xe000 && code <= 0xfffd) ||
      (code >= 0x10000 && code <= 0x10ffff);
    if (!isChar) return false;
  }
  return true;
}

describe("titles with entity-like text, markup and CDATA ends", () => {
  // Invented titles: text that looks like XML or HTML references must reach a reader as typed.
  const titles = [
    "OH + ethane rate constants&nbsp;(measured) &#0; &lt;b&gt;",
    "OH &amp; ethane",
    "OH + <b>ethane</b>",
    "OH + ethane ]]> end",
    "&#x41; &unknown; & && &#65;",
  ];
  for (const title of titles) {
    it(`${JSON.stringify(title)} reads back exactly, in the JSON and the XML alike`, () => {
      const creator = `${title} Group`;
      const attrs = buildDoiMetadata({ ...input, payload: { ...payload, title, description: title, creators: [{ name: creator }] } }).data
        .attributes;
      const doc = buildDataciteXml(attrs);
      expect(XMLValidator.validate(doc)).toBe(true);
      expect(referencesAreDefined(doc)).toBe(true);
      const back = parser.parse(doc).resource;
      expect(attrs.titles[0].title).toBe(title);
      expect(back.titles.title[0]).toBe(title);
      expect(back.descriptions.description.map((d: { "#text": string }) => d["#text"])).toContain(title);
      expect(back.creators.creator[0].creatorName["#text"]).toBe(creator);
      expect(back.creators.creator[0].creatorName["#text"]).toBe(attrs.creators[0].name);
    });
  }

  it("the check of references refuses what xmlbuilder2 would have left as it is", () => {
    expect(referencesAreDefined("<t>&nbsp;</t>")).toBe(false);
    expect(referencesAreDefined("<t>&#0;</t>")).toBe(false);
    expect(referencesAreDefined("<t>&amp;nbsp; &#65; &#x41;</t>")).toBe(true);
  });
});

describe("XML of a retracted version by an organisation and a person", () => {
  const retractedXml = buildDataciteXml(
    buildDoiMetadata({
      ...input,
      payload: { ...payload, creators: [{ name: "Emi Tanaka" }, { name: "Kinetics Consortium" }] },
      retraction: { at: new Date("2026-06-01T00:00:00Z"), notice: "Mislabelled temperatures" },
    }).data.attributes,
  );
  const r = parser.parse(retractedXml).resource;

  it("is well-formed, with a Withdrawn date and the retraction described", () => {
    expect(XMLValidator.validate(retractedXml)).toBe(true);
    expect(r.dates.date[1]).toEqual({ "#text": "2026-06-01", "@dateType": "Withdrawn", "@dateInformation": "Retracted" });
    expect(r.descriptions.description.at(-1)["#text"]).toMatch(
      /^This version was retracted on 2026-06-01 .* Reason: Mislabelled temperatures\.$/,
    );
  });

  // DataCite Metadata Schema 4: creatorName's nameType is Personal or Organizational; givenName and familyName are for persons.
  it("names the person Personal with given and family names, the organisation Organizational with neither", () => {
    expect(r.creators.creator[0]).toEqual({
      creatorName: { "#text": "Tanaka, Emi", "@nameType": "Personal" },
      givenName: "Emi",
      familyName: "Tanaka",
    });
    expect(r.creators.creator[1]).toEqual({ creatorName: { "#text": "Kinetics Consortium", "@nameType": "Organizational" } });
  });
});

import { describe, expect, it } from "vitest";
import { buildDoiMetadata, buildLandingUrl, normaliseDoi, orcidUri, type DoiMetadataInput } from "@/lib/identifiers/datacite";

const payload = {
  title: "OH + CH4 → H2O + CH3, 200–400 K",
  description: "Pulsed laser photolysis with laser-induced fluorescence detection of OH.",
  keywords: ["methane", "hydroxyl radical"],
  license: "CC0-1.0",
  creators: [{ name: "Okafor, Maren", orcid: "0000-0002-1825-0097", affiliation: "Example Institute" }, { name: "Lin Tao" }],
  funding: [{ funder: "Example Science Fund", awardId: "ESF-123" }],
  source: { doi: "10.5555/example.123", locator: "Table 2" },
  relatedIdentifiers: [
    { kind: "url", identifier: "https://lab.example/notes", relation: "described_by" },
    { kind: "doi", identifier: "10.5555/other.9", relation: "cites" },
  ],
};

const version: DoiMetadataInput = {
  kind: "version",
  doi: "10.5072/arrhenia.7.v2",
  datasetId: 7,
  versionNumber: 2,
  baseUrl: "https://arrhenia.test/",
  payload,
  fallbackTitle: "row title",
  publishedAt: new Date("2024-03-05T10:00:00Z"),
  seriesIdentifier: "10.5072/arrhenia.7",
  previousVersionIdentifier: "10.5072/arrhenia.7.v1",
};
// The first creator's entry is linked to an account that proved the iD at ORCID (creator_people).
const verifiedCreatorIds = new Map([[0, "0000-0002-1825-0097"]]);

describe("buildDoiMetadata for a version", () => {
  const { data } = buildDoiMetadata({ ...version, verifiedCreatorIds });
  const a = data.attributes;

  it("is a JSON:API dois resource that publishes the identifier at the version's landing page", () => {
    expect(data.type).toBe("dois");
    expect(a.doi).toBe("10.5072/arrhenia.7.v2");
    expect(a.event).toBe("publish");
    expect(a.url).toBe("https://arrhenia.test/datasets/7/v2");
    expect(a.publisher).toBe("Arrhenia");
    expect(a.publicationYear).toBe(2024);
    expect(a.dates).toEqual([{ date: "2024-03-05", dateType: "Issued" }]);
    expect(a.types.resourceTypeGeneral).toBe("Dataset");
    expect(a.version).toBe("2");
    expect(a.titles).toEqual([{ title: payload.title }]);
    expect(a.subjects).toEqual([{ subject: "methane" }, { subject: "hydroxyl radical" }]);
    expect(a.fundingReferences).toEqual([{ funderName: "Example Science Fund", awardNumber: "ESF-123" }]);
  });

  it("names creators with ORCID iDs as https://orcid.org/ URIs and splits 'Family, Given' and 'Given Family' alike", () => {
    expect(a.creators).toEqual([
      {
        name: "Okafor, Maren",
        nameType: "Personal",
        familyName: "Okafor",
        givenName: "Maren",
        nameIdentifiers: [
          { nameIdentifier: "https://orcid.org/0000-0002-1825-0097", nameIdentifierScheme: "ORCID", schemeUri: "https://orcid.org" },
        ],
        affiliation: [{ name: "Example Institute" }],
      },
      { name: "Tao, Lin", nameType: "Personal", givenName: "Lin", familyName: "Tao" },
    ]);
  });

  it("names only verified iDs: an iD typed into the deposit alone is no name identifier", () => {
    const typedOnly = buildDoiMetadata(version).data.attributes;
    expect(typedOnly.creators[0].nameIdentifiers).toBeUndefined();
    const elsewhere = buildDoiMetadata({ ...version, verifiedCreatorIds: new Map([[1, "0000-0002-1694-233X"]]) }).data.attributes;
    expect(elsewhere.creators.map((c) => c.nameIdentifiers?.[0].nameIdentifier)).toEqual([
      undefined,
      "https://orcid.org/0000-0002-1694-233X",
    ]);
  });

  it("relates the version to its series, its predecessor, the source publication and the deposit's own links", () => {
    expect(a.relatedIdentifiers).toEqual([
      { relatedIdentifier: "10.5072/arrhenia.7", relatedIdentifierType: "DOI", relationType: "IsVersionOf" },
      { relatedIdentifier: "10.5072/arrhenia.7.v1", relatedIdentifierType: "DOI", relationType: "IsNewVersionOf" },
      { relatedIdentifier: "10.5555/example.123", relatedIdentifierType: "DOI", relationType: "IsSupplementTo" },
      { relatedIdentifier: "https://lab.example/notes", relatedIdentifierType: "URL", relationType: "IsDescribedBy" },
      { relatedIdentifier: "10.5555/other.9", relatedIdentifierType: "DOI", relationType: "Cites" },
    ]);
  });

  it("states the licence by its SPDX id and the description as the abstract", () => {
    expect(a.rightsList).toEqual([
      {
        rights: "Creative Commons Zero v1.0 Universal",
        rightsUri: "https://spdx.org/licenses/CC0-1.0.html",
        rightsIdentifier: "CC0-1.0",
        rightsIdentifierScheme: "SPDX",
        schemeUri: "https://spdx.org/licenses/",
      },
    ]);
    expect(a.descriptions).toEqual([
      { description: payload.description, descriptionType: "Abstract" },
      { description: "Numbers taken from Table 2 of the source publication.", descriptionType: "Other" },
    ]);
  });

  it("is deterministic: the same input gives the same body", () => {
    expect(JSON.stringify(buildDoiMetadata(version))).toBe(JSON.stringify(buildDoiMetadata(version)));
  });
});

describe("buildDoiMetadata for a series", () => {
  const { data } = buildDoiMetadata({
    kind: "series",
    doi: "10.5072/arrhenia.7",
    datasetId: 7,
    versionNumber: 2,
    baseUrl: "https://arrhenia.test",
    payload,
    fallbackTitle: "row title",
    publishedAt: new Date("2023-12-31T23:59:59Z"),
    versionIdentifiers: ["10.5072/arrhenia.7.v1", "10.5072/arrhenia.7.v2"],
  });
  const a = data.attributes;

  it("points at the dataset page, has every version, and no version number of its own", () => {
    expect(a.url).toBe("https://arrhenia.test/datasets/7");
    expect(a.version).toBeUndefined();
    expect(a.publicationYear).toBe(2023);
    expect(a.relatedIdentifiers.filter((r) => r.relationType === "HasVersion").map((r) => r.relatedIdentifier)).toEqual([
      "10.5072/arrhenia.7.v1",
      "10.5072/arrhenia.7.v2",
    ]);
    expect(a.relatedIdentifiers.some((r) => r.relationType === "IsVersionOf")).toBe(false);
  });
});

describe("buildDoiMetadata with a sparse or malformed payload", () => {
  const sparse = (payload: unknown) =>
    buildDoiMetadata({
      ...version,
      payload,
      seriesIdentifier: null,
      previousVersionIdentifier: null,
      publishedAt: null,
      now: new Date("2026-01-02T00:00:00Z"),
    }).data.attributes;

  it("falls back to the row's title, a placeholder creator, the default licence and no relations", () => {
    for (const payload of [{}, null, "not an object", [1, 2]]) {
      const a = sparse(payload);
      expect(a.titles).toEqual([{ title: "row title" }]);
      expect(a.creators).toEqual([{ name: ":unav" }]);
      expect(a.rightsList[0].rightsIdentifier).toBe("CC-BY-4.0");
      expect(a.relatedIdentifiers).toEqual([]);
      expect(a.descriptions).toEqual([]);
      expect(a.publicationYear).toBe(2026);
      expect(a.dates).toBeUndefined();
      expect(a.subjects).toBeUndefined();
      expect(a.fundingReferences).toBeUndefined();
    }
  });

  it("drops what is not usable: blank names, bad ORCID iDs, non-DOI sources, unknown relations", () => {
    const a = sparse({
      creators: [{ name: "  " }, { name: "Ada Example", orcid: "1234" }, "just a string", { name: "Bo, " }],
      source: { doi: "not a doi", reference: { type: "article-journal", title: "T", DOI: "https://doi.org/10.5555/from.csl" } },
      relatedIdentifiers: [
        { kind: "doi", identifier: "10.5555/x", relation: "is_friend_of" },
        { kind: "url", identifier: "ftp://x", relation: "cites" },
        null,
      ],
      keywords: ["ok", 3, ""],
    });
    expect(a.creators).toEqual([
      { name: "Example, Ada", nameType: "Personal", givenName: "Ada", familyName: "Example" },
      { name: "Bo", nameType: "Personal", familyName: "Bo" },
    ]);
    expect(a.relatedIdentifiers).toEqual([
      { relatedIdentifier: "10.5555/from.csl", relatedIdentifierType: "DOI", relationType: "IsSupplementTo" },
    ]);
    expect(a.subjects).toEqual([{ subject: "ok" }]);
  });

  it("does not repeat a relation given twice", () => {
    const a = sparse({
      source: { doi: "10.5555/dup" },
      relatedIdentifiers: [{ kind: "doi", identifier: "10.5555/DUP", relation: "supplement_to" }],
    });
    expect(a.relatedIdentifiers).toHaveLength(1);
  });
});

describe("creators' names agree with the citations' (citation-js's name parser, @citation-js/name)", () => {
  const creators = (names: string[]) => sparseCreators(names.map((name) => ({ name })));
  const sparseCreators = (list: unknown[]) => buildDoiMetadata({ ...version, payload: { creators: list } }).data.attributes.creators;

  it("splits a personal name written either way into givenName and familyName, particles kept with the family name", () => {
    expect(creators(["Emi Tanaka", "Tanaka, Emi", "Rosalind van der Berg"])).toEqual([
      { name: "Tanaka, Emi", nameType: "Personal", givenName: "Emi", familyName: "Tanaka" },
      { name: "Tanaka, Emi", nameType: "Personal", givenName: "Emi", familyName: "Tanaka" },
      { name: "van der Berg, Rosalind", nameType: "Personal", givenName: "Rosalind", familyName: "van der Berg" },
    ]);
  });

  it("names an organisation as Organizational, with no given or family name", () => {
    expect(creators(["Kinetics Consortium", "Institute of Invented Kinetics"])).toEqual([
      { name: "Kinetics Consortium", nameType: "Organizational" },
      { name: "Institute of Invented Kinetics", nameType: "Organizational" },
    ]);
  });

  it("gives the same parts as the CSL item's authors", async () => {
    const { cslName } = await import("@/lib/citation/csl");
    for (const name of ["Emi Tanaka", "Varga, Bence", "Rosalind van der Berg", "Kinetics Consortium"]) {
      const [c] = creators([name]);
      const csl = cslName(name);
      if ("literal" in csl) expect(c).toEqual({ name: csl.literal, nameType: "Organizational" });
      else expect([c.givenName, c.familyName]).toEqual([csl.given, [csl["non-dropping-particle"], csl.family].filter(Boolean).join(" ")]);
    }
  });
});

describe("the source publication", () => {
  const attrs = (source: unknown, sourceReference?: string) =>
    buildDoiMetadata({ ...version, payload: { source }, seriesIdentifier: null, previousVersionIdentifier: null, sourceReference }).data
      .attributes;
  const reference = {
    type: "article-journal",
    title: "Hydroxyl radical kinetics",
    "container-title": "J. Invented Chem.",
    issued: { "date-parts": [[1999]] },
  };

  it("without any identifier: named in a description, and no related identifier", () => {
    const a = attrs({ reference, locator: "Table 2" }, "Okafor, M. (1999). Hydroxyl radical kinetics. J. Invented Chem.");
    expect(a.relatedIdentifiers).toEqual([]);
    expect(a.descriptions).toEqual([
      {
        description:
          "Numbers taken from Table 2 of the source publication: Okafor, M. (1999). Hydroxyl radical kinetics. J. Invented Chem.",
        descriptionType: "Other",
      },
    ]);
    // Without the formatted reference the builder names its title.
    expect(attrs({ reference }).descriptions).toEqual([
      { description: "Numbers taken from the source publication: “Hydroxyl radical kinetics”", descriptionType: "Other" },
    ]);
  });

  it("relates the one identifier it has: DOI, else ISBN, else web address", () => {
    expect(attrs({ reference: { ...reference, ISBN: "978-3-16-148410-0", URL: "https://pub.example/a" } }).relatedIdentifiers).toEqual([
      { relatedIdentifier: "978-3-16-148410-0", relatedIdentifierType: "ISBN", relationType: "IsSupplementTo" },
    ]);
    expect(attrs({ reference: { ...reference, URL: "https://pub.example/a" } }).relatedIdentifiers).toEqual([
      { relatedIdentifier: "https://pub.example/a", relatedIdentifierType: "URL", relationType: "IsSupplementTo" },
    ]);
    expect(attrs({ reference: { ...reference, ISBN: "not an isbn" } }).relatedIdentifiers).toEqual([]);
  });
});

describe("a retracted version", () => {
  const a = buildDoiMetadata({
    ...version,
    retraction: { at: new Date("2026-06-01T08:00:00Z"), notice: "The temperatures were mislabelled" },
  }).data.attributes;

  it("carries a Withdrawn date (DataCite kernel 4.x dateType, from memory) beside the Issued one", () => {
    expect(a.dates).toEqual([
      { date: "2024-03-05", dateType: "Issued" },
      { date: "2026-06-01", dateType: "Withdrawn", dateInformation: "Retracted" },
    ]);
  });

  it("says in a description that it was retracted, when and why", () => {
    expect(a.descriptions.at(-1)).toEqual({
      description:
        "This version was retracted on 2026-06-01 by the curators of Arrhenia and should not be used; it stays readable so that " +
        "citations of it can be followed. Reason: The temperatures were mislabelled.",
      descriptionType: "Other",
    });
  });

  it("a published version says nothing of the kind", () => {
    const p = buildDoiMetadata(version).data.attributes;
    expect(p.dates?.map((d) => d.dateType)).toEqual(["Issued"]);
    expect(p.descriptions.some((d) => /retracted/i.test(d.description))).toBe(false);
  });
});

describe("helpers", () => {
  it("builds landing URLs without doubled slashes", () => {
    expect(buildLandingUrl({ baseUrl: "http://127.0.0.1:3000/", datasetId: 3 })).toBe("http://127.0.0.1:3000/datasets/3");
    expect(buildLandingUrl({ baseUrl: "http://127.0.0.1:3000", datasetId: 3, versionNumber: 1 })).toBe(
      "http://127.0.0.1:3000/datasets/3/v1",
    );
  });

  it("normalises DOIs given with a resolver or scheme prefix", () => {
    expect(normaliseDoi("https://doi.org/10.1021/jp0123")).toBe("10.1021/jp0123");
    expect(normaliseDoi("doi:10.1021/jp0123")).toBe("10.1021/jp0123");
    expect(normaliseDoi("10.1021/jp0123")).toBe("10.1021/jp0123");
    expect(normaliseDoi("11.1021/jp0123")).toBeNull();
    expect(normaliseDoi(42)).toBeNull();
  });

  it("writes ORCID iDs as https://orcid.org/ URIs", () => {
    // Example iD from ORCID's own documentation of the identifier structure.
    expect(orcidUri("0000-0002-1825-0097")).toBe("https://orcid.org/0000-0002-1825-0097");
    expect(orcidUri("https://orcid.org/0000-0002-1694-233X")).toBe("https://orcid.org/0000-0002-1694-233X");
    expect(orcidUri("0000-0002-1825")).toBeNull();
  });
});

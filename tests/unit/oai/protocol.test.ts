import { describe, expect, it } from "vitest";
import { formatDatestamp, parseDateBound, readOaiRequest } from "@/lib/oai/protocol";
import { dublinCoreFields } from "@/lib/oai/dublin-core";
import { buildDoiMetadata } from "@/lib/identifiers/datacite";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";

// Rules of "The Open Archives Initiative Protocol for Metadata Harvesting, Protocol Version 2.0"
// (openarchives.org), section named beside each check.

const read = (query: string) => readOaiRequest(new URLSearchParams(query));

describe("UTCdatetime (§3.3)", () => {
  it("§3.3.1: day and seconds granularity; until covers its whole day or second", () => {
    expect(parseDateBound("2024-03-01", "from")).toMatchObject({ granularity: "day", instant: new Date("2024-03-01T00:00:00Z") });
    expect(parseDateBound("2024-03-01", "until")?.instant).toEqual(new Date("2024-03-02T00:00:00Z"));
    // The last day a four-digit year writes ends within it (the next instant would be year 10000).
    expect(parseDateBound("9999-12-31", "until")?.instant.toISOString()).toBe("9999-12-31T23:59:59.999Z");
    expect(parseDateBound("9999-12-31T23:59:59Z", "until")?.instant.toISOString()).toBe("9999-12-31T23:59:59.999Z");
    expect(parseDateBound("2024-03-01T10:20:30Z", "until")?.instant).toEqual(new Date("2024-03-01T10:20:31Z"));
    // Leap day 2024 exists, 2023's does not (Gregorian calendar).
    expect(parseDateBound("2024-02-29", "from")).not.toBeNull();
    for (const bad of [
      "2023-02-29",
      "2024-3-1",
      "2024-03-01T10:20Z",
      "2024-03-01T10:20:30",
      "2024-03-01T24:00:00Z",
      "2024-03-01T10:20:30.5Z",
    ])
      expect(parseDateBound(bad, "from"), bad).toBeNull();
  });

  it("§3.3.2: responses write seconds granularity with Z, fractions dropped", () => {
    expect(formatDatestamp(new Date("2024-03-01T10:20:30.999Z"))).toBe("2024-03-01T10:20:30Z");
  });
});

describe("arguments (§4, errors §3.6)", () => {
  it("reads each verb's required and optional arguments", () => {
    expect(read("verb=GetRecord&identifier=oai:x:1&metadataPrefix=oai_dc")).toMatchObject({ ok: true, verb: "GetRecord" });
    expect(read("verb=ListRecords&metadataPrefix=oai_dc&set=addition&from=2024-01-01&until=2024-01-01")).toMatchObject({ ok: true });
    expect(read("verb=ListIdentifiers&resumptionToken=abc")).toMatchObject({ ok: true, args: { resumptionToken: "abc" } });
  });

  it("badVerb and badArgument never echo the arguments (§3.2)", () => {
    for (const q of ["", "verb=Nope", "verb=Identify&verb=ListSets"])
      expect(read(q)).toMatchObject({ ok: false, echo: false, errors: [{ code: "badVerb" }] });
    for (const q of [
      "verb=Identify&x=1",
      "verb=GetRecord&identifier=a",
      "verb=ListSets&resumptionToken=a&set=b",
      "verb=ListRecords&metadataPrefix=a&metadataPrefix=a",
      "verb=ListRecords&metadataPrefix=oai_dc&identifier=\u0000",
    ])
      expect(read(q), q).toMatchObject({ ok: false, echo: false, errors: [{ code: "badArgument" }] });
  });
});

describe("oai_dc from the DataCite metadata", () => {
  it("every Dublin Core value comes from the one DataCite description", () => {
    const { attributes } = buildDoiMetadata({
      kind: "version",
      doi: "10.5072/ARH-4F7K-9QXM/2",
      datasetId: 4,
      baseUrl: "https://kinetics.example.org",
      payload: EXAMPLE_DEPOSIT,
      fallbackTitle: "x",
      publishedAt: new Date("2024-05-01T09:00:00Z"),
      versionNumber: 2,
      seriesIdentifier: "10.5072/ARH-4F7K-9QXM",
    }).data;
    const fields = dublinCoreFields(attributes);
    const of = (name: string) => fields.filter(([n]) => n === name).map(([, v]) => v);
    expect(of("title")).toEqual([attributes.titles[0].title]);
    expect(of("creator")).toEqual(attributes.creators.map((c) => c.name));
    expect(of("date")).toEqual(["2024-05-01"]);
    expect(of("identifier")).toEqual(["https://doi.org/10.5072/ARH-4F7K-9QXM/2", "https://kinetics.example.org/datasets/4/v2"]);
    expect(of("relation")).toContain("https://doi.org/10.5072/ARH-4F7K-9QXM");
    expect(of("type")).toEqual(["Dataset"]);
  });
});

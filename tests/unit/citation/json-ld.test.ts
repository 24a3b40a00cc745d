import jsonld from "jsonld";
import { describe, expect, it } from "vitest";
import { buildDatasetJsonLd, jsonLdScript, type DatasetJsonLdInput } from "@/lib/citation/json-ld";

// Invented dataset.
const input: DatasetJsonLdInput = {
  url: "https://arrhenia.test/datasets/3/v2",
  siteUrl: "https://arrhenia.test",
  title: "OH + CH4 rate constants </script>",
  description: "Pulsed laser photolysis.",
  versionNumber: 2,
  versionIdentifier: "10.5072/ARH-4F7K-9QXM/2",
  seriesIdentifier: "10.5072/ARH-4F7K-9QXM",
  publishedAt: new Date("2026-03-04T10:00:00Z"),
  retracted: false,
  creators: [{ name: "Maren Okafor", orcid: "0000-0002-1825-0097", affiliation: "Example Institute" }, { name: "Lin Tao" }],
  keywords: ["methane"],
  licence: "CC-BY-4.0",
  tRange: { min: 250, max: 420 },
  kUnit: "cm3 molecule-1 s-1",
  hasPressure: true,
  downloads: [{ name: "Points as CSV", contentUrl: "https://arrhenia.test/api/v1/versions/9/points.csv", encodingFormat: "text/csv" }],
  source: { doi: "10.5555/example.123", title: "A study" },
};
const S = "https://schema.org/";
const value = buildDatasetJsonLd(input);

// No document is ever fetched: the context is inline.
const offline = async (url: string) => {
  throw new Error(`no network in tests (asked for ${url})`);
};

describe("schema.org Dataset JSON-LD", () => {
  it("expands with the jsonld processor to schema.org types and properties", async () => {
    const [node] = (await jsonld.expand(value, { documentLoader: offline })) as Record<string, unknown[]>[];
    expect(node["@type"]).toEqual([`${S}Dataset`]);
    expect(node["@id"]).toBe(input.url);
    expect(node[`${S}license`]).toEqual([{ "@id": "https://spdx.org/licenses/CC-BY-4.0.html" }]);
    expect(node[`${S}isAccessibleForFree`]).toEqual([{ "@value": true }]);
    const creators = node[`${S}creator`] as Record<string, unknown>[];
    expect(creators[0]["@id"]).toBe("https://orcid.org/0000-0002-1825-0097");
    expect(creators[0]["@type"]).toEqual([`${S}Person`]);
    const variables = node[`${S}variableMeasured`] as Record<string, Record<string, unknown>[]>[];
    expect(variables.map((v) => v[`${S}name`][0]["@value"])).toEqual(["T", "k", "p"]);
    expect(variables.map((v) => v["@type"])).toEqual([[`${S}PropertyValue`], [`${S}PropertyValue`], [`${S}PropertyValue`]]);
    expect(variables[0][`${S}unitCode`][0]["@value"]).toBe("KEL");
    expect(variables[2][`${S}unitCode`][0]["@value"]).toBe("PAL");
    expect((node[`${S}distribution`] as Record<string, unknown[]>[])[0]["@type"]).toEqual([`${S}DataDownload`]);
    expect((node[`${S}includedInDataCatalog`] as Record<string, unknown[]>[])[0]["@type"]).toEqual([`${S}DataCatalog`]);
    expect((node[`${S}citation`] as Record<string, unknown>[])[0]["@id"]).toBe("https://doi.org/10.5555/example.123");
    expect(node[`${S}temporalCoverage`]).toBeUndefined();
  });

  it("leaves out pressure when no point or condition has one, and marks a retraction", () => {
    const v = buildDatasetJsonLd({ ...input, hasPressure: false, retracted: true }) as {
      variableMeasured: { name: string }[];
      creativeWorkStatus?: string;
    };
    expect(v.variableMeasured.map((x) => x.name)).toEqual(["T", "k"]);
    expect(v.creativeWorkStatus).toBe("Retracted");
  });

  it("names creators with the same parts as the citations: a person's given and family names, an organisation as one", () => {
    const v = buildDatasetJsonLd({ ...input, creators: [{ name: "Okafor, Maren" }, { name: "Kinetics Consortium" }] }) as {
      creator: Record<string, unknown>[];
    };
    expect(v.creator).toEqual([
      { "@type": "Person", name: "Okafor, Maren", familyName: "Okafor", givenName: "Maren" },
      { "@type": "Organization", name: "Kinetics Consortium" },
    ]);
  });

  it("is safe inside a script element: no '<' survives", () => {
    const text = jsonLdScript(value);
    expect(text).not.toContain("<");
    expect(JSON.parse(text).name).toBe(input.title);
  });
});

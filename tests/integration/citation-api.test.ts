import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import { toJSON as parseBibtexIndependently } from "@orcid/bibtex-parse-js";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { GET as getCitation } from "@/app/api/v1/datasets/[id]/citation/route";
import { GET as getReferences } from "@/app/api/v1/datasets/[id]/citation/references/route";
import { GET as getDataciteJson } from "@/app/api/v1/datasets/[id]/versions/[n]/datacite.json/route";
import { GET as getDataciteXml } from "@/app/api/v1/datasets/[id]/versions/[n]/datacite.xml/route";
import { getCurrentUser } from "@/lib/auth/session";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { getRegistrationSubject } from "@/lib/identifiers/queries";
import { buildRegistrationBody } from "@/lib/identifiers/register";
import type { UserDto } from "@/lib/users/queries";
import { createRolePeople, depositInState, uniqueEmail, WALKS_TO_STATE, type WalkState } from "./helpers";

let owner: UserDto, other: UserDto, curator: UserDto, admin: UserDto;
beforeAll(async () => {
  ({ owner, other, curator, admin } = await createRolePeople("cite"));
});

async function datasetIn(state: WalkState, change?: (doc: Record<string, unknown>) => void) {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as typeof EXAMPLE_DEPOSIT;
  doc.title = `Citation test (${state}) ${uniqueEmail("t")}`;
  change?.(doc as unknown as Record<string, unknown>);
  const v = await depositInState({ owner, curator, document: doc, state });
  return { datasetId: v.datasetId, versionId: v.id, title: doc.title };
}

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const citation = (datasetId: number | string, query = "") =>
  getCitation(new Request(`http://127.0.0.1/api/v1/datasets/${datasetId}/citation${query}`), {
    params: Promise.resolve({ id: String(datasetId) }),
  });
const references = (datasetId: number | string, query = "") =>
  getReferences(new Request(`http://127.0.0.1/api/v1/datasets/${datasetId}/citation/references${query}`), {
    params: Promise.resolve({ id: String(datasetId) }),
  });
const datacite = (kind: "json" | "xml", datasetId: number | string, n: number | string, query = "") =>
  (kind === "json" ? getDataciteJson : getDataciteXml)(
    new Request(`http://127.0.0.1/api/v1/datasets/${datasetId}/versions/${n}/datacite.${kind}${query}`),
    {
      params: Promise.resolve({ id: String(datasetId), n: String(n) }),
    },
  );

const roles: [string, () => UserDto | null][] = [
  ["anonymous", () => null],
  ["owner", () => owner],
  ["another researcher", () => other],
  ["curator", () => curator],
  ["admin", () => admin],
];

describe("GET /api/v1/datasets/:id/citation", () => {
  const sets: Record<string, Awaited<ReturnType<typeof datasetIn>>> = {};
  beforeAll(async () => {
    for (const state of Object.keys(WALKS_TO_STATE) as WalkState[]) sets[state] = await datasetIn(state);
  }, 120_000);

  it.each(roles)("%s: a published or retracted version is cited; every other state is not found, even to its owner", async (_, who) => {
    as(who());
    for (const [state, set] of Object.entries(sets)) {
      const res = await citation(set.datasetId, "?format=bibtex&version=1");
      expect(res.status, `${state}`).toBe(state === "published" || state === "retracted" ? 200 : 404);
      if (res.status === 404) expect(res.headers.get("content-type")).toBe("application/problem+json");
    }
  });

  it("serves each format with its media type; the BibTeX parses with an independent BibTeX parser", async () => {
    as(null);
    const { datasetId, title } = sets.published;
    const types = {
      bibtex: "application/x-bibtex; charset=utf-8",
      ris: "application/x-research-info-systems; charset=utf-8",
      "csl-json": "application/vnd.citationstyles.csl+json; charset=utf-8",
      text: "text/plain; charset=utf-8",
    };
    for (const [format, type] of Object.entries(types)) {
      const res = await citation(datasetId, `?format=${format}&version=1`);
      expect(res.status, format).toBe(200);
      expect(res.headers.get("content-type"), format).toBe(type);
    }
    const bib = await (await citation(datasetId, "?format=bibtex&version=1")).text();
    const [entry] = parseBibtexIndependently(bib);
    const tags = Object.fromEntries(Object.entries(entry.entryTags).map(([k, v]) => [k.toLowerCase(), v]));
    expect(tags.author).toBe("Okafor, Maren and Lindqvist, Tomas");
    expect(tags.doi).toMatch(/^10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}\/1$/);
    expect(tags.note).toBe("Version 1");
    expect(tags.title.replace(/[{}]/g, "")).toContain("Citation test (published)");
    const [item] = JSON.parse(await (await citation(datasetId, "?format=csl-json&version=1")).text());
    expect(item).toMatchObject({ type: "dataset", title, version: "1", publisher: "Arrhenia" });
    expect(item.URL).toMatch(new RegExp(`/datasets/${datasetId}/v1$`));
  });

  it("without a version, cites every version by the series identifier; styles are chosen by name", async () => {
    as(null);
    const { datasetId } = sets.published;
    const [series] = JSON.parse(await (await citation(datasetId, "?format=csl-json")).text());
    expect(series.DOI).toMatch(/^10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}$/);
    expect(series.version).toBeUndefined();
    const apa = await (await citation(datasetId, "?format=text&style=apa&version=1")).text();
    expect(apa).toMatch(
      /^Okafor, M\., & Lindqvist, T\. \(\d{4}\)\. Citation test \(published\).* \(Version 1\) \[Dataset\]\. Arrhenia\. https:\/\/doi\.org\/10\.5072\//,
    );
    const acs = await (await citation(datasetId, "?format=text&style=acs&version=1")).text();
    expect(acs).toMatch(/^Okafor, M\.; Lindqvist, T\. /);
  });

  it("400 problem naming the parameter for a bad format, style or version, an unknown or repeated parameter", async () => {
    as(null);
    const { datasetId } = sets.published;
    const cases: [string, string][] = [
      ["?format=endnote", "format"],
      ["?format=text&style=chicago", "style"],
      ["?version=two", "version"],
      ["?version=0", "version"],
      ["?lang=de", "lang"],
      ["?format=ris&format=bibtex", "format"],
    ];
    for (const [query, parameter] of cases) {
      const res = await citation(datasetId, query);
      expect(res.status, query).toBe(400);
      expect(res.headers.get("content-type")).toBe("application/problem+json");
      const problem = await res.json();
      expect(
        problem.errors.map((e: { parameter: string }) => e.parameter),
        query,
      ).toContain(parameter);
    }
  });

  it("404 for a version number the dataset does not have, an id that is not one, and a dataset with only a draft", async () => {
    as(owner);
    expect((await citation(sets.published.datasetId, "?version=2")).status).toBe(404);
    expect((await citation("abc")).status).toBe(404);
    expect((await citation(sets.draft.datasetId)).status).toBe(404);
  });
});

describe("GET /api/v1/datasets/:id/citation/references (the Cite panel's other styles)", () => {
  const sets: Partial<Record<WalkState, Awaited<ReturnType<typeof datasetIn>>>> = {};
  beforeAll(async () => {
    for (const state of ["retracted", "draft", "submitted"] as WalkState[]) sets[state] = await datasetIn(state);
    sets.published = await datasetIn("published", (doc) => {
      doc.source = {
        reference: {
          type: "article-journal",
          title: "Rate constants of an invented reaction between 250 and 420 K",
          author: [{ family: "Okafor", given: "Maren" }],
          "container-title": "Journal of Invented Chemistry",
          issued: { "date-parts": [[2004]] },
        },
      };
    });
  }, 120_000);

  it("the version's, the series' and the source's reference in the style asked for, the same text as the citation endpoint's", async () => {
    as(null);
    const { datasetId } = sets.published!;
    for (const style of ["apa", "vancouver", "harvard", "acs"]) {
      const res = await references(datasetId, `?style=${style}&version=1`);
      expect(res.status, style).toBe(200);
      const body = await res.json();
      expect(body.style).toBe(style);
      expect(body.version + "\n").toBe(await (await citation(datasetId, `?format=text&style=${style}&version=1`)).text());
      expect(body.series + "\n").toBe(await (await citation(datasetId, `?format=text&style=${style}`)).text());
      expect(body.source.toLowerCase(), style).toContain("rate constants of an invented reaction");
    }
    const acs = await (await references(datasetId, "?style=acs&version=1")).json();
    expect(acs.version).toMatch(/^Okafor, M\.; Lindqvist, T\. /);
  });

  it("a retracted version's reference says so; drafts and submissions are not found, even to their owner", async () => {
    as(owner);
    const retracted = await (await references(sets.retracted!.datasetId, "?style=harvard&version=1")).json();
    expect(retracted.version).toMatch(/retracted/i);
    for (const state of ["draft", "submitted"] as const)
      expect((await references(sets[state]!.datasetId, "?version=1")).status, state).toBe(404);
  });

  it("400 problem naming the parameter for an unknown style, a bad version, format (not taken here) or a repeated parameter", async () => {
    as(null);
    const { datasetId } = sets.published!;
    const cases: [string, string][] = [
      ["?style=chicago", "style"],
      ["?version=0", "version"],
      ["?format=bibtex", "format"],
      ["?style=apa&style=acs", "style"],
    ];
    for (const [query, parameter] of cases) {
      const res = await references(datasetId, query);
      expect(res.status, query).toBe(400);
      const problem = await res.json();
      expect(
        problem.errors.map((e: { parameter: string }) => e.parameter),
        query,
      ).toContain(parameter);
    }
    const unknown = await (await references(datasetId, "?lang=de")).json();
    expect(unknown.errors[0].message).toBe("unknown parameter “lang” (style, version)");
  });
});

describe("GET /api/v1/datasets/:id/versions/:n/datacite.json and .xml", () => {
  let published: Awaited<ReturnType<typeof datasetIn>>, draft: Awaited<ReturnType<typeof datasetIn>>;
  beforeAll(async () => {
    [published, draft] = [await datasetIn("published"), await datasetIn("draft")];
  }, 60_000);

  it.each(roles)("%s: a published version's metadata is the body its registration sends; a draft is not found", async (_, who) => {
    as(who());
    const res = await datacite("json", published.datasetId, 1);
    expect(res.status).toBe(200);
    const body = await res.json();
    const identifier = body.data.attributes.doi as string;
    const subject = await getRegistrationSubject({ identifier });
    expect(body).toEqual(JSON.parse(JSON.stringify(buildRegistrationBody(subject!))));
    expect(body.data.attributes.relatedIdentifiers).toContainEqual({
      relatedIdentifier: "10.5555/arrhenia.example.0001",
      relatedIdentifierType: "DOI",
      relationType: "IsSupplementTo",
    });
    expect(body.data.attributes.subjects).toContainEqual({ subject: "H-atom abstraction", subjectScheme: "Arrhenia reaction class" });
    expect((await datacite("json", draft.datasetId, 1)).status).toBe(404);
    expect((await datacite("xml", draft.datasetId, 1)).status).toBe(404);
  });

  it("XML: well-formed kernel-4 resource with the same identifier", async () => {
    as(null);
    const res = await datacite("xml", published.datasetId, "v1");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/xml; charset=utf-8");
    const xml = await res.text();
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml).toContain('<resource xmlns="http://datacite.org/schema/kernel-4"');
    expect(xml).toMatch(/<identifier identifierType="DOI">10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}\/1<\/identifier>/);
  });

  it("a retracted version: a Withdrawn date and the retraction in a description; its citation text says it is retracted", async () => {
    as(null);
    const retracted = await datasetIn("retracted");
    const a = (await (await datacite("json", retracted.datasetId, 1)).json()).data.attributes;
    const today = new Date().toISOString().slice(0, 10);
    expect(a.dates).toContainEqual({ date: today, dateType: "Withdrawn", dateInformation: "Retracted" });
    expect(a.descriptions.at(-1).description).toMatch(
      /^This version was retracted on .* Reason: Retracted for the test: a calibration error\.$/,
    );
    const xml = await (await datacite("xml", retracted.datasetId, 1)).text();
    expect(xml).toContain(`<date dateType="Withdrawn" dateInformation="Retracted">${today}</date>`);
    for (const style of ["apa", "vancouver", "harvard", "acs"])
      expect(await (await citation(retracted.datasetId, `?format=text&style=${style}&version=1`)).text(), style).toMatch(/retracted/i);
    expect(await (await citation(retracted.datasetId, "?format=bibtex&version=1")).text()).toMatch(/note = \{Version 1\. Retracted\}/);
  });

  it("a source publication with no DOI: named in the description, no related identifier for it", async () => {
    as(null);
    const noDoi = await datasetIn("published", (doc) => {
      doc.source = {
        reference: {
          type: "article-journal",
          title: "Hydroxyl radical kinetics in a heated flow tube",
          author: [{ family: "Okafor", given: "Maren" }],
          "container-title": "Journal of Invented Chemistry",
          issued: { "date-parts": [[1999]] },
        },
        locator: "Table 2",
      };
    });
    const a = (await (await datacite("json", noDoi.datasetId, 1)).json()).data.attributes;
    expect(a.relatedIdentifiers.filter((r: { relationType: string }) => r.relationType === "IsSupplementTo")).toEqual([]);
    expect(a.descriptions).toContainEqual({
      description:
        "Numbers taken from Table 2 of the source publication: Okafor, M. (1999). Hydroxyl radical kinetics in a heated flow tube. Journal of Invented Chemistry.",
      descriptionType: "Other",
    });
  });

  it("404 for a version the dataset does not have and for a malformed number", async () => {
    as(null);
    expect((await datacite("json", published.datasetId, 9)).status).toBe(404);
    expect((await datacite("xml", published.datasetId, "x1")).status).toBe(404);
  });

  it("400 problem naming an unknown or repeated parameter (neither route takes any)", async () => {
    as(null);
    for (const kind of ["json", "xml"] as const)
      for (const [query, parameter] of [
        ["?format=xml", "format"],
        ["?x=1&x=2", "x"],
      ]) {
        const res = await datacite(kind, published.datasetId, 1, query);
        expect(res.status, `${kind} ${query}`).toBe(400);
        expect(res.headers.get("content-type")).toBe("application/problem+json");
        expect((await res.json()).errors.map((e: { parameter: string }) => e.parameter)).toContain(parameter);
      }
  });

  it("a title with entity-like text and markup reads back as deposited from the XML, as in the JSON", async () => {
    as(null);
    // An invented title: "&nbsp;", "&#0;", "&amp;" and "<b>" are text here, not markup.
    const title = `OH + ethane rate constants&nbsp;(measured) &#0; &lt;b&gt; &amp; <b>x</b> ]]> ${uniqueEmail("t")}`;
    const odd = await datasetIn("published", (doc) => {
      doc.title = title;
    });
    const json = (await (await datacite("json", odd.datasetId, 1)).json()).data.attributes;
    const xml = await (await datacite("xml", odd.datasetId, 1)).text();
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml).not.toMatch(/&(?!(amp|lt|gt|quot|apos);)/);
    const back = new XMLParser({ isArray: (name) => name === "title" }).parse(xml).resource;
    expect(json.titles[0].title).toBe(title);
    expect(back.titles.title[0]).toBe(title);
  });
});

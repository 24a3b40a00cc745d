import { toJSON as parseBibtexIndependently } from "@orcid/bibtex-parse-js";
import { Cite } from "@citation-js/core";
import { describe, expect, it } from "vitest";
import { buildCslItem, citationKey, citationLineOf, cslName, sourceCslItem, type CitationSubject, type CslItem } from "@/lib/citation/csl";
import {
  CITATION_STYLES,
  formatBibtex,
  formatCitation,
  formatCslJson,
  formatReference,
  formatRis,
  risRecordId,
} from "@/lib/citation/formats";

// Invented people, title and identifier.
const version: CitationSubject = {
  kind: "version",
  identifier: "10.5072/ARH-4F7K-9QXM/2",
  title: "OH + CH4 rate constants, 250–420 K",
  creators: ["Emi Tanaka", "Varga, Bence"],
  publishedAt: new Date("2026-03-04T10:00:00Z"),
  versionNumber: 2,
  url: "https://arrhenia.test/datasets/3/v2",
};
const series: CitationSubject = {
  ...version,
  kind: "series",
  identifier: "10.5072/ARH-4F7K-9QXM",
  versionNumber: null,
  url: "https://arrhenia.test/datasets/3",
};
const item = buildCslItem(version);

describe("buildCslItem", () => {
  it("is a CSL-JSON dataset with creators, date, publisher, version, identifier and landing page", () => {
    expect(item).toEqual({
      id: "arrhenia_ARH_4F7K_9QXM_v2",
      "citation-key": "arrhenia_ARH_4F7K_9QXM_v2",
      type: "dataset",
      title: version.title,
      author: [
        { given: "Emi", family: "Tanaka" },
        { given: "Bence", family: "Varga" },
      ],
      issued: { "date-parts": [[2026, 3, 4]] },
      publisher: "Arrhenia",
      version: "2",
      DOI: "10.5072/ARH-4F7K-9QXM/2",
      URL: "https://arrhenia.test/datasets/3/v2",
    });
  });

  it("cites every version by the series identifier, with no version number", () => {
    const s = buildCslItem(series);
    expect(s.DOI).toBe("10.5072/ARH-4F7K-9QXM");
    expect(s.version).toBeUndefined();
    expect(s.id).toBe("arrhenia_ARH_4F7K_9QXM");
    expect(citationKey({ ...version, identifier: null })).toBe("arrhenia_OH2026");
  });

  it("keeps an organisation's name as one literal, and particles and suffixes apart (citation-js's name parser)", () => {
    expect(cslName("Rosalind van der Berg")).toEqual({ given: "Rosalind", "non-dropping-particle": "van der", family: "Berg" });
    expect(cslName("Smith, John, Jr.")).toEqual({ given: "John", family: "Smith", suffix: "Jr." });
    expect(cslName("Kinetics Consortium")).toEqual({ literal: "Kinetics Consortium" });
    expect(cslName("Institute of Invented Kinetics")).toEqual({ literal: "Institute of Invented Kinetics" });
  });

  it("takes the source publication's own CSL reference, adding the DOI given apart", () => {
    expect(sourceCslItem({ doi: "https://doi.org/10.5555/ex.1", reference: { type: "article-journal", title: "A study" } })).toMatchObject({
      id: "source",
      title: "A study",
      DOI: "10.5555/ex.1",
    });
    expect(sourceCslItem({ doi: "10.5555/ex.1" })).toBeNull();
    expect(sourceCslItem(undefined)).toBeNull();
  });
});

describe("formatted references (citation-js + the shipped CSL styles)", () => {
  // Expected strings follow each style's rules as the CSL style file states them (APA 7th: "(Version 2) [Dataset]").
  it("APA", () =>
    expect(formatReference(item, "apa")).toBe(
      "Tanaka, E., & Varga, B. (2026). OH + CH4 rate constants, 250–420 K (Version 2) [Dataset]. Arrhenia. https://doi.org/10.5072/ARH-4F7K-9QXM/2",
    ));
  it("Vancouver", () =>
    expect(formatReference(item, "vancouver")).toBe(
      "Tanaka E, Varga B. OH + CH4 rate constants, 250–420 K (version 2) [Internet]. Arrhenia; 2026. Available from: https://doi.org/10.5072/ARH-4F7K-9QXM/2",
    ));
  it("Harvard", () => expect(formatReference(item, "harvard")).toMatch(/^Tanaka, E\. and Varga, B\. \(2026\)/));
  it("American Chemical Society", () =>
    expect(formatReference(item, "acs")).toBe(
      "Tanaka, E.; Varga, B. OH + CH4 Rate Constants, 250–420 K (Version 2). Arrhenia, 2026. https://doi.org/10.5072/ARH-4F7K-9QXM/2.",
    ));
  it("every style names the creators and the year, with no list number", () => {
    for (const s of CITATION_STYLES) {
      const text = formatReference(item, s.id);
      expect(text, s.id).toMatch(/^Tanaka/);
      expect(text, s.id).toContain("2026");
    }
  });
  it("every style shows the version number, the publisher and the identifier", () => {
    for (const s of CITATION_STYLES) {
      const text = formatReference(item, s.id);
      expect(text, s.id).toMatch(/\bversion 2\b/i);
      expect(text, s.id).toContain("Arrhenia");
      expect(text, s.id).toContain("10.5072/ARH-4F7K-9QXM/2");
    }
  });
  it("each shipped style file still ignores what CITATION_STYLES says it does (else the title would say the version twice)", () => {
    // The item as a style file alone renders it, without styleItem's adaptation.
    const plain = (style: string, it: CslItem) =>
      new Cite(it).format("bibliography", { format: "text", template: `arrhenia-${style}`, lang: "en-US" }) as string;
    const retracted = { ...item, title: "Plain title", status: "retracted" };
    for (const s of CITATION_STYLES) {
      formatReference(item, s.id); // registers the style
      const text = plain(s.id, retracted);
      const ignores: readonly string[] = s.ignores;
      expect(/version\W+2/i.test(text), `${s.id} prints the version`).toBe(!ignores.includes("version"));
      expect(/retracted/i.test(text), `${s.id} prints the status`).toBe(!ignores.includes("status"));
      expect(text.includes("Arrhenia"), `${s.id} prints the publisher`).toBe(!ignores.includes("publisher"));
      expect(text.includes("10.5072/ARH-4F7K-9QXM/2"), `${s.id} prints the DOI`).toBe(!ignores.includes("DOI"));
    }
  });
});

describe("a retracted version", () => {
  const retracted = buildCslItem({ ...version, retracted: { at: new Date("2026-06-01T00:00:00Z") } });
  it("is a CSL item with status retracted (CSL 1.0.2 `status`, from memory)", () => expect(retracted.status).toBe("retracted"));
  it("says so in every style, in its one-line citation, and in BibTeX's and RIS's note", () => {
    for (const s of CITATION_STYLES) expect(formatReference(retracted, s.id), s.id).toMatch(/retracted/i);
    expect(citationLineOf(retracted)).toBe(
      "Tanaka, Emi; Varga, Bence (2026). OH + CH4 rate constants, 250–420 K. Version 2. Retracted. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2",
    );
    expect(formatBibtex(retracted)).toMatch(/note = \{Version 2\. Retracted\}/);
    expect(formatRis(retracted)).toMatch(/^N1 {2}- Version 2\. Retracted$/m);
    // A published version says nothing of the kind.
    expect(formatRis(item)).not.toMatch(/^N1/m);
    // RIS dates carry a two-digit month and day (the RIS format's YYYY/MM/DD/other; common practice of RIS readers).
    expect(formatRis(item)).toMatch(/^DA {2}- 2026\/03\/04\/$/m);
    for (const s of CITATION_STYLES) expect(formatReference(item, s.id), s.id).not.toMatch(/retracted/i);
  });
});

describe("a source publication without a DOI", () => {
  // Invented reference: title, journal, year and authors only.
  const source = sourceCslItem({
    reference: {
      type: "article-journal",
      title: "Hydroxyl radical kinetics in a heated flow tube",
      author: [{ family: "Okafor", given: "Maren" }],
      "container-title": "Journal of Invented Chemistry",
      volume: "12",
      page: "34-56",
      issued: { "date-parts": [[1999]] },
    },
  });
  it("is a CSL item of its own, with no DOI", () => {
    expect(source).toMatchObject({ id: "source", title: "Hydroxyl radical kinetics in a heated flow tube" });
    expect(source!.DOI).toBeUndefined();
  });
  it("is named in every style: its authors, title, journal and year", () => {
    for (const s of CITATION_STYLES) {
      const text = formatReference(source!, s.id);
      expect(text, s.id).toMatch(/^Okafor/);
      expect(text, s.id).toMatch(/hydroxyl radical kinetics/i);
      expect(text, s.id).toMatch(/J(ournal|) ?(of )?Invented Chem/);
      expect(text, s.id).toContain("1999");
    }
  });
});

describe("BibTeX, RIS and CSL-JSON", () => {
  it("citation-js reads its own BibTeX back to the same creators, title, year, identifier and version note (round trip)", () => {
    const bib = formatBibtex(item);
    expect(bib).toMatch(/^@misc\{arrhenia_ARH_4F7K_9QXM_v2,/);
    const [back] = new Cite(bib).data as Record<string, unknown>[];
    expect(back.author).toEqual(item.author);
    expect(back.title).toBe(item.title);
    expect(back.DOI).toBe(item.DOI);
    expect(back.note).toBe("Version 2");
    expect((back.issued as { "date-parts": number[][] })["date-parts"][0][0]).toBe(2026);
  });

  it("a second, independent BibTeX parser (@orcid/bibtex-parse-js) reads the entry", () => {
    const [entry] = parseBibtexIndependently(formatBibtex(item));
    expect(entry.citationKey).toBe("arrhenia_ARH_4F7K_9QXM_v2");
    expect(entry.entryType.toLowerCase()).toBe("misc");
    const tags = Object.fromEntries(Object.entries(entry.entryTags).map(([k, v]) => [k.toLowerCase(), v]));
    expect(tags.author).toBe("Tanaka, Emi and Varga, Bence");
    expect(tags.doi).toBe("10.5072/ARH-4F7K-9QXM/2");
    expect(tags.year).toBe("2026");
    expect(tags.note).toBe("Version 2");
    expect(tags.title).toContain("rate constants");
  });

  it("citation-js reads its own RIS back to the same item (round trip)", () => {
    const ris = formatRis(item);
    expect(ris).toMatch(/^TY {2}- DATA$/m);
    // The record id is whole: RIS's ID holds at most 20 characters (the RIS specification; citation-js cuts longer ones).
    expect(ris).toMatch(/^ID {2}- ARH_4F7K_9QXM_v2$/m);
    expect((new Cite(ris).data[0] as Record<string, unknown>).id).toBe("ARH_4F7K_9QXM_v2");
    expect(ris).toMatch(/^ET {2}- 2$/m);
    expect(ris).toMatch(/^DO {2}- 10\.5072\/ARH-4F7K-9QXM\/2$/m);
    const [back] = new Cite(ris).data as Record<string, unknown>[];
    for (const k of ["type", "title", "author", "issued", "publisher", "version", "DOI", "URL"] as const)
      expect(back[k], k).toEqual(item[k]);
  });

  it("CSL-JSON is an array of the one item, read back by citation-js unchanged", () => {
    const json = formatCslJson(item);
    expect(JSON.parse(json)).toEqual([item]);
    const [back] = new Cite(JSON.parse(json)).data as Record<string, unknown>[];
    expect(back.title).toBe(item.title);
    expect(formatCitation(item, "text", "apa")).toBe(formatReference(item, "apa") + "\n");
  });
});

describe("BibTeX of names and titles with braces and backslashes", () => {
  // Invented names and titles: an organisation's name (a literal) trying to close its field early.
  const awkward = [
    ["Evil Group}}, title = {Pwned}, howpublished = {{x", "OH + ethane {rate} constants"],
    ["Eve Consortium}}, title = {Pwned", "Rates \\ of OH }"],
    ["Odd Team {a} \\x $1_2^3~ & 50% #1", "{{Unbalanced title"],
    ["Smith and Jones Group", "A plain title"],
  ] as const;

  for (const [creator, title] of awkward) {
    it(`${JSON.stringify(creator)} stays one author and the title stays one title`, () => {
      const subject: CitationSubject = { ...version, title, creators: [creator, "Emi Tanaka"] };
      const bib = formatBibtex(buildCslItem(subject));
      // citation-js reads its own entry back to the deposited name and title.
      const [back] = new Cite(bib).data as Record<string, unknown>[];
      expect(back.title).toBe(title);
      expect(back.author).toEqual([{ family: creator }, { family: "Tanaka", given: "Emi" }]);
      // An independent parser (@orcid/bibtex-parse-js) sees one entry with one title and no field of the name's making.
      const entries = parseBibtexIndependently(bib);
      expect(entries).toHaveLength(1);
      const fields = Object.keys(entries[0].entryTags)
        .map((k) => k.toLowerCase())
        .sort();
      expect(fields.every((f) => ["author", "doi", "month", "note", "publisher", "title", "url", "year"].includes(f))).toBe(true);
      expect(fields.filter((f) => f === "title")).toHaveLength(1);
      expect(fields).not.toContain("howpublished");
      expect(bib.match(/^\s*title\s*=/gm)).toHaveLength(1);
    });
  }
});

describe("RIS record ids", () => {
  it("are whole, at most 20 characters, stable and read back unchanged by citation-js", () => {
    const keys = [
      buildCslItem(series),
      buildCslItem({ ...version, versionNumber: 123456, identifier: "10.5072/ARH-4F7K-9QXM/123456" }),
      buildCslItem({ ...version, identifier: null, title: "Temperature-dependent rate constants" }),
    ];
    const ids = keys.map(risRecordId);
    expect(ids[0]).toBe("ARH_4F7K_9QXM");
    expect(new Set(ids).size).toBe(ids.length);
    for (const [i, it] of keys.entries()) {
      const id = ids[i];
      expect(id.length).toBeLessThanOrEqual(20);
      expect(risRecordId(it)).toBe(id);
      const ris = formatRis(it);
      expect(ris).toContain(`\nID  - ${id}\n`);
      expect((new Cite(ris).data[0] as Record<string, unknown>).id).toBe(id);
    }
  });
});

describe("RIS of awkward titles", () => {
  const long = "Rate constants of the reaction of hydroxyl radicals with methane measured over a wide range, 250–1500 K";
  it("keeps a long title on its one TI line (citation-js folds at 70 characters)", () => {
    const ris = formatRis(buildCslItem({ ...version, title: long }));
    expect(ris.split("\n").filter((l) => l && !/^[A-Z][A-Z0-9] {2}-/.test(l))).toEqual([]);
    // Read back by citation-js's own RIS parser: the same title.
    expect(new Cite(ris).data[0].title).toBe(long);
  });
  it("never lets a line break or control character in a title start a new tag or record", () => {
    const ris = formatRis(buildCslItem({ ...version, title: "Line one\nER  - \nTY  - BOOK\u0001" }));
    expect(ris.match(/^TY {2}-/gm)).toHaveLength(1);
    expect(ris.match(/^ER {2}-/gm)).toHaveLength(1);
    expect(ris).toMatch(/^TI {2}- Line one ER - TY - BOOK$/m);
  });
});

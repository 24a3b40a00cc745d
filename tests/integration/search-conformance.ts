import { beforeAll, describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import type { DepositDocument } from "@/lib/deposits/types";
import { search, type SearchResponse } from "@/lib/search";
import { parseSearchParamsOrThrow } from "@/lib/search/params";
import type { DatasetHit, ReactionHit, SearchEngine } from "@/lib/search/types";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

/**
 * The conformance suite: the same queries against any engine, the same hits expected. Every
 * fixture carries one invented creator surname made for the run, and most queries filter on that
 * creator, so datasets of the demo and of other test files never change the answers. Numbers are
 * invented (k = A exp(−E/RT) with made-up A and E, a little deterministic scatter).
 *
 * `engine()` gives the engine under test; `sync()` runs after the fixtures are published and before
 * any query (an engine fed from an outbox drains it there).
 */

type Side = [name: string, smiles: string][];

interface Fixture {
  key: string;
  reactants: Side;
  products: Side;
  cls: string;
  category: "experiment" | "theory";
  technique: string;
  Ts: number[];
  A: number;
  EoverR: number;
  /** Pressure in Torr and bath gas. */
  torr: number;
  bathGas: string;
  licence: string;
  year: number;
  outlier?: boolean;
  end: "published" | "retracted" | "draft" | "submitted" | "in_review" | "returned" | "declined";
}

const OH: [string, string] = ["hydroxyl", "[OH]"];
const CH4: [string, string] = ["methane", "C"];
const H2O: [string, string] = ["water", "O"];
const CH3: [string, string] = ["methyl", "[CH3]"];
const spread = (lo: number, hi: number, n: number) =>
  Array.from({ length: n }, (_, i) => Math.round(1 / (1 / lo - (i / (n - 1)) * (1 / lo - 1 / hi))));

const FIXTURES: Fixture[] = [
  {
    key: "oh-ch4",
    reactants: [OH, CH4],
    products: [H2O, CH3],
    cls: "hydrogen-abstraction",
    category: "experiment",
    technique: "flash photolysis",
    Ts: spread(220, 420, 10),
    A: 2.4e-12,
    EoverR: 1770,
    torr: 50,
    bathGas: "He",
    licence: "CC-BY-4.0",
    year: 1998,
    end: "published",
  },
  {
    key: "ch4-oh-theory",
    reactants: [CH4, OH],
    products: [H2O, CH3],
    cls: "hydrogen-abstraction",
    category: "theory",
    // Words joined by a slash, which PostgreSQL's parser would read as one path (drizzle/0043).
    technique: "transition-state theory/RRKM",
    Ts: spread(250, 1500, 14),
    A: 2.0e-12,
    EoverR: 1700,
    torr: 760,
    bathGas: "N2",
    licence: "CC0-1.0",
    year: 2010,
    end: "published",
  },
  {
    key: "oh-c2h6",
    reactants: [OH, ["ethane", "CC"]],
    products: [H2O, ["ethyl", "C[CH2]"]],
    cls: "hydrogen-abstraction",
    category: "experiment",
    technique: "discharge flow",
    Ts: spread(230, 400, 8),
    A: 8.1e-12,
    EoverR: 1020,
    torr: 5,
    bathGas: "He",
    licence: "CC-BY-4.0",
    year: 2005,
    outlier: true,
    end: "published",
  },
  {
    key: "cl-ch4",
    reactants: [["chlorine atom", "[Cl]"], CH4],
    products: [["hydrogen chloride", "Cl"], CH3],
    cls: "hydrogen-abstraction",
    category: "experiment",
    technique: "flash photolysis",
    Ts: spread(200, 300, 6),
    A: 7.2e-12,
    EoverR: 1270,
    torr: 100,
    bathGas: "Ar",
    licence: "CC-BY-4.0",
    year: 2015,
    end: "published",
  },
  {
    key: "oh-c2h4",
    reactants: [OH, ["ethene", "C=C"]],
    products: [["2-hydroxyethyl", "OC[CH2]"]],
    cls: "addition",
    category: "experiment",
    technique: "pulsed laser photolysis",
    Ts: spread(200, 350, 7),
    A: 1.8e-12,
    EoverR: -430,
    torr: 200,
    bathGas: "He",
    licence: "CC-BY-4.0",
    year: 2020,
    end: "published",
  },
  {
    key: "oh-ch4-retracted",
    reactants: [OH, CH4],
    products: [H2O, CH3],
    cls: "hydrogen-abstraction",
    category: "experiment",
    technique: "shock tube",
    Ts: spread(900, 1400, 6),
    A: 2.6e-12,
    EoverR: 1800,
    torr: 1000,
    bathGas: "Ar",
    licence: "CC-BY-4.0",
    year: 2001,
    end: "retracted",
  },
  // Never public: a species of their own (cyclodecane) that no public dataset has.
  ...(["draft", "submitted", "in_review", "returned", "declined"] as const).map((end): Fixture => ({
    key: `hidden-${end}`,
    reactants: [OH, ["cyclodecane", "C1CCCCCCCCC1"]],
    products: [H2O, ["cyclodecyl", "[CH]1CCCCCCCCC1"]],
    cls: "elimination",
    category: "experiment",
    technique: "flash photolysis",
    Ts: spread(250, 400, 5),
    A: 1e-11,
    EoverR: 300,
    torr: 10,
    bathGas: "Xe",
    licence: "PDDL-1.0",
    year: 1990,
    end,
  })),
];

const PUBLIC = FIXTURES.filter((f) => f.end === "published" || f.end === "retracted").map((f) => f.key);
const HIDDEN_SMILES = "C1CCCCCCCCC1";

function fixtureDocument(f: Fixture, surname: string): DepositDocument {
  const { reportedFit: _unused, ...base } = EXAMPLE_DEPOSIT;
  void _unused;
  return {
    ...base,
    title: `${f.reactants.map((r) => r[0]).join(" + ")}: search fixture ${f.key}`,
    description: `Invented rate constants for the search conformance suite (${f.key}).`,
    keywords: ["search fixture"],
    license: f.licence as DepositDocument["license"],
    creators: [{ name: `${surname}, Ada` }],
    reaction: {
      reactants: f.reactants.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      products: f.products.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      class: f.cls as DepositDocument["reaction"]["class"],
      order: 2,
      phase: "gas",
    },
    method: { category: f.category, technique: f.technique },
    conditions: { pressure: { value: f.torr }, bathGas: f.bathGas },
    units: { k: "cm3 molecule-1 s-1", T: "K", pressure: "Torr" },
    points: f.Ts.map((T, i) => ({
      T,
      k: Number((f.A * Math.exp(-f.EoverR / T) * (1 + 0.03 * Math.sin(3 * i + 1)) * (f.outlier && i === 4 ? 6 : 1)).toPrecision(4)),
      uncertainty: { kind: "relative" as const, value: 6, confidence: "2sigma" as const },
    })),
    source: {
      reference: {
        type: "article-journal",
        title: `Search fixture ${f.key}`,
        author: [{ family: surname, given: "Ada" }],
        issued: { "date-parts": [[f.year]] },
      },
    },
  };
}

async function walk(f: Fixture, versionId: number, owner: UserDto, curator: UserDto) {
  const step = (transition: Parameters<typeof applyTransition>[0]["transition"], actor: UserDto, reason?: string) =>
    applyTransition({ versionId, actorId: actor.id, transition, reason });
  if (f.end === "draft") return;
  await step("submit", owner);
  if (f.end === "submitted") return;
  await step("start_review", curator);
  if (f.end === "in_review") return;
  if (f.end === "returned") return void (await step("return", curator, "Please state the pressure of each point."));
  if (f.end === "declined") return void (await step("decline", curator, "Outside the scope of the repository."));
  await step("accept", curator, "Consistent with its source.");
  if (f.end === "retracted") await step("retract", curator, "Withdrawn by its authors.");
}

export function runSearchConformance(
  label: string,
  { engine, sync = async () => {} }: { engine: () => SearchEngine; sync?: () => Promise<void> },
) {
  describe(`search conformance: ${label}`, () => {
    // Letters only, so the text search reads it as one word.
    const surname = `Quillfeather${Array.from({ length: 6 }, () => String.fromCharCode(97 + Math.floor(Math.random() * 26))).join("")}`;
    const creator = `${surname}, Ada`;
    const ids = new Map<string, number>();
    const keyOf = (versionId: number) => [...ids].find(([, id]) => id === versionId)?.[0] ?? `other:${versionId}`;

    const run = (params: Record<string, string | string[]>) => search(parseSearchParamsOrThrow(params, { strict: true }), engine());
    /** Fixture keys of a datasets-view answer, in order. */
    const keys = (r: SearchResponse) => (r.hits as DatasetHit[]).map((h) => keyOf(h.versionId));
    const mine = (params: Record<string, string | string[]>) => run({ creator, limit: "100", ...params });

    beforeAll(async () => {
      const owner = await createUser({ email: uniqueEmail("search-owner"), name: `Ada ${surname}`, passwordHash: "x", verified: true });
      const curator = await createUser({
        email: uniqueEmail("search-curator"),
        name: "Search Curator",
        passwordHash: "x",
        role: "curator",
        verified: true,
      });
      for (const f of FIXTURES) {
        const v = await depositNewDataset({ actor: owner, document: fixtureDocument(f, surname) });
        ids.set(f.key, v.id);
        await walk(f, v.id, owner, curator);
      }
      await sync();
    }, 120_000);

    it("finds every public fixture by its creator's surname (free text), and nothing else", async () => {
      const r = await run({ q: surname, limit: "100" });
      expect(r.parsed.query.kind).toBe("text");
      expect(keys(r).sort()).toEqual([...PUBLIC].sort());
      expect(r.total).toBe(PUBLIC.length);
    });

    it.each([
      ["methane", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["OH", ["oh-ch4", "ch4-oh-theory", "oh-c2h6", "oh-c2h4", "oh-ch4-retracted"]],
      ["hydroxyl", ["oh-ch4", "ch4-oh-theory", "oh-c2h6", "oh-c2h4", "oh-ch4-retracted"]],
      ["CH4", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      // "C": the SMILES of methane (and the formula of a carbon atom, which no fixture has).
      ["C", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["InChI=1S/CH4/h1H4", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["VNWKTOKETHGBQD-UHFFFAOYSA-N", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["OH + CH4", ["oh-ch4", "ch4-oh-theory", "oh-ch4-retracted"]],
      ["CH4 + OH", ["oh-ch4", "ch4-oh-theory", "oh-ch4-retracted"]],
      ["OH + *", ["oh-ch4", "ch4-oh-theory", "oh-c2h6", "oh-c2h4", "oh-ch4-retracted"]],
      ["CH4 -> CH3", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["CH4 → CH3", ["oh-ch4", "ch4-oh-theory", "cl-ch4", "oh-ch4-retracted"]],
      ["C=C => OC[CH2]", ["oh-c2h4"]],
      ["flash photolysis", ["oh-ch4", "cl-ch4"]],
      ["RRKM", ["ch4-oh-theory"]],
      ["theory/RRKM", ["ch4-oh-theory"]],
      // A "+" between words that name no species: the whole text is searched as words, not a reaction.
      ["flash photolysis + OH", ["oh-ch4"]],
      ["ethene", ["oh-c2h4"]],
    ])("%s finds exactly its fixtures", async (q, expected) => {
      const r = await mine({ q });
      expect(keys(r).sort()).toEqual([...expected].sort());
      expect(r.total).toBe(expected.length);
    });

    it("reads a misspelt name through trigram similarity", async () => {
      const r = await mine({ q: "hydroxy1" });
      expect(keys(r)).toEqual(expect.arrayContaining(["oh-c2h4"]));
    });

    it("finds a reaction by its key", async () => {
      const first = await mine({ q: "ethene" });
      const key = (first.hits as DatasetHit[])[0].reactionKey;
      expect(keys(await mine({ q: key }))).toEqual(["oh-c2h4"]);
    });

    it.each([
      [{ class: "addition" }, ["oh-c2h4"]],
      [{ class: "addition,elimination" }, ["oh-c2h4"]],
      [{ phase: "liquid" }, []],
      [{ method: "theory" }, ["ch4-oh-theory"]],
      [{ bathGas: "Ar" }, ["cl-ch4", "oh-ch4-retracted"]],
      [{ bathGas: ["Ar", "N2"] }, ["cl-ch4", "oh-ch4-retracted", "ch4-oh-theory"]],
      [{ licence: "CC0-1.0" }, ["ch4-oh-theory"]],
      [{ flag: "outliers" }, ["oh-c2h6"]],
      [{ tMin: "1000" }, ["ch4-oh-theory", "oh-ch4-retracted"]],
      [{ tMax: "210" }, ["cl-ch4", "oh-c2h4"]],
      // Overlap counts a shared end (Cl + CH4 ends at 300 K).
      [{ tMin: "300", tMax: "400" }, ["oh-ch4", "ch4-oh-theory", "oh-c2h6", "oh-c2h4", "cl-ch4"]],
      [{ tMin: "300", tMax: "400", tCovers: "true" }, ["oh-ch4", "ch4-oh-theory", "oh-c2h6"]],
      // 100 Torr = 13 332 Pa; 760 Torr = 101 325 Pa.
      [{ pMin: "20000" }, ["ch4-oh-theory", "oh-c2h4", "oh-ch4-retracted"]],
      [{ pMin: "10000", pMax: "30000" }, ["cl-ch4", "oh-c2h4"]],
      [{ yearMin: "2005", yearMax: "2015" }, ["ch4-oh-theory", "oh-c2h6", "cl-ch4"]],
      [{ q: "OH", method: "experiment", tMax: "300" }, ["oh-ch4", "oh-c2h6", "oh-c2h4"]],
    ])("filter %j keeps exactly its fixtures", async (params, expected) => {
      const r = await mine(params as Record<string, string>);
      expect(keys(r).sort()).toEqual([...expected].sort());
      expect(r.total).toBe(expected.length);
    });

    it("counts facets live: each facet over the matches with every other facet's filter applied", async () => {
      const r = await mine({ class: "addition" });
      const count = (facet: keyof SearchResponse["facets"], value: string) => r.facets[facet].find((c) => c.value === value)?.count ?? 0;
      // The class facet ignores its own filter: every class of the creator's public datasets is offered.
      expect(count("reactionClass", "hydrogen-abstraction")).toBe(5);
      expect(count("reactionClass", "addition")).toBe(1);
      // Other facets count within the chosen class.
      expect(count("methodCategory", "experiment")).toBe(1);
      expect(count("methodCategory", "theory")).toBe(0);
      expect(count("creator", creator)).toBe(1);
    });

    it("never shows a draft, a submission, a version in review, a returned or a declined one, not even in facet counts", async () => {
      const bySmiles = await run({ q: HIDDEN_SMILES });
      expect(bySmiles.total).toBe(0);
      expect(bySmiles.hits).toEqual([]);
      expect(Object.values(bySmiles.facets).flat()).toEqual([]);
      const all = await mine({});
      expect(all.total).toBe(PUBLIC.length);
      expect(all.facets.creator.find((c) => c.value === creator)?.count).toBe(PUBLIC.length);
      expect(all.facets.reactionClass.map((c) => c.value)).not.toContain("elimination");
      expect(all.facets.bathGas.map((c) => c.value)).not.toContain("Xe");
      expect(all.facets.licence.map((c) => c.value)).not.toContain("PDDL-1.0");
      expect(all.facets.sourceYear.map((c) => c.value)).not.toContain("1990");
    });

    it("lists a retracted version, marked as such", async () => {
      const r = await mine({ q: "OH + CH4" });
      const hits = r.hits as DatasetHit[];
      expect(hits.find((h) => keyOf(h.versionId) === "oh-ch4-retracted")?.retracted).toBe(true);
      expect(hits.find((h) => keyOf(h.versionId) === "oh-ch4")?.retracted).toBe(false);
    });

    it("gives each hit what the datasets view shows", async () => {
      const [hit] = (await mine({ q: "ethene" })).hits as DatasetHit[];
      expect(hit).toMatchObject({
        versionNumber: 1,
        retracted: false,
        reactionClass: "addition",
        methodCategory: "experiment",
        tMin: 200,
        tMax: 350,
        pointCount: 7,
        creators: [creator],
        aUnit: "cm3 molecule-1 s-1",
      });
      expect(hit.equation).toMatch(/hydroxyl/);
      expect(hit.versionIdentifier).toMatch(/\/1$/);
      // The re-fit of k = 1.8e-12 exp(430 K/T) with ±3 % scatter: Ea ≈ −430 K × R (invented numbers).
      expect(hit.ea! / 8.314462618).toBeGreaterThan(-600);
      expect(hit.ea! / 8.314462618).toBeLessThan(-250);
      expect(Number.isNaN(Date.parse(hit.publishedAt))).toBe(false);
    });

    it.each([
      ["newest", (h: DatasetHit) => Date.parse(h.publishedAt)],
      ["widest", (h: DatasetHit) => h.tMax - h.tMin],
      ["points", (h: DatasetHit) => h.pointCount],
    ] as const)("sorts by %s, largest first, ties by the newest version", async (sort, value) => {
      const hits = (await mine({ sort })).hits as DatasetHit[];
      expect(hits).toHaveLength(PUBLIC.length);
      for (let i = 1; i < hits.length; i++) {
        const [a, b] = [value(hits[i - 1]), value(hits[i])];
        expect(a > b || (a === b && hits[i - 1].versionId > hits[i].versionId)).toBe(true);
      }
    });

    it("sorts by relevance: a title match ranks above a match in the description alone", async () => {
      const r = await mine({ q: "ethene", sort: "relevance" });
      expect(keys(r)[0]).toBe("oh-c2h4");
      const text = await mine({ q: "search fixture oh-c2h4" });
      expect(keys(text)[0]).toBe("oh-c2h4");
    });

    it.each(["relevance", "newest", "widest", "points"])("pages through %s with cursors, without gaps or repeats", async (sort) => {
      const whole = await mine({ sort, q: surname });
      const seen: string[] = [];
      let cursor: string | null = null;
      let pages = 0;
      do {
        const page: SearchResponse = await run({ creator, q: surname, sort, limit: "2", ...(cursor ? { cursor } : {}) });
        expect(page.total).toBe(PUBLIC.length);
        seen.push(...keys(page));
        cursor = page.nextCursor;
        pages++;
      } while (cursor && pages < 10);
      expect(pages).toBe(Math.ceil(PUBLIC.length / 2));
      expect(seen).toEqual(keys(whole));
    });

    it("groups by reaction in the reactions view", async () => {
      const r = await mine({ view: "reactions", q: "methane", sort: "points" });
      const hits = r.hits as ReactionHit[];
      // OH + CH4 (three datasets, one retracted) and Cl + CH4.
      expect(r.total).toBe(2);
      // The retracted one is found and said, but counts in neither the number nor the range.
      expect(hits.map((h) => [h.datasetCount, h.retractedCount]).sort()).toEqual([
        [1, 0],
        [2, 1],
      ]);
      const ohCh4 = hits.find((h) => h.retractedCount === 1)!;
      expect(ohCh4.tMin).toBe(220);
      expect(ohCh4.tMax).toBe(1500);
      // Only the retracted dataset matches the shock-tube words: listed, no range, no evidence.
      const onlyRetracted = await mine({ view: "reactions", q: "shock tube", sort: "widest" });
      expect((onlyRetracted.hits as ReactionHit[]).map((h) => [h.datasetCount, h.retractedCount, h.tMin, h.tMax])).toEqual([
        [0, 1, null, null],
      ]);
      const paged = await mine({ view: "reactions", q: "methane", sort: "points", limit: "1" });
      expect(paged.hits).toHaveLength(1);
      expect(paged.nextCursor).not.toBeNull();
    });

    it("treats SQL and markup as text", async () => {
      for (const q of ["'; drop table search_documents; --", "<script>alert(1)</script>", '" or 1=1 --', "%_\\"]) {
        const r = await mine({ q });
        expect(r.total).toBe(0);
      }
      expect((await mine({})).total).toBe(PUBLIC.length);
    });
  });
}

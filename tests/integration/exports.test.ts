import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import Papa from "papaparse";
import { parse as parseYaml } from "yaml";
import { GET as getExportJson } from "@/app/api/v1/datasets/[id]/versions/[n]/export.json/route";
import { GET as getParameters } from "@/app/api/v1/datasets/[id]/versions/[n]/parameters/route";
import { GET as getConsensus } from "@/app/api/v1/reactions/[id]/consensus/route";
import { GET as getReactionParameters } from "@/app/api/v1/reactions/[id]/parameters/route";
import { GET as getSearchExport } from "@/app/api/v1/search/export/route";
import { GET as getSearch } from "@/app/api/v1/search/route";
import { GET as getPointsCsv } from "@/app/api/v1/versions/[id]/points.csv/route";
import type { Transition } from "@/lib/curation/lifecycle";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { reactionSegment } from "@/lib/reactions/paths";
import { getReaction } from "@/lib/reactions/queries";
import { DEFAULT_REQUEST, EMPTY_FILTERS } from "@/lib/search/params";
import { postgresEngine } from "@/lib/search/engines/postgres";
import { searchExportStream } from "@/lib/search/export";
import type { DatasetHit, EngineQuery, SearchEngine, SearchFacet, SearchResult } from "@/lib/search/types";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

// Sources: CODATA 2018 (R exact since the 2019 SI: N_A·k_B) and the thermochemical calorie, 4.184 J (NIST SP 811, 2008, B.8).
const R = 8.31446261815324;
const CAL = 4.184;

let owner: UserDto, curator: UserDto;
/** A word only this file's datasets carry in their titles, so a search finds exactly them. */
const WORD = `exporttest${Date.now().toString(36)}`;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"]) =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, curator] = await Promise.all([mk("export-owner", "researcher"), mk("export-curator", "curator")]);
});

const walks: Record<string, Transition[]> = {
  draft: [],
  published: ["submit", "accept"],
  retracted: ["submit", "accept", "retract"],
};

async function versionIn(state: keyof typeof walks, title: string) {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as typeof EXAMPLE_DEPOSIT;
  doc.title = `${title} ${WORD}`;
  const v = await depositNewDataset({ actor: owner, document: doc });
  for (const t of walks[state]) {
    const byOwner = t === "submit";
    const reason = t === "retract" ? "Retracted for the test: a calibration error." : byOwner ? undefined : "For the test.";
    await applyTransition({ versionId: v.id, actorId: byOwner ? owner.id : curator.id, transition: t, reason });
  }
  return v;
}

const ctx = <P>(p: P) => ({ params: Promise.resolve(p) });
const parameters = (datasetId: number, n: string, query = "") =>
  getParameters(
    new Request(`http://127.0.0.1/api/v1/datasets/${datasetId}/versions/${n}/parameters${query}`),
    ctx({ id: String(datasetId), n }),
  );
const exportJson = (datasetId: number, n: string, query = "") =>
  getExportJson(
    new Request(`http://127.0.0.1/api/v1/datasets/${datasetId}/versions/${n}/export.json${query}`),
    ctx({ id: String(datasetId), n }),
  );

/** Cantera's units block → factor from A′'s unit to cm³ molecule⁻¹ s⁻¹ (second order), written out from the definitions. */
const N_A = 6.02214076e23; // CODATA 2018, exact
const toPerMolecule = (u: { length: string; quantity: string }) =>
  ({ cm: 1, dm: 1e3, m: 1e6 })[u.length]! / (u.quantity === "mol" ? N_A : 1);
const toJoules: Record<string, number> = { "J/mol": 1, "kJ/mol": 1000, "cal/mol": CAL, "kcal/mol": 1000 * CAL, K: R };

describe("mechanism parameters of a version", () => {
  let published: { id: number; datasetId: number };
  let retracted: { id: number; datasetId: number };
  let draft: { id: number; datasetId: number };
  beforeAll(async () => {
    [published, retracted, draft] = [
      await versionIn("published", "Export test (published)"),
      await versionIn("retracted", "Export test (retracted)"),
      await versionIn("draft", "Export test (draft)"),
    ];
  }, 120_000);

  it("Cantera YAML in kcal and cm³ mol⁻¹ s⁻¹ reproduces k(T) of the stored preferred fit to 1e-10", async () => {
    const res = await parameters(published.datasetId, "1", "?format=cantera-yaml&k=cm3%20mol-1%20s-1&energy=kcal%20mol-1");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/yaml; charset=utf-8");
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="ARH-[0-9A-Z-]+-1-parameters\.yaml"$/);
    const text = await res.text();
    expect(text).toContain(FIT_CAUTION);
    const doc = parseYaml(text);
    expect(doc.units).toEqual({ length: "cm", quantity: "mol", time: "s", "activation-energy": "kcal/mol" });
    const [reaction] = doc.reactions;
    expect(reaction.equation).toMatch(/=>/);
    const stored = await (await exportJson(published.datasetId, "1")).json();
    const result = stored.analysis.result;
    const model = result.band.model === "modified_arrhenius" && result.modifiedArrhenius ? "modified_arrhenius" : "arrhenius";
    const fit = model === "modified_arrhenius" ? result.modifiedArrhenius.params : { ...result.arrhenius.params, n: 0, T0: 298.15 };
    const { A, b, Ea } = reaction["rate-constant"];
    for (const T of [250, 300, 420, 1000]) {
      const ours = Math.exp(fit.lnA) * (T / fit.T0) ** fit.n * Math.exp(-fit.Ea / (R * T));
      const cantera = A * toPerMolecule(doc.units) * T ** b * Math.exp(-(Ea * toJoules[doc.units["activation-energy"]]) / (R * T));
      expect(Math.abs(cantera / ours - 1)).toBeLessThan(1e-10);
    }
  });

  it("the plain table names the reaction, the identifier, T0, the range and the caution", async () => {
    const res = await parameters(published.datasetId, "v1", "?energy=K");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("text/plain; charset=utf-8");
    const text = await res.text();
    expect(text).toMatch(/^reaction: .+ → .+$/m);
    expect(text).toMatch(/^version identifier: doi:10\.5072\/ARH-.+\/1$/m);
    expect(text).toMatch(/T0 = [\d.]+ K/);
    expect(text).toMatch(/^valid range: 250 K to 420 K/m);
    expect(text).toContain(`caution: ${FIT_CAUTION}`);
    expect(text).toMatch(/^fit\s+preferred\s+A \(cm3 molecule-1 s-1\)\s+n\s+Ea\/R \(K\)/m);
  });

  it("bad parameters are a 400 problem naming each one", async () => {
    for (const [query, parameter] of [
      ["?k=s-1", "k"],
      ["?energy=eV", "energy"],
      ["?format=xml", "format"],
      ["?fit=eyring", "fit"],
      ["?units=K", "units"],
    ] as const) {
      const res = await parameters(published.datasetId, "1", query);
      expect(res.status, query).toBe(400);
      expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
      const body = await res.json();
      expect(
        body.errors.map((e: { parameter: string }) => e.parameter),
        query,
      ).toEqual([parameter]);
    }
  });

  it("a retracted version still answers, saying so; a draft or a missing version is a 404", async () => {
    const res = await parameters(retracted.datasetId, "1");
    expect(res.status).toBe(200);
    expect(await res.text()).toMatch(/^retracted: .*calibration error/m);
    expect((await parameters(draft.datasetId, "1")).status).toBe(404);
    expect((await parameters(published.datasetId, "2")).status).toBe(404);
    expect((await parameters(published.datasetId, "x")).status).toBe(404);
  });

  it("export.json: the deposit document, the re-fits and flags with the engine version; 404 for a draft", async () => {
    const res = await exportJson(published.datasetId, "1");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(/-1-export\.json"$/);
    const body = await res.json();
    expect(body.document.title).toBe(`Export test (published) ${WORD}`);
    expect(body.document.points).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    expect(body.analysis.engineVersion).toBe(ENGINE_VERSION);
    expect(body.analysis.result.arrhenius.params.Ea).toBeGreaterThan(0);
    expect(Array.isArray(body.analysis.flags)).toBe(true);
    expect(body.analysis.flags).toEqual(body.analysis.result.flags);
    expect(body.about).toMatchObject({
      state: "published",
      caution: FIT_CAUTION,
      licence: "CC-BY-4.0",
      units: { k: "cm3 molecule-1 s-1" },
    });
    const gone = await exportJson(retracted.datasetId, "1");
    expect((await gone.json()).about.retraction.notice).toMatch(/calibration error/);
    expect((await exportJson(draft.datasetId, "1")).status).toBe(404);
    expect((await exportJson(published.datasetId, "1", "?format=xml")).status).toBe(400);
  });

  it("points.csv with ?bom=1 starts with a UTF-8 byte order mark; without it, none; a bad bom is a 400", async () => {
    const csv = (q: string) =>
      getPointsCsv(new Request(`http://127.0.0.1/api/v1/versions/${published.id}/points.csv${q}`), ctx({ id: String(published.id) }));
    const withBom = new Uint8Array(await (await csv("?bom=1")).arrayBuffer());
    // The first header line is one quoted cell: '"#'.
    expect([...withBom.slice(0, 5)]).toEqual([0xef, 0xbb, 0xbf, '"'.charCodeAt(0), "#".charCodeAt(0)]);
    const plain = new Uint8Array(await (await csv("")).arrayBuffer());
    expect([...plain.slice(0, 2)]).toEqual(['"'.charCodeAt(0), "#".charCodeAt(0)]);
    const bad = await csv("?bom=yes");
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].parameter).toBe("bom");
  });
});

describe("mechanism parameters of a reaction's consensus", () => {
  let segment: string;
  beforeAll(async () => {
    const a = await versionIn("published", "Export consensus test A");
    await versionIn("published", "Export consensus test B");
    const reaction = await getReaction({ id: a.reactionId! });
    segment = reactionSegment(reaction!.key);
  }, 120_000);
  const get = (seg: string, query = "") =>
    getReactionParameters(new Request(`http://127.0.0.1/api/v1/reactions/${seg}/parameters${query}`), ctx({ id: seg }));

  it("by the reaction page's key: Cantera YAML reproduces the consensus route's k(T)", async () => {
    const res = await get(segment, "?format=cantera-yaml&energy=kJ%20mol-1&k=m3%20mol-1%20s-1");
    expect(res.status).toBe(200);
    const doc = parseYaml(await res.text());
    expect(doc.units).toMatchObject({ length: "m", quantity: "mol" });
    expect(doc.description).toMatch(/^datasets: doi:10\.5072\//m);
    const consensusRes = await getConsensus(
      new Request(`http://127.0.0.1/api/v1/reactions/${segment}/consensus`),
      ctx({ id: String((await getReactionFromSegment(segment)).id) }),
    );
    const { data } = await consensusRes.json();
    const c = data.consensus;
    const fit = c.preferred === "modified_arrhenius" ? c.modifiedArrhenius.params : { ...c.arrhenius.params, n: 0, T0: c.T0 };
    const { A, b, Ea } = doc.reactions[0]["rate-constant"];
    for (const T of [250, 330, 420]) {
      const ours = Math.exp(fit.lnA) * (T / fit.T0) ** fit.n * Math.exp(-fit.Ea / (R * T));
      const cantera = A * toPerMolecule(doc.units) * T ** b * Math.exp(-(Ea * 1000) / (R * T));
      expect(Math.abs(cantera / ours - 1)).toBeLessThan(1e-10);
    }
  });

  it("an unknown key is a 404, a bad consensus choice a 400 naming it", async () => {
    expect((await get("AAAAAAAAAAAAAA-BBBBBBBBBB-N~CCCCCCCCCCCCCC-DDDDDDDDDD-N")).status).toBe(404);
    expect((await get("not-a-key")).status).toBe(404);
    const bad = await get(segment, "?include=some");
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].parameter).toBe("include");
  });
});

/** The reaction id behind a page segment (the consensus route takes the id). */
async function getReactionFromSegment(seg: string) {
  const { findPublicReaction } = await import("@/lib/reactions/public-queries");
  return (await findPublicReaction({ key: seg.replace("~", ">>") }))!;
}

describe("export of a whole search result", () => {
  const exportOf = (query: string) => getSearchExport(new Request(`http://127.0.0.1/api/v1/search/export?${query}`), ctx({}));

  it("CSV: header block with the search and the caution, one formula-safe row per match, optional BOM", async () => {
    await versionIn("published", "Export search test");
    const res = await exportOf(`q=${WORD}&bom=1`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv; charset=utf-8/);
    expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="arrhenia-search-\d{4}-\d{2}-\d{2}\.csv"$/);
    const bytes = new Uint8Array(await res.arrayBuffer());
    expect([...bytes.slice(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = new TextDecoder().decode(bytes.slice(3));
    const lines = text.split("\r\n");
    // Each header line is one quoted cell (RFC 4180, read by papaparse) starting with "#".
    const comments = lines.filter((l) => l.startsWith('"#')).map((l) => Papa.parse<string[]>(l, { delimiter: "," }).data[0][0]);
    expect(comments).toContain(`# caution: ${FIT_CAUTION}`);
    expect(comments.find((l) => l.startsWith("# search: "))).toContain(`q=${WORD}`);
    // The units line is plain text like every header line, in the files' ASCII spelling.
    const units = comments.find((l) => l.startsWith("# units: "))!;
    expect(units).toMatch(/^# units: T in K; Ea in J mol-1; A in /);
    expect(units).not.toMatch(/[{}⁻³]/);
    const table = Papa.parse<Record<string, string>>(lines.filter((l) => !l.startsWith('"#')).join("\n"), {
      header: true,
      skipEmptyLines: true,
    });
    expect(table.errors).toEqual([]);
    expect(table.data.length).toBeGreaterThanOrEqual(4);
    for (const row of table.data) {
      expect(row.title).toContain(WORD);
      expect(row.version_identifier).toMatch(/^10\.5072\/ARH-/);
      expect(row.page).toMatch(/\/datasets\/\d+\/v\d+$/);
      // One spelling of a unit in every file meant for scripts (lib/unit-labels.ts unitText), whatever the stored document holds.
      if (row.arrhenius_A_unit) expect(row.arrhenius_A_unit).toMatch(/^(s-1|cm3 molecule-1 s-1|cm6 molecule-2 s-1)$/);
    }
  });

  it("JSON lines and JSON: the same rows, each line or the whole document parses", async () => {
    const jsonl = await (await exportOf(`q=${WORD}&format=jsonl`)).text();
    const [about, ...rows] = jsonl
      .trimEnd()
      .split("\n")
      .map((l) => JSON.parse(l));
    expect(about.about.caution).toBe(FIT_CAUTION);
    const json = await (await exportOf(`q=${WORD}&format=json`)).json();
    expect(json.hits).toEqual(rows);
    expect(rows.length).toBeGreaterThanOrEqual(4);
    const reactions = await (await exportOf(`q=${WORD}&format=json&view=reactions`)).json();
    expect(reactions.hits[0]).toMatchObject({ datasets: expect.any(Number), page: expect.stringMatching(/\/reactions\//) });
    const none = await (await exportOf(`q=nothingmatchesthis${WORD}&format=json`)).json();
    expect(none.hits).toEqual([]);
  });

  it("bad parameters are a 400 naming each: the format, a search parameter, limit and cursor", async () => {
    for (const [query, parameter] of [
      ["format=xml", "format"],
      ["tmin=300", "tmin"],
      ["tMin=abc", "tMin"],
      ["limit=10", "limit"],
      ["cursor=abc", "cursor"],
    ] as const) {
      const res = await exportOf(query);
      expect(res.status, query).toBe(400);
      expect((await res.json()).errors[0].parameter, query).toBe(parameter);
    }
  });
});

describe("a search export that cannot be answered", () => {
  const exportOf = (query: string) => getSearchExport(new Request(`http://127.0.0.1/api/v1/search/export?${query}`), ctx({}));
  const searchOf = (query: string) => getSearch(new Request(`http://127.0.0.1/api/v1/search?${query}`), ctx({}));
  /** The error the postgres driver gives when the database does not accept connections. */
  const outage = () => Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" });

  it("a search text GET /api/v1/search refuses is refused the same way, as a problem naming q, before any byte", async () => {
    for (const q of ["[]", "%", "%ZZ", "%00", "../../etc/passwd"]) {
      const query = `q=${q}`;
      const search = await searchOf(query);
      const res = await exportOf(query);
      expect(res.status, query).toBe(search.status);
      if (search.status === 200) continue;
      expect(res.status, query).toBeGreaterThanOrEqual(400);
      expect(res.status, query).toBeLessThan(500);
      expect(res.headers.get("content-type"), query).toMatch(/^application\/problem\+json/);
      expect((await res.json()).errors[0].pointer, query).toBe("/q");
    }
    // The malformed one is refused (the attack that answered 502 before).
    expect((await exportOf("q=[]")).status).toBe(400);
  });

  it("the database out of reach for the first batch: a 503 problem with Retry-After, no download", async () => {
    const spy = vi.spyOn(postgresEngine, "search").mockRejectedValueOnce(outage());
    try {
      const res = await exportOf("format=jsonl&view=reactions");
      expect(res.status).toBe(503);
      expect(res.headers.get("retry-after")).toBe("5");
      expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
      expect(res.headers.get("content-disposition")).toBeNull();
    } finally {
      spy.mockRestore();
    }
  });

  it("the database lost after the first batch: the stream errors (the connection is cut), it never just stops or hangs", async () => {
    const search = postgresEngine.search.bind(postgresEngine);
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    const spy = vi
      .spyOn(postgresEngine, "search")
      // A first page that says more follows, then the outage.
      .mockImplementationOnce(async (query) => ({ ...(await search(query)), nextAfter: "more" }))
      .mockRejectedValueOnce(outage());
    try {
      const res = await exportOf("format=jsonl&view=reactions");
      expect(res.status).toBe(200);
      const reader = res.body!.getReader();
      const first = await reader.read();
      expect(new TextDecoder().decode(first.value)).toMatch(/^\{"about":/);
      await expect(reader.read()).rejects.toMatchObject({ code: "ECONNREFUSED" });
      expect(warn).toHaveBeenCalled();
    } finally {
      spy.mockRestore();
      warn.mockRestore();
    }
  });

  it("CSV: a search text with commas and quotes stays inside its one header cell; no cell starts a formula (read as RFC 4180)", async () => {
    const q = 'ozone,"=HYPERLINK(""http://evil.example"",""x"")",';
    const res = await exportOf(`q=${encodeURIComponent(q)}`);
    expect(res.status).toBe(200);
    const text = await res.text();
    // papaparse, an RFC 4180 reader.
    const records = Papa.parse<string[]>(text, { delimiter: ",", skipEmptyLines: true }).data;
    const head = records.filter((r) => r[0].startsWith("#"));
    expect(head.length).toBeGreaterThan(5);
    for (const record of head) expect(record).toHaveLength(1);
    expect(head.find((r) => r[0].startsWith("# understood: "))![0]).toContain("=HYPERLINK(");
    // Common practice (OWASP "CSV injection"): no text cell starts with = + - @.
    for (const record of records) for (const cell of record) if (!Number.isFinite(Number(cell))) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe("a search export of 100 000 rows streams", () => {
  const TOTAL = 100_000;
  /** An engine over a generated result: hits made on demand, page by page, counting the pages asked for. */
  function generatedEngine() {
    const served = { pages: 0 };
    const engine: SearchEngine = {
      name: "postgres",
      async search(query: EngineQuery): Promise<SearchResult> {
        served.pages++;
        const from = query.after === null ? 0 : Number(query.after);
        const to = Math.min(TOTAL, from + query.limit);
        const hits: DatasetHit[] = [];
        for (let i = from; i < to; i++)
          hits.push({
            versionId: i + 1,
            datasetId: i + 1,
            versionNumber: 1,
            versionIdentifier: `10.5072/ARH-GEN0-${String(i).padStart(6, "0")}/1`,
            retracted: false,
            title: i === 7 ? '=HYPERLINK("http://example.invalid") invented title' : `Invented dataset ${i}, generated for the test`,
            equation: "A + B → C",
            reactionKey: `GENERATEDKEYXX-XXXXXXXXXX-N>>GENERATEDKEYYY-YYYYYYYYYY-N`,
            reactionClass: "abstraction",
            methodCategory: "measured",
            tMin: 200 + (i % 100),
            tMax: 400 + (i % 100),
            pointCount: 5 + (i % 20),
            ea: 1000 + i,
            a: 1e-12,
            aUnit: "cm³ molecule⁻¹ s⁻¹",
            flags: [],
            creators: ["Invented, Person"],
            publishedAt: new Date(Date.UTC(2020, 0, 1) + i * 1000).toISOString(),
          });
        return {
          view: "datasets",
          total: TOTAL,
          hits,
          facets: {} as Record<SearchFacet, []>,
          nextAfter: to < TOTAL ? String(to) : null,
        };
      },
    };
    return { engine, served };
  }

  it("the first bytes arrive after one batch is read, the walk never runs more than one batch ahead of the reader, and every row arrives", async () => {
    const { engine, served } = generatedEngine();
    const request = { ...DEFAULT_REQUEST, filters: { ...EMPTY_FILTERS } };
    const reader = (await searchExportStream(request, { format: "csv", engine })).getReader();
    const decoder = new TextDecoder();
    let chunks = 0;
    let bytes = 0;
    let text = "";
    let rows = -1; // the column line is not a row
    let firstRowsAfterPages = -1;
    let mostAhead = 0;
    // A full collection before each heap reading, so the reading is what is still held, not garbage.
    setFlagsFromString("--expose-gc");
    const gc = runInNewContext("gc") as () => void;
    const held = () => {
      gc();
      return process.memoryUsage().heapUsed;
    };
    const heapStart = held();
    let heapMost = heapStart;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks++;
      bytes += value.byteLength;
      const piece = decoder.decode(value, { stream: true });
      const lines = piece.split("\r\n").filter((l) => l && !l.startsWith('"#')).length;
      if (lines > 1 && firstRowsAfterPages < 0) firstRowsAfterPages = served.pages;
      rows += lines;
      // Pages the engine served beyond the chunks the reader has taken (the header rides with the first batch).
      mostAhead = Math.max(mostAhead, served.pages - chunks);
      // Kept for the checks below: the first two chunks (the header rides with the first batch) and every 25th.
      if (chunks <= 2 || chunks % 25 === 0) text += piece;
      if (chunks % 10 === 0) heapMost = Math.max(heapMost, held());
    }
    expect(rows).toBe(TOTAL);
    expect(served.pages).toBe(TOTAL / 1000);
    // The first rows reached the reader when only the first batches had been read, long before the last row.
    expect(firstRowsAfterPages).toBeLessThanOrEqual(2);
    expect(mostAhead).toBeLessThanOrEqual(2);
    // A title that would start a formula is neutralised.
    expect(text).toContain(`'=HYPERLINK`);
    const heapGrowth = heapMost - heapStart;
    console.log(
      `search export: ${TOTAL} rows, ${bytes} bytes in ${chunks} chunks, heap held beyond the start at most ${(heapGrowth / 2 ** 20).toFixed(2)} MiB`,
    );
    // What is held while streaming stays a small part of the file (a buffered export would hold all of it, twice as UTF-16).
    expect(heapGrowth).toBeLessThan(bytes / 10);
  }, 120_000);
});

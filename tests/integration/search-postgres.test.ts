import { describe, expect, it } from "vitest";
import { GET as searchGET } from "@/app/api/v1/search/route";
import { GET as suggestGET } from "@/app/api/v1/search/suggest/route";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { postgresEngine } from "@/lib/search/engines/postgres";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";
import { runSearchConformance } from "./search-conformance";

runSearchConformance("PostgreSQL", { engine: () => postgresEngine });

const call = (handler: typeof searchGET, path: string) => handler(new Request(`http://127.0.0.1${path}`), { params: Promise.resolve({}) });

describe("search documents in the transaction of the change", () => {
  it("are written by acceptance, rolled back with it, rewritten by retraction", async () => {
    const owner = await createUser({ email: uniqueEmail("sd-owner"), name: "Doc Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("sd-cur"),
      name: "Doc Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Search document transaction test" } });
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    const docs = async () =>
      sql<{ latest: boolean; retracted: boolean }[]>`select latest, retracted from search_documents where version_id = ${v.id}`;
    expect(await docs()).toEqual([]);
    // A failure later in the publishing transaction takes the document with it.
    await expect(
      applyTransition({
        versionId: v.id,
        actorId: curator.id,
        transition: "accept",
        reason: "Consistent.",
        beforeCommit: async () => {
          throw new Error("failure after the document was written");
        },
      }),
    ).rejects.toThrow("failure after");
    expect(await docs()).toEqual([]);
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    expect(await docs()).toEqual([{ latest: true, retracted: false }]);
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "retract", reason: "Withdrawn by its authors." });
    expect(await docs()).toEqual([{ latest: true, retracted: true }]);
  });

  it("are refused by the database for a version that is not public", async () => {
    const owner = await createUser({ email: uniqueEmail("sd-forge"), name: "Forger", passwordHash: "x", verified: true });
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Search document forged" } });
    const [reaction] = await sql<{ reaction_id: number }[]>`select reaction_id from dataset_versions where id = ${v.id}`;
    await expect(sql`
      insert into search_documents (version_id, dataset_id, version_number, latest, retracted, title, description, keywords, creators, technique, source,
        reaction_id, reaction_key, equation, reactant_keys, product_keys, species_names, formulas, reaction_class, phase, method_category, bath_gases,
        licence, t_min, t_max, point_count, flags, published_at)
      values (${v.id}, 1, 1, true, false, 'forged', '', '{}', '{}', '', '', ${reaction.reaction_id}, 'k', 'e', '{}', '{}', '{}', '{}', 'other', 'gas',
        'experiment', '{}', 'CC-BY-4.0', 1, 2, 2, '{none}', now())`).rejects.toThrow(
      /only published and retracted versions are searchable/,
    );
  });
});

describe("GET /api/v1/search", () => {
  it("answers the query, what was understood, hits, facets and the caution", async () => {
    const res = await call(searchGET, "/api/v1/search?q=hydroxyl&limit=2");
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.parsed).toMatch(/either side/);
    expect(body.query).toMatchObject({ q: "hydroxyl", limit: 2 });
    expect(body.hits.length).toBeLessThanOrEqual(2);
    expect(Object.keys(body.facets)).toEqual([
      "reactionClass",
      "phase",
      "methodCategory",
      "bathGas",
      "licence",
      "sourceYear",
      "flags",
      "creator",
    ]);
    expect(body.caution).toMatch(/extrapolat/i);
    if (body.total > 2) {
      const next = await call(searchGET, `/api/v1/search?q=hydroxyl&limit=2&cursor=${encodeURIComponent(body.nextCursor)}`);
      expect(next.status).toBe(200);
    }
  });

  it.each([
    ["tMin=400&tMax=300", "tMax"],
    ["tMin=-1", "tMin"],
    ["tMin=abc", "tMin"],
    ["class=unknown-class", "class"],
    ["flag=shiny", "flag"],
    ["limit=1000", "limit"],
    ["tmin=300", "tmin"],
    [`q=${"x".repeat(501)}`, "q"],
    ["q=C(C", "q"],
    ["q=InChI%3D1S%2Fxx", "q"],
    ["cursor=eyJhIjoiWzEsMl0ifQ.AAAA", "cursor"],
  ])("answers 400 problem+json naming the parameter for %s", async (query, parameter) => {
    const res = await call(searchGET, `/api/v1/search?${query}`);
    expect(res.status).toBe(400);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const problem = await res.json();
    expect(problem.errors.map((e: { parameter: string }) => e.parameter)).toContain(parameter);
  });

  it("refuses a cursor carried over to another search", async () => {
    const first = await (await call(searchGET, "/api/v1/search?limit=1")).json();
    expect(first.nextCursor).toBeTruthy();
    const res = await call(searchGET, `/api/v1/search?limit=1&sort=points&cursor=${encodeURIComponent(first.nextCursor)}`);
    expect(res.status).toBe(400);
  });
});

describe("GET /api/v1/search/suggest", () => {
  it("offers species by name, synonym and formula, and reactions, published data only", async () => {
    const body = await (await call(suggestGET, "/api/v1/search/suggest?q=hydrox")).json();
    expect(body.species.map((s: { formula: string }) => s.formula)).toContain("HO");
    expect(body.species.length).toBeLessThanOrEqual(8);
    expect(body.reactions.length).toBeGreaterThan(0);
    expect(body.reactions.length).toBeLessThanOrEqual(8);
    const formula = await (await call(suggestGET, "/api/v1/search/suggest?q=CH4")).json();
    expect(formula.species.map((s: { formula: string }) => s.formula)).toContain("CH4");
    const typo = await (await call(suggestGET, "/api/v1/search/suggest?q=metane")).json();
    expect(typo.species.map((s: { formula: string }) => s.formula)).toContain("CH4");
    // A species only a draft uses is never offered.
    const hidden = await (await call(suggestGET, "/api/v1/search/suggest?q=cyclodecane")).json();
    expect(hidden.species.map((s: { formula: string }) => s.formula)).not.toContain("C10H20");
    expect((await call(suggestGET, "/api/v1/search/suggest?q=")).status).toBe(200);
  });
});

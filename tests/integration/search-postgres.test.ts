import { describe, expect, it } from "vitest";
import { GET as searchGET } from "@/app/api/v1/search/route";
import { GET as suggestGET } from "@/app/api/v1/search/suggest/route";
import { applyTransition } from "@/lib/curation/transitions";
import { newSeriesIdentifier, versionIdentifierOf } from "@/lib/identifiers/series-code";
import { depositNewDataset, startNextVersion } from "@/lib/datasets/deposits";
import { refitVersion } from "@/lib/datasets/refit";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { postgresEngine } from "@/lib/search/engines/postgres";
import { createApiToken, createUser } from "@/lib/users/queries";
import { depositInState, sql, uniqueEmail } from "./helpers";
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

  it("list only the newest public version of a dataset: publishing v2 unlists v1 in the same transaction", async () => {
    const owner = await createUser({ email: uniqueEmail("sd-v2"), name: "Second Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("sd-v2c"),
      name: "Second Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v1 = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Search latest test" } });
    await applyTransition({ versionId: v1.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v1.id, actorId: curator.id, transition: "accept", reason: "Fine." });
    const v2 = await startNextVersion({ actor: owner, versionId: v1.id });
    const latest = async () =>
      (
        await sql<
          { version_id: number; latest: boolean }[]
        >`select version_id, latest from search_documents where version_id in (${v1.id}, ${v2.id}) order by version_id`
      ).map((r) => [r.version_id, r.latest]);
    // A draft of the next version changes nothing.
    expect(await latest()).toEqual([[v1.id, true]]);
    await applyTransition({ versionId: v2.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v2.id, actorId: curator.id, transition: "accept", reason: "Second version fine." });
    expect(await latest()).toEqual([
      [v1.id, false],
      [v2.id, true],
    ]);
  });

  it("are rewritten by a re-fit (new Ea, A and flags) in its transaction", async () => {
    const owner = await createUser({ email: uniqueEmail("sd-refit"), name: "Refit Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("sd-refitc"),
      name: "Refit Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Search document re-fit test" } });
    // Fitted by an older engine, then published: the re-fit appends the current engine's analysis.
    await sql`update version_analyses set engine_version = 'kinetics-0' where version_id = ${v.id}`;
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    const [before] = await sql<{ ea: number }[]>`select ea from search_documents where version_id = ${v.id}`;
    await sql`update search_documents set ea = 0, flags = '{curved}' where version_id = ${v.id}`;
    expect(await refitVersion({ versionId: v.id })).toBe("refitted");
    const [after] = await sql<{ ea: number; flags: string[] }[]>`select ea, flags from search_documents where version_id = ${v.id}`;
    expect(after.ea).toBeCloseTo(before.ea, 6);
    expect(after.flags).not.toContain("curved");
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
    ["q=%00", "q"],
    ["q=InChI%3D1S%2Fxx", "q"],
    // A dataset's own identifier pasted into the search: the answer says where it resolves (/search opens it).
    [`q=${encodeURIComponent(`doi:${versionIdentifierOf(newSeriesIdentifier("10.5072", 4242), 1)}`)}`, "q"],
    ["cursor=eyJhIjoiWzEsMl0ifQ.AAAA", "cursor"],
    // Each hyphen a NOT: PostgreSQL's query parser gives up past 32 levels (found by an outside review: was a 500).
    [`q=${"-".repeat(33)}`, "q"],
    [`q=${"-".repeat(60)}x`, "q"],
  ])("answers 400 problem+json naming the parameter for %s", async (query, parameter) => {
    const res = await call(searchGET, `/api/v1/search?${query}`);
    expect(res.status).toBe(400);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const problem = await res.json();
    expect(problem.errors.map((e: { parameter: string }) => e.parameter)).toContain(parameter);
  });

  it("answers a repeated search from memory, yet shows a publication and a retraction at the very next search", async () => {
    const owner = await createUser({ email: uniqueEmail("ac-owner"), name: "Kept Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("ac-cur"),
      name: "Kept Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const word = `keptanswer${Date.now().toString(36)}`;
    const path = `/api/v1/search?q=${word}`;
    const hits = async () => {
      const res = await call(searchGET, path);
      expect(res.status).toBe(200);
      return ((await res.json()) as { total: number; hits: { retracted: boolean }[] }).hits.map((h) => h.retracted);
    };
    expect(await hits()).toEqual([]);
    const v = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: `Answer cache ${word}` } });
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    // A submission is not public: the kept answer (nothing) is still right.
    expect(await hits()).toEqual([]);
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    expect(await hits()).toEqual([false]);
    expect(await hits()).toEqual([false]);
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "retract", reason: "Withdrawn by its authors." });
    expect(await hits()).toEqual([true]);
  });

  it("refuses a cursor carried over to another search", async () => {
    const first = await (await call(searchGET, "/api/v1/search?limit=1")).json();
    expect(first.nextCursor).toBeTruthy();
    const res = await call(searchGET, `/api/v1/search?limit=1&sort=points&cursor=${encodeURIComponent(first.nextCursor)}`);
    expect(res.status).toBe(400);
  });
});

describe("visibility per role", () => {
  it("no caller — anonymous, the owner, a curator, an admin — finds a draft, a submission or a returned or declined version", async () => {
    const mk = (tag: string, role: "researcher" | "curator" | "admin") =>
      createUser({ email: uniqueEmail(tag), name: `Vis ${tag}`, passwordHash: "x", role, verified: true });
    const [owner, curator, admin] = await Promise.all([mk("vis-owner", "researcher"), mk("vis-cur", "curator"), mk("vis-admin", "admin")]);
    // A reaction of its own (cyclononane), never published by anyone.
    const document = {
      ...EXAMPLE_DEPOSIT,
      reaction: {
        ...EXAMPLE_DEPOSIT.reaction,
        reactants: [
          { name: "hydroxyl", smiles: "[OH]", coefficient: 1 },
          { name: "cyclononane", smiles: "C1CCCCCCCC1", coefficient: 1 },
        ],
        products: [
          { name: "water", smiles: "O", coefficient: 1 },
          { name: "cyclononyl", smiles: "[CH]1CCCCCCCC1", coefficient: 1 },
        ],
      },
    };
    const steps: [string, ["submit" | "start_review" | "return" | "decline", "owner" | "curator"][]][] = [
      ["draft", []],
      ["submitted", [["submit", "owner"]]],
      [
        "in review",
        [
          ["submit", "owner"],
          ["start_review", "curator"],
        ],
      ],
      [
        "returned",
        [
          ["submit", "owner"],
          ["start_review", "curator"],
          ["return", "curator"],
        ],
      ],
      [
        "declined",
        [
          ["submit", "owner"],
          ["start_review", "curator"],
          ["decline", "curator"],
        ],
      ],
    ];
    for (const [title, path] of steps) {
      const v = await depositNewDataset({ actor: owner, document: { ...document, title: `Visibility ${title}` } });
      for (const [transition, who] of path)
        await applyTransition({
          versionId: v.id,
          actorId: (who === "owner" ? owner : curator).id,
          transition,
          reason: "A reason for the record.",
        });
    }
    const tokens = await Promise.all(
      [owner, curator, admin].map(
        async (u) =>
          (
            await createApiToken({
              userId: u.id,
              name: "vis",
              scopes: ["deposit:read", "deposit:write", ...(u.role === "admin" ? (["admin"] as const) : [])],
            })
          ).secret,
      ),
    );
    for (const secret of [null, ...tokens]) {
      const headers: Record<string, string> = secret ? { authorization: `Bearer ${secret}` } : {};
      for (const q of ["C1CCCCCCCC1", "cyclononane", "Visibility", "OH + C1CCCCCCCC1"]) {
        const res = await searchGET(new Request(`http://127.0.0.1/api/v1/search?q=${encodeURIComponent(q)}`, { headers }), {
          params: Promise.resolve({}),
        });
        expect(res.status).toBe(200);
        const body = await res.json();
        expect((body.hits as { title: string }[]).filter((h) => h.title.startsWith("Visibility"))).toEqual([]);
        if (q !== "Visibility") expect(body.total).toBe(0);
      }
    }
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

  it("offers the reactions a reaction pattern finds on the search page (both reactants, reactant → product, any arrow)", async () => {
    const suggest = async (q: string) =>
      (await (await call(suggestGET, `/api/v1/search/suggest?${new URLSearchParams({ q })}`)).json()) as {
        species: unknown[];
        reactions: { reactionKey: string; equation: string }[];
      };
    const search = async (q: string) =>
      (await (await call(searchGET, `/api/v1/search?${new URLSearchParams({ q, view: "reactions" })}`)).json()) as {
        hits: { reactionKey: string }[];
      };
    // The demo's OH + methane reaction (hydrogen abstraction, water and methyl).
    for (const q of ["OH + CH4", "CH4 + OH", "CH4 -> CH3", "CH4 → CH3", "hydroxyl + methane", "OH + *"]) {
      const body = await suggest(q);
      const found = (await search(q)).hits.map((h) => h.reactionKey);
      expect(found.length, q).toBeGreaterThan(0);
      expect(body.reactions.length, q).toBeGreaterThan(0);
      // What is offered first is what the search finds, the most datasets first.
      expect(found, q).toContain(body.reactions[0].reactionKey);
      // Every suggestion is a reaction the search finds. (Other test files publish reactions of OH meanwhile: the search,
      // asked after the suggestions, may find one more than they offered, never one fewer.)
      if (found.length <= 8)
        expect(found, q).toEqual(expect.arrayContaining(body.reactions.slice(0, found.length).map((r) => r.reactionKey)));
      expect(body.species, q).toEqual([]);
    }
    const ohMethane = await suggest("OH + CH4");
    // A reaction key typed whole offers that reaction.
    const key = ohMethane.reactions[0].reactionKey;
    expect((await suggest(key)).reactions.map((r) => r.reactionKey)).toContain(key);
    // A half-typed structure is no error while typing; a term naming no species falls back to the words.
    expect((await call(suggestGET, `/api/v1/search/suggest?${new URLSearchParams({ q: "OH + C(" })}`)).status).toBe(200);
    expect((await suggest("zzqx + CH4")).reactions).toEqual([]);
  });
});

describe("the rows of the datasets view, read from the in-memory index", () => {
  it("are what search_documents holds for every listed document, field for field", async () => {
    const { datasetHitAt, memoryIndex } = await import("@/lib/search/engines/memory-index");
    const owner = await createUser({ email: uniqueEmail("sd-rows"), name: "Row Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("sd-rows-c"),
      name: "Row Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const v = await depositInState({ owner, curator, document: { ...EXAMPLE_DEPOSIT, title: "Index rows test" }, state: "published" });
    const index = await memoryIndex();
    const rows = await sql<Record<string, unknown>[]>`
      select version_id, dataset_id, version_number, version_identifier, retracted, title, equation, reaction_key, reaction_class,
        method_category, t_min, t_max, point_count, ea, a, a_unit, flags, creators, to_json(published_at)#>>'{}' as published_at
      from search_documents where latest order by version_id`;
    expect(index.size).toBe(rows.length);
    expect(rows.some((r) => Number(r.version_id) === v.id)).toBe(true);
    for (const r of rows) {
      const at = index.byVersion.get(Number(r.version_id));
      expect(at).toBeDefined();
      expect(datasetHitAt(index, at!)).toEqual({
        versionId: Number(r.version_id),
        datasetId: Number(r.dataset_id),
        versionNumber: Number(r.version_number),
        versionIdentifier: r.version_identifier,
        retracted: r.retracted,
        title: r.title,
        equation: r.equation,
        reactionKey: r.reaction_key,
        reactionClass: r.reaction_class,
        methodCategory: r.method_category,
        tMin: Number(r.t_min),
        tMax: Number(r.t_max),
        pointCount: Number(r.point_count),
        ea: r.ea === null ? null : Number(r.ea),
        a: r.a === null ? null : Number(r.a),
        aUnit: r.a_unit,
        flags: r.flags,
        creators: r.creators,
        // A Date keeps milliseconds: the database's microseconds are cut, as new Date(text) cuts them.
        publishedAt: new Date(String(r.published_at)).toISOString(),
      });
    }
  });
});

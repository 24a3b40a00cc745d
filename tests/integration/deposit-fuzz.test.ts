// Property-based fuzz of the deposit and analysis endpoints: documents built by mutating a valid
// example must never get a 5xx, every 422 carries JSON pointers, and a refused document stores
// nothing. FUZZ_RUNS raises the number of cases (default: a few hundred, well under a minute).
import fc from "fast-check";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
// The per-address limit is tested elsewhere; here every case must reach the handler's body.
vi.mock("@/lib/auth/rate-limit", async (importOriginal) => ({
  ...(await importOriginal<object>()),
  consumeOrThrow: vi.fn(async () => undefined),
}));

import { createDraftAction, saveDraftAction } from "@/app/deposits/actions";
import { POST as postAnalysis } from "@/app/api/v1/analyses/route";
import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { getCurrentUser } from "@/lib/auth/session";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { MAX_JSON_DEPTH } from "@/lib/json-depth";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const RUNS = Number(process.env.FUZZ_RUNS ?? 300);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;

let owner: UserDto;
beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("fuzz"), name: "fuzz", passwordHash: "x", role: "researcher", verified: true });
  vi.mocked(getCurrentUser).mockResolvedValue(owner);
});

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
type Path = (string | number)[];

/** Every path to a value inside a JSON value (the root excluded). */
function pathsOf(value: Json, at: Path = []): Path[] {
  if (Array.isArray(value)) return value.flatMap((v, i) => [[...at, i], ...pathsOf(v, [...at, i])]);
  if (value !== null && typeof value === "object")
    return Object.entries(value).flatMap(([k, v]) => [[...at, k], ...pathsOf(v, [...at, k])]);
  return [];
}

const EXAMPLE = JSON.parse(JSON.stringify(EXAMPLE_DEPOSIT)) as Json;
const PATHS = pathsOf(EXAMPLE);
const isLeafNamed = (names: string[]) => PATHS.filter((p) => names.includes(String(p[p.length - 1])));
const UNIT_PATHS = isLeafNamed(["k", "T", "pressure", "EaUnit"]).filter((p) => p[0] === "units" || p[0] === "reportedFit");
const SPECIES_PATHS = isLeafNamed(["smiles", "inchi", "name", "coefficient"]).filter((p) => p[0] === "reaction");

const badText = fc.oneof(
  fc.string({ maxLength: 20 }).map((s) => `${s}\u0000${s}`),
  fc.string({ maxLength: 20 }).map((s) => `${s}\ud800`),
  fc.string({ maxLength: 20 }).map((s) => `\udc00${s}`),
  fc.constantFrom("\u0000", "\ud83d", "\ude00\ud83d", "a\u0000b\ud800c"),
);
const oddNumber = fc.oneof(
  fc.constantFrom(
    5e-324,
    -5e-324,
    1e-320,
    1e-310,
    1e-300,
    1e-45,
    1e38,
    3.5e38,
    1e300,
    1e308,
    -1e308,
    0,
    -0,
    -1,
    2 ** 31,
    -(2 ** 31) - 1,
    2 ** 53 + 2,
    0.1 + 0.2,
    1.5,
    0.5,
  ),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer(),
);
const wrongType = fc.oneof(
  fc.constantFrom<Json>(null, true, false, [], {}, "", " ", "NaN", "Infinity", "-Infinity", "1e999", "0x10"),
  fc.jsonValue({ maxDepth: 2 }) as fc.Arbitrary<Json>,
);
// Huge values travel as small descriptions, expanded when applied, so that a counterexample prints.
type Big = { $long: number } | { $deep: number; $object: boolean };
const longString = fc.constantFrom(10_000, 100_000, 1_000_000).map((n): Big => ({ $long: n }));
const deep = fc.tuple(fc.constantFrom(100, 1000, 5000, 20_000), fc.boolean()).map(([d, o]): Big => ({ $deep: d, $object: o }));
// Deep nesting stays a placeholder string until the text is written: JSON.stringify itself
// recurses, and a client can send any depth.
function expand(value: Json | Big): Json {
  if (value && typeof value === "object" && "$long" in value) return "a".repeat(value.$long as number);
  if (value && typeof value === "object" && "$deep" in value) return `\u0001deep:${value.$deep}:${value.$object ? "o" : "a"}\u0001`;
  return value as Json;
}

function toText(doc: Json): string {
  return JSON.stringify(doc).replace(/"\\u0001deep:(\d+):([oa])\\u0001"/g, (_m, depth: string, kind: string) => {
    const n = Number(depth);
    return kind === "o" ? '{"a":'.repeat(n) + "1" + "}".repeat(n) : "[".repeat(n) + "1" + "]".repeat(n);
  });
}
const unitString = fc.constantFrom(
  " ",
  "",
  "\t",
  "K ",
  " K",
  "°C",
  "degC",
  "kelvin",
  "cm3",
  "cm3 molecule-1",
  "m3 molecule-1 s-1",
  "L mol-1 s-1",
  "cm^3/molecule/s",
  "s-1",
  "cm6 molecule-2 s-1",
  "kJ",
  "Torr\u0000",
  "x".repeat(200),
  "⁻¹",
);
const speciesString = fc.constantFrom(
  "",
  " ",
  "C1CC",
  "[OH",
  "X",
  "[Xx]",
  "C".repeat(3000),
  "[Na+].[Cl-]",
  "[H]",
  "[2H]",
  "c1ccccc1",
  "InChI=1S/",
  "InChI=1S/H2O/h1H2",
  "InChI=1S/garbage",
  "O=O",
  "[O-][O+]=O",
  "*",
);
const anyValue: fc.Arbitrary<Json | Big> = fc.oneof(badText, oddNumber, wrongType, longString, deep);

type Mutation =
  | { kind: "set"; path: Path; value: Json | Big }
  | { kind: "delete"; path: Path }
  | { kind: "add"; path: Path; key: string; value: Json | Big };

const pathArb = fc.constantFrom(...PATHS);
const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant("set" as const), path: pathArb, value: anyValue }) },
  {
    weight: 2,
    arbitrary: fc.record({ kind: fc.constant("set" as const), path: fc.constantFrom(...UNIT_PATHS), value: fc.oneof(unitString, badText) }),
  },
  {
    weight: 2,
    arbitrary: fc.record({
      kind: fc.constant("set" as const),
      path: fc.constantFrom(...SPECIES_PATHS),
      value: fc.oneof(speciesString, oddNumber, badText),
    }),
  },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant("delete" as const), path: pathArb }) },
  {
    weight: 1,
    arbitrary: fc.record({
      kind: fc.constant("add" as const),
      path: fc.constantFrom<Path>([], ["reaction"], ["points", 0], ["source"], ["source", "reference"], ["units"], ["creators", 0]),
      key: fc.oneof(fc.string({ maxLength: 12 }), badText),
      value: anyValue,
    }),
  },
);

function apply(doc: Json, m: Mutation): Json {
  const parentPath = m.kind === "add" ? m.path : m.path.slice(0, -1);
  let parent: Json = doc;
  for (const step of parentPath) {
    if (parent === null || typeof parent !== "object") return doc; // an earlier mutation replaced the branch
    parent = (parent as Record<string, Json>)[step as string];
  }
  if (parent === null || typeof parent !== "object") return doc;
  const target = parent as Record<string | number, Json>;
  if (m.kind === "add") target[m.key] = expand(m.value);
  else if (m.kind === "set") target[m.path[m.path.length - 1]] = expand(m.value);
  else if (Array.isArray(parent)) parent.splice(Number(m.path[m.path.length - 1]), 1);
  else delete target[m.path[m.path.length - 1]];
  return doc;
}

const counts = async () =>
  (
    await sql`select (select count(*) from datasets)::int as datasets, (select count(*) from dataset_versions)::int as versions,
      (select count(*) from version_points)::int as points, (select count(*) from version_analyses)::int as analyses, (select count(*) from reactions)::int as reactions`
  )[0];

type Problem = { errors?: { pointer?: unknown; message?: unknown }[] };

function expectPointers(problem: Problem) {
  expect(Array.isArray(problem.errors) && problem.errors.length).toBeGreaterThan(0);
  for (const e of problem.errors!) {
    expect(typeof e.pointer).toBe("string");
    expect(e.pointer === "" || String(e.pointer).startsWith("/")).toBe(true);
    expect(typeof e.message).toBe("string");
  }
}

describe("fuzz: POST /api/v1/datasets", () => {
  it(
    `never answers 5xx, points at every problem and stores nothing from a refused document (${RUNS} cases)`,
    { timeout: 120_000 },
    async () => {
      const seen = new Map<number, number>();
      await fc.assert(
        fc.asyncProperty(fc.array(mutation, { minLength: 1, maxLength: 3 }), async (mutations) => {
          const doc = mutations.reduce(apply, structuredClone(EXAMPLE));
          const before = await counts();
          const res = await createDataset(new Request("http://127.0.0.1/api/v1/datasets", { method: "POST", body: toText(doc) }), {
            params: Promise.resolve({}),
          });
          seen.set(res.status, (seen.get(res.status) ?? 0) + 1);
          expect(res.status).toBeLessThan(500);
          expect([201, 413, 422]).toContain(res.status);
          if (res.status === 201) return;
          if (res.status === 422) expectPointers(await res.json());
          expect(await counts()).toEqual(before);
        }),
        { numRuns: RUNS, seed: SEED, endOnFailure: true },
      );
      // The generator must reach both outcomes, or it tests nothing.
      expect(seen.get(422)).toBeGreaterThan(RUNS / 4);
      expect(seen.get(201) ?? 0).toBeGreaterThan(0);
    },
  );
});

describe("fuzz: POST /api/v1/analyses", () => {
  const valid: Json = {
    order: 2,
    units: { k: "cm3 molecule-1 s-1", T: "K" },
    T0: 298,
    points: [250, 300, 350, 400].map((T, i) => ({ T, k: 1e-12 * Math.exp(-1500 / T), sigmaLnK: 0.05 + i / 100 })),
  };
  const analysisPaths = pathsOf(valid);
  const analysisMutation: fc.Arbitrary<Mutation> = fc.oneof(
    {
      weight: 4,
      arbitrary: fc.record({
        kind: fc.constant("set" as const),
        path: fc.constantFrom(...analysisPaths),
        value: fc.oneof(anyValue, unitString),
      }),
    },
    { weight: 1, arbitrary: fc.record({ kind: fc.constant("delete" as const), path: fc.constantFrom(...analysisPaths) }) },
    {
      weight: 1,
      arbitrary: fc.record({
        kind: fc.constant("add" as const),
        path: fc.constantFrom<Path>([], ["units"], ["points", 0]),
        key: fc.oneof(fc.string({ maxLength: 8 }), badText),
        value: anyValue,
      }),
    },
  );
  const runs = Math.max(20, Math.round(RUNS / 3));

  it(`never answers 5xx and points at every problem (${runs} cases)`, { timeout: 60_000 }, async () => {
    let ok = 0;
    await fc.assert(
      fc.asyncProperty(fc.array(analysisMutation, { minLength: 1, maxLength: 3 }), async (mutations) => {
        const body = mutations.reduce(apply, structuredClone(valid));
        const res = await postAnalysis(new Request("http://127.0.0.1/api/v1/analyses", { method: "POST", body: toText(body) }), {
          params: Promise.resolve({}),
        });
        expect(res.status).toBeLessThan(500);
        expect([200, 413, 422]).toContain(res.status);
        if (res.status === 200) ok++;
        if (res.status === 422) expectPointers(await res.json());
      }),
      { numRuns: runs, seed: SEED, endOnFailure: true },
    );
    expect(ok).toBeGreaterThan(0);
  });
});

describe("deeply nested documents are refused with the pointer of the first place too deep", () => {
  // Each check of a document (schema, unstorable text) walks it recursively: thousands of levels
  // once overflowed the stack (500) in the incomplete-draft save.
  const arrays = (levels: number) => `${"[".repeat(levels)}${"]".repeat(levels)}`;
  const objects = (levels: number) => `${'{"a":'.repeat(levels)}1${"}".repeat(levels)}`;
  const nested = [
    { name: "6000 levels of arrays", text: arrays(6000), pointer: `/description${"/0".repeat(MAX_JSON_DEPTH - 1)}` },
    { name: "5000 levels of objects", text: objects(5000), pointer: `/description${"/a".repeat(MAX_JSON_DEPTH - 1)}` },
  ];
  const draft = (inner: string) => `{"title":"nest","description":${inner}}`;

  for (const { name, text, pointer } of nested) {
    it(`${name}: editor actions (text and Blob), the deposit API and the analysis API answer 422 at ${pointer.slice(0, 20)}…`, async () => {
      const before = await counts();
      for (const out of [await createDraftAction(draft(text)), await createDraftAction(new Blob([draft(text)]))]) {
        expect(out).toMatchObject({ ok: false, status: 422 });
        if (!out.ok) expect(out.errors[0].pointer).toBe(pointer);
      }
      const created = await createDraftAction(draft('"a draft to save over"'));
      if (!created.ok) throw new Error(created.message);
      const saved = await saveDraftAction(created.versionId, created.lockVersion, new Blob([draft(text)]));
      expect(saved).toMatchObject({ ok: false, status: 422 });
      if (!saved.ok) expect(saved.errors[0].pointer).toBe(pointer);

      const api = await createDataset(new Request("http://127.0.0.1/api/v1/datasets", { method: "POST", body: draft(text) }), {
        params: Promise.resolve({}),
      });
      expect(api.status).toBe(422);
      expect((await api.json()).errors[0].pointer).toBe(pointer);

      const analysis = await postAnalysis(
        new Request("http://127.0.0.1/api/v1/analyses", { method: "POST", body: `{"order":2,"points":${text}}` }),
        { params: Promise.resolve({}) },
      );
      expect(analysis.status).toBe(422);
      expect((await analysis.json()).errors[0].pointer).toMatch(/^\/points(\/(0|a))+$/);
      // Only the one draft saved over is new; nothing of the refused documents is stored.
      const after = await counts();
      expect(after).toEqual({ ...before, datasets: before.datasets + 1, versions: before.versions + 1 });
    });
  }

  it(`a draft nested ${MAX_JSON_DEPTH} levels deep is still kept as incomplete`, async () => {
    const out = await createDraftAction(draft(arrays(MAX_JSON_DEPTH - 1)));
    expect(out).toMatchObject({ ok: true, state: "draft" });
  });
});

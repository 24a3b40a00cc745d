import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import { POST as postAnalysis } from "@/app/api/v1/analyses/route";
import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { updateProfileAction } from "@/app/settings/actions";
import { signUpAction } from "@/app/sign-up/actions";
import { transitionVersion } from "@/lib/datasets/deposits";
import { GET as previewSpecies } from "@/app/api/v1/species/preview/route";
import { getCurrentUser } from "@/lib/auth/session";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let owner: UserDto;
beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("unstorable"), name: "unstorable", passwordHash: "x", role: "researcher", verified: true });
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = { params: Promise.resolve({}) };
const req = (url: string, init: RequestInit = {}) => new Request(`http://127.0.0.1${url}`, init);
const ex = EXAMPLE_DEPOSIT;
const counts = async () =>
  (
    await sql`select (select count(*) from datasets)::int as d, (select count(*) from dataset_versions)::int as v, (select count(*) from version_points)::int as p`
  )[0];

// JSON text written by hand: a lone surrogate cannot survive JSON.stringify of a JS string into a
// request body as anything but the escape itself, which is what a client sends.
const cases: [string, string, string][] = [
  ["U+0000 in the title", JSON.stringify({ ...ex, title: "OH + CH4 \u0000 rate" }), "/title"],
  ["a lone high surrogate in the description", JSON.stringify({ ...ex, description: "abc \ud800 def" }), "/description"],
  [
    "a lone low surrogate in a point note",
    JSON.stringify({ ...ex, points: [...ex.points.slice(0, 9), { ...ex.points[9], note: "x\udc00" }] }),
    "/points/9/note",
  ],
  ["U+0000 in a creator name", JSON.stringify({ ...ex, creators: [{ name: "A\u0000B" }] }), "/creators/0/name"],
  ["U+0000 in a property name", JSON.stringify({ ...ex, "x\u0000": 1 }), "/x\u0000"],
  ["U+0000 in a unit", JSON.stringify({ ...ex, units: { ...ex.units, k: "cm3\u0000 molecule-1 s-1" } }), "/units/k"],
  [
    "a coefficient of 5e-324",
    JSON.stringify({
      ...ex,
      reaction: { ...ex.reaction, reactants: [{ ...ex.reaction.reactants[0], coefficient: 5e-324 }, ex.reaction.reactants[1]] },
    }),
    "/reaction/reactants/0/coefficient",
  ],
  [
    "a coefficient of 0.3",
    JSON.stringify({
      ...ex,
      reaction: { ...ex.reaction, reactants: [{ ...ex.reaction.reactants[0], coefficient: 0.3 }, ex.reaction.reactants[1]] },
    }),
    "/reaction/reactants/0/coefficient",
  ],
  // Control characters and the like (lib/deposits/text-characters.ts): stored fine by PostgreSQL, refused by the deposit rules.
  [
    "U+0007 in the second creator's name",
    JSON.stringify({ ...ex, creators: [{ name: "Okafor, Maren" }, { name: "Tanaka\u0007, Emi" }] }),
    "/creators/1/name",
  ],
  ["a line feed in the title", JSON.stringify({ ...ex, title: "OH + CH4\nrate constants" }), "/title"],
  [
    "U+0085 in an affiliation",
    JSON.stringify({ ...ex, creators: [{ name: "Okafor, Maren", affiliation: "Lab\u0085" }] }),
    "/creators/0/affiliation",
  ],
  ["U+FFFF in a keyword", JSON.stringify({ ...ex, keywords: ["methane\uffff"] }), "/keywords/0"],
  ["U+001B in a method note", JSON.stringify({ ...ex, method: { ...ex.method, notes: "colour \u001b[31m" } }), "/method/notes"],
  ["a k unit of one space", JSON.stringify({ ...ex, units: { ...ex.units, k: " " } }), "/units/k"],
  ["a T unit of one space", JSON.stringify({ ...ex, units: { ...ex.units, T: " " } }), "/units/T"],
  ["a pressure unit of one space", JSON.stringify({ ...ex, units: { ...ex.units, pressure: " " } }), "/units/pressure"],
  ["an Ea unit of one space", JSON.stringify({ ...ex, reportedFit: { ...ex.reportedFit, EaUnit: " " } }), "/reportedFit/EaUnit"],
];

describe("POST /api/v1/datasets refuses text and numbers PostgreSQL cannot store", () => {
  for (const [what, body, pointer] of cases) {
    it(`answers 422 at ${pointer} for ${what}, storing nothing`, async () => {
      const before = await counts();
      as(owner);
      const res = await createDataset(req("/api/v1/datasets", { method: "POST", body }), ctx);
      expect(res.status).toBe(422);
      const problem = await res.json();
      expect(problem.errors.map((e: { pointer: string }) => e.pointer)).toContain(pointer);
      if (/^(U\+(0007|0085|FFFF|001B)|a line feed)/.test(what))
        expect(problem.errors.find((e: { pointer: string }) => e.pointer === pointer).message).toMatch(/U\+[0-9A-F]{4}.*\(\/.+\)/);
      expect(await counts()).toEqual(before);
    });
  }
});

describe("query parameters and analysis bodies", () => {
  it("answers 400 naming the parameter for U+0000 in a query parameter", async () => {
    as(owner);
    const res = await previewSpecies(req("/api/v1/species/preview?smiles=C%00C"), ctx);
    expect(res.status).toBe(400);
    const problem = await res.json();
    expect(problem.errors[0].pointer).toBe("/smiles");
    expect(problem.title).toMatch(/query parameter “smiles” contains U\+0000/);
  });

  it("does not fail on a percent-encoded surrogate in a query parameter", async () => {
    as(owner);
    const res = await previewSpecies(req("/api/v1/species/preview?inchi=%ED%A0%80"), ctx);
    // %ED%A0%80 is the UTF-8-style encoding of U+D800, which URL decoding turns into U+FFFD: harmless.
    expect(res.status).not.toBe(500);
  });

  it("answers 422 with a pointer for U+0000 in an analysis request", async () => {
    as(null);
    const body = JSON.stringify({
      order: 2,
      units: { k: "cm3 molecule-1 s-1\u0000", T: "K" },
      points: [
        { T: 300, k: 1e-12 },
        { T: 400, k: 2e-12 },
        { T: 500, k: 3e-12 },
      ],
    });
    const res = await postAnalysis(req("/api/v1/analyses", { method: "POST", body, headers: { "x-forwarded-for": "10.9.9.9" } }), ctx);
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0].pointer).toBe("/units/k");
  });
});

const form = (fields: Record<string, string>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.append(k, v);
  return fd;
};

describe("form actions and reasons", () => {
  it("refuses a sign-up whose name holds U+0000, naming the field and creating nobody", async () => {
    const email = uniqueEmail("nul-signup");
    const state = await signUpAction(
      { status: "idle" },
      form({ name: "Ada\u0000", email, password: "a-long-enough-password", confirm: "a-long-enough-password" }),
    );
    expect(state.status).toBe("error");
    expect(state.fieldErrors?.name).toMatch(/U\+0000/);
    expect(await sql`select 1 from users where email = ${email}`).toHaveLength(0);
  });

  // FormData holds well-formed strings only (a lone surrogate becomes U+FFFD on the way in), so NUL is the case to refuse.
  it("refuses a profile name with U+0000, leaving the stored name as it was", async () => {
    as(owner);
    const state = await updateProfileAction({ status: "idle" }, form({ name: "Ada \u0000", orcid: "" }));
    expect(state.status).toBe("error");
    expect(state.fieldErrors?.name).toMatch(/U\+0000/);
    const [row] = await sql`select name from users where id = ${owner.id}`;
    expect(row.name).toBe("unstorable");
  });

  it("refuses a transition reason with U+0000 through the API (422 at /reason) and in the domain function", async () => {
    as(owner);
    const created = await (await createDataset(req("/api/v1/datasets", { method: "POST", body: JSON.stringify(ex) }), ctx)).json();
    const id = created.data.versionId as number;
    const res = await postTransition(
      req(`/api/v1/versions/${id}/transitions`, { method: "POST", body: JSON.stringify({ transition: "submit", reason: "ready\u0000" }) }),
      { params: Promise.resolve({ id: String(id) }) },
    );
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0].pointer).toBe("/reason");
    await expect(transitionVersion({ actor: owner, versionId: id, transition: "submit", reason: "a\udc00" })).rejects.toMatchObject({
      status: 422,
    });
    const [v] = await sql`select state from dataset_versions where id = ${id}`;
    expect(v.state).toBe("draft");
  });
});

import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { GET as getVersion, PUT as putVersion } from "@/app/api/v1/versions/[id]/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { getCurrentUser } from "@/lib/auth/session";
import { addDatasetMember } from "@/lib/datasets/queries";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createApiToken, createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let owner: UserDto, editor: UserDto, viewer: UserDto, stranger: UserDto, curator: UserDto, admin: UserDto;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, editor, viewer, stranger, curator, admin] = await Promise.all([
    mk("owner"),
    mk("editor"),
    mk("viewer"),
    mk("stranger"),
    mk("curator", "curator"),
    mk("admin", "admin"),
  ]);
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = (id?: number) => ({ params: Promise.resolve({ id: String(id ?? 0) }) });
const req = (url: string, init: RequestInit = {}) => new Request(`http://127.0.0.1${url}`, init);
const doc = (over: Record<string, unknown> = {}) => JSON.stringify({ ...EXAMPLE_DEPOSIT, ...over });

async function deposit(body = doc()) {
  as(owner);
  const res = await createDataset(req("/api/v1/datasets", { method: "POST", body }), ctx());
  return { res, json: await res.json() };
}

async function withMembers() {
  const { json } = await deposit();
  const { versionId, datasetId } = json.data;
  await addDatasetMember({ datasetId, userId: editor.id, role: "editor", actorId: owner.id });
  await addDatasetMember({ datasetId, userId: viewer.id, role: "viewer", actorId: owner.id });
  return { versionId: versionId as number, datasetId: datasetId as number };
}

const transition = (id: number, body: unknown) =>
  postTransition(req(`/api/v1/versions/${id}/transitions`, { method: "POST", body: JSON.stringify(body) }), ctx(id));

describe("POST /api/v1/datasets", () => {
  it("stores an overall removal rate (products not determined) on a reaction of its own", async () => {
    const reaction = {
      ...EXAMPLE_DEPOSIT.reaction,
      products: [],
      productsUnknown: { reason: "loss of the radical followed; products not analysed" },
    };
    const { res, json } = await deposit(doc({ reaction }));
    expect(res.status).toBe(201);
    const [r] =
      await sql`select r.key, r.equation from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${json.data.versionId}`;
    expect(r.key).toMatch(/>>\*$/);
    expect(r.equation).toMatch(/→ products$/);
  });

  it("stores a valid document as a draft with species, reaction, points and the analysis", async () => {
    const { res, json } = await deposit();
    expect(res.status).toBe(201);
    expect(json.data).toMatchObject({ number: 1, state: "draft", lockVersion: 1 });
    const [v] = await sql`select point_count, t_min, t_max, worst_flag from dataset_versions where id = ${json.data.versionId}`;
    expect(v.point_count).toBe(EXAMPLE_DEPOSIT.points.length);
    const [r] =
      await sql`select r.equation from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${json.data.versionId}`;
    // One row per reaction: its wording comes from whichever deposit named it first.
    expect(r.equation).toMatch(/^hydroxyl( radical)? \+ methane → water \+ methyl( radical)?$/);
    const [a] =
      await sql`select checks, result->'arrhenius'->'params'->>'Ea' as ea from version_analyses where version_id = ${json.data.versionId}`;
    expect(a.checks.map((c: { code: string }) => c.code)).toContain("balanced");
    expect(Number(a.ea) / 8.31446261815324).toBeGreaterThan(1500); // the example follows E/R ≈ 1750 K
  });

  it("refuses anonymous callers and tokens without the deposit scope", async () => {
    as(null);
    expect((await createDataset(req("/api/v1/datasets", { method: "POST", body: doc() }), ctx())).status).toBe(401);
    const { secret } = await createApiToken({ userId: owner.id, name: "read only", scopes: ["deposit:read"] });
    const res = await createDataset(
      req("/api/v1/datasets", { method: "POST", body: doc(), headers: { authorization: `Bearer ${secret}` } }),
      ctx(),
    );
    expect(res.status).toBe(403);
  });

  const bad: [string, string, string, RegExp][] = [
    ["malformed JSON", '{"title": "x",', "", /not valid JSON/],
    ["a wrong type", doc({ title: 42 }), "/title", /.+/],
    [
      "a missing required field",
      JSON.stringify({ ...EXAMPLE_DEPOSIT, reaction: { ...EXAMPLE_DEPOSIT.reaction, order: undefined } }),
      "/reaction/order",
      /.+/,
    ],
    [
      "T ≤ 0 K",
      doc({
        points: [
          { T: 0, k: 1e-12 },
          { T: 300, k: 2e-12 },
        ],
      }),
      "/points/0/T",
      /.+/,
    ],
    [
      "k ≤ 0",
      doc({
        points: [
          { T: 250, k: 1e-12 },
          { T: 300, k: -2e-12 },
        ],
      }),
      "/points/1/k",
      /.+/,
    ],
    ["an unknown unit", doc({ units: { ...EXAMPLE_DEPOSIT.units, k: "furlongs" } }), "/units/k", /.+/],
    [
      "an unparsable SMILES",
      JSON.stringify({
        ...EXAMPLE_DEPOSIT,
        reaction: { ...EXAMPLE_DEPOSIT.reaction, reactants: [{ smiles: "C1CC" }, EXAMPLE_DEPOSIT.reaction.reactants[1]] },
      }),
      "/reaction/reactants/0/smiles",
      /Could not read the SMILES/,
    ],
  ];
  for (const [what, body, pointer, message] of bad) {
    it(`answers 422 with a pointer for ${what}, storing nothing`, async () => {
      const [{ n: before }] = await sql`select count(*)::int as n from dataset_versions`;
      as(owner);
      const res = await createDataset(req("/api/v1/datasets", { method: "POST", body }), ctx());
      expect(res.status).toBe(422);
      const problem = await res.json();
      expect(problem.errors.map((e: { pointer: string }) => e.pointer)).toContain(pointer);
      expect(problem.errors.find((e: { pointer: string }) => e.pointer === pointer).message).toMatch(message);
      const [{ n: after }] = await sql`select count(*)::int as n from dataset_versions`;
      expect(after).toBe(before);
    });
  }

  it("flags an unbalanced reaction as an error check (but keeps the draft for fixing)", async () => {
    const unbalanced = {
      ...EXAMPLE_DEPOSIT,
      reaction: { ...EXAMPLE_DEPOSIT.reaction, products: [{ name: "water", smiles: "O", coefficient: 1 }] },
    };
    const { res, json } = await deposit(JSON.stringify(unbalanced));
    expect(res.status).toBe(201);
    const [v] = await sql`select worst_flag, flag_codes from dataset_versions where id = ${json.data.versionId}`;
    expect(v.worst_flag).toBe("error");
    expect(v.flag_codes).toContain("unbalanced");
  });
});

describe("GET and PUT /api/v1/versions/:id, per role", () => {
  it("a draft is visible to its co-editors and curators only", async () => {
    const { versionId } = await withMembers();
    const table: [string, UserDto | null, number][] = [
      ["anonymous", null, 404],
      ["owner", owner, 200],
      ["editor", editor, 200],
      ["viewer", viewer, 200],
      ["other researcher", stranger, 404],
      ["curator", curator, 200],
      ["admin", admin, 200],
    ];
    for (const [who, user, status] of table) {
      as(user);
      expect([who, (await getVersion(req(`/api/v1/versions/${versionId}`), ctx(versionId))).status]).toEqual([who, status]);
    }
  });

  it("owner and editor save; viewer, stranger and curator cannot; a stale lock version gets 412 and changes nothing", async () => {
    const { versionId } = await withMembers();
    const put = (user: UserDto | null, lock: number, body = doc({ title: `Edited by ${user?.name}` })) => {
      as(user);
      return putVersion(
        req(`/api/v1/versions/${versionId}`, { method: "PUT", body, headers: { "if-match": `"${lock}"` } }),
        ctx(versionId),
      );
    };
    expect((await put(null, 1)).status).toBe(401);
    expect((await put(viewer, 1)).status).toBe(403);
    expect((await put(stranger, 1)).status).toBe(404);
    expect((await put(curator, 1)).status).toBe(403);
    const ok = await put(editor, 1);
    expect(ok.status).toBe(200);
    expect(ok.headers.get("etag")).toBe('"2"');
    expect((await put(owner, 1)).status).toBe(412);
    // A failed upload leaves the draft as it was.
    expect(
      (
        await put(
          owner,
          2,
          doc({
            points: [
              { T: -5, k: 1 },
              { T: 300, k: 1 },
            ],
          }),
        )
      ).status,
    ).toBe(422);
    const [row] = await sql`select title, lock_version from dataset_versions where id = ${versionId}`;
    expect(row).toEqual({ title: "Edited by editor", lock_version: 2 });
  });
});

describe("POST /api/v1/versions/:id/transitions, per role", () => {
  it("walks a version through submission, return to the authors, resubmission and acceptance", async () => {
    const { versionId } = await withMembers();
    const step = async (user: UserDto | null, body: unknown) => {
      as(user);
      return (await transition(versionId, body)).status;
    };
    expect(await step(null, { transition: "submit" })).toBe(401);
    expect(await step(editor, { transition: "submit" })).toBe(403);
    expect(await step(stranger, { transition: "submit" })).toBe(404); // may not see it: not told it exists
    expect(await step(owner, { transition: "submit" })).toBe(200);
    expect(await step(owner, { transition: "submit" })).toBe(409); // a duplicate submission
    expect(await step(owner, { transition: "accept", reason: "mine" })).toBe(403);
    expect(await step(curator, { transition: "return" })).toBe(422);
    expect(await step(curator, { transition: "return", reason: "State the bath gas pressure of each point." })).toBe(200);
    expect(await step(owner, { transition: "submit" })).toBe(422); // a resubmission answers the return
    expect(await step(owner, { transition: "submit", reply: "Added the bath gas pressure of each point." })).toBe(200);
    expect(await step(admin, { transition: "accept", reason: "Consistent and complete." })).toBe(200);
    as(null);
    const res = await getVersion(req(`/api/v1/versions/${versionId}`), ctx(versionId));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.data.state).toBe("published");
    expect(body.data.versionIdentifier).toMatch(/^10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{3}[0-9A-Z*~$=]\/1$/);
    expect(body.data.decisions).toBeUndefined(); // the public does not see the review history
    expect(body.data.caution).toMatch(/Extrapolation outside the measured temperature range is unreliable/);
  });

  it("queues mail to curators on submission and to every co-editor on a decision", async () => {
    const { versionId } = await withMembers();
    as(owner);
    await transition(versionId, { transition: "submit" });
    as(curator);
    await transition(versionId, { transition: "decline", reason: "Duplicate of an existing dataset." });
    const jobs =
      await sql`select data->>'to' as to, data->>'subject' as subject from pgboss.job where name = 'mail' and data->>'subject' like ${"%OH + CH4 rate constants%"} order by created_on desc limit 50`;
    const tos = jobs.map((j) => j.to);
    expect(tos).toContain(curator.email);
    for (const m of [owner, editor, viewer]) expect(tos).toContain(m.email);
  });
});

describe("junk in a deposit document is refused with a pointer and changes nothing", () => {
  const withPoint0 = (p: Record<string, unknown>) =>
    doc({ points: [{ ...EXAMPLE_DEPOSIT.points[0], ...p }, ...EXAMPLE_DEPOSIT.points.slice(1)] });
  const cases: [string, string, string, RegExp][] = [
    ["a creator's name of spaces", doc({ creators: [{ name: "   " }] }), "/creators/0/name", /other than spaces/],
    [
      "a source type of spaces",
      doc({ source: { reference: { type: "  ", title: "A paper" } } }),
      "/source/reference/type",
      /other than spaces/,
    ],
    [
      "a relative uncertainty of 9e15 %",
      withPoint0({ uncertainty: { kind: "relative", value: 9e15 } }),
      "/points/0/uncertainty/value",
      /at most 1000 %/,
    ],
    ["T = 1e308 K", withPoint0({ T: 1e308, uncertainty: undefined }), "/points/0/T", /out of range.*100 000 K/],
    ["a key written twice", doc().replace('"title":', '"title":"Other","title":'), "/title", /more than once/],
  ];

  it.each(cases)("%s: 422 on deposit, nothing stored", async (_what, body, pointer, message) => {
    const ownedBy = async () =>
      (await sql`select count(*)::int as n from dataset_members where user_id = ${owner.id} and role = 'owner'`)[0].n as number;
    const before = await ownedBy();
    const { res, json } = await deposit(body);
    expect(res.status).toBe(422);
    expect(json.errors).toEqual(expect.arrayContaining([expect.objectContaining({ pointer, message: expect.stringMatching(message) })]));
    expect(json.errors.map((e: { message: string }) => e.message).join(" ")).not.toMatch(/too close/);
    expect(await ownedBy()).toBe(before);
  });

  it.each(cases)("%s: 422 on saving a draft, which stays as it was", async (_what, body, pointer, message) => {
    const { versionId } = await withMembers();
    const snapshot = async () =>
      (
        await sql`select title, lock_version, payload::text as payload, (select count(*)::int from version_points where version_id = ${versionId}) as points
          from dataset_versions where id = ${versionId}`
      )[0];
    const before = await snapshot();
    as(owner);
    const res = await putVersion(
      req(`/api/v1/versions/${versionId}`, { method: "PUT", body, headers: { "if-match": `"${before.lock_version}"` } }),
      ctx(versionId),
    );
    expect(res.status).toBe(422);
    const json = await res.json();
    expect(json.errors).toEqual(expect.arrayContaining([expect.objectContaining({ pointer, message: expect.stringMatching(message) })]));
    expect(await snapshot()).toEqual(before);
  });
});

import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import * as collectionsRoute from "@/app/api/v1/collections/route";
import * as collectionRoute from "@/app/api/v1/collections/[id]/route";
import * as membersRoute from "@/app/api/v1/collections/[id]/members/route";
import * as memberRoute from "@/app/api/v1/collections/[id]/members/[versionId]/route";
import * as publishRoute from "@/app/api/v1/collections/[id]/publish/route";
import * as revisionsRoute from "@/app/api/v1/collections/[id]/revisions/route";
import * as citationRoute from "@/app/api/v1/collections/[id]/versions/[n]/citation/route";
import * as parametersRoute from "@/app/api/v1/collections/[id]/versions/[n]/parameters/route";
import * as dataciteRoute from "@/app/api/v1/collections/[id]/versions/[n]/datacite.json/route";
import * as identifiersRoute from "@/app/api/v1/identifiers/route";
import { listSitemapEntries } from "@/lib/sitemap";
import { getCurrentUser } from "@/lib/auth/session";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { startFakeDoiService, type FakeDoiService } from "@/lib/identifiers/fake-service";
import { registerIdentifier } from "@/lib/identifiers/register";
import { createUser, type UserDto } from "@/lib/users/queries";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { sql, uniqueEmail } from "./helpers";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- each route types its own params
type Handler = (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;

/** Calls a route handler as `user` (null: anonymous). */
async function call(
  user: UserDto | null,
  handler: Handler,
  params: Record<string, string>,
  init: RequestInit & { json?: unknown } = {},
  query = "",
) {
  vi.mocked(getCurrentUser).mockResolvedValue(user);
  const { json, ...rest } = init;
  const req = new Request(`http://127.0.0.1/api/v1/collections${query}`, {
    ...rest,
    ...(json !== undefined ? { body: JSON.stringify(json), headers: { "content-type": "application/json" } } : {}),
  });
  return handler(req, { params: Promise.resolve(params) });
}

let owner: UserDto, other: UserDto, curator: UserDto;
let fake: FakeDoiService;
const saved = process.env.DOI_API_URL;
/** Published versions a (v1, v2 of one dataset), b; a draft of the owner; another person's draft. */
const v: Record<"a1" | "a2" | "b" | "draft" | "foreign", number> = { a1: 0, a2: 0, b: 0, draft: 0, foreign: 0 };

async function publish(versionId: number, by: UserDto) {
  await applyTransition({ versionId, actorId: by.id, transition: "submit" });
  await applyTransition({ versionId, actorId: curator.id, transition: "accept", reason: "Consistent." });
}

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: `Collector ${tag}`, passwordHash: "x", role, verified: true });
  [owner, other, curator] = await Promise.all([mk("co"), mk("cx"), mk("cc", "curator")]);
  fake = await startFakeDoiService({ port: 0 });
  process.env.DOI_API_URL = fake.url;
  const doc = (title: string, carbons: number) => labelledAlkaneDeposit({ title, name: `collected alkane ${carbons}`, carbons });
  const a = await depositNewDataset({ actor: owner, document: doc("Collected alkane A", 27) });
  await publish(a.id, owner);
  v.a1 = a.id;
  const b = await depositNewDataset({ actor: other, document: doc("Collected alkane B", 28) });
  await publish(b.id, other);
  v.b = b.id;
  v.draft = (await depositNewDataset({ actor: owner, document: doc("Collected alkane draft", 29) })).id;
  v.foreign = (await depositNewDataset({ actor: other, document: doc("Someone else's draft", 30) })).id;
});

afterAll(async () => {
  await fake.close();
  if (saved === undefined) delete process.env.DOI_API_URL;
  else process.env.DOI_API_URL = saved;
});

describe("collections: a citable set of published versions", () => {
  it("lives from draft to published to a new revision; refuses drafts, others' and retracted versions; registers HasPart; stays frozen", async () => {
    // Anonymous people make nothing.
    expect((await call(null, collectionsRoute.POST, {}, { method: "POST", json: { title: "Nobody's" } })).status).toBe(401);

    // Bad members: each named by its pointer, nothing stored.
    const before = (await sql`select count(*)::int as n from collections`)[0].n;
    const refused = await call(
      owner,
      collectionsRoute.POST,
      {},
      {
        method: "POST",
        json: {
          title: "Release 2 data",
          members: [{ versionId: v.a1 }, { versionId: v.draft }, { versionId: v.foreign }, { versionId: 2147483647 }],
        },
      },
    );
    expect(refused.status).toBe(422);
    const problem = await refused.json();
    expect(problem.errors.map((e: { pointer: string }) => e.pointer)).toEqual([
      "/members/1/versionId",
      "/members/2/versionId",
      "/members/3/versionId",
    ]);
    expect(problem.errors[0].message).toBe(
      `Version ${v.draft} (“Collected alkane draft”, version 1) is a draft: only published versions can join a collection`,
    );
    // Someone else's draft is not revealed: the same words as a version that does not exist.
    expect(problem.errors[1].message).toBe(
      `Version ${v.foreign} is not a published version: only published versions can join a collection`,
    );
    expect((await sql`select count(*)::int as n from collections`)[0].n).toBe(before);
    const blank = await call(owner, collectionsRoute.POST, {}, { method: "POST", json: { title: "", members: [{ versionId: "x" }] } });
    expect(blank.status).toBe(422);
    expect((await blank.json()).errors.map((e: { pointer: string }) => e.pointer)).toEqual(["/title", "/members/0/versionId"]);

    // Created with a member and a note; another member added from a second request.
    const created = await call(
      owner,
      collectionsRoute.POST,
      {},
      {
        method: "POST",
        json: {
          title: "Release 2 data",
          description: "The rate data behind release 2.",
          members: [{ versionId: v.a1, note: "used for R12" }],
        },
      },
    );
    expect(created.status).toBe(201);
    const { id } = (await created.json()).data as { id: number };
    const p = { id: String(id) };
    expect((await call(owner, membersRoute.POST, p, { method: "POST", json: { members: [{ versionId: v.b }] } })).status).toBe(200);

    // A draft is private: others and anonymous readers find nothing; the owner sees it.
    expect((await call(other, collectionRoute.GET, p)).status).toBe(404);
    expect((await call(null, collectionRoute.GET, p)).status).toBe(404);
    expect((await call(other, membersRoute.POST, p, { method: "POST", json: { members: [{ versionId: v.b }] } })).status).toBe(404);
    const mine = (await (await call(owner, collectionRoute.GET, p)).json()).data;
    expect(mine.version).toMatchObject({ number: 1, state: "draft", title: "Release 2 data", versionIdentifier: null });
    expect(mine.members.map((m: { versionId: number; note: string | null }) => [m.versionId, m.note])).toEqual([
      [v.a1, "used for R12"],
      [v.b, null],
    ]);

    // Remove and add back; PATCH the title.
    expect((await call(owner, memberRoute.DELETE, { id: p.id, versionId: String(v.b) }, { method: "DELETE" })).status).toBe(204);
    expect((await call(owner, memberRoute.DELETE, { id: p.id, versionId: String(v.b) }, { method: "DELETE" })).status).toBe(404);
    await call(owner, membersRoute.POST, p, { method: "POST", json: { members: [{ versionId: v.b, note: "checked against R7" }] } });
    const patched = await call(owner, collectionRoute.PATCH, p, { method: "PATCH", json: { title: "Release 2 rate data" } });
    expect(patched.status).toBe(200);

    // Publish: identifier minted, registration queued in the same transaction and registered with DataCite metadata.
    const published = await call(owner, publishRoute.POST, p, { method: "POST" });
    expect(published.status).toBe(200);
    const { versionIdentifier } = (await published.json()).data as { versionIdentifier: string };
    expect(versionIdentifier).toMatch(/^10\.5072\/ARH-[0-9A-Z]{4}-[0-9A-Z]{4}\/1$/);
    const [queued] =
      await sql`select count(*)::int as n from pgboss.job where name = 'register-identifier' and data->>'identifier' = ${versionIdentifier}`;
    expect(queued.n).toBe(1);
    expect(await registerIdentifier(versionIdentifier)).toEqual({ identifier: versionIdentifier, status: "registered" });
    const [record] = fake.records().filter((r) => r.doi === versionIdentifier);
    const [ida1, idb] = (await sql`select version_identifier from dataset_versions where id in (${v.a1}, ${v.b}) order by id`).map(
      (r) => r.version_identifier,
    );
    expect(record.attributes).toMatchObject({
      url: `${process.env.APP_URL}/collections/${id}/versions/1`,
      types: { resourceTypeGeneral: "Collection" },
      titles: [{ title: "Release 2 rate data" }],
      creators: [{ name: "co, Collector" }],
      version: "1",
      relatedIdentifiers: [
        { relatedIdentifier: ida1, relatedIdentifierType: "DOI", relationType: "HasPart" },
        { relatedIdentifier: idb, relatedIdentifierType: "DOI", relationType: "HasPart" },
      ],
    });
    expect((await (await call(null, dataciteRoute.GET, { id: p.id, n: "1" })).json()).data.attributes.doi).toBe(versionIdentifier);

    // Now public; frozen at the API (409, worded) and in the database.
    expect((await (await call(null, collectionRoute.GET, p)).json()).data.version.state).toBe("published");
    const edit = await call(owner, collectionRoute.PATCH, p, { method: "PATCH", json: { title: "Changed" } });
    expect(edit.status).toBe(409);
    expect((await edit.json()).title).toMatch(/Version 1 of collection \d+ is published and cannot change; start a new revision/);
    expect((await call(owner, membersRoute.POST, p, { method: "POST", json: { members: [{ versionId: v.b }] } })).status).toBe(409);
    expect((await call(owner, memberRoute.DELETE, { id: p.id, versionId: String(v.b) }, { method: "DELETE" })).status).toBe(409);
    expect((await call(other, collectionRoute.PATCH, p, { method: "PATCH", json: { title: "Mine now" } })).status).toBe(403);
    await expect(sql`update collection_versions set title = 'forged' where collection_id = ${id}`).rejects.toThrow(
      /is published and cannot be changed/,
    );
    await expect(sql`delete from collection_members where version_id = ${v.b}`).rejects.toThrow(
      /is published: its members cannot be changed/,
    );
    await expect(sql`update collections set series_identifier = null where id = ${id}`).rejects.toThrow(
      /identifier and owner never change/,
    );
    await expect(sql`insert into collection_members (collection_version_id, version_id, position)
      select id, ${v.draft}, 9 from collection_versions where collection_id = ${id}`).rejects.toThrow(
      /is published: its members cannot be changed/,
    );

    // Exports: the citation (with members on demand) and the combined parameters, each reaction with its identifier.
    const bib = await call(null, citationRoute.GET, { id: p.id, n: "1" }, {}, "?format=bibtex");
    expect(bib.status).toBe(200);
    const bibText = await bib.text();
    expect(bibText).toContain(versionIdentifier);
    expect(bibText).not.toContain(ida1);
    const withMembers = await (await call(null, citationRoute.GET, { id: p.id, n: "1" }, {}, "?format=csl-json&members=1")).json();
    expect(withMembers.map((i: { DOI: string }) => i.DOI)).toEqual([versionIdentifier, ida1, idb]);
    expect((await call(null, citationRoute.GET, { id: p.id, n: "1" }, {}, "?format=word")).status).toBe(400);
    const yaml = await (await call(null, parametersRoute.GET, { id: p.id, n: "1" }, {}, "?format=cantera-yaml")).text();
    expect(yaml).toContain(`# doi:${ida1}`);
    expect(yaml).toContain(`# doi:${idb}`);
    expect(yaml).toMatch(/Extrapolation|extrapolat/);
    const table = await (await call(null, parametersRoute.GET, { id: p.id, n: "1" }, {}, "?format=table")).text();
    expect(table).toContain(`version identifier: doi:${ida1}`);
    expect((await call(null, parametersRoute.GET, { id: p.id, n: "1" }, {}, "?energy=eV")).status).toBe(400);

    // A member retracted; then a new revision: v1 stays, the retracted member is left out.
    await applyTransition({ versionId: v.b, actorId: curator.id, transition: "retract", reason: "Pressure in the wrong unit." });
    // A retracted version cannot join a collection.
    const revised = await call(owner, revisionsRoute.POST, p, { method: "POST" });
    expect(revised.status).toBe(201);
    const revision = (await revised.json()).data;
    expect(revision).toMatchObject({
      number: 2,
      state: "draft",
      leftOut: [{ versionId: v.b, reason: "retracted: Pressure in the wrong unit." }],
    });
    expect((await call(owner, revisionsRoute.POST, p, { method: "POST" })).status).toBe(409);
    const retractedAdd = await call(owner, membersRoute.POST, p, { method: "POST", json: { members: [{ versionId: v.b }] } });
    expect(retractedAdd.status).toBe(422);
    expect((await retractedAdd.json()).errors[0].message).toBe(
      `Version ${v.b} (“Collected alkane B”, version 1) was retracted and cannot join a collection`,
    );
    const v2 = await call(owner, publishRoute.POST, p, { method: "POST" });
    const v2Identifier = (await v2.json()).data.versionIdentifier as string;
    expect(v2Identifier).toBe(versionIdentifier.replace(/\/1$/, "/2"));
    await registerIdentifier(v2Identifier);
    await registerIdentifier(versionIdentifier, { refresh: true });
    const byDoi = new Map(
      fake.records().map((r) => [r.doi, r.attributes.relatedIdentifiers as { relationType: string; relatedIdentifier: string }[]]),
    );
    expect(byDoi.get(v2Identifier)).toContainEqual({
      relatedIdentifier: versionIdentifier,
      relatedIdentifierType: "DOI",
      relationType: "IsNewVersionOf",
    });
    expect(byDoi.get(versionIdentifier)).toContainEqual({
      relatedIdentifier: v2Identifier,
      relatedIdentifierType: "DOI",
      relationType: "IsPreviousVersionOf",
    });
    // The old version keeps its members and identifier.
    const old = (await (await call(null, collectionRoute.GET, p)).json()).data;
    expect(old.versions.map((x: { number: number; versionIdentifier: string }) => [x.number, x.versionIdentifier])).toEqual([
      [2, v2Identifier],
      [1, versionIdentifier],
    ]);
    const listed = (await (await call(null, collectionsRoute.GET, {}, {}, "?limit=100")).json()).data as { id: number; number: number }[];
    expect(listed.find((c) => c.id === id)).toMatchObject({ number: 2 });

    // Its identifiers resolve as a dataset's do: the version's to that version, the series' to the newest.
    const resolve = async (identifier: string) =>
      identifiersRoute.GET(new Request(`http://127.0.0.1/api/v1/identifiers?identifier=${encodeURIComponent(identifier)}`), {
        params: Promise.resolve({}),
      });
    const one = await resolve(versionIdentifier);
    expect(one.status).toBe(200);
    expect((await one.json()).data).toMatchObject({ kind: "collection_version", versionNumber: 1 });
    expect((await (await resolve(versionIdentifier)).json()).data.url).toMatch(new RegExp(`/collections/${id}/versions/1$`));
    const series = versionIdentifier.replace(/\/1$/, "");
    expect((await (await resolve(series)).json()).data).toMatchObject({ kind: "collection" });
    expect((await (await resolve(series)).json()).data.url).toMatch(new RegExp(`/collections/${id}$`));
    // And the sitemap lists both published versions.
    const urls = (await listSitemapEntries()).map((e) => e.url);
    expect(urls.filter((u) => u.includes(`/collections/${id}/versions/`)).map((u) => u.replace(/.*\/versions\//, ""))).toEqual(["1", "2"]);
    expect(urls.some((u) => u.endsWith("/collections"))).toBe(true);
  });
});

describe("text every export can carry", () => {
  it("refuses a title with a direction override or only invisible characters, and a note with a control character, naming the field", async () => {
    const refuse = async (json: unknown) => {
      const res = await call(owner, collectionsRoute.POST, {}, { method: "POST", json });
      expect(res.status).toBe(422);
      return (await res.json()).errors as { pointer: string; message: string }[];
    };
    expect((await refuse({ title: "Release \u202Egnp.exe" }))[0]).toMatchObject({ pointer: "/title" });
    expect((await refuse({ title: "\u200B\u200B\u200B\u200B" }))[0].pointer).toBe("/title");
    expect((await refuse({ title: "Fine title", members: [{ versionId: v.a1, note: "bell\u0007" }] }))[0]).toMatchObject({
      pointer: "/members/0/note",
      message: expect.stringContaining("U+0007"),
    });
  });
});

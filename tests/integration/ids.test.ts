import { readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import { changeRoleAction, setActiveAction } from "@/app/admin/people/actions";
import * as collectionRoute from "@/app/api/v1/collections/[id]/route";
import * as collectionMembersRoute from "@/app/api/v1/collections/[id]/members/route";
import * as collectionMemberRoute from "@/app/api/v1/collections/[id]/members/[versionId]/route";
import * as collectionPublishRoute from "@/app/api/v1/collections/[id]/publish/route";
import * as collectionRevisionsRoute from "@/app/api/v1/collections/[id]/revisions/route";
import * as collectionVersionRoute from "@/app/api/v1/collections/[id]/versions/[n]/route";
import * as datasetRoute from "@/app/api/v1/datasets/[id]/route";
import * as mechanismCheckRoute from "@/app/api/v1/mechanism-checks/[id]/route";
import * as mechanismShareRoute from "@/app/api/v1/mechanism-checks/[id]/share/route";
import * as mechanismRerunRoute from "@/app/api/v1/mechanism-checks/[id]/rerun/route";
import * as datasetVersionRoute from "@/app/api/v1/datasets/[id]/versions/[n]/route";
import * as filesRoute from "@/app/api/v1/files/[fileId]/route";
import * as reactionRoute from "@/app/api/v1/reactions/[id]/route";
import * as speciesRoute from "@/app/api/v1/species/[inchikey]/route";
import * as reactionConsensusRoute from "@/app/api/v1/reactions/[id]/consensus/route";
import * as usersRoute from "@/app/api/v1/users/[id]/route";
import * as versionFilesRoute from "@/app/api/v1/versions/[id]/files/route";
import * as nextRoute from "@/app/api/v1/versions/[id]/next/route";
import * as versionRoute from "@/app/api/v1/versions/[id]/route";
import * as transitionsRoute from "@/app/api/v1/versions/[id]/transitions/route";
import MailMessagePage from "@/app/admin/mail/[id]/page";
import DatasetVersionPage from "@/app/datasets/[id]/[version]/page";
import DatasetSeriesPage from "@/app/datasets/[id]/page";
import { inviteAction, saveDraftAction, startNextVersionAction, transitionAction } from "@/app/deposits/actions";
import DepositPage from "@/app/deposits/[id]/page";
import ReactionPage from "@/app/reactions/[id]/page";
import ClassPage from "@/app/classes/[id]/page";
import SpeciesPage from "@/app/species/[inchikey]/page";
import ReviewPage from "@/app/review/[id]/page";
import PersonPage from "@/app/people/[id]/page";
import MechanismCheckPage from "@/app/mechanisms/[id]/page";
import CollectionPage from "@/app/collections/[id]/page";
import CollectionVersionPage from "@/app/collections/[id]/versions/[n]/page";
import { revokeTokenAction } from "@/app/settings/actions";
import { idleState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/session";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { MAX_ID, parseIdOrNull } from "@/lib/ids";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

/** Ids that must never reach the database: each is a 404 (or "No such …"), never a 500. */
const badIds = [
  "0",
  "-1",
  "1.5",
  "abc",
  "2147483648",
  "99999999999",
  "1e3",
  "%00",
  "\u0000",
  "01",
  "+1",
  " 1",
  "0x10",
  "Infinity",
  "NaN",
  "",
  "9".repeat(5000),
];
/** Well-formed ids of rows that do not exist: also 404. */
const missingIds = [String(MAX_ID), "2147483646"];

let admin: UserDto;
beforeAll(async () => {
  admin = await createUser({ email: uniqueEmail("idadmin"), name: "Id Admin", passwordHash: "x", role: "admin", verified: true });
});

describe("parseIdOrNull", () => {
  it("accepts 1 … 2³¹−1 written plainly and nothing else", () => {
    expect(parseIdOrNull("1")).toBe(1);
    expect(parseIdOrNull(String(MAX_ID))).toBe(MAX_ID);
    expect(parseIdOrNull(42)).toBe(42);
    for (const raw of [...badIds, 0, -1, 1.5, MAX_ID + 1, Number.NaN, null, undefined, {}, ["1"]]) expect(parseIdOrNull(raw)).toBeNull();
  });
});

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- each route types its own params
type Handler = (req: Request, ctx: { params: Promise<any> }) => Promise<Response>;
const apiCases: [string, string, Handler, string, () => RequestInit][] = [
  ["GET", "/api/v1/versions/[id]", versionRoute.GET as Handler, "id", () => ({})],
  [
    "PUT",
    "/api/v1/versions/[id]",
    versionRoute.PUT as Handler,
    "id",
    () => ({ method: "PUT", body: JSON.stringify(EXAMPLE_DEPOSIT), headers: { "if-match": '"1"' } }),
  ],
  [
    "POST",
    "/api/v1/versions/[id]/transitions",
    transitionsRoute.POST as Handler,
    "id",
    () => ({ method: "POST", body: JSON.stringify({ transition: "submit" }) }),
  ],
  ["POST", "/api/v1/versions/[id]/next", nextRoute.POST as Handler, "id", () => ({ method: "POST" })],
  ["GET", "/api/v1/versions/[id]/files", versionFilesRoute.GET as Handler, "id", () => ({})],
  [
    "POST",
    "/api/v1/versions/[id]/files",
    versionFilesRoute.POST as Handler,
    "id",
    () => {
      const form = new FormData();
      form.set("file", new File(["T,k\n300,1e-12\n"], "raw.csv", { type: "text/csv" }));
      return { method: "POST", body: form };
    },
  ],
  ["GET", "/api/v1/files/[fileId]", filesRoute.GET as Handler, "fileId", () => ({})],
  ["GET", "/api/v1/reactions/[id]/consensus", reactionConsensusRoute.GET as Handler, "id", () => ({})],
  ["GET", "/api/v1/datasets/[id]", datasetRoute.GET as Handler, "id", () => ({})],
  ["GET", "/api/v1/datasets/[id]/versions/[n]", datasetVersionRoute.GET as Handler, "id", () => ({})],
  // Named by a reaction key or an InChIKey: a number that is no id, or anything malformed, is not found either.
  ["GET", "/api/v1/reactions/[id]", reactionRoute.GET as Handler, "id", () => ({})],
  ["GET", "/api/v1/species/[inchikey]", speciesRoute.GET as Handler, "inchikey", () => ({})],
  ["DELETE", "/api/v1/files/[fileId]", filesRoute.DELETE as Handler, "fileId", () => ({ method: "DELETE" })],
  ["GET", "/api/v1/mechanism-checks/[id]", mechanismCheckRoute.GET as Handler, "id", () => ({})],
  [
    "POST",
    "/api/v1/mechanism-checks/[id]/share",
    mechanismShareRoute.POST as Handler,
    "id",
    () => ({ method: "POST", body: JSON.stringify({ shared: true }) }),
  ],
  ["POST", "/api/v1/mechanism-checks/[id]/rerun", mechanismRerunRoute.POST as Handler, "id", () => ({ method: "POST" })],
  ["GET", "/api/v1/collections/[id]", collectionRoute.GET as Handler, "id", () => ({})],
  [
    "PATCH",
    "/api/v1/collections/[id]",
    collectionRoute.PATCH as Handler,
    "id",
    () => ({ method: "PATCH", body: JSON.stringify({ title: "Renamed" }) }),
  ],
  ["DELETE", "/api/v1/collections/[id]", collectionRoute.DELETE as Handler, "id", () => ({ method: "DELETE" })],
  [
    "POST",
    "/api/v1/collections/[id]/members",
    collectionMembersRoute.POST as Handler,
    "id",
    () => ({ method: "POST", body: JSON.stringify({ members: [{ versionId: 1 }] }) }),
  ],
  [
    "DELETE",
    "/api/v1/collections/[id]/members/[versionId]",
    collectionMemberRoute.DELETE as Handler,
    "versionId",
    () => ({ method: "DELETE" }),
  ],
  ["POST", "/api/v1/collections/[id]/publish", collectionPublishRoute.POST as Handler, "id", () => ({ method: "POST" })],
  ["POST", "/api/v1/collections/[id]/revisions", collectionRevisionsRoute.POST as Handler, "id", () => ({ method: "POST" })],
  // The version number: with the collection id missing too, still a 404.
  ["GET", "/api/v1/collections/[id]/versions/[n]", collectionVersionRoute.GET as Handler, "n", () => ({})],
  [
    "PATCH",
    "/api/v1/users/[id]",
    usersRoute.PATCH as Handler,
    "id",
    () => ({ method: "PATCH", body: JSON.stringify({ role: "curator" }) }),
  ],
];

type Page = (props: { params: Promise<Record<string, string>> }) => Promise<unknown>;
const pageCases: [string, Page, (id: string) => Record<string, string>][] = [
  ["/datasets/[id]", DatasetSeriesPage as Page, (id) => ({ id })],
  ["/datasets/[id]/[version]", DatasetVersionPage as Page, (id) => ({ id, version: "v1" })],
  ["/datasets/[id]/[version] (version part)", DatasetVersionPage as Page, (id) => ({ id: "1", version: `v${id}` })],
  ["/reactions/[id]", ReactionPage as Page, (id) => ({ id })],
  // Named by a class word and an InChIKey, not a number: a number or anything malformed is no class and no species.
  ["/classes/[id]", ClassPage as Page, (id) => ({ id })],
  ["/species/[inchikey]", SpeciesPage as Page, (id) => ({ inchikey: id })],
  ["/review/[id]", ReviewPage as Page, (id) => ({ id })],
  ["/deposits/[id]", DepositPage as Page, (id) => ({ id })],
  ["/admin/mail/[id]", MailMessagePage as Page, (id) => ({ id })],
  ["/people/[id]", PersonPage as Page, (id) => ({ id })],
  ["/mechanisms/[id]", MechanismCheckPage as Page, (id) => ({ id })],
  ["/collections/[id]", CollectionPage as Page, (id) => ({ id })],
  ["/collections/[id]/versions/[n]", CollectionVersionPage as Page, (id) => ({ id, n: "1" })],
  ["/collections/[id]/versions/[n] (version part)", CollectionVersionPage as Page, (id) => ({ id: "1", n: id })],
];

/** Every dynamic segment under app/, so a new one without a case above fails this test. */
function dynamicRoutes(dir = join(process.cwd(), "app")): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const full = join(dir, name);
    if (!statSync(full).isDirectory()) continue;
    if (name.startsWith("[") && !name.startsWith("[...")) {
      const files = readdirSync(full);
      const route = `/${relative(join(process.cwd(), "app"), full).split("\\").join("/")}`;
      if (files.includes("route.ts") || files.includes("page.tsx")) out.push(route);
    }
    out.push(...dynamicRoutes(full));
  }
  return out;
}

async function pageOutcome(page: Page, params: Record<string, string>): Promise<string> {
  try {
    await page({ params: Promise.resolve(params) });
    return "rendered";
  } catch (err) {
    const digest = (err as { digest?: string }).digest ?? "";
    if (digest.startsWith("NEXT_HTTP_ERROR_FALLBACK;404")) return "404";
    if (digest.startsWith("NEXT_REDIRECT")) return `redirect ${digest.split(";")[2]}`;
    return `error ${(err as Error).message}`;
  }
}

describe("ids in paths: anything but 1 … 2³¹−1 is a 404", () => {
  it("covers every dynamic route of the app", () => {
    const covered = new Set([...apiCases.map((c) => c[1]), ...pageCases.map((c) => c[0])]);
    for (const route of dynamicRoutes()) expect(covered, route).toContain(route);
  });

  for (const [method, route, handler, param, init] of apiCases) {
    it(`${method} ${route}`, async () => {
      vi.mocked(getCurrentUser).mockResolvedValue(admin);
      const wrong: string[] = [];
      for (const id of [...badIds, ...missingIds]) {
        const res = await handler(new Request(`http://127.0.0.1${route.replace(`[${param}]`, encodeURIComponent(id) || "x")}`, init()), {
          params: Promise.resolve({ [param]: id }),
        });
        if (res.status !== 404) wrong.push(`${JSON.stringify(id.slice(0, 20))} → ${res.status}`);
        else expect(res.headers.get("content-type")).toBe("application/problem+json");
      }
      expect(wrong).toEqual([]);
    });
  }

  for (const [route, page, params] of pageCases) {
    it(`page ${route}`, async () => {
      vi.mocked(getCurrentUser).mockResolvedValue(admin);
      const wrong: string[] = [];
      for (const id of [...badIds, ...missingIds]) {
        const got = await pageOutcome(page, params(id));
        if (got !== "404") wrong.push(`${JSON.stringify(id.slice(0, 20))} → ${got}`);
      }
      expect(wrong).toEqual([]);
    });
  }
});

describe("ids in server actions: parsed by the same rule", () => {
  const form = (values: Record<string, string>) => {
    const fd = new FormData();
    for (const [k, v] of Object.entries(values)) fd.set(k, v);
    return fd;
  };
  it("the editor's actions answer 404 for a malformed or missing version id", async () => {
    vi.mocked(getCurrentUser).mockResolvedValue(admin);
    for (const id of [0, -1, 1.5, MAX_ID + 1, Number.NaN, MAX_ID, "abc" as unknown as number]) {
      expect(await transitionAction(id, "submit"), String(id)).toMatchObject({ ok: false, status: 404 });
      expect(await startNextVersionAction(id), String(id)).toMatchObject({ ok: false, status: 404 });
      expect(await saveDraftAction(id, 1, JSON.stringify(EXAMPLE_DEPOSIT)), String(id)).toMatchObject({ ok: false, status: 404 });
      expect(await inviteAction(id, uniqueEmail("x"), "viewer"), String(id)).toMatchObject({ ok: false, status: 404 });
    }
  });

  it("form actions say the record does not exist", async () => {
    vi.mocked(getCurrentUser).mockResolvedValue(admin);
    for (const id of ["0", "1.5", "abc", "2147483648", "99999999999", "1e3"]) {
      expect(await changeRoleAction(idleState, form({ userId: id, role: "curator" })), id).toMatchObject({
        status: "error",
        message: "No such person",
      });
      expect(await setActiveAction(idleState, form({ userId: id, active: "false" })), id).toMatchObject({
        status: "error",
        message: "No such person",
      });
      expect(await revokeTokenAction(idleState, form({ tokenId: id })), id).toMatchObject({ status: "error", message: "No such token" });
    }
  });
});

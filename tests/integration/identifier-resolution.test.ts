import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));

import { GET } from "@/app/api/v1/identifiers/route";
import { applyTransition } from "@/lib/curation/transitions";
import { createDatasetDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { resolveIdentifier } from "@/lib/identifiers/queries";
import { parseIdentifier } from "@/lib/identifiers/series-code";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const points: StoredPoint[] = [
  { T: 300, k: 6.4e-15, original: { T: 300, k: 6.4e-15 } },
  { T: 400, k: 4.1e-14, original: { T: 400, k: 4.1e-14 } },
];
const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };
const payload = { title: "OH + CH4 resolution test", creators: [{ name: "Okafor, Maren" }], license: "CC-BY-4.0" };

let owner: UserDto, curator: UserDto;
beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("res-owner"), name: "Owner", passwordHash: "x", verified: true });
  curator = await createUser({ email: uniqueEmail("res-cur"), name: "Curator", passwordHash: "x", role: "curator", verified: true });
});

async function publish(before?: (datasetId: number) => Promise<void>) {
  const v = await createDatasetDraft({ ownerId: owner.id, title: payload.title, payload, points, analysis });
  if (before) await before(v.datasetId);
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  const out = await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Fine." });
  return { datasetId: v.datasetId, ids: out.identifiers! };
}

const get = (identifier: string) =>
  GET(new Request(`http://localhost/api/v1/identifiers?identifier=${encodeURIComponent(identifier)}`), {
    params: Promise.resolve({}),
  });

describe("identifier resolution", () => {
  it("resolves a series and its version, as typed by a person (lower case, O for 0, no hyphens)", async () => {
    const { datasetId, ids } = await publish();
    expect(await resolveIdentifier({ identifier: ids.series })).toEqual({ kind: "series", identifier: ids.series, datasetId });
    expect(await resolveIdentifier({ identifier: ids.version })).toMatchObject({ kind: "version", datasetId, versionNumber: 1 });
    const code = ids.series.slice(8).toLowerCase().replace(/-/g, "").replace(/0/g, "o").replace(/1/g, "l");
    const typed = `doi:10.5072/${code}/1`;
    const parsed = parseIdentifier(typed);
    expect(parsed).toMatchObject({ ok: true, identifier: ids.version });
    const res = await get(typed);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.data).toMatchObject({ identifier: ids.version, kind: "version", versionNumber: 1, state: "published" });
    expect(body.data.url).toMatch(new RegExp(`/datasets/${datasetId}/v1$`));
  });

  it("says 'mistyped' (422, pointing at the parameter) when the check character does not match, and 404 for a well-formed unknown code", async () => {
    const { ids } = await publish();
    const code = ids.series.slice(-9).replace("-", "");
    const changed = code[0] === "7" ? "8" : "7";
    const typo = ids.series.slice(0, -9) + `${changed}${code.slice(1, 4)}-${code.slice(4)}`;
    const res = await get(typo);
    expect(res.status).toBe(422);
    const problem = await res.json();
    expect(problem.title).toBe("Mistyped identifier");
    expect(problem.errors[0]).toMatchObject({ pointer: "/identifier", parameter: "identifier" });
    // ARH-0000-0000 is well formed (0 mod 37 = 0); the chance that a random draw took it is 1 in 32⁷.
    expect((await get("10.5072/ARH-0000-0000")).status).toBe(404);
    expect((await get("10.5072/nothing.of.ours")).status).toBe(422);
    expect((await get("")).status).toBe(400);
    const twice = await GET(
      new Request("http://localhost/api/v1/identifiers?identifier=10.5072/ARH-0000-0000&identifier=10.5072/ARH-0000-0011"),
      {
        params: Promise.resolve({}),
      },
    );
    expect(twice.status).toBe(400);
    expect((await twice.json()).errors[0]).toMatchObject({ parameter: "identifier", message: "Give identifier once (it appears 2 times)" });
  });

  it("keeps a series minted before the codes in its own form, and both forms resolve", async () => {
    const { datasetId, ids } = await publish(async (id) => {
      await sql`update datasets set series_identifier = ${`10.5072/arrhenia.${id}`} where id = ${id}`;
    });
    expect(ids).toEqual({ series: `10.5072/arrhenia.${datasetId}`, version: `10.5072/arrhenia.${datasetId}.v1` });
    const res = await get(`doi:10.5072/arrhenia.${datasetId}.v1`);
    expect(res.status).toBe(200);
    expect((await res.json()).data).toMatchObject({ kind: "version", versionNumber: 1 });
    expect(await resolveIdentifier({ identifier: ids.series })).toEqual({ kind: "series", identifier: ids.series, datasetId });
  });
});

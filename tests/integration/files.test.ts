import { createHash } from "node:crypto";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
process.env.STORAGE_DIR = mkdtempSync(path.join(tmpdir(), "arrhenia-files-"));

import { DELETE as deleteFile, GET as getFile } from "@/app/api/v1/files/[fileId]/route";
import { GET as listFiles, POST as postFile } from "@/app/api/v1/versions/[id]/files/route";
import { getCurrentUser } from "@/lib/auth/session";
import { applyTransition } from "@/lib/curation/transitions";
import { startNextVersion } from "@/lib/datasets/deposits";
import { addDatasetMember, createDatasetDraft } from "@/lib/datasets/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

let owner: UserDto, viewer: UserDto, stranger: UserDto, curator: UserDto;
beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, viewer, stranger, curator] = await Promise.all([mk("owner"), mk("viewer"), mk("stranger"), mk("curator", "curator")]);
});

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);

async function draft() {
  const v = await createDatasetDraft({
    ownerId: owner.id,
    title: "Files test",
    payload: {},
    points: [],
    analysis: { engineVersion: "t", result: null, checks: [] },
  });
  await addDatasetMember({ datasetId: v.datasetId, userId: viewer.id, role: "viewer", actorId: owner.id });
  return v;
}

function upload(versionId: number, name: string, content: Uint8Array | string) {
  const form = new FormData();
  form.set("file", new File([typeof content === "string" ? content : new Blob([content.slice().buffer])], name));
  return postFile(new Request(`http://127.0.0.1/api/v1/versions/${versionId}/files`, { method: "POST", body: form }), {
    params: Promise.resolve({ id: String(versionId) }),
  });
}

describe("supplementary files", () => {
  it("the owner uploads; the SHA-256 is recorded; co-editors and curators download the same bytes", async () => {
    const v = await draft();
    as(owner);
    const text = "T,k\n300,1e-12\n";
    const res = await upload(v.id, "raw data.csv", text);
    expect(res.status).toBe(201);
    const { data } = await res.json();
    expect(data.sha256).toBe(createHash("sha256").update(text).digest("hex"));
    expect(data).toMatchObject({ filename: "raw data.csv", contentType: "text/csv", sizeBytes: text.length });
    for (const [who, status] of [
      [viewer, 200],
      [curator, 200],
      [stranger, 404],
      [null, 404],
    ] as const) {
      as(who);
      const got = await getFile(new Request(`http://127.0.0.1/api/v1/files/${data.id}`), {
        params: Promise.resolve({ fileId: String(data.id) }),
      });
      expect(got.status).toBe(status);
      if (status === 200) expect(await got.text()).toBe(text);
    }
    as(viewer);
    const listed = await listFiles(new Request("http://127.0.0.1/"), { params: Promise.resolve({ id: String(v.id) }) });
    expect((await listed.json()).data).toHaveLength(1);
  });

  const bad: [string, string, Uint8Array | string, number, RegExp][] = [
    ["a type outside the allowlist", "tool.exe", "MZ", 422, /not accepted/],
    ["a script disguised as a picture", "x.svg", "<svg onload=alert(1)>", 422, /not accepted/],
    ["an empty file", "empty.csv", "", 422, /empty/],
    ["a 30 MB file", "big.csv", new Uint8Array(30 * 1024 * 1024), 413, /larger than 25 MB|limit is 25 MB/],
  ];
  for (const [what, name, content, status, message] of bad) {
    it(`refuses ${what} and stores nothing`, async () => {
      const v = await draft();
      as(owner);
      const res = await upload(v.id, name, content);
      expect(res.status).toBe(status);
      expect((await res.json()).title).toMatch(message);
      const listed = await listFiles(new Request("http://127.0.0.1/"), { params: Promise.resolve({ id: String(v.id) }) });
      expect((await listed.json()).data).toHaveLength(0);
    });
  }

  it("viewers cannot upload; files of a published version cannot be added or removed", async () => {
    const v = await draft();
    as(viewer);
    expect((await upload(v.id, "a.csv", "1")).status).toBe(403);
    as(owner);
    const { data } = await (await upload(v.id, "a.csv", "1,2")).json();
    await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Fine." });
    expect((await upload(v.id, "b.csv", "3")).status).toBe(409);
    const del = await deleteFile(new Request(`http://127.0.0.1/api/v1/files/${data.id}`, { method: "DELETE" }), {
      params: Promise.resolve({ fileId: String(data.id) }),
    });
    expect(del.status).toBe(409); // and the database trigger would refuse it too
    as(null);
    expect((await getFile(new Request("http://127.0.0.1/"), { params: Promise.resolve({ fileId: String(data.id) }) })).status).toBe(200);

    // The next version lists the same file; removing it there keeps the published one intact.
    const v2 = await startNextVersion({ actor: owner, versionId: v.id });
    as(owner);
    const listed = await (await listFiles(new Request("http://127.0.0.1/"), { params: Promise.resolve({ id: String(v2.id) }) })).json();
    expect(listed.data.map((f: { sha256: string }) => f.sha256)).toEqual([data.sha256]);
    const del2 = await deleteFile(new Request("http://127.0.0.1/"), { params: Promise.resolve({ fileId: String(listed.data[0].id) }) });
    expect(del2.status).toBe(204);
    as(null);
    const still = await getFile(new Request("http://127.0.0.1/"), { params: Promise.resolve({ fileId: String(data.id) }) });
    expect(still.status).toBe(200);
    expect(await still.text()).toBe("1,2");
  });
});

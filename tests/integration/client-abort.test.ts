import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import { POST as postAnalysis } from "@/app/api/v1/analyses/route";
import { POST as createDataset } from "@/app/api/v1/datasets/route";
import { POST as postTransition } from "@/app/api/v1/versions/[id]/transitions/route";
import { getCurrentUser } from "@/lib/auth/session";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail, uniqueIp } from "./helpers";

// A client that closes its connection mid-body: Node fails the body stream with ECONNRESET
// ("aborted"), the same code a database connection reset has. It must be logged as an abort,
// never as the database out of reach (a 503 and an outage in the logs), and store nothing.
let owner: UserDto;
beforeAll(async () => {
  owner = await createUser({
    email: uniqueEmail("abort-owner"),
    name: "Abort owner",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
  vi.mocked(getCurrentUser).mockResolvedValue(owner);
});
afterEach(() => vi.restoreAllMocks());

/** A body that delivers `first` and then breaks as Node's does when the client's socket closes. */
function breakingBody(first: string): ReadableStream<Uint8Array> {
  let sent = false;
  return new ReadableStream({
    pull(controller) {
      if (!sent) {
        sent = true;
        controller.enqueue(new TextEncoder().encode(first));
      } else controller.error(Object.assign(new Error("aborted"), { code: "ECONNRESET" }));
    },
  });
}

function post(url: string, body: ReadableStream<Uint8Array>, signal?: AbortSignal) {
  return new Request(url, {
    method: "POST",
    body,
    signal,
    headers: { "content-type": "application/json", "x-forwarded-for": uniqueIp() },
    duplex: "half",
  } as RequestInit);
}

const cases: [string, () => Promise<Response>][] = [
  ["POST /api/v1/datasets", () => createDataset(post("http://127.0.0.1/api/v1/datasets", breakingBody('{"title":"Aborted upl')), ctx())],
  ["POST /api/v1/analyses", () => postAnalysis(post("http://127.0.0.1/api/v1/analyses", breakingBody('{"order":2,"points":[')), ctx())],
  [
    "POST /api/v1/versions/1/transitions",
    () => postTransition(post("http://127.0.0.1/api/v1/versions/1/transitions", breakingBody('{"action":')), ctx("1")),
  ],
];
function ctx(id = "0") {
  return { params: Promise.resolve({ id }) };
}

describe("a client that closes the connection mid-request", () => {
  for (const [name, call] of cases) {
    it(`${name}: logged as an abort, not as a database outage or a failure; no 503, no 500`, async () => {
      const warn = vi.spyOn(console, "warn");
      const error = vi.spyOn(console, "error");
      const info = vi.spyOn(console, "info").mockImplementation(() => {});
      const before = Number((await sql`select count(*) from datasets`)[0].count);
      const res = await call();
      expect(res.status).toBe(400);
      expect(warn).not.toHaveBeenCalled();
      expect(error).not.toHaveBeenCalled();
      expect(info.mock.calls.map((c) => String(c[0]))).toEqual([expect.stringMatching(/aborted by the client/)]);
      expect(Number((await sql`select count(*) from datasets`)[0].count)).toBe(before);
    });
  }

  it("a request whose signal was aborted (Next aborts it when the socket closes) fails as an abort too", async () => {
    const warn = vi.spyOn(console, "warn");
    const info = vi.spyOn(console, "info").mockImplementation(() => {});
    const controller = new AbortController();
    const req = post("http://127.0.0.1/api/v1/datasets", breakingBody("{"), controller.signal);
    controller.abort();
    const res = await createDataset(req, ctx());
    expect(res.status).toBe(400);
    expect(warn).not.toHaveBeenCalled();
    expect(info).toHaveBeenCalledWith(expect.stringMatching(/aborted by the client/));
  });
});

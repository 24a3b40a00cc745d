import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { readBodyOrThrow, readFormDataOrThrow, readJsonBodyOrThrow } from "@/lib/http/read-body";

/** A request whose body arrives in the given chunks, without Content-Length. */
function chunked(chunks: Uint8Array[], headers: Record<string, string> = {}) {
  let i = 0;
  const body = new ReadableStream<Uint8Array>(
    { pull: (c) => (i < chunks.length ? c.enqueue(chunks[i++]) : c.close()) },
    { highWaterMark: 0 },
  );
  return { req: new Request("http://127.0.0.1/", { method: "POST", body, headers, duplex: "half" } as RequestInit), pulled: () => i };
}

const bytes = (n: number, fill = 0x61) => new Uint8Array(n).fill(fill);

async function refusal(p: Promise<unknown>): Promise<AppError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(AppError);
  return err as AppError;
}

describe("readBodyOrThrow", () => {
  it("joins the chunks of a body exactly at the limit", async () => {
    const { req } = chunked([bytes(3), bytes(4, 0x62), bytes(3, 0x63)]);
    expect(new TextDecoder().decode(await readBodyOrThrow(req, { limit: 10 }))).toBe("aaabbbbccc");
  });

  it("refuses one byte over the limit with a 413 that names the limit, and pulls no further chunk", async () => {
    const { req, pulled } = chunked([bytes(6), bytes(6), bytes(6), bytes(6)]);
    const err = await refusal(readBodyOrThrow(req, { limit: 11, what: "test body" }));
    expect(err.status).toBe(413);
    expect(err.code).toBe("payload_too_large");
    expect(err.message).toBe("The test body is larger than 11 bytes, the limit");
    expect(pulled()).toBe(2);
  });

  it("refuses a declared Content-Length above the limit before reading", async () => {
    const { req, pulled } = chunked([bytes(5)], { "content-length": String(25 * 1024 * 1024 + 1) });
    const err = await refusal(readBodyOrThrow(req, { limit: 25 * 1024 * 1024 }));
    expect(err.message).toMatch(/larger than 25 MB, the limit/);
    expect(pulled()).toBe(0);
  });

  it("reads a missing body as empty", async () => {
    expect((await readBodyOrThrow(new Request("http://127.0.0.1/", { method: "POST" }), { limit: 1 })).byteLength).toBe(0);
  });
});

describe("readJsonBodyOrThrow and readFormDataOrThrow", () => {
  it("malformed JSON is a 422 at the document root", async () => {
    const err = await refusal(readJsonBodyOrThrow(chunked([new TextEncoder().encode("{oops")]).req, { limit: 100 }));
    expect(err.status).toBe(422);
    expect(err.errors[0].pointer).toBe("");
  });

  it("parses multipart within the limit and refuses a non-multipart body with 422", async () => {
    const form = new FormData();
    form.set("file", new File(["T,k\n"], "a.csv"));
    const req = new Request("http://127.0.0.1/", { method: "POST", body: form });
    const parsed = await readFormDataOrThrow(req, { limit: 10_000 });
    expect(await (parsed.get("file") as File).text()).toBe("T,k\n");
    const err = await refusal(readFormDataOrThrow(new Request("http://127.0.0.1/", { method: "POST", body: "x" }), { limit: 10 }));
    expect(err.status).toBe(422);
  });
});

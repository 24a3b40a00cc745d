import http from "node:http";
import net, { type AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { EDGE_KEY_HEADER } from "@/lib/auth/client-address";
import { carriesEdgeKey, innerGate } from "@/lib/auth/inner-gate";

// The gate before Next's handler on the private port, around a stand-in for Next that reports
// what reached it and when the body's bytes arrived.
const KEY = "a1".repeat(24);
let server: http.Server;
let port: number;
let reached = 0;

beforeAll(async () => {
  server = http.createServer(
    innerGate(KEY, (req, res) => {
      reached++;
      let bytes = 0;
      let firstChunkAt: number | null = null;
      req.on("data", (c: Buffer) => {
        firstChunkAt ??= bytes;
        bytes += c.length;
        // Answers after the first 1 MB while the client is still sending: only possible if the body streams.
        if (req.url === "/early" && bytes >= 1024 * 1024 && !res.headersSent) {
          res.writeHead(200, { "content-type": "application/json", connection: "close" });
          res.end(JSON.stringify({ bytes }));
          req.destroy();
        }
      });
      req.on("end", () => {
        if (res.headersSent) return;
        res.writeHead(200, { "content-type": "application/json" });
        res.end(
          JSON.stringify({ bytes, keyHeader: req.headers[EDGE_KEY_HEADER] ?? null, raw: req.rawHeaders.map((h) => h.toLowerCase()) }),
        );
      });
    }),
  );
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  port = (server.address() as AddressInfo).port;
});

afterAll(() => new Promise((resolve) => server.close(resolve)));

function send(headers: Record<string, string | string[]>, body?: string, method = "GET") {
  return new Promise<{ status: number; text: string }>((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port, method, path: "/", headers }, (res) => {
      let text = "";
      res.on("data", (c) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

describe("the inner gate", () => {
  it("refuses with 403 a request without the key, with a wrong key, or with a key of another length, before the handler runs", async () => {
    const before = reached;
    const attempts: Record<string, string>[] = [
      {},
      { [EDGE_KEY_HEADER]: "b2".repeat(24) },
      { [EDGE_KEY_HEADER]: KEY.slice(0, -1) },
      { [EDGE_KEY_HEADER]: `${KEY} ` + "x" },
      { [EDGE_KEY_HEADER]: "" },
    ];
    for (const headers of attempts) {
      const res = await send(headers, "x".repeat(5000), "POST");
      expect(res.status).toBe(403);
      expect(JSON.parse(res.text)).toMatchObject({ status: 403, code: "forbidden" });
    }
    expect(reached).toBe(before);
  });

  it("lets the key through once, and the handler never sees it", async () => {
    const res = await send({ [EDGE_KEY_HEADER]: KEY, "x-other": "kept" }, "hello", "POST");
    expect(res.status).toBe(200);
    const seen = JSON.parse(res.text);
    expect(seen.bytes).toBe(5);
    expect(seen.keyHeader).toBeNull();
    expect(seen.raw).not.toContain(EDGE_KEY_HEADER);
    expect(seen.raw).not.toContain(KEY);
    expect(seen.raw).toContain("x-other");
  });

  it("streams the body on: the handler can answer after 1 MB of a chunked 64 MB upload", async () => {
    const result = await new Promise<{ status: number; sent: number }>((resolve, reject) => {
      let sent = 0;
      let answered = false;
      const chunk = Buffer.alloc(64 * 1024, 0x20);
      const req = http.request(
        { host: "127.0.0.1", port, method: "POST", path: "/early", headers: { [EDGE_KEY_HEADER]: KEY, "transfer-encoding": "chunked" } },
        (res) => {
          answered = true;
          res.resume();
          res.on("end", () => resolve({ status: res.statusCode ?? 0, sent }));
        },
      );
      req.on("error", (err) => (answered ? undefined : reject(err)));
      const write = () => {
        while (!answered && sent < 64 * 1024 * 1024) {
          sent += chunk.length;
          if (!req.write(chunk)) return void req.once("drain", write);
        }
        if (!answered) req.end();
      };
      write();
    });
    expect(result.status).toBe(200);
    expect(result.sent).toBeLessThan(32 * 1024 * 1024);
  });
});

describe("carriesEdgeKey", () => {
  it("accepts exactly the key, once", () => {
    expect(carriesEdgeKey(KEY, KEY)).toBe(true);
    expect(carriesEdgeKey(KEY.toUpperCase(), KEY)).toBe(false);
    expect(carriesEdgeKey([KEY, KEY], KEY)).toBe(false);
    expect(carriesEdgeKey(undefined, KEY)).toBe(false);
    expect(carriesEdgeKey("", "")).toBe(false);
  });

  it("refuses to build a gate without a key", () => {
    expect(() => innerGate("", () => {})).toThrow(/ARRHENIA_EDGE_KEY/);
  });
});

describe("the inner gate against requests written by hand", () => {
  /** Sends raw bytes on one connection and collects everything answered until the server closes (or 3 s). */
  function raw(bytes: string): Promise<string> {
    return new Promise((resolve, reject) => {
      const socket = net.connect(port, "127.0.0.1");
      let got = "";
      const done = () => resolve(got);
      socket.on("data", (d) => (got += d));
      socket.on("end", done);
      socket.on("close", done);
      socket.on("error", reject);
      socket.setTimeout(3000, () => {
        socket.destroy();
        done();
      });
      socket.write(bytes);
    });
  }
  const statuses = (answer: string) => [...answer.matchAll(/^HTTP\/1\.[01] (\d{3})/gm)].map((m) => Number(m[1]));
  const wrongSameLength = KEY.split("").reverse().join("");

  it.each([
    ["no key", `GET / HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`, [403]],
    [
      "a wrong key of the same length",
      `GET / HTTP/1.1\r\nHost: x\r\nX-Arrhenia-Edge-Key: ${wrongSameLength}\r\nConnection: close\r\n\r\n`,
      [403],
    ],
    ["the key in upper case", `GET / HTTP/1.1\r\nHost: x\r\nx-arrhenia-edge-key: ${KEY.toUpperCase()}\r\nConnection: close\r\n\r\n`, [403]],
    [
      "the key twice, in two casings of the header name",
      `GET / HTTP/1.1\r\nHost: x\r\nX-ARRHENIA-EDGE-KEY: ${KEY}\r\nx-arrhenia-edge-key: ${KEY}\r\nConnection: close\r\n\r\n`,
      [403],
    ],
    [
      "a wrong key then the right one",
      `GET / HTTP/1.1\r\nHost: x\r\nx-arrhenia-edge-key: ${wrongSameLength}\r\nx-arrhenia-edge-key: ${KEY}\r\nConnection: close\r\n\r\n`,
      [403],
    ],
    ["HTTP/1.0 without the key", `GET / HTTP/1.0\r\n\r\n`, [403]],
    [
      "the key as a header of another name",
      `GET / HTTP/1.1\r\nHost: x\r\nx-arrhenia-edge-key-2: ${KEY}\r\nConnection: close\r\n\r\n`,
      [403],
    ],
    ["a header far over the size limit", `GET / HTTP/1.1\r\nHost: x\r\nx-pad: ${"a".repeat(64 * 1024)}\r\n\r\n`, [431]],
  ])("%s is refused before the handler", async (_what, request, expected) => {
    const before = reached;
    expect(statuses(await raw(request))).toEqual(expected);
    expect(reached).toBe(before);
  });

  it("pipelined: a request with the key, then one without, on one connection: the second is refused", async () => {
    const before = reached;
    const answer = await raw(
      `GET / HTTP/1.1\r\nHost: x\r\nx-arrhenia-edge-key: ${KEY}\r\n\r\nGET / HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n`,
    );
    expect(statuses(answer)).toEqual([200, 403]);
    expect(reached).toBe(before + 1);
  });

  it("the header name's casing does not matter with the right key (HTTP header names are case-insensitive), and the key is removed", async () => {
    const answer = await raw(`GET / HTTP/1.0\r\nX-ArRhEnIa-EdGe-KeY: ${KEY}\r\n\r\n`);
    expect(statuses(answer)).toEqual([200]);
    expect(answer).not.toContain(KEY);
    expect(answer.toLowerCase()).not.toContain("x-arrhenia-edge-key");
  });
});

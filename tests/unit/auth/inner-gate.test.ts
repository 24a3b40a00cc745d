import http from "node:http";
import type { AddressInfo } from "node:net";
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

import type http from "node:http";
import { afterEach, describe, expect, it } from "vitest";
import { CLIENT_ADDRESS_HEADER, clientAddress, EDGE_KEY_HEADER, INNER_GATE_MARK, UNKNOWN_ADDRESS } from "@/lib/auth/client-address";
import { compileTrustProxy, forwardedHeaders, isCrossOriginPagePost, originFormTarget } from "@/lib/auth/edge-proxy";

function fakeRequest(remoteAddress: string, headers: http.IncomingHttpHeaders): http.IncomingMessage {
  return { headers, socket: { remoteAddress }, connection: { remoteAddress } } as unknown as http.IncomingMessage;
}

describe("clientAddress: only the front server's word counts", () => {
  afterEach(() => {
    delete process.env.ARRHENIA_EDGE_KEY;
  });

  it("ignores X-Forwarded-For and X-Real-IP sent by a client", () => {
    process.env.ARRHENIA_EDGE_KEY = "k".repeat(48);
    expect(clientAddress(new Headers({ "x-forwarded-for": "203.0.113.9", "x-real-ip": "203.0.113.9" }))).toBe(UNKNOWN_ADDRESS);
  });

  it("believes the client-address header only with the front server's key", () => {
    process.env.ARRHENIA_EDGE_KEY = "k".repeat(48);
    expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "198.51.100.7", [EDGE_KEY_HEADER]: "k".repeat(48) })).toBe("198.51.100.7");
    expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "198.51.100.7", [EDGE_KEY_HEADER]: "guessed" })).toBe(UNKNOWN_ADDRESS);
    expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "198.51.100.7" })).toBe(UNKNOWN_ADDRESS);
    expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "not an address", [EDGE_KEY_HEADER]: "k".repeat(48) })).toBe(UNKNOWN_ADDRESS);
  });

  it("behind the inner gate (which checked the key and removed it) believes the front server's header", () => {
    const marks = globalThis as Record<symbol, unknown>;
    marks[INNER_GATE_MARK] = true;
    try {
      expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "198.51.100.7" })).toBe("198.51.100.7");
      expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "not an address" })).toBe(UNKNOWN_ADDRESS);
      expect(clientAddress(new Headers({ "x-forwarded-for": "203.0.113.9" }))).toBe(UNKNOWN_ADDRESS);
    } finally {
      delete marks[INNER_GATE_MARK];
    }
    expect(clientAddress({ [CLIENT_ADDRESS_HEADER]: "198.51.100.7" })).toBe(UNKNOWN_ADDRESS);
  });

  it("believes nothing when no front server is configured", () => {
    expect(clientAddress(new Request("http://x/", { headers: { [CLIENT_ADDRESS_HEADER]: "198.51.100.7", [EDGE_KEY_HEADER]: "" } }))).toBe(
      UNKNOWN_ADDRESS,
    );
  });
});

describe("TRUST_PROXY", () => {
  const spoofed = {
    "x-forwarded-for": "203.0.113.50, 192.0.2.10",
    "x-forwarded-host": "evil.example",
    "x-real-ip": "203.0.113.99",
    [CLIENT_ADDRESS_HEADER]: "203.0.113.1",
  };

  it("unset: the socket address, and every forwarding header dropped", () => {
    const h = forwardedHeaders(fakeRequest("::ffff:127.0.0.1", { ...spoofed }), compileTrustProxy(""), "key");
    expect(h[CLIENT_ADDRESS_HEADER]).toBe("127.0.0.1");
    expect(h["x-forwarded-for"]).toBe("127.0.0.1");
    expect(h["x-forwarded-host"]).toBeUndefined();
    expect(h["x-real-ip"]).toBeUndefined();
    expect(h[EDGE_KEY_HEADER]).toBe("key");
  });

  it("a socket already reset (no address at all) is the one unknown client, never a crash", () => {
    const gone = { headers: { ...spoofed }, socket: {}, connection: {} } as unknown as http.IncomingMessage;
    for (const trust of ["", "1", "10.0.0.0/8"]) {
      const h = forwardedHeaders(gone, compileTrustProxy(trust), "key");
      expect(h[CLIENT_ADDRESS_HEADER]).toBe("unknown");
    }
  });

  it("a hop count believes that many proxies, counted from the socket", () => {
    expect(forwardedHeaders(fakeRequest("10.0.0.2", { ...spoofed }), compileTrustProxy("1"), "k")[CLIENT_ADDRESS_HEADER]).toBe(
      "192.0.2.10",
    );
    expect(forwardedHeaders(fakeRequest("10.0.0.2", { ...spoofed }), compileTrustProxy("2"), "k")[CLIENT_ADDRESS_HEADER]).toBe(
      "203.0.113.50",
    );
    expect(forwardedHeaders(fakeRequest("10.0.0.2", { ...spoofed }), compileTrustProxy("1"), "k")["x-forwarded-host"]).toBe("evil.example");
  });

  it("a list believes only the proxies it names", () => {
    const trust = compileTrustProxy("10.0.0.0/8, 192.0.2.10");
    expect(forwardedHeaders(fakeRequest("10.1.2.3", { ...spoofed }), trust, "k")[CLIENT_ADDRESS_HEADER]).toBe("203.0.113.50");
    const untrusted = forwardedHeaders(fakeRequest("198.51.100.1", { ...spoofed }), trust, "k");
    expect(untrusted[CLIENT_ADDRESS_HEADER]).toBe("198.51.100.1");
    expect(untrusted["x-forwarded-host"]).toBeUndefined();
  });

  it("a value that is neither a count nor addresses stops start-up with a clear message", () => {
    expect(() => compileTrustProxy("yes please")).toThrow(/TRUST_PROXY/);
  });
});

describe("cross-origin page posts (server actions)", () => {
  const app = { appOrigin: "https://arrhenia.example", peerAddress: "203.0.113.9" };
  const h = (extra: http.IncomingHttpHeaders) => ({ host: "arrhenia.example", ...extra });
  it.each([
    ["another origin", h({ origin: "https://evil.example" }), true],
    ["an opaque origin", h({ origin: "null" }), true],
    ["the app's origin", h({ origin: "https://arrhenia.example" }), false],
    ["the app's host over another scheme", h({ origin: "http://arrhenia.example" }), true],
    ["a server action with no origin and no referer", h({ "next-action": "abc" }), true],
    ["a multipart form post with no origin and no referer", h({ "content-type": "multipart/form-data; boundary=x" }), true],
    ["a plain post with no origin (not an action; Next refuses it itself)", h({}), false],
    ["no origin, a referer on the app's origin", h({ referer: "https://arrhenia.example/deposits/4" }), false],
    ["no origin, a referer on another site", h({ referer: "https://evil.example/arrhenia.example/" }), true],
    ["an action with no origin and a referer that is not a URL", h({ "next-action": "abc", referer: "arrhenia.example" }), true],
    // The Host header is the client's to choose: matching it proves nothing.
    ["another origin with a forged Host to match", { host: "evil.example", origin: "https://evil.example" }, true],
    ["another origin claimed by X-Forwarded-Host", h({ origin: "https://evil.example", "x-forwarded-host": "evil.example" }), true],
    ["a loopback origin from a remote socket", { host: "127.0.0.1:3000", origin: "http://127.0.0.1:3000" }, true],
  ])("%s", (_label, headers, refused) => {
    expect(isCrossOriginPagePost("POST", "/settings", headers, app)).toBe(refused);
  });
  it("a browser on this machine reaching the server directly on loopback keeps working", () => {
    const local = { ...app, peerAddress: "::ffff:127.0.0.1", ownPort: 3000 };
    expect(isCrossOriginPagePost("POST", "/settings", { host: "127.0.0.1:3000", origin: "http://127.0.0.1:3000" }, local)).toBe(false);
    expect(isCrossOriginPagePost("POST", "/settings", { host: "localhost:3000", origin: "http://localhost:3000" }, local)).toBe(false);
    // Another local site (another port) is another origin.
    expect(isCrossOriginPagePost("POST", "/settings", { host: "127.0.0.1:3000", origin: "http://127.0.0.1:8080" }, local)).toBe(true);
    // The reference is the front server's own port, not the Host header the client chose.
    expect(isCrossOriginPagePost("POST", "/settings", { host: "127.0.0.1:8080", origin: "http://127.0.0.1:8080" }, local)).toBe(true);
  });
  it.each([
    ["/settings?x=1", "/settings?x=1"],
    ["http://evil.example/", "/"],
    ["https://evil.example/sign-in?callbackUrl=%2F", "/sign-in?callbackUrl=%2F"],
    ["HTTP://evil.example:8080/datasets/1", "/datasets/1"],
    ["evil.example/", null],
    ["*", null],
    ["ftp://evil.example/", null],
  ])("the request target %s reaches Next as %s", (target, expected) => {
    expect(originFormTarget(target)).toBe(expected);
  });
  it("leaves reads and the API alone", () => {
    expect(isCrossOriginPagePost("GET", "/settings", h({ origin: "https://evil.example" }), app)).toBe(false);
    expect(isCrossOriginPagePost("POST", "/api/v1/analyses", h({ origin: "https://evil.example" }), app)).toBe(false);
  });
  it("the OAI-PMH repository takes a harvester's POST from any origin (public, read-only); a server action sent there does not pass", async () => {
    const form = { origin: "https://harvester.example", "content-type": "application/x-www-form-urlencoded" };
    expect(isCrossOriginPagePost("POST", "/oai", h(form), app)).toBe(false);
    expect(isCrossOriginPagePost("POST", "/oai?verb=Identify", h(form), app)).toBe(false);
    expect(isCrossOriginPagePost("POST", "/oai", h({ ...form, "next-action": "abc" }), app)).toBe(true);
    // Only /oai itself: a page whose path merely starts so, or reached through dot segments, is a page.
    for (const url of ["/oai/../settings", "/oaix", "/oai/%2e%2e/settings"])
      expect(isCrossOriginPagePost("POST", url, h(form), app), url).toBe(true);
  });
  it("a page reached through /api/ with dot segments is a page", () => {
    for (const url of ["/api/%2e%2e/admin/people", "/api/../admin/people", "/api\\..\\admin"])
      expect(isCrossOriginPagePost("POST", url, h({ origin: "https://evil.example" }), app)).toBe(true);
  });
});

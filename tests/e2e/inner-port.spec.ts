import http from "node:http";
import { networkInterfaces } from "node:os";
import { expect, test } from "@playwright/test";

// Next's private port (INNER_PORT, fixed by playwright.config.ts) answers only the front server:
// a local process that knocks on it directly, with no key or a guessed one, gets 403, and the
// port is not open on any address but loopback.

const frontPort = Number(process.env.E2E_PORT ?? 3100);
const innerPort = Number(process.env.E2E_INNER_PORT ?? frontPort + 1);

function send(
  host: string,
  port: number,
  {
    method = "GET",
    path = "/api/health",
    headers = {},
    body,
  }: { method?: string; path?: string; headers?: Record<string, string>; body?: string },
  localAddress?: string,
) {
  return new Promise<{ status: number; text: string }>((resolve, reject) => {
    const req = http.request({ host, port, method, path, headers, localAddress, timeout: 10_000 }, (res) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (c) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
    });
    req.on("timeout", () => req.destroy(new Error("timed out")));
    req.on("error", reject);
    req.end(body);
  });
}

test("the inner port refuses requests without the front server's key, and the front server still serves", async () => {
  type Knock = { method?: string; path: string; headers: Record<string, string>; body?: string };
  const keyless: Knock[] = [
    { path: "/api/health", headers: {} },
    { path: "/api/health", headers: { "x-arrhenia-edge-key": "0".repeat(48) } },
    { path: "/api/health", headers: { "x-arrhenia-edge-key": "guessed" } },
    // What the front server would have refused or rewritten: a spoofed client address, a cross-origin action.
    { path: "/", headers: { "x-arrhenia-client-address": "203.0.113.5", "x-forwarded-for": "203.0.113.5" } },
    {
      path: "/sign-up",
      method: "POST",
      headers: { "next-action": "0".repeat(40), origin: "https://evil.example", "content-type": "text/plain;charset=UTF-8" },
      body: "[]",
    },
    { path: "/api/v1/analyses", method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ points: [] }) },
  ];
  for (const request of keyless) {
    const res = await send("127.0.0.1", innerPort, request);
    expect(res.status, `${request.method ?? "GET"} ${request.path}`).toBe(403);
    expect(JSON.parse(res.text).code).toBe("forbidden");
  }

  const front = await send("127.0.0.1", frontPort, {});
  expect(front.status).toBe(200);
  expect(JSON.parse(front.text).status).toBe("ok");
});

test("the inner port listens on loopback only", async () => {
  const outside = Object.values(networkInterfaces())
    .flat()
    .find((a) => a && !a.internal && a.family === "IPv4");
  test.skip(!outside, "this machine has no non-loopback IPv4 address");
  await expect(send(outside!.address, innerPort, {})).rejects.toThrow(/ECONNREFUSED/);
});

test("behind the gate the app still counts by the address the front server saw", async () => {
  // 120 species previews a minute per address (lib/auth/rate-limit.ts). Two loopback addresses of
  // this machine: the first is limited, the second is not, so the app told them apart.
  const first = `127.91.${Math.floor(Math.random() * 250)}.${1 + Math.floor(Math.random() * 250)}`;
  const second = `127.92.${Math.floor(Math.random() * 250)}.${1 + Math.floor(Math.random() * 250)}`;
  const preview = { path: "/api/v1/species/preview" }; // no species given: a 422 after the limit is counted
  const statuses: number[] = [];
  for (let i = 0; i < 121; i++) statuses.push((await send("127.0.0.1", frontPort, preview, first)).status);
  expect(statuses.slice(0, 120).every((s) => s === 422)).toBe(true);
  expect(statuses[120]).toBe(429);
  expect((await send("127.0.0.1", frontPort, preview, second)).status).toBe(422);
});

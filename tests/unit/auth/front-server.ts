import http from "node:http";
import type { AddressInfo } from "node:net";
import { compileTrustProxy, startEdgeProxy } from "@/lib/auth/edge-proxy";

/** The key the front server of these tests passes on to the app behind it. */
export const TEST_EDGE_KEY = "k".repeat(32);

/**
 * Starts `app` (a stand-in for Next) on a free loopback port and the front server before it, trusting
 * no proxy, with APP_URL's origin http://127.0.0.1; `options` adds or overrides start options.
 */
export async function startFrontBefore(
  app: http.Server,
  options: Partial<Parameters<typeof startEdgeProxy>[0]> = {},
): Promise<Awaited<ReturnType<typeof startEdgeProxy>>> {
  await new Promise<void>((resolve) => app.listen(0, "127.0.0.1", () => resolve()));
  return startEdgeProxy({
    host: "127.0.0.1",
    port: 0,
    upstreamPort: (app.address() as AddressInfo).port,
    trust: compileTrustProxy(""),
    key: TEST_EDGE_KEY,
    appOrigin: "http://127.0.0.1",
    ...options,
  });
}

/** One request to the front server on `port`, on its own connection: status, headers and the whole body. */
export function askFront(
  port: number,
  method: string,
  path: string,
  headers: http.OutgoingHttpHeaders = {},
): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port, method, path, headers, agent: false }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
    });
    req.on("error", reject);
    req.end();
  });
}

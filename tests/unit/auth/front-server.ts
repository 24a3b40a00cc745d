import type http from "node:http";
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

// Runs before every route (pages, server actions, route handlers, static files). Next listens on a
// private loopback port behind the front server (scripts/serve.ts, lib/auth/edge-proxy.ts), which
// refuses cross-origin actions, oversized or over-nested action bodies and spoofed addresses. Any
// local process could reach that port directly and skip those checks, so a request without the
// front server's per-start key is refused here.
import { NextResponse, type NextRequest } from "next/server";
import { hasEdgeKey } from "@/lib/auth/client-address";

export function proxy(request: NextRequest) {
  if (!hasEdgeKey(request.headers)) {
    return NextResponse.json(
      {
        type: "about:blank",
        title: "Forbidden",
        status: 403,
        code: "forbidden",
        detail: "This port serves only the front server; use the site's address.",
      },
      { status: 403, headers: { "content-type": "application/problem+json" } },
    );
  }
  return NextResponse.next();
}

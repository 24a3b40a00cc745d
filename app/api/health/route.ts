// GET /api/health — liveness of the app and its database (503 when the database is unreachable)
import { NextResponse } from "next/server";
import { isDatabaseReachable } from "@/lib/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const ok = await isDatabaseReachable();
  return NextResponse.json(
    { status: ok ? "ok" : "degraded", database: ok ? "ok" : "unreachable" },
    { status: ok ? 200 : 503, headers: { "cache-control": "no-store" } },
  );
}

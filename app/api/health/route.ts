// GET /api/health — liveness of the app and a round trip through its database pool (503 when it fails)
import { NextResponse } from "next/server";
import { checkDatabase } from "@/lib/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const db = await checkDatabase();
  return NextResponse.json(
    { status: db.ok ? "ok" : "degraded", database: db.ok ? "ok" : "unreachable", databaseLatencyMs: db.latencyMs },
    { status: db.ok ? 200 : 503, headers: { "cache-control": "no-store" } },
  );
}

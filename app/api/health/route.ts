// GET /api/health — liveness of the app and a round trip through its database pool (503 when it fails)
import { NextResponse } from "next/server";
import { checkDatabase } from "@/lib/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const db = await checkDatabase();
  return NextResponse.json(
    { status: db.ok ? "ok" : "degraded", database: db.ok ? "ok" : "unreachable", databaseLatencyMs: db.latencyMs },
    // A 503 says when to look again, as every other answer while the database is out of reach does.
    { status: db.ok ? 200 : 503, headers: { "cache-control": "no-store", ...(db.ok ? {} : { "retry-after": "5" }) } },
  );
}

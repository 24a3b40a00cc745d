// GET /schemas/deposit/v1.json — the deposit document's JSON Schema
import schema from "@/schemas/deposit.v1.schema.json";

// Serialised once per process; the schema only changes with a deploy. (No `dynamic = "force-static"`:
// that segment option is refused once cacheComponents is on; the cache header does the caching.)
const body = `${JSON.stringify(schema, null, 2)}\n`;

export function GET() {
  return new Response(body, {
    headers: {
      "content-type": "application/schema+json; charset=utf-8",
      // An hour fresh, a day stale-while-revalidate: editors fetch it often, v1 changes rarely.
      "cache-control": "public, max-age=3600, stale-while-revalidate=86400",
      // Schema-aware editors and validators fetch it from other origins.
      "access-control-allow-origin": "*",
    },
  });
}

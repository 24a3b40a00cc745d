// POST /api/v1/mechanism-checks — check a mechanism (Cantera YAML or plain text) against the published data
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { readBodyOrThrow } from "@/lib/http/read-body";
import { MAX_MECHANISM_BYTES } from "@/lib/mechanisms/limits";
import { mechanismWindowSchema } from "@/lib/mechanisms/request";
import { runMechanismCheck } from "@/lib/mechanisms/run-check";

/** Room for the JSON wrapping around a 20 MB mechanism. */
const BODY_LIMIT = MAX_MECHANISM_BYTES + 64 * 1024;

export const POST = withApi(
  async ({ req, user }) => {
    const url = new URL(req.url);
    const json = (req.headers.get("content-type") ?? "").toLowerCase().startsWith("application/json");
    const q = url.searchParams;
    let window: { Tmin: number; Tmax: number } | null = null;
    if (q.has("Tmin") || q.has("Tmax")) {
      const parsed = mechanismWindowSchema.safeParse({ Tmin: Number(q.get("Tmin") ?? 300), Tmax: Number(q.get("Tmax") ?? 2500) });
      if (!parsed.success)
        throw new AppError("bad_request", `The use window is not valid: ${parsed.error.issues[0].message}`, [
          { pointer: "", parameter: q.has("Tmin") ? "Tmin" : "Tmax", message: parsed.error.issues[0].message },
        ]);
      window = parsed.data;
    }
    const format = q.get("format");
    if (format !== null && !["auto", "cantera-yaml", "plain-text"].includes(format))
      throw new AppError("bad_request", "format must be auto, cantera-yaml or plain-text", [
        { pointer: "", parameter: "format", message: "must be auto, cantera-yaml or plain-text" },
      ]);
    const bytes = await readBodyOrThrow(req, { limit: BODY_LIMIT, what: "mechanism", shownLimit: MAX_MECHANISM_BYTES });
    // Decoding, the pre-check and reading run on a worker thread (lib/mechanisms/request.ts).
    const { id, report } = await runMechanismCheck({
      ownerId: user!.id,
      input: { bytes, json, name: q.get("name"), window, format: (format ?? "auto") as "auto" },
    });
    return NextResponse.json(
      { data: { id, url: `/mechanisms/${id}`, summary: report.summary, problems: report.problems.slice(0, 50) } },
      { status: 201, headers: { location: `/api/v1/mechanism-checks/${id}` } },
    );
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);

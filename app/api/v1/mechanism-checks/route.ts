// POST /api/v1/mechanism-checks — queue a check of a mechanism (Cantera YAML or plain text) against the published data
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { readBodyOrThrow } from "@/lib/http/read-body";
import { MAX_MECHANISM_BYTES } from "@/lib/mechanisms/limits";
import { mechanismWindowSchema } from "@/lib/mechanisms/request";
import { submitMechanismCheck } from "@/lib/mechanisms/run-check";

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
    // Decoding, the pre-check and reading run on a worker thread (lib/mechanisms/request.ts): a file that cannot be
    // read is refused here. Every check then runs as a job, small or large, so callers have one way: 202, then poll
    // the Location until its state is done (the report) or failed (the error).
    const { id, reactions, problems } = await submitMechanismCheck({
      ownerId: user!.id,
      input: { bytes, json, name: q.get("name"), window, format: (format ?? "auto") as "auto" },
    });
    return NextResponse.json(
      { data: { id, state: "queued", url: `/mechanisms/${id}`, reactions, problems: problems.slice(0, 50) } },
      { status: 202, headers: { location: `/api/v1/mechanism-checks/${id}` } },
    );
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);

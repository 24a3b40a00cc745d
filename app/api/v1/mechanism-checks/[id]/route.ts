// GET /api/v1/mechanism-checks/:id — one check: its state and progress, then its report (owner, or anyone with its share token); ?format=json|csv|mapping downloads
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { readableMechanismCheckOrThrow } from "@/lib/mechanisms/access";
import { mechanismReportCsv } from "@/lib/mechanisms/export";
import { speciesMappingCsv } from "@/lib/mechanisms/mapping";
import { describeProgress } from "@/lib/mechanisms/progress";
import type { MechanismReport } from "@/lib/mechanisms/run-check";

export const GET = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const id = parseIdOrThrow(params.id, "mechanism check");
    const url = new URL(req.url);
    const check = await readableMechanismCheckOrThrow({ id, user, share: url.searchParams.get("share") });
    const asked = url.searchParams.get("format");
    const format = asked ?? "json";
    if (format !== "json" && format !== "csv" && format !== "mapping")
      throw new AppError("bad_request", "format must be json, csv or mapping", [
        { pointer: "", parameter: "format", message: "must be json, csv or mapping" },
      ]);
    const headers = { "cache-control": "private, no-store" };
    if (format !== "json") {
      if (!check.report) throw new AppError("conflict", `The check is ${check.state}; its report is not ready.`);
      const report = check.report as unknown as MechanismReport;
      const body = format === "csv" ? mechanismReportCsv(report, check.name) : speciesMappingCsv(report.species, check.name);
      return new NextResponse(body, {
        headers: {
          ...headers,
          "content-type": "text/csv; charset=utf-8",
          "content-disposition": `attachment; filename="mechanism-check-${check.id}${format === "mapping" ? "-species" : ""}.csv"`,
        },
      });
    }
    const { shareToken, ownerId, ...rest } = check;
    const isOwner = user?.id === ownerId;
    // Without a format this is the API's read (and the page's polling); ?format=json is the report's download.
    const download: Record<string, string> =
      asked === "json" ? { "content-disposition": `attachment; filename="mechanism-check-${check.id}.json"` } : {};
    return NextResponse.json(
      {
        data: {
          ...rest,
          progressText: describeProgress(check),
          shared: shareToken !== null,
          ...(isOwner && shareToken ? { shareToken } : {}),
        },
      },
      { headers: { ...headers, ...download } },
    );
  },
  { identify: true, scope: "deposit:read" },
);

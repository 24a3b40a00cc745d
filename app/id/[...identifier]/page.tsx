import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { parseIdentifier } from "@/lib/identifiers/series-code";
import { resolveIdentifier } from "@/lib/identifiers/queries";

export const metadata: Metadata = { title: "Identifier" };
export const dynamic = "force-dynamic";

// /id/10.5072/ARH-4F7K-9QXM[/2] — where an identifier resolves: the version's page, or the series' newest version.
export default async function IdentifierPage({ params }: { params: Promise<{ identifier: string[] }> }) {
  const { identifier } = await params;
  const typed = identifier.map((part) => safeDecode(part)).join("/");
  const parsed = parseIdentifier(typed);
  if (!parsed.ok) {
    // Said before any lookup: the check character alone shows a mistyped code.
    return (
      <article className="space-y-3">
        <h1 className="text-2xl font-semibold">
          {parsed.reason === "mistyped" ? "Mistyped identifier" : "Not an identifier of this repository"}
        </h1>
        <p role="alert">{parsed.message}</p>
        <p className="font-mono text-sm break-all">{typed}</p>
      </article>
    );
  }
  const found = await resolveIdentifier({ identifier: parsed.identifier });
  if (!found) notFound();
  redirect(found.kind === "version" ? `/datasets/${found.datasetId}/v${found.versionNumber}` : `/datasets/${found.datasetId}`);
}

function safeDecode(part: string): string {
  try {
    return decodeURIComponent(part);
  } catch {
    return part;
  }
}

import { resolvedIdentifierPath } from "@/lib/identifiers/paths";
import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { parseIdentifier } from "@/lib/identifiers/series-code";
import { resolveIdentifier } from "@/lib/identifiers/queries";

export async function generateMetadata({ params }: { params: Promise<{ identifier: string[] }> }): Promise<Metadata> {
  const { identifier } = await params;
  const parsed = parseIdentifier(identifier.map((part) => safeDecode(part)).join("/"));
  return { title: parsed.ok ? `Identifier ${parsed.identifier}` : "Not found" };
}
export const dynamic = "force-dynamic";

// /id/10.5072/ARH-4F7K-9QXM[/2] — where an identifier resolves: the version's page, or the series' newest version.
export default async function IdentifierPage({ params }: { params: Promise<{ identifier: string[] }> }) {
  const { identifier } = await params;
  const typed = identifier.map((part) => safeDecode(part)).join("/");
  const parsed = parseIdentifier(typed);
  // Mistyped or malformed: answered 404 (not 200) before any lookup, with the page in not-found.tsx.
  if (!parsed.ok) notFound();
  const found = await resolveIdentifier({ identifier: parsed.identifier });
  if (!found) notFound();
  redirect(resolvedIdentifierPath(found));
}

function safeDecode(part: string): string {
  try {
    return decodeURIComponent(part);
  } catch {
    return part;
  }
}

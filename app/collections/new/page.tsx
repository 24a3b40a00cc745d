import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { readableMechanismCheckOrThrow } from "@/lib/mechanisms/access";
import type { MechanismReport } from "@/lib/mechanisms/run-check";
import { suggestVersionsFromReport } from "@/lib/collections/suggest";
import { listPublicVersionsById } from "@/lib/collections/queries";
import { AppError } from "@/lib/errors";
import { parseIdOrNull } from "@/lib/ids";
import { NewCollectionForm, type OfferedVersion } from "../collection-forms";

export const metadata: Metadata = { title: "New collection" };

type Search = Promise<{ versions?: string | string[]; check?: string | string[] }>;

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

// /collections/new — a new collection; ?check=<id> offers the versions behind a mechanism check's matched
// reactions ("use these"), ?versions=1,2 the versions a page chose; the owner reviews the list before it is made.
export default async function NewCollectionPage({ searchParams }: { searchParams: Search }) {
  const user = await getCurrentUser();
  const query = await searchParams;
  if (!user) {
    const back = `/collections/new?${new URLSearchParams(Object.entries(query).flatMap(([k, v]) => (v === undefined ? [] : [[k, String(one(v))]])))}`;
    redirect(`/sign-in?callbackUrl=${encodeURIComponent(back)}`);
  }
  let offered: OfferedVersion[] = [];
  let defaultTitle = "";
  let from: string | null = null;
  const checkId = parseIdOrNull(one(query.check));
  if (checkId !== null) {
    try {
      const check = await readableMechanismCheckOrThrow({ id: checkId, user, share: null });
      const report = check.report as MechanismReport | null;
      if (report) {
        offered = (await suggestVersionsFromReport(report)).map((s) => ({
          versionId: s.versionId,
          label: `${s.title}, version ${s.number}`,
          detail: `behind ${s.mechanismEquation} (line ${s.line})${s.versionIdentifier ? `, ${s.versionIdentifier}` : ""}`,
        }));
        defaultTitle = `Data behind ${check.name ?? `mechanism check ${check.id}`}`;
        from = check.name ?? `mechanism check ${check.id}`;
      }
    } catch (err) {
      if (!(err instanceof AppError && err.status === 404)) throw err;
    }
  } else {
    const ids = (one(query.versions) ?? "")
      .split(/[\s,]+/)
      .map(parseIdOrNull)
      .filter((id): id is number => id !== null)
      .slice(0, 500);
    offered = (await listPublicVersionsById({ versionIds: ids })).map((v) => ({
      versionId: v.versionId,
      label: `${v.title}, version ${v.number}`,
      detail: v.equation + (v.versionIdentifier ? `, ${v.versionIdentifier}` : ""),
    }));
  }
  return (
    <div className="max-w-3xl space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">New collection</h1>
        {from ? (
          <p>
            These are the published versions behind the consensus of each reaction that {from} matched. Untick any you do not want; you can
            add and remove versions later, until you publish the collection.
          </p>
        ) : (
          <p>A title now; versions from here or later, from a dataset, a reaction, a search or a mechanism check.</p>
        )}
        {checkId !== null && !from && <p className="text-error">That mechanism check is not yours or does not exist.</p>}
      </header>
      <NewCollectionForm offered={offered} defaultTitle={defaultTitle} />
    </div>
  );
}

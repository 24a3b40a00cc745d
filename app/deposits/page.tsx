import type { Metadata } from "next";
import Link from "next/link";
import { DateTime } from "@/components/date-time";
import { ROLE_WORDS } from "@/components/deposit-editor/words";
import { CheckSummaryCell } from "@/components/check-summary";
import { StateLabel } from "@/components/state-label";
import { listCheckSummaries } from "@/lib/curation/queries";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { listMyVersions } from "@/lib/datasets/queries";
import { ScrollRegion } from "@/components/scroll-region";
import { formatRange } from "@/lib/format";

export const metadata: Metadata = { title: "My deposits" };

export default async function MyDepositsPage() {
  const user = await requirePagePermission("dataset.deposit", "/deposits");
  const versions = (await listMyVersions({ userId: user.id })).sort((a, b) => b.updatedAt.getTime() - a.updatedAt.getTime());
  const checks = await listCheckSummaries(versions.map((v) => v.id));
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-4">
        <div className="space-y-1">
          <h1 className="text-3xl font-semibold">My deposits</h1>
          <p className="text-sm text-muted">The datasets you own or co-edit, each at its newest version.</p>
        </div>
        <Link href="/deposits/new" className="btn-primary no-underline hover:no-underline">
          New deposit
        </Link>
      </header>
      {versions.length === 0 ? (
        <div className="card space-y-2">
          <p>You have no datasets yet.</p>
          <p className="text-sm text-muted">
            Start a <Link href="/deposits/new">new deposit</Link>: paste or upload a table of temperatures and rate constants, describe the
            reaction and where the numbers come from, and save it as a draft. Nothing is public until a curator accepts it.
          </p>
        </div>
      ) : (
        <ScrollRegion label="Your datasets" className="card p-0">
          <table className="table">
            <caption className="sr-only">Your datasets, most recently changed first</caption>
            <thead>
              <tr>
                <th scope="col">Title</th>
                <th scope="col">Version</th>
                <th scope="col">State</th>
                <th scope="col">Your role</th>
                <th scope="col">Checks</th>
                <th scope="col" className="text-right">
                  Points
                </th>
                <th scope="col">Temperatures</th>
                <th scope="col">Last change</th>
              </tr>
            </thead>
            <tbody>
              {versions.map((v) => (
                <tr key={v.id}>
                  <td className="max-w-md">
                    <Link href={`/deposits/${v.id}`}>{v.title || "Untitled"}</Link>
                  </td>
                  <td>v{v.number}</td>
                  <td>
                    <StateLabel state={v.state} />
                  </td>
                  <td>{ROLE_WORDS[v.role]}</td>
                  <td>
                    <CheckSummaryCell summary={checks.get(v.id)} href={`/deposits/${v.id}#checks-of-last-save`} />
                  </td>
                  <td className="text-right tabular-nums">{v.pointCount.toLocaleString("en")}</td>
                  <td className="whitespace-nowrap">{formatRange(v.tMin, v.tMax, "K")}</td>
                  <td className="whitespace-nowrap">
                    <DateTime value={v.updatedAt} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
    </div>
  );
}

import type { Metadata } from "next";
import { DateTime } from "@/components/date-time";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { getQueueCounts, listTroubledJobs } from "@/lib/jobs/queries";
import { RetryButton } from "./retry-button";
import { ScrollRegion } from "@/components/scroll-region";

export const metadata: Metadata = { title: "Background jobs" };
export const dynamic = "force-dynamic";

const queueWords: Record<string, string> = {
  mail: "Outgoing mail",
  "register-identifier": "Identifier registration",
  refit: "Re-fits after an engine change",
  "search-sync": "Search index updates (Meilisearch)",
};

export default async function JobsPage() {
  await requirePagePermission("job.read", "/admin/jobs");
  const [counts, troubled] = await Promise.all([getQueueCounts(), listTroubledJobs()]);
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-3xl font-semibold">Background jobs</h1>
        <p className="text-sm text-muted">Failed jobs are retried with growing delays; those that ran out of retries wait here for you.</p>
      </header>
      <ScrollRegion label="Job queues" className="card p-0">
        <table className="table">
          <thead>
            <tr>
              <th scope="col">Queue</th>
              <th scope="col">Waiting</th>
              <th scope="col">Retrying</th>
              <th scope="col">Running</th>
              <th scope="col">Done</th>
              <th scope="col">Failed</th>
            </tr>
          </thead>
          <tbody>
            {counts.map((c) => (
              <tr key={c.name}>
                <th scope="row" className="text-left font-medium">
                  {queueWords[c.name] ?? c.name}
                </th>
                <td>{c.created}</td>
                <td>{c.retry}</td>
                <td>{c.active}</td>
                <td>{c.completed}</td>
                <td className={c.failed ? "font-semibold text-error" : undefined}>{c.failed}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
      <section aria-labelledby="troubled-heading" className="space-y-3">
        <h2 id="troubled-heading" className="text-xl font-semibold">
          Failing or retrying
        </h2>
        {troubled.length === 0 ? (
          <p className="card text-sm">Nothing is failing.</p>
        ) : (
          <ScrollRegion label="Failed jobs" className="card p-0">
            <table className="table">
              <thead>
                <tr>
                  <th scope="col">Queue</th>
                  <th scope="col">About</th>
                  <th scope="col">State</th>
                  <th scope="col">Tries</th>
                  <th scope="col">Last error</th>
                  <th scope="col">Next try</th>
                  <th scope="col">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {troubled.map((j) => (
                  <tr key={j.id}>
                    <td>{queueWords[j.name] ?? j.name}</td>
                    <td className="max-w-64 break-words">{j.summary}</td>
                    <td>{j.state === "retry" ? "retrying" : "failed"}</td>
                    <td>
                      {j.retryCount} of {j.retryLimit}
                    </td>
                    <td className="max-w-80 break-words font-mono text-xs">{j.error ?? "—"}</td>
                    <td className="whitespace-nowrap">{j.state === "retry" ? <DateTime value={j.startAfter} /> : "—"}</td>
                    <td>{j.state === "failed" && <RetryButton queue={j.name} id={j.id} />}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        )}
      </section>
    </div>
  );
}

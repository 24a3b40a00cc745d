import type { Metadata } from "next";
import { z } from "zod";
import { requirePagePermission } from "@/lib/auth/page-guard";
import Link from "next/link";
import { QUEUE_SORTS, countReviewQueue, listCheckSummaries, listReviewQueue } from "@/lib/curation/queries";
import { REACTION_CLASSES } from "@/lib/deposits";
import { formatWaiting } from "@/lib/format";
import { QueueTable } from "./queue-table";

export const metadata: Metadata = { title: "Review queue" };

const flagOptions = [
  "unbalanced",
  "implausible_magnitude",
  "outlier",
  "curvature",
  "reported_fit_disagrees",
  "excess_scatter",
  "narrow_range",
] as const;

const queueParams = z.object({
  // "waiting": waiting for a curator (submitted or in review). A returned version waits for its
  // authors and is listed only under "returned". An old "all" address reads as "waiting".
  state: z.enum(["waiting", "submitted", "in_review", "returned"]).catch("waiting"),
  // Filters are closed lists: anything else (including text the database cannot hold) shows every row.
  class: z
    .enum(REACTION_CLASSES.map((c) => c.id) as [string, ...string[]])
    .optional()
    .catch(undefined),
  flag: z.enum(flagOptions).optional().catch(undefined),
  older: z.coerce.number().int().min(0).max(3650).optional().catch(undefined),
  sort: z.enum(QUEUE_SORTS).catch("submitted"),
  dir: z.enum(["asc", "desc"]).catch("asc"),
  page: z.coerce.number().int().min(1).catch(1),
});

export default async function ReviewQueuePage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  await requirePagePermission("dataset.review", "/review");
  const q = queueParams.parse(await searchParams);
  const filters = { reactionClass: q.class || undefined, flag: q.flag || undefined, olderThanDays: q.older || undefined };
  const [result, counts] = await Promise.all([
    listReviewQueue({ ...filters, states: q.state === "waiting" ? undefined : [q.state], sort: q.sort, direction: q.dir, page: q.page }),
    countReviewQueue(filters),
  ]);
  const checks = await listCheckSummaries(result.rows.map((r) => r.versionId));
  const withAuthors = q.state === "returned";
  const groupHref = (state: string) => {
    const p = new URLSearchParams();
    // The other group with the same filters and order, from its first page.
    for (const [k, v] of Object.entries({ state, class: q.class, flag: q.flag, older: q.older, sort: q.sort, dir: q.dir }))
      if (v) p.set(k, String(v));
    return `/review?${p.toString()}`;
  };
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-3xl font-semibold">Review queue</h1>
        <p className="text-sm text-muted">
          Versions submitted for review, with their checks already run. Oldest first unless you sort otherwise.
        </p>
      </header>
      <nav aria-label="Whom the versions wait for" className="flex flex-wrap gap-2 text-sm">
        <Link
          href={groupHref("waiting")}
          aria-current={withAuthors ? undefined : "page"}
          className={`rounded-md border px-3 py-1.5 ${withAuthors ? "border-line" : "border-ink font-semibold no-underline"}`}
        >
          Waiting for a curator ({counts.waiting}: {counts.submitted} not taken yet, {counts.inReview} in review)
        </Link>
        <Link
          href={groupHref("returned")}
          aria-current={withAuthors ? "page" : undefined}
          className={`rounded-md border px-3 py-1.5 ${withAuthors ? "border-ink font-semibold no-underline" : "border-line"}`}
        >
          With the authors ({counts.returned} returned for revision)
        </Link>
      </nav>
      <form method="get" className="card flex flex-wrap items-end gap-4 py-4" aria-label="Filter the queue">
        <label className="space-y-1 text-sm">
          <span className="block font-medium">State</span>
          <select name="state" defaultValue={q.state} className="field-input">
            <option value="waiting">waiting for a curator ({counts.waiting})</option>
            <option value="submitted">submitted, not taken yet ({counts.submitted})</option>
            <option value="in_review">in review ({counts.inReview})</option>
            <option value="returned">returned, with the authors ({counts.returned})</option>
          </select>
        </label>
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Reaction class</span>
          <select name="class" defaultValue={q.class ?? ""} className="field-input">
            <option value="">any</option>
            {REACTION_CLASSES.map((c) => (
              <option key={c.id} value={c.id}>
                {c.label}
              </option>
            ))}
          </select>
        </label>
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Has check</span>
          <select name="flag" defaultValue={q.flag ?? ""} className="field-input">
            <option value="">any</option>
            {flagOptions.map((f) => (
              <option key={f} value={f}>
                {f.replace(/_/g, " ")}
              </option>
            ))}
          </select>
        </label>
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Waiting at least (days)</span>
          <input name="older" type="number" min={0} defaultValue={q.older ?? ""} className="field-input w-28" />
        </label>
        <input type="hidden" name="sort" value={q.sort} />
        <input type="hidden" name="dir" value={q.dir} />
        <button type="submit" className="btn-secondary">
          Apply filters
        </button>
      </form>
      <QueueTable
        rows={result.rows.map((r) => ({
          ...r,
          submittedAt: r.submittedAt?.toISOString() ?? null,
          waiting: r.waitingSeconds !== null ? formatWaiting(r.waitingSeconds * 1000) : "—",
          withAuthorsFor: r.returnedSeconds !== null ? formatWaiting(r.returnedSeconds * 1000) : null,
          checks: checks.get(r.versionId),
        }))}
        withAuthors={withAuthors}
        total={result.total}
        page={result.page}
        pageSize={result.pageSize}
        sort={q.sort}
        direction={q.dir}
      />
    </div>
  );
}

import "server-only";
import { asc, inArray, lte, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { searchOutbox } from "@/db/search-outbox";
import { jobRetryDelaySeconds, meilisearchConfig } from "@/lib/config";
import { getSender, jobsInTransaction } from "@/lib/jobs/boss";
import { meiliIndex, waitForSuccess } from "@/lib/search/meili/client";
import { loadSearchDocuments } from "@/lib/search/queries";
import { toIndexedDocument } from "@/lib/search/meili/index-settings";
import type { SearchDocument } from "@/lib/search/types";

/** The pg-boss queue whose job drains the outbox (policy "short": at most one waiting). */
export const SEARCH_SYNC_QUEUE = "search-sync";

/** Longest wait between two attempts at a row that could not be delivered. */
const MAX_BACKOFF_SECONDS = 3600;
/** Lock id of the one drainer at a time (so two drains never send states of one version out of order). */
const DRAIN_LOCK = 7_314_021;

/**
 * Records that a version's (or a batch of versions') searchable state changed, inside the transaction of the change: a row
 * per public version of its dataset (a new version also changes which one is the newest), and a
 * search-sync job. Nothing when no Meilisearch service is configured (PostgreSQL keeps its own
 * documents in the same transaction).
 */
export async function recordSearchChange(tx: Transaction, versionIds: number | readonly number[]): Promise<void> {
  if (!meilisearchConfig()) return;
  const ids = `{${(typeof versionIds === "number" ? [versionIds] : versionIds).map((id) => Math.trunc(Number(id))).join(",")}}`;
  await tx.execute(sql`
    insert into search_outbox (version_id)
    select v.id from dataset_versions v
    where v.dataset_id in (select dataset_id from dataset_versions where id = any(${ids}::int[]))
      and (v.id = any(${ids}::int[]) or v.state in ('published', 'retracted'))
    order by v.id`);
  const boss = await getSender();
  await boss.send(SEARCH_SYNC_QUEUE, {}, { db: jobsInTransaction(tx) });
}

/** The current search documents of these versions; a version missing from the answer is no longer searchable. */
export type DocumentLoader = (versionIds: number[]) => Promise<SearchDocument[]>;

export interface DrainOutcome {
  /** Documents written and deleted in the service. */
  written: number;
  deleted: number;
  /** Outbox rows confirmed and removed. */
  confirmed: number;
  /** Rows that could not be delivered this time (they wait their back-off). */
  postponed: number;
  error: string | null;
}

/**
 * Sends every due outbox row to Meilisearch, batch by batch, until none is due or the service
 * fails. Each batch sends the versions' current documents (or deletes the ones no longer public),
 * waits until the service reports its tasks succeeded, and only then deletes exactly the rows it
 * read; a change that arrives meanwhile keeps its own row for the next batch, so the last state
 * always wins. On failure the batch's rows stay and wait 2^attempts × JOB_RETRY_DELAY_SECONDS (at
 * most an hour). One drainer at a time (a transaction-scoped advisory lock).
 */
export async function drainSearchOutbox({
  loadDocuments = loadSearchDocuments,
  batchSize = 500,
  retryDelaySeconds = jobRetryDelaySeconds(),
}: {
  loadDocuments?: DocumentLoader;
  batchSize?: number;
  retryDelaySeconds?: number;
} = {}): Promise<DrainOutcome> {
  const outcome: DrainOutcome = { written: 0, deleted: 0, confirmed: 0, postponed: 0, error: null };
  const config = meilisearchConfig();
  if (!config) return outcome;
  const { client, index } = meiliIndex(config);
  for (;;) {
    const done = await getDb().transaction(async (tx) => {
      const [{ locked }] = await tx.execute<{ locked: boolean }>(sql`select pg_try_advisory_xact_lock(${DRAIN_LOCK}) as locked`);
      if (!locked) return true;
      const rows = await tx
        .select({ id: searchOutbox.id, versionId: searchOutbox.versionId })
        .from(searchOutbox)
        .where(lte(searchOutbox.nextAttemptAt, sql`now()`))
        .orderBy(asc(searchOutbox.id))
        .limit(batchSize)
        .for("update", { skipLocked: true });
      if (!rows.length) return true;
      const ids = rows.map((r) => r.id);
      const versionIds = [...new Set(rows.map((r) => r.versionId))];
      try {
        const docs = await loadDocuments(versionIds);
        const present = new Set(docs.map((d) => d.versionId));
        const gone = versionIds.filter((v) => !present.has(v)).map(String);
        if (docs.length) await waitForSuccess(client, index.addDocuments(docs.map(toIndexedDocument), { primaryKey: "id" }));
        if (gone.length) await waitForSuccess(client, index.deleteDocuments(gone));
        await tx.delete(searchOutbox).where(inArray(searchOutbox.id, ids));
        outcome.written += docs.length;
        outcome.deleted += gone.length;
        outcome.confirmed += ids.length;
        return rows.length < batchSize;
      } catch (err) {
        outcome.error = err instanceof Error ? err.message : String(err);
        outcome.postponed += ids.length;
        await tx
          .update(searchOutbox)
          .set({
            attempts: sql`${searchOutbox.attempts} + 1`,
            nextAttemptAt: sql`now() + least(${MAX_BACKOFF_SECONDS}, ${retryDelaySeconds} * power(2, ${searchOutbox.attempts})) * interval '1 second'`,
            lastError: outcome.error.slice(0, 2000),
          })
          .where(inArray(searchOutbox.id, ids));
        return true;
      }
    });
    if (done) return outcome;
  }
}

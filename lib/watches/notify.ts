import "server-only";
import { getDb, type Transaction } from "@/db/client";
import { getSender, jobsInTransaction, retryPolicy } from "@/lib/jobs/boss";
import { enqueueMail } from "@/lib/mail/queue";
import { watchDigestMail, watchEventMail, type WatchEvent, type WatchNews } from "@/lib/mail/watch-templates";
import {
  getNoticeVersion,
  listDigestRecipients,
  listSupersededMembers,
  listWatchersOfVersion,
  markNoticesMailed,
  recordNotice,
  takeWaitingNotices,
} from "./queries";
import { signStopToken } from "./token";

/** The queue whose job tells the watchers of one event; the daily digest's queue. */
export const WATCH_NOTIFY_QUEUE = "watch-notify";
export const WATCH_DIGEST_QUEUE = "watch-digest";
/** When the digest goes out: every day at 06:00 UTC (cron). */
export const WATCH_DIGEST_CRON = "0 6 * * *";

export interface WatchJob {
  versionId: number;
  event: WatchEvent;
  /** ISO time of the event: a notice is unique per person, version, event and time. */
  at: string;
}

/**
 * Queues the telling of an event. With `tx`, inside the transaction of the change: the job exists
 * exactly when the publication or retraction commits, and the request never waits for the mail.
 */
export async function queueWatchNotice(job: WatchJob, { tx }: { tx?: Transaction } = {}): Promise<void> {
  const boss = await getSender();
  await boss.send(WATCH_NOTIFY_QUEUE, job, { ...retryPolicy, ...(tx ? { db: jobsInTransaction(tx) } : {}) });
}

/** What a mail says of one version (from its current public state, read when the job runs). */
async function newsOf(versionId: number, event: WatchEvent): Promise<WatchNews | null> {
  const version = await getNoticeVersion({ versionId });
  // Only what the public may see is ever told: a version that is not (or no longer) public is news to nobody.
  if (!version || (version.state !== "published" && version.state !== "retracted")) return null;
  return { event, version };
}

/**
 * Tells every watcher of one event: a mail each (one per person however many of their watches it
 * touches), or a notice kept for the person's daily digest. Safe to run twice: a person already
 * told of this event is skipped.
 */
export async function notifyWatchers(job: WatchJob): Promise<{ mailed: number; kept: number }> {
  const news = await newsOf(job.versionId, job.event);
  if (!news) return { mailed: 0, kept: 0 };
  const watchers = await listWatchersOfVersion({ versionId: job.versionId, event: job.event });
  let mailed = 0;
  let kept = 0;
  // A new version supersedes the older ones that collections hold: their owners and watchers hear of each.
  if (job.event === "published")
    for (const older of await listSupersededMembers({ versionId: job.versionId })) {
      const told = await notifyWatchers({ versionId: older, event: "superseded", at: job.at });
      mailed += told.mailed;
      kept += told.kept;
    }
  for (const w of watchers) {
    await getDb().transaction(async (tx) => {
      const fresh = await recordNotice(tx, {
        userId: w.userId,
        versionId: job.versionId,
        event: job.event,
        eventAt: new Date(job.at),
        reasons: w.reasons,
        mailed: !w.dailyDigest,
      });
      if (!fresh) return;
      if (w.dailyDigest) {
        kept += 1;
        return;
      }
      const stops = w.reasons.map((r) => ({ label: r.label, token: signStopToken(r.watchId, w.userId) }));
      await enqueueMail(watchEventMail({ to: w.email, name: w.name, news, reasons: w.reasons.map((r) => r.label), stops }), { tx });
      mailed += 1;
    });
  }
  return { mailed, kept };
}

/** Sends each person with waiting notices one digest of them. */
export async function sendWatchDigests(): Promise<{ digests: number }> {
  let digests = 0;
  for (const userId of await listDigestRecipients()) {
    await getDb().transaction(async (tx) => {
      const notices = await takeWaitingNotices(tx, { userId });
      if (notices.length === 0) return;
      const { email, name, active } = notices[0];
      const items: { news: WatchNews; reasons: string[] }[] = [];
      for (const n of notices) {
        const news = await newsOf(n.versionId, n.event as WatchEvent);
        if (news) items.push({ news, reasons: n.reasons.map((r) => r.label) });
      }
      // An account closed meanwhile, or nothing left that is public: the notices are settled, nothing is sent.
      if (active && items.length > 0) {
        const stops = [...new Map(notices.flatMap((n) => n.reasons).map((r) => [r.watchId, r.label])).entries()].map(
          ([watchId, label]) => ({
            label,
            token: signStopToken(watchId, userId),
          }),
        );
        await enqueueMail(watchDigestMail({ to: email, name, items, stops }), { tx });
        digests += 1;
      }
      await markNoticesMailed(
        tx,
        notices.map((n) => n.id),
      );
    });
  }
  return { digests };
}

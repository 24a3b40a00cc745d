import { describe, expect, it } from "vitest";
import { POST as stopRoute } from "@/app/api/watches/stop/route";
import { addCollectionMembers, createCollection, publishCollection } from "@/lib/collections/queries";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset, startNextVersion } from "@/lib/datasets/deposits";
import { notifyWatchers, sendWatchDigests } from "@/lib/watches/notify";
import { addWatch, isWatching, listWatches, setDailyDigest } from "@/lib/watches/queries";
import { createUser } from "@/lib/users/queries";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { sql, uniqueEmail } from "./helpers";

const person = (tag: string, role: "researcher" | "curator" = "researcher") =>
  createUser({ email: uniqueEmail(tag), name: `Follower ${tag}`, passwordHash: "x", role, verified: true });

/** The mails queued to one address (the worker is not running: they wait in the mail queue). */
const mailsTo = async (to: string) =>
  (await sql`select data from pgboss.job where name = 'mail' and data->>'to' = ${to} order by created_on`).map(
    (r) => r.data as { subject: string; text: string; headers?: Record<string, string> },
  );

describe("a collection's owner and watchers hear when a member is retracted or superseded", () => {
  it("mails the owner and a watcher naming the collection, the version, the reason and what replaces it; digest readers get it once; the stop link works", async () => {
    const owner = await person("fo");
    const watcher = await person("fw");
    const digestReader = await person("fd");
    const curator = await person("fc", "curator");
    const publish = async (versionId: number, by: number) => {
      await applyTransition({ versionId, actorId: by, transition: "submit" });
      await applyTransition({ versionId, actorId: curator.id, transition: "accept", reason: "Consistent." });
    };
    const a = await depositNewDataset({
      actor: owner,
      document: labelledAlkaneDeposit({ title: "Followed alkane A", name: "followed alkane 31", carbons: 31 }),
    });
    await publish(a.id, owner.id);
    const b = await depositNewDataset({
      actor: owner,
      document: labelledAlkaneDeposit({ title: "Followed alkane B", name: "followed alkane 32", carbons: 32 }),
    });
    await publish(b.id, owner.id);

    const { id } = await createCollection({ ownerId: owner.id, title: "Release 3 data", description: "", members: [{ versionId: a.id }] });
    // A draft collection cannot be watched by others: it is not public.
    await expect(addWatch({ userId: watcher.id, subject: { kind: "collection", id } })).rejects.toMatchObject({ code: "not_found" });
    await addCollectionMembers({ collectionId: id, actorId: owner.id, members: [{ versionId: b.id, note: "used for R4" }] });
    await publishCollection({ collectionId: id, actorId: owner.id });
    await addWatch({ userId: watcher.id, subject: { kind: "collection", id } });
    await addWatch({ userId: digestReader.id, subject: { kind: "collection", id } });
    await setDailyDigest({ userId: digestReader.id, dailyDigest: true });
    // The owner watches their collection from its creation; the watch list shows it.
    expect((await listWatches({ userId: owner.id })).map((w) => [w.kind, w.label, w.collectionId])).toEqual([
      ["collection", "the collection “Release 3 data”", id],
    ]);

    // Retraction of a member: the job queued in the retracting transaction tells the owner and the watcher.
    await applyTransition({ versionId: b.id, actorId: curator.id, transition: "retract", reason: "Wrong bath gas." });
    const [job] = await sql`select data from pgboss.job where name = 'watch-notify' and (data->>'versionId')::int = ${b.id}
      and data->>'event' = 'retracted'`;
    expect(job).toBeDefined();
    expect(await notifyWatchers(job.data as { versionId: number; event: "retracted"; at: string })).toEqual({ mailed: 2, kept: 1 });
    for (const to of [owner.email, watcher.email]) {
      const [mail] = await mailsTo(to);
      expect(mail.subject).toBe("Retracted: Followed alkane B (version 1)");
      expect(mail.text).toContain("The reason given: Wrong bath gas. No newer version of the dataset replaces it.");
      expect(mail.text).toContain("You hear of it because you watch the collection “Release 3 data”.");
      expect(mail.text).toMatch(/To stop watching the collection “Release 3 data”: http\S+\/watches\/stop\?token=/);
      // One watch behind the mail: the one-click stop header (RFC 8058).
      expect(mail.headers?.["List-Unsubscribe-Post"]).toBe("List-Unsubscribe=One-Click");
    }

    // Superseded: a new version of member A is published.
    const next = await startNextVersion({ actor: owner, versionId: a.id });
    await publish(next.id, owner.id);
    const at = new Date().toISOString();
    expect(await notifyWatchers({ versionId: next.id, event: "published", at })).toMatchObject({ mailed: 2, kept: 1 });
    // Run twice (a retried job): nobody is told twice.
    await notifyWatchers({ versionId: next.id, event: "published", at });
    const superseded = (await mailsTo(watcher.email)).filter((m) => m.subject.startsWith("Superseded"));
    expect(superseded).toHaveLength(1);
    expect(superseded[0].subject).toBe("Superseded: Followed alkane A (version 1)");
    expect(superseded[0].text).toContain("Version 1 of “Followed alkane A”");
    expect(superseded[0].text).toContain("version 2 (“Followed alkane A”) was published and replaces it");
    expect(superseded[0].text).toContain("because you watch the collection “Release 3 data”");

    // The digest reader gets both events in one mail.
    await sendWatchDigests();
    const digests = await mailsTo(digestReader.email);
    expect(digests).toHaveLength(1);
    expect(digests[0].text).toContain("Version 1 of “Followed alkane B”");
    expect(digests[0].text).toContain("Version 1 of “Followed alkane A”");
    expect(digests[0].text).toContain("is superseded");

    // The stop link ends the watcher's collection watch.
    const token = /watches\/stop\?token=(\S+)/.exec(superseded[0].text)![1];
    const stopped = await stopRoute(new Request(`http://127.0.0.1/api/watches/stop?token=${token}`, { method: "POST" }), {
      params: Promise.resolve({}),
    });
    expect(await stopped.json()).toEqual({ stopped: true });
    expect(await isWatching({ userId: watcher.id, subject: { kind: "collection", id } })).toBe(false);
  });
});

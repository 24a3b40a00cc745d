import { describe, expect, it } from "vitest";
import { POST as stopRoute } from "@/app/api/watches/stop/route";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { AppError } from "@/lib/errors";
import { createUser } from "@/lib/users/queries";
import { notifyWatchers, sendWatchDigests } from "@/lib/watches/notify";
import { addWatch, isWatching, listWatches, removeWatch, setDailyDigest } from "@/lib/watches/queries";
import { readStopToken, signStopToken } from "@/lib/watches/token";
import { labelledAlkaneDeposit } from "../fixtures/labelled-alkane-deposit";
import { sql, uniqueEmail } from "./helpers";

const person = (tag: string, extra: { verified?: boolean } = {}) =>
  createUser({ email: uniqueEmail(tag), name: `Watcher ${tag}`, passwordHash: "x", verified: extra.verified ?? true });

/** The mails queued to one address (the worker is not running: they wait in the mail queue). */
const mailsTo = async (to: string) =>
  (await sql`select data from pgboss.job where name = 'mail' and data->>'to' = ${to} order by created_on`).map(
    (r) => r.data as { subject: string; text: string; headers?: Record<string, string> },
  );

async function publish(versionId: number, ownerId: number, curatorId: number) {
  await applyTransition({ versionId, actorId: ownerId, transition: "submit" });
  await applyTransition({ versionId, actorId: curatorId, transition: "accept", reason: "Consistent." });
}

describe("watches and the mail they cause", () => {
  it("tells each watcher once per event (one mail however many watches), keeps digest readers' news for the day, and stops by a signed link", async () => {
    const owner = await person("wo");
    const curator = await createUser({
      email: uniqueEmail("wc"),
      name: "Watch Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const document = labelledAlkaneDeposit({ title: "Watched alkane A", name: "watched pentacosane", carbons: 25 });
    const a = await depositNewDataset({ actor: owner, document });
    const [row] = await sql`select v.reaction_id, v.dataset_id from dataset_versions v where v.id = ${a.id}`;
    const reactionId = Number(row.reaction_id);
    const [alkane] = await sql`select s.inchi_key from reaction_participants rp join species s on s.id = rp.species_id
      where rp.reaction_id = ${reactionId} and rp.side = 'reactant' and s.inchi_key <> 'TUJKJAMUKRIRHC-UHFFFAOYSA-N'`;
    const inchiKey = alkane.inchi_key as string;

    // Before anything is public there is nothing to watch, and saying so reveals nothing.
    const early = await person("we");
    await expect(addWatch({ userId: early.id, subject: { kind: "reaction", id: reactionId } })).rejects.toMatchObject({
      code: "not_found",
    });
    await expect(addWatch({ userId: early.id, subject: { kind: "dataset", id: a.datasetId } })).rejects.toBeInstanceOf(AppError);
    await publish(a.id, owner.id, curator.id);
    // The publication queued the telling of it in its own transaction.
    const [queued] =
      await sql`select count(*)::int as n from pgboss.job where name = 'watch-notify' and (data->>'versionId')::int = ${a.id}`;
    expect(queued.n).toBe(1);

    const both = await person("wb");
    const digest = await person("wd");
    const unconfirmed = await person("wu", { verified: false });
    await addWatch({ userId: both.id, subject: { kind: "reaction", id: reactionId } });
    await addWatch({ userId: both.id, subject: { kind: "species", inchiKey } });
    await addWatch({ userId: both.id, subject: { kind: "species", inchiKey } }); // twice: still one watch
    await addWatch({ userId: digest.id, subject: { kind: "dataset", id: a.datasetId } });
    await addWatch({ userId: digest.id, subject: { kind: "reaction", id: reactionId } });
    await setDailyDigest({ userId: digest.id, dailyDigest: true });
    await addWatch({ userId: unconfirmed.id, subject: { kind: "reaction", id: reactionId } });
    expect((await listWatches({ userId: both.id })).map((w) => w.kind).sort()).toEqual(["reaction", "species"]);
    expect(await isWatching({ userId: both.id, subject: { kind: "species", inchiKey } })).toBe(true);

    // A second dataset of the reaction is published: news for the reaction and species watchers.
    const b = await depositNewDataset({ actor: owner, document: { ...document, title: "Watched alkane B" } });
    await publish(b.id, owner.id, curator.id);
    const at = new Date().toISOString();
    expect(await notifyWatchers({ versionId: b.id, event: "published", at })).toEqual({ mailed: 1, kept: 1 });
    expect(await notifyWatchers({ versionId: b.id, event: "published", at })).toEqual({ mailed: 0, kept: 0 });
    const [published] = await mailsTo(both.email);
    expect(published.subject).toBe("New on Arrhenia: Watched alkane B (version 1)");
    expect(published.text).toMatch(/You hear of it because you watch the reaction .+ and the species /);
    expect(published.text).toMatch(/To stop watching the species .+: http\S+\/watches\/stop\?token=/);
    expect(published.headers).toBeUndefined(); // two watches behind it: no single one-click stop
    expect(await mailsTo(digest.email)).toEqual([]);
    expect(await mailsTo(unconfirmed.email)).toEqual([]);

    // Retracted: the reason, and that nothing replaces it.
    await applyTransition({ versionId: b.id, actorId: curator.id, transition: "retract", reason: "Wrong pressure units." });
    await notifyWatchers({ versionId: b.id, event: "retracted", at: new Date().toISOString() });
    const retracted = (await mailsTo(both.email)).at(-1)!;
    expect(retracted.subject).toBe("Retracted: Watched alkane B (version 1)");
    expect(retracted.text).toContain("The reason given: Wrong pressure units. No newer version of the dataset replaces it.");

    // The digest reader gets both events in one mail, once.
    const sent = await sendWatchDigests();
    expect(sent.digests).toBeGreaterThanOrEqual(1);
    const digests = await mailsTo(digest.email);
    expect(digests).toHaveLength(1);
    expect(digests[0].subject).toBe("Arrhenia: 2 changes to what you watch");
    expect(digests[0].text).toContain("“Watched alkane B”, version 1, was published");
    expect(digests[0].text).toContain("Version 1 of “Watched alkane B”");
    await sendWatchDigests();
    expect(await mailsTo(digest.email)).toHaveLength(1);

    // Stop links: signed for one watch of one person; an altered one changes nothing.
    const [speciesWatch] = (await listWatches({ userId: both.id })).filter((w) => w.kind === "species");
    const token = signStopToken(speciesWatch.id, both.id);
    expect(readStopToken(token)).toEqual({ watchId: speciesWatch.id, userId: both.id });
    expect(readStopToken(signStopToken(speciesWatch.id, digest.id).replace(/^\d+/, String(speciesWatch.id + 1)))).toBeNull();
    expect(readStopToken(`0${token}`)).toBeNull(); // one link, one spelling
    const bad = await stopRoute(
      new Request(`http://127.0.0.1/api/watches/stop?token=${encodeURIComponent(token.slice(0, -2))}`, { method: "POST" }),
      {
        params: Promise.resolve({}),
      },
    );
    expect(bad.status).toBe(400);
    expect(await isWatching({ userId: both.id, subject: { kind: "species", inchiKey } })).toBe(true);
    const ok = await stopRoute(new Request(`http://127.0.0.1/api/watches/stop?token=${encodeURIComponent(token)}`, { method: "POST" }), {
      params: Promise.resolve({}),
    });
    expect(await ok.json()).toEqual({ stopped: true });
    expect(await isWatching({ userId: both.id, subject: { kind: "species", inchiKey } })).toBe(false);
    // A mail from one watch carries the one-click stop header (RFC 8058).
    const c = await depositNewDataset({ actor: owner, document: { ...document, title: "Watched alkane C" } });
    await publish(c.id, owner.id, curator.id);
    await notifyWatchers({ versionId: c.id, event: "published", at: new Date().toISOString() });
    const single = (await mailsTo(both.email)).at(-1)!;
    expect(single.subject).toBe("New on Arrhenia: Watched alkane C (version 1)");
    expect(single.headers).toEqual({
      "List-Unsubscribe": expect.stringMatching(/^<http\S+\/api\/watches\/stop\?token=[^>]+>$/),
      "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
    });
    await removeWatch({ userId: both.id, subject: { kind: "reaction", id: reactionId } });
    expect(await listWatches({ userId: both.id })).toEqual([]);
  });
});

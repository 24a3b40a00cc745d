import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { transitionVersion } from "@/lib/datasets/deposits";
import { getRegistrationSubject } from "@/lib/identifiers/queries";
import { buildRegistrationBody } from "@/lib/identifiers/register";
import { createDatasetDraft, type AnalysisSummary, type StoredPoint } from "@/lib/datasets/queries";
import { startFakeDoiService, type FakeDoiService } from "@/lib/identifiers/fake-service";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { registerIdentifier, registerPendingIdentifiers } from "@/lib/identifiers/register";
import { startWorkers } from "@/lib/jobs/worker";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

const points: StoredPoint[] = [
  { T: 300, k: 6.4e-15, original: { T: 300, k: 6.4e-15 } },
  { T: 400, k: 4.1e-14, original: { T: 400, k: 4.1e-14 } },
];
const analysis: AnalysisSummary = { engineVersion: "test", result: { flags: [] }, checks: [] };
const payload = {
  title: "OH + CH4 rate constants, 300–400 K",
  description: "Flash photolysis, resonance fluorescence.",
  creators: [{ name: "Okafor, Maren", orcid: "0000-0002-1825-0097" }],
  license: "CC-BY-4.0",
  source: { doi: "10.5555/example.123" },
};

let owner: UserDto, curator: UserDto;
let fake: FakeDoiService;
const saved = { url: process.env.DOI_API_URL, user: process.env.DOI_API_USER };

beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("doi-owner"), name: "Owner", passwordHash: "x", role: "researcher", verified: true });
  curator = await createUser({ email: uniqueEmail("doi-curator"), name: "Curator", passwordHash: "x", role: "curator", verified: true });
  fake = await startFakeDoiService({ port: 0 });
  // The client reads its agency from the environment, as the worker does under `npm start`.
  process.env.DOI_API_URL = fake.url;
  delete process.env.DOI_API_USER;
});

afterAll(async () => {
  await fake.close();
  if (saved.url === undefined) delete process.env.DOI_API_URL;
  else process.env.DOI_API_URL = saved.url;
  if (saved.user !== undefined) process.env.DOI_API_USER = saved.user;
});

/** A draft that its owner submits and a curator accepts, minting both identifiers. */
async function publishDataset() {
  const v = await createDatasetDraft({ ownerId: owner.id, title: payload.title, payload, points, analysis });
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  const out = await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Complete and consistent." });
  return { datasetId: v.datasetId, ids: out.identifiers! };
}

async function registration(identifier: string) {
  const [row] =
    await sql`select registered, attempts, last_error, registered_at from identifier_registrations where identifier = ${identifier}`;
  return row;
}

/** PUTs the fake accepted (200 or 201) for one identifier. */
function acceptedPuts(doi: string): number {
  return fake.requests().filter((r) => r.method === "PUT" && r.doi === doi && (r.status === 200 || r.status === 201)).length;
}

describe("identifier registration", () => {
  it("is idempotent with the fake service failing once: one failed attempt, one registration, then nothing", async () => {
    const { datasetId, ids } = await publishDataset();
    expect(await registration(ids.version)).toMatchObject({ registered: false, attempts: 0 });

    fake.failNext(1);
    await expect(registerIdentifier(ids.version)).rejects.toMatchObject({ status: 500 });
    const failed = await registration(ids.version);
    expect(failed).toMatchObject({ registered: false, attempts: 1, registered_at: null });
    expect(failed.last_error).toMatch(/HTTP 500/);

    expect(await registerIdentifier(ids.version)).toEqual({ identifier: ids.version, status: "registered" });
    const done = await registration(ids.version);
    expect(done).toMatchObject({ registered: true, attempts: 2, last_error: null });
    expect(done.registered_at).toBeInstanceOf(Date);

    expect(await registerIdentifier(ids.version)).toEqual({ identifier: ids.version, status: "already_registered" });
    expect(await registerPendingIdentifiers({ datasetId })).toEqual([{ identifier: ids.series, status: "registered" }]);
    expect(await registerPendingIdentifiers({ datasetId })).toEqual([]);
    expect(await registration(ids.version)).toMatchObject({ registered: true, attempts: 2 });
    expect(await registration(ids.series)).toMatchObject({ registered: true, attempts: 1 });

    expect(acceptedPuts(ids.version)).toBe(1);
    expect(acceptedPuts(ids.series)).toBe(1);
    const records = fake.records().filter((r) => r.doi === ids.version || r.doi === ids.series);
    expect(records).toHaveLength(2);
    const version = records.find((r) => r.doi === ids.version)!;
    expect(version).toMatchObject({ state: "findable", writes: 1 });
    expect((version.attributes.creators as { nameIdentifiers?: unknown }[])[0].nameIdentifiers).toBeUndefined();
    expect(version.attributes).toMatchObject({
      url: `${process.env.APP_URL}/datasets/${datasetId}/v1`,
      publisher: "Arrhenia",
      version: "1",
      // The iD is only typed into the deposit, not verified on an account: no name identifier (creator_people).
      creators: [{ name: "Okafor, Maren" }],
      relatedIdentifiers: [
        { relatedIdentifier: ids.series, relatedIdentifierType: "DOI", relationType: "IsVersionOf" },
        { relatedIdentifier: "10.5555/example.123", relatedIdentifierType: "DOI", relationType: "IsSupplementTo" },
      ],
    });
    const series = records.find((r) => r.doi === ids.series)!;
    expect(series.attributes).toMatchObject({
      url: `${process.env.APP_URL}/datasets/${datasetId}`,
      relatedIdentifiers: expect.arrayContaining([
        { relatedIdentifier: ids.version, relatedIdentifierType: "DOI", relationType: "HasVersion" },
      ]),
    });
  });

  it("retries after a lost answer without minting a second record", async () => {
    const { datasetId, ids } = await publishDataset();
    // The fake stores the first PUT and then answers 500, as if the answer were lost.
    fake.failNext(1, { when: "after" });
    await expect(registerPendingIdentifiers({ datasetId })).rejects.toThrow(
      new RegExp(`1 identifier registration\\(s\\) failed — ${ids.version.replace(/\./g, "\\.")}`),
    );
    expect(await registration(ids.version)).toMatchObject({ registered: false, attempts: 1 });
    expect(await registration(ids.series)).toMatchObject({ registered: true, attempts: 1 });
    const created = fake.records().find((r) => r.doi === ids.version)!.created;

    expect(await registerPendingIdentifiers({ datasetId })).toEqual([{ identifier: ids.version, status: "registered" }]);
    const records = fake.records().filter((r) => r.doi === ids.version);
    expect(records).toHaveLength(1);
    expect(records[0]).toMatchObject({ writes: 2, created });
    expect(await registration(ids.version)).toMatchObject({ registered: true, attempts: 2 });
  });

  it("refreshes the metadata of a registered identifier on request, without a second record", async () => {
    const { ids } = await publishDataset();
    await registerIdentifier(ids.series);
    const first = await registration(ids.series);
    expect(await registerIdentifier(ids.series, { refresh: true })).toEqual({ identifier: ids.series, status: "registered" });
    expect(fake.records().filter((r) => r.doi === ids.series)).toMatchObject([{ writes: 2 }]);
    // The registration time stays the time of the first registration.
    expect((await registration(ids.series)).registered_at).toEqual(first.registered_at);
  });

  it("a retraction queues the version's and the series' metadata again, now with a Withdrawn date and the reason", async () => {
    const { ids } = await publishDataset();
    const [{ id: versionId }] = await sql`select id from dataset_versions where version_identifier = ${ids.version}`;
    await sql`delete from pgboss.job where name = 'register-identifier' and state in ('created', 'retry')`;
    await transitionVersion({ actor: curator, versionId, transition: "retract", reason: "A calibration error in every point." });
    const jobs = await sql`
      select data->>'identifier' as identifier, (data->>'refresh')::boolean as refresh from pgboss.job
      where name = 'register-identifier' and state in ('created', 'retry') and data->>'identifier' in ${sql([ids.version, ids.series])}`;
    expect(jobs.map((j) => `${j.identifier} ${j.refresh}`).sort()).toEqual([`${ids.series} true`, `${ids.version} true`].sort());
    const a = buildRegistrationBody((await getRegistrationSubject({ identifier: ids.version }))!).data.attributes;
    expect(a.dates?.find((d) => d.dateType === "Withdrawn")?.date).toBe(new Date().toISOString().slice(0, 10));
    expect(a.descriptions.at(-1)?.description).toMatch(/^This version was retracted on .*Reason: A calibration error in every point\.$/);
    await sql`delete from pgboss.job where name = 'register-identifier' and state in ('created', 'retry')`;
  });

  it("refuses an identifier that was never minted", async () => {
    await expect(registerIdentifier("10.5072/arrhenia.0.v0")).rejects.toMatchObject({ status: 404 });
  });

  it("registers through the pg-boss queue, retrying after the fake fails once", async () => {
    // Other files' acceptances queue registrations too; clear them so the one failure hits ours.
    await sql`delete from pgboss.job where name = 'register-identifier' and state in ('created', 'retry')`;
    const workers = await startWorkers();
    try {
      const { ids } = await publishDataset();
      fake.failNext(1);
      const jobIds = [await enqueueIdentifierRegistration(ids.version), await enqueueIdentifierRegistration(ids.series)];
      expect(jobIds.every(Boolean)).toBe(true);
      await expect
        .poll(async () => [(await registration(ids.version)).registered, (await registration(ids.series)).registered], {
          timeout: 25_000,
          interval: 250,
        })
        .toEqual([true, true]);
      const [{ attempts }] =
        await sql`select sum(attempts)::int as attempts from identifier_registrations where identifier in (${ids.version}, ${ids.series})`;
      expect(attempts).toBe(3);
      await expect
        .poll(async () => (await sql`select state from pgboss.job where id in ${sql(jobIds as string[])}`).map((j) => j.state), {
          timeout: 10_000,
        })
        .toEqual(["completed", "completed"]);
      const [{ retries }] = await sql`select sum(retry_count)::int as retries from pgboss.job where id in ${sql(jobIds as string[])}`;
      expect(retries).toBe(1);

      // Queuing a registered identifier again completes without sending anything.
      const again = await enqueueIdentifierRegistration(ids.version);
      await expect
        .poll(async () => (await sql`select state from pgboss.job where id = ${again!}`)[0]?.state, { timeout: 10_000 })
        .toBe("completed");
      expect(acceptedPuts(ids.version)).toBe(1);
      expect(acceptedPuts(ids.series)).toBe(1);
    } finally {
      await workers.stop();
    }
  });
});

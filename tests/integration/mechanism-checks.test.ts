import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));

import { GET as getCheck } from "@/app/api/v1/mechanism-checks/[id]/route";
import { POST as shareCheck } from "@/app/api/v1/mechanism-checks/[id]/share/route";
import { POST as postCheck } from "@/app/api/v1/mechanism-checks/route";
import { POST as postChoices } from "@/app/api/v1/mechanism-checks/species-choices/route";
import { POST as rerunCheck } from "@/app/api/v1/mechanism-checks/[id]/rerun/route";
import { GET as searchSpecies } from "@/app/api/v1/mechanism-checks/species-search/route";
import { GET as health } from "@/app/api/health/route";
import { getCurrentUser } from "@/lib/auth/session";
import { getSender } from "@/lib/jobs/boss";
import { runMechanismCheckJob } from "@/lib/mechanisms/check-job";
import { MAX_CHECK_RUNS } from "@/lib/mechanisms/progress";
import { MECHANISM_CHECK_QUEUE, saveSpeciesChoices, sweepStalledMechanismChecks } from "@/lib/mechanisms/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { consensusDocument, publish } from "./consensus-fixtures";
import { sql, uniqueEmail } from "./helpers";

// Br + undecane → HBr + undecyl: no other test uses this chain length (consensus-fixtures.ts). Invented numbers:
// k = 2.2e-12 exp(−1750 K/T) cm³ molecule⁻¹ s⁻¹ (times 1.05 for the second set), 250–400 K.
const CARBONS = 11;

let owner: UserDto, other: UserDto, curator: UserDto, admin: UserDto;

const as = (u: UserDto | null) => vi.mocked(getCurrentUser).mockResolvedValue(u);
const ctx = (id: number | string = 0) => ({ params: Promise.resolve({ id: String(id) }) });
const req = (url: string, init: RequestInit = {}) => new Request(`http://127.0.0.1${url}`, init);
const post = (body: BodyInit, { json = true, query = "" } = {}) =>
  postCheck(
    req(`/api/v1/mechanism-checks${query}`, {
      method: "POST",
      body,
      headers: { "content-type": json ? "application/json" : "text/plain" },
    }),
    ctx(),
  );
/** POST, then the check's job run here (no job worker runs in these tests), as the worker would run it. */
const postAndRun = async (body: BodyInit, options: { json?: boolean; query?: string } = {}) => {
  const res = await post(body, options);
  expect(res.status).toBe(202);
  const { data } = await res.json();
  expect(await runMechanismCheckJob({ checkId: data.id })).toBe("done");
  return { res, data };
};
const read = async (id: number) => (await (await getCheck(req(`/api/v1/mechanism-checks/${id}`), ctx(id))).json()).data;

const MECHANISM = `! invented demo mechanism for the test
ELEMENTS C H BR END
SPECIES BR C11H24 HBR C11H23 XQ END
REACTIONS MOLECULES KELVINS
BR+C11H24=>HBR+C11H23     2.2E-12  0.0  1750.0   ! as the data say: agrees
BR+C11H24=>HBR+C11H23     2.2E-11  0.0  1750.0   ! ten times faster: disagrees
DUPLICATE
HBR+C11H23=>BR+C11H24     1.0E-12  0.0  0.0      ! reverse direction only: no data
BR+BR+M=>XQ+M             1.0E-32  0.0  0.0      ! three-body: not checked yet
XQ+BR=>HBR+C11H23         1.0E-12  0.0  0.0      ! unknown species: no data
BR+C11H24=>HBR+C11H23     2.2E-12  0.0  zero     ! malformed: listed, line 11
END
`;

beforeAll(async () => {
  const mk = (tag: string, role: UserDto["role"] = "researcher") =>
    createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", role, verified: true });
  [owner, other, curator, admin] = await Promise.all([mk("modeller"), mk("other"), mk("curator", "curator"), mk("admin", "admin")]);
  const first = await publish(consensusDocument({ carbons: CARBONS, title: "Br + undecane one", category: "experiment" }), {
    owner,
    curator,
  });
  await publish(consensusDocument({ carbons: CARBONS, title: "Br + undecane two", category: "experiment", factor: 1.05 }), {
    owner,
    curator,
  });
  // The mechanism's names are the person's own: remembered choices map them (the species table is shared with other tests).
  const keys = await sql<{ inchi_key: string; smiles: string }[]>`
    select s.inchi_key, s.canonical_smiles as smiles from reaction_participants p join species s on s.id = p.species_id where p.reaction_id = ${first.reactionId}`;
  const bySmiles = (test: (s: string) => boolean) => keys.find((k) => test(k.smiles))!.inchi_key;
  await saveSpeciesChoices({
    userId: owner.id,
    choices: [
      { name: "BR", inchiKey: bySmiles((s) => s === "[Br]") },
      { name: "HBR", inchiKey: bySmiles((s) => s === "Br") },
      { name: "C11H24", inchiKey: bySmiles((s) => s === "C".repeat(CARBONS)) },
      { name: "C11H23", inchiKey: bySmiles((s) => s.startsWith("[CH2]")) },
    ],
  });
});

describe("POST /api/v1/mechanism-checks", () => {
  it("refuses anonymous callers", async () => {
    as(null);
    expect((await post(JSON.stringify({ text: MECHANISM }))).status).toBe(401);
  });

  it.each([
    ["researcher", () => owner],
    ["curator", () => curator],
    ["admin", () => admin],
  ])("lets a %s check a mechanism", async (_role, who) => {
    as(who());
    const res = await post(JSON.stringify({ text: MECHANISM, window: { Tmin: 250, Tmax: 400 } }));
    expect(res.status).toBe(202);
  });

  it("gives every verdict, lists the malformed line, and remembers the owner's choices", async () => {
    as(owner);
    const { res, data } = await postAndRun(MECHANISM, { json: false, query: "?Tmin=300&Tmax=2500&name=Test%20mechanism" });
    expect(res.headers.get("location")).toBe(`/api/v1/mechanism-checks/${data.id}`);
    expect(data).toMatchObject({ state: "queued", reactions: 6 });
    expect(data.problems[0]).toMatchObject({ line: 11 });
    expect(data.problems[0].message).toMatch(/"zero" is not a number \(Ea\)/);

    const got = await getCheck(req(`/api/v1/mechanism-checks/${data.id}`), ctx(data.id));
    expect(got.headers.get("content-disposition")).toBeNull();
    const { data: check } = await got.json();
    expect(check.state).toBe("done");
    expect(check.report.summary).toMatchObject({ reactions: 6, agrees: 1, disagrees: 1, no_data: 2, not_checked: 2, extrapolatedAny: 2 });
    expect(check.name).toBe("Test mechanism");
    expect(check.source).toBeUndefined();
    const byLine = Object.fromEntries(check.report.reactions.map((r: { line: number }) => [r.line, r]));
    expect(byLine[5].verdict).toBe("agrees");
    expect(byLine[5].extrapolated).toEqual([{ Tmin: 400, Tmax: 2500 }]);
    expect(byLine[5].comparison.basis).toBe("consensus");
    expect(byLine[5].comparison.overlap).toEqual({ Tmin: 300, Tmax: 400 });
    expect(byLine[6].verdict).toBe("disagrees");
    expect(byLine[6].comparison.worst.ratio).toBeGreaterThan(8);
    expect(byLine[8].verdict).toBe("no_data");
    expect(byLine[8].note).toMatch(/reverse direction only/);
    expect(byLine[5].reverse).toBeNull();
    expect(byLine[9].verdict).toBe("not_checked");
    expect(byLine[10].note).toMatch(/Species not matched: XQ/);
    expect(check.report.about.caution).toMatch(/extrapolation/i);

    const download = await getCheck(req(`/api/v1/mechanism-checks/${data.id}?format=json`), ctx(data.id));
    expect(download.headers.get("content-disposition")).toBe(`attachment; filename="mechanism-check-${data.id}.json"`);
    expect((await download.json()).data.report.summary.reactions).toBe(6);
    const csv = await (await getCheck(req(`/api/v1/mechanism-checks/${data.id}?format=csv`), ctx(data.id))).text();
    expect(csv.split("\r\n")[1]).toMatch(/^"# caution: .*extrapolation/i);
    expect(csv).toMatch(/\n1,5,BR\+C11H24=>HBR\+C11H23,elementary,agrees,400-2500,/);
  });

  it("keeps a check to its owner until the owner shares it", async () => {
    as(owner);
    const { data } = await (await post(JSON.stringify({ text: MECHANISM }))).json();
    as(other);
    expect((await getCheck(req(`/api/v1/mechanism-checks/${data.id}`), ctx(data.id))).status).toBe(404);
    expect(
      (await shareCheck(req(`/api/v1/mechanism-checks/${data.id}/share`, { method: "POST", body: '{"shared": true}' }), ctx(data.id)))
        .status,
    ).toBe(404);
    as(owner);
    const shared = await (
      await shareCheck(req(`/api/v1/mechanism-checks/${data.id}/share`, { method: "POST", body: '{"shared": true}' }), ctx(data.id))
    ).json();
    const token = new URL(shared.data.url, "http://x").searchParams.get("share")!;
    as(null);
    expect((await getCheck(req(`/api/v1/mechanism-checks/${data.id}?share=${token}`), ctx(data.id))).status).toBe(200);
    expect((await getCheck(req(`/api/v1/mechanism-checks/${data.id}?share=${token}x`), ctx(data.id))).status).toBe(404);
    as(owner);
    await shareCheck(req(`/api/v1/mechanism-checks/${data.id}/share`, { method: "POST", body: '{"shared": false}' }), ctx(data.id));
    as(null);
    expect((await getCheck(req(`/api/v1/mechanism-checks/${data.id}?share=${token}`), ctx(data.id))).status).toBe(404);
    expect((await getCheck(req(`/api/v1/mechanism-checks/abc`), ctx("abc"))).status).toBe(404);
  });
});

describe("bad input", () => {
  it.each([
    ["a YAML line error", "units: {length: cm}\nreactions:\n- equation: A => B\n  rate-constant: {A: 1, b: 0, Ea: 0\n", 202],
    ["no mechanism at all", "hello", 422],
    ["a NUL byte", "REACTIONS\nA=>B 1 0 0\u0000\nEND\n", 422],
  ])("answers %s", async (_what, text, status) => {
    as(owner);
    const res = await post(JSON.stringify({ text }));
    expect(res.status).toBe(status);
    if (status === 422) expect((await res.json()).errors[0].pointer).toBe("/text");
  });

  it("names the window's problem and unknown unit keywords with the allowed ones", async () => {
    as(owner);
    const res = await post(
      JSON.stringify({ text: "SPECIES A B END\nREACTIONS KCAL\nA=>B 1 0 0\nEND\n", window: { Tmin: 900, Tmax: 300 } }),
    );
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0].pointer).toBe("/window/Tmax");
    const units = await (await post(JSON.stringify({ text: "SPECIES A B END\nREACTIONS KCAL\nA=>B 1 0 0\nEND\n" }))).json();
    expect(units.data.problems[0].message).toMatch(/unknown unit keyword "KCAL"; allowed: CAL\/MOLE/);
    expect(await runMechanismCheckJob({ checkId: units.data.id })).toBe("done");
    expect((await read(units.data.id)).report.summary.not_checked).toBe(1);
  });

  it("refuses over 20 MB with a 413 before reading it", async () => {
    as(owner);
    const res = await post("x".repeat(20 * 1024 * 1024 + 70 * 1024), { json: false });
    expect(res.status).toBe(413);
  });

  it("refuses the nested-bracket bomb quickly, naming line and column, and the server still answers", async () => {
    as(owner);
    const bomb = JSON.stringify({ text: "reactions: " + "[".repeat(1_000_000) + "]".repeat(1_000_000) });
    const started = performance.now();
    const [res, alive] = await Promise.all([post(bomb), health()]);
    expect(performance.now() - started).toBeLessThan(3000);
    expect(res.status).toBe(422);
    const problem = await res.json();
    expect(problem.detail ?? problem.title).toBeDefined();
    expect(problem.errors[0].value).toMatchObject({ line: 1, column: 75, code: "too_deep" });
    expect(alive.status).toBe(200);
    expect((await health()).status).toBe(200);
  });
});

describe("species choices", () => {
  const choose = (body: string, type: string) =>
    postChoices(req("/api/v1/mechanism-checks/species-choices", { method: "POST", body, headers: { "content-type": type } }), ctx());

  it("downloads a check's mapping and takes it back as CSV, naming bad rows", async () => {
    as(other);
    const { data } = await postAndRun(JSON.stringify({ text: MECHANISM }));
    const mapping = await (await getCheck(req(`/api/v1/mechanism-checks/${data.id}?format=mapping`), ctx(data.id))).text();
    expect(mapping).toMatch(/\r\nname,inchikey,matched_by,candidates\r\n/);
    expect(mapping).toMatch(/\r\nXQ,,none,/);
    const [bromine] = await sql<{ inchi_key: string }[]>`select inchi_key from species where canonical_smiles = '[Br]'`;
    const refused = await choose(`name,inchikey\r\nBR,${bromine.inchi_key}\r\nXQ,not-a-key\r\n`, "text/csv");
    expect(refused.status).toBe(422);
    expect((await refused.json()).errors[0].message).toBe('Row 3, column "inchikey": "NOT-A-KEY" is not an InChIKey.');
    const unknown = await choose(`name,inchikey\r\nXQ,AAAAAAAAAAAAAA-AAAAAAAAAA-A\r\n`, "text/csv");
    expect((await unknown.json()).errors[0].message).toMatch(/^row 2: no species has the InChIKey/);
    const saved = await choose(`name,inchikey\r\nBR,${bromine.inchi_key}\r\nXQ,\r\n`, "text/csv");
    expect(await saved.json()).toEqual({ data: { saved: 1 } });
    const again = await postAndRun(JSON.stringify({ text: MECHANISM }));
    const check = await (await getCheck(req(`/api/v1/mechanism-checks/${again.data.id}`), ctx(again.data.id))).json();
    expect(check.data.report.species.find((s: { name: string }) => s.name === "BR")).toMatchObject({
      by: "choice",
      inchiKey: bromine.inchi_key,
    });
  });

  it("takes JSON with pointers for bad entries, and refuses anonymous callers", async () => {
    as(owner);
    const bad = await choose('{"choices": [{"name": "A", "inchiKey": "x"}]}', "application/json");
    expect((await bad.json()).errors[0].pointer).toBe("/choices/0/inchiKey");
    as(null);
    expect((await choose('{"choices": []}', "application/json")).status).toBe(401);
  });
});

describe("the check as a background job", () => {
  const rowOf = async (id: number) =>
    (
      await sql<{ state: string; attempts: number; stage: string | null; progress: number; total: number; error: string | null }[]>`
      select state::text as state, attempts, stage, progress, total, error from mechanism_checks where id = ${id}`
    )[0];
  const jobsOf = async (id: number) =>
    Number(
      (
        await sql<{ n: number }[]>`select count(*)::int as n from pgboss.job where name = ${MECHANISM_CHECK_QUEUE}
          and state in ('created', 'retry') and (data ->> 'checkId')::int = ${id}`
      )[0].n,
    );

  it("is queued with its job, runs (stage and progress on its row, read by GET), and is done with its report", async () => {
    as(owner);
    const res = await post(JSON.stringify({ text: MECHANISM, name: "Job test" }));
    expect(res.status).toBe(202);
    const { data } = await res.json();
    expect(await jobsOf(data.id)).toBe(1);
    expect(await read(data.id)).toMatchObject({ state: "queued", report: null, progressText: "Waiting for its turn" });

    // Watch the row while the job runs: it is seen running with a stage and a count before it is done.
    const seen: { state: string; stage: string | null; progress: number; total: number }[] = [];
    let running = true;
    const watcher = (async () => {
      while (running) {
        seen.push(await rowOf(data.id));
        await new Promise((r) => setTimeout(r, 5));
      }
    })();
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("done");
    running = false;
    await watcher;
    const during = seen.filter((s) => s.state === "running");
    expect(during.length).toBeGreaterThan(0);
    expect(during.some((s) => s.stage !== null && s.total > 0)).toBe(true);
    const after = await read(data.id);
    expect(after).toMatchObject({ state: "done", stage: null, attempts: 1 });
    expect(after.progress).toBe(after.total);
    expect(after.report.summary.reactions).toBe(6);
    // A job handed out twice runs the check once.
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("skipped");
  });

  it("shows a running check's stage and count in words", async () => {
    as(owner);
    const { data } = await (await post(JSON.stringify({ text: MECHANISM }))).json();
    await sql`update mechanism_checks set state = 'running', stage = 'data', progress = 1, total = 4, heartbeat_at = now() where id = ${data.id}`;
    expect(await read(data.id)).toMatchObject({
      state: "running",
      progressText: "Reading the published data of the matched reactions: 1 of 4",
    });
  });

  it("queues again a running check whose heartbeat is stale, and fails it with a worded message after three runs", async () => {
    as(owner);
    const { data } = await (await post(JSON.stringify({ text: MECHANISM }))).json();
    await sql`delete from pgboss.job where name = ${MECHANISM_CHECK_QUEUE} and (data ->> 'checkId')::int = ${data.id}`;
    // The server stopped under its first run: running, one attempt, no heartbeat for five minutes.
    await sql`update mechanism_checks set state = 'running', attempts = 1, stage = 'judging', heartbeat_at = now() - interval '5 minutes' where id = ${data.id}`;
    const fresh = await (await post(JSON.stringify({ text: MECHANISM }))).json();
    await sql`update mechanism_checks set state = 'running', attempts = 1, heartbeat_at = now() where id = ${fresh.data.id}`;
    const first = await sweepStalledMechanismChecks();
    expect(first.queued).toContain(data.id);
    expect(first.queued).not.toContain(fresh.data.id);
    expect(await rowOf(data.id)).toMatchObject({ state: "queued", attempts: 1, stage: null });
    expect(await jobsOf(data.id)).toBe(1);
    expect((await rowOf(fresh.data.id)).state).toBe("running");

    // Its next run claims it (a second attempt) and finishes it.
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("done");
    expect(await rowOf(data.id)).toMatchObject({ state: "done", attempts: 2 });

    // A check whose third run stopped too is given up, with the reason on its page and in the API.
    await sql`update mechanism_checks set state = 'running', attempts = ${MAX_CHECK_RUNS}, heartbeat_at = now() - interval '3 minutes' where id = ${fresh.data.id}`;
    const second = await sweepStalledMechanismChecks();
    expect(second.failed).toContain(fresh.data.id);
    const failed = await read(fresh.data.id);
    expect(failed.state).toBe("failed");
    expect(failed.error).toMatch(/started 3 times and each run stopped before it finished/);
  });

  it("fails a check its run cannot read, with the reason, and lets the owner run it again", async () => {
    as(owner);
    const { data } = await (await post(JSON.stringify({ text: MECHANISM }))).json();
    await sql`update mechanism_checks set source = 'hello', format = null where id = ${data.id}`;
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("failed");
    const failed = await read(data.id);
    expect(failed.state).toBe("failed");
    expect(failed.error).toMatch(/does not look like a mechanism/);
    // Another person cannot start it again; the owner can (and a queued check cannot be queued twice).
    as(other);
    expect((await rerunCheck(req(`/api/v1/mechanism-checks/${data.id}/rerun`, { method: "POST" }), ctx(data.id))).status).toBe(404);
    as(owner);
    await sql`update mechanism_checks set source = ${MECHANISM}, format = 'plain-text' where id = ${data.id}`;
    const again = await rerunCheck(req(`/api/v1/mechanism-checks/${data.id}/rerun`, { method: "POST" }), ctx(data.id));
    expect(again.status).toBe(202);
    expect((await rerunCheck(req(`/api/v1/mechanism-checks/${data.id}/rerun`, { method: "POST" }), ctx(data.id))).status).toBe(409);
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("done");
    expect(await read(data.id)).toMatchObject({ state: "done", error: null, attempts: 1 });
  });
});

describe("choosing species row by row", () => {
  it("finds a species by name, formula, SMILES or InChI, saves the choice, and the check run again uses it", async () => {
    const [bromine] = await sql<
      { inchi_key: string; inchi: string }[]
    >`select inchi_key, inchi from species where canonical_smiles = '[Br]'`;
    const find = async (q: string) =>
      (await (await searchSpecies(req(`/api/v1/mechanism-checks/species-search?q=${encodeURIComponent(q)}`), ctx())).json()).data as {
        inchiKey: string;
      }[];
    as(null);
    expect((await searchSpecies(req(`/api/v1/mechanism-checks/species-search?q=Br`), ctx())).status).toBe(401);
    const person = await createUser({
      email: uniqueEmail("rowchoice"),
      name: "rowchoice",
      passwordHash: "x",
      role: "researcher",
      verified: true,
    });
    as(person);
    expect((await searchSpecies(req(`/api/v1/mechanism-checks/species-search?q=`), ctx())).status).toBe(400);
    for (const q of ["[Br]", bromine.inchi, bromine.inchi_key, "Br"])
      expect(
        (await find(q)).map((f) => f.inchiKey),
        q,
      ).toContain(bromine.inchi_key);

    // Without choices this person's BR is not the bromine atom of the data (or nothing at all).
    const { data } = await postAndRun(JSON.stringify({ text: MECHANISM }));
    const before = (await read(data.id)).report.species.find((s: { name: string }) => s.name === "BR");
    expect(before.by === "choice").toBe(false);
    const saved = await postChoices(
      req("/api/v1/mechanism-checks/species-choices", {
        method: "POST",
        body: JSON.stringify({ choices: [{ name: "BR", inchiKey: bromine.inchi_key }] }),
        headers: { "content-type": "application/json" },
      }),
      ctx(),
    );
    expect(saved.status).toBe(200);
    expect((await rerunCheck(req(`/api/v1/mechanism-checks/${data.id}/rerun`, { method: "POST" }), ctx(data.id))).status).toBe(202);
    expect(await runMechanismCheckJob({ checkId: data.id })).toBe("done");
    const after = (await read(data.id)).report.species.find((s: { name: string }) => s.name === "BR");
    expect(after).toMatchObject({ by: "choice", inchiKey: bromine.inchi_key });
  });
});

afterAll(async () => {
  // Nothing of this file is left for a job worker of a later file to run.
  await sql`update mechanism_checks set state = 'failed', error = 'left by a test' where state in ('queued', 'running')
    and owner_id in (select id from users where email like '%@test.arrhenia.invalid')`;
  await (await getSender()).purgeQueue(MECHANISM_CHECK_QUEUE);
});

describe("the comparison basis kept with each reaction's search summary", () => {
  const reportOf = async () => {
    as(owner);
    const { data } = await postAndRun(JSON.stringify({ text: MECHANISM, name: "Basis test" }));
    return (await read(data.id)).report;
  };
  const reactionIdOf = async () =>
    (
      await sql<
        { id: number }[]
      >`select v.reaction_id as id from dataset_versions v where v.title = 'Br + undecane one' and v.state = 'published'`
    )[0].id;

  it("is written when the data are published, and gives the same report as reading the points", async () => {
    const reactionId = await reactionIdOf();
    const [kept] = await sql<{ comparison: { engine: string; published: number; basis: string } | null }[]>`
      select comparison from search_reaction_summaries where reaction_id = ${reactionId}`;
    expect(kept.comparison).toMatchObject({ published: 2, basis: "consensus" });
    const fromBasis = await reportOf();
    // Without it (a row written before bases were kept), the check reads the points and judges on the threads.
    await sql`update search_reaction_summaries set comparison = null where reaction_id = ${reactionId}`;
    const fromPoints = await reportOf();
    expect(fromPoints.reactions).toEqual(fromBasis.reactions);
    expect(fromPoints.summary).toEqual(fromBasis.summary);
    expect(fromBasis.summary).toMatchObject({ agrees: 1, disagrees: 1 });
  });

  it("is not used when another engine version wrote it, and the migration's rewrite brings it back", async () => {
    const reactionId = await reactionIdOf();
    const { rebuildStaleComparisonBases } = await import("@/lib/search/documents");
    await rebuildStaleComparisonBases();
    await sql`update search_reaction_summaries set comparison = jsonb_set(comparison, '{curve}', 'null') || '{"engine": "kinetics-0"}'
      where reaction_id = ${reactionId} and comparison is not null`;
    // A stale basis with no curve would say "no data"; it is ignored, and the verdicts come from the points.
    expect((await reportOf()).summary).toMatchObject({ agrees: 1, disagrees: 1 });
    const { readPublicPagesMark } = await import("@/db/public-pages-mark");
    const mark = await readPublicPagesMark();
    expect(await rebuildStaleComparisonBases()).toBeGreaterThanOrEqual(1);
    // Reaction pages show the kept consensus: a running server renders them again.
    expect(await readPublicPagesMark()).not.toBe(mark);
    const [kept] = await sql<
      { engine: string }[]
    >`select comparison ->> 'engine' as engine from search_reaction_summaries where reaction_id = ${reactionId}`;
    expect(kept.engine).not.toBe("kinetics-0");
  });
});

describe("forgetting a remembered choice", () => {
  it("forgets one of the person's own choices, 404 for one they do not have, 400 without a name", async () => {
    const { DELETE: forget } = await import("@/app/api/v1/mechanism-checks/species-choices/route");
    const call = (query: string) => forget(req(`/api/v1/mechanism-checks/species-choices${query}`, { method: "DELETE" }), ctx());
    as(other);
    await saveSpeciesChoices({
      userId: other.id,
      choices: [{ name: "HBR", inchiKey: (await sql`select inchi_key from species limit 1`)[0].inchi_key }],
    });
    expect((await call("?name=HBR")).status).toBe(200);
    expect((await call("?name=HBR")).status).toBe(404);
    expect((await call("")).status).toBe(400);
    // The owner's own choice of the same name is untouched.
    expect((await sql`select count(*)::int as n from species_mapping_choices where user_id = ${owner.id} and name = 'HBR'`)[0].n).toBe(1);
    as(null);
    expect((await call("?name=HBR")).status).toBe(401);
  });
});

describe("scheduled jobs", () => {
  it("have pg-boss's queue of due scheduled jobs made by the migration (the runtime role may not make it)", async () => {
    const { CRON_QUEUE } = await import("@/lib/jobs/boss");
    expect((await sql`select count(*)::int as n from pgboss.queue where name = ${CRON_QUEUE}`)[0].n).toBe(1);
  });
});

describe("a reaction written as very many DUPLICATE entries", () => {
  it("is not summed beyond the limit: each entry is listed as not checked, and the check still finishes", async () => {
    const { MAX_DUPLICATE_TERMS } = await import("@/lib/mechanisms/run-check");
    const copies = MAX_DUPLICATE_TERMS + 5;
    const text = [
      "ELEMENTS C H BR END",
      "SPECIES BR C11H24 HBR C11H23 END",
      "REACTIONS MOLECULES KELVINS",
      ...Array.from({ length: copies }, (_, i) => `BR+C11H24=>HBR+C11H23     ${(1 + i / 100).toFixed(2)}E-13  0.0  1750.0\nDUPLICATE`),
      "END",
    ].join("\n");
    as(owner);
    const { data } = await postAndRun(JSON.stringify({ text, name: "Many duplicates" }));
    const report = (await read(data.id)).report;
    expect(report.summary.not_checked).toBe(copies);
    expect(report.reactions[0].note).toContain(`One of ${copies} DUPLICATE entries`);
  });
});

describe("outside attack round: refusals", () => {
  it("refuses a name given twice in species choices with 422 naming the row, saving nothing", async () => {
    as(owner);
    const key = (await sql`select inchi_key from species limit 1`)[0].inchi_key;
    const res = await postChoices(
      req("/api/v1/mechanism-checks/species-choices", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({
          choices: [
            { name: "ZZ1", inchiKey: key },
            { name: "ZZ1", inchiKey: key },
          ],
        }),
      }),
      ctx(),
    );
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0]).toMatchObject({ pointer: "/choices/1/name" });
    expect((await sql`select count(*)::int as n from species_mapping_choices where name = 'ZZ1'`)[0].n).toBe(0);
  });

  it("refuses at once a YAML file of many aliases, a file with no reaction, and contradicting unit keywords name the line", async () => {
    as(owner);
    const aliases = [
      "units: {length: cm, quantity: mol, activation-energy: cal/mol}",
      "species: [{name: H}, {name: O2}, {name: O}, {name: OH}]",
      "reactions:",
      "- &r {equation: H + O2 <=> O + OH, rate-constant: {A: 1.0e14, b: 0, Ea: 16000}}",
      ...Array.from({ length: 5000 }, () => "- *r"),
    ].join("\n");
    const started = Date.now();
    const refused = await post(aliases, { json: false });
    expect(refused.status).toBe(422);
    expect(JSON.stringify(await refused.json())).toMatch(/more than 100 YAML aliases/);
    expect(Date.now() - started).toBeLessThan(10_000);
    const empty = await post("ELEMENTS H END\nSPECIES H END\nREACTIONS\nEND\n", { json: false });
    expect(empty.status).toBe(422);
    const both = await post(MECHANISM.replace("REACTIONS MOLECULES KELVINS", "REACTIONS MOLES MOLECULES KELVINS"), { json: false });
    expect(both.status).toBe(202);
    const { data } = await both.json();
    expect(data.problems.map((p: { message: string }) => p.message)).toContainEqual(
      expect.stringMatching(/^Line 4, column \d+: the quantity unit is given twice, as MOLES and as MOLECULES/),
    );
  });
});

describe("a check's name", () => {
  it("is one line of at most 200 characters, from the query as from JSON", async () => {
    as(owner);
    expect((await post(MECHANISM, { json: false, query: `?name=${"x".repeat(201)}` })).status).toBe(422);
    expect((await post(MECHANISM, { json: false, query: `?name=${encodeURIComponent("bell\u0007")}` })).status).toBe(422);
    expect((await post(JSON.stringify({ text: MECHANISM, name: "a\u202Eb" }))).status).toBe(422);
    expect((await post(MECHANISM, { json: false, query: "?name=Fine" })).status).toBe(202);
  });
});

/**
 * Responsiveness of a running Arrhenia under heavy submissions: the latency of GET /api/health
 * (p50 / p95 / max of every sample) while idle, while ten 1.7 MB deposit documents of 100 000 bad
 * points ({"T":"x","k":-1}) are posted at once, and while the deposit editor saves a 20 000-point
 * document (its server action, as the browser sends it). Starts `scripts/serve.ts` on a free
 * loopback port against the production build (`next build` first; NEXT_DIST_DIR chooses it) and
 * stops it at the end. Not a test: prints a table. Run with `npm run bench:server`.
 *
 * BENCH_DIR serves another checkout of the project (with its own build) for a before/after
 * comparison; BENCH_ROUNDS (default 3) repeats each loaded scenario; BENCH_PROFILE_DIR writes a
 * CPU profile of the front server's process (scripts/serve.ts) there.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { mkdtempSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { encode } from "next-auth/jwt";
import { nextDistDir } from "@/lib/config";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { createApiToken, createUser, getUserForSession } from "@/lib/users/queries";
import { sampleHealth as sampleHealthFrom } from "./health-sampler";

const dir = path.resolve(process.env.BENCH_DIR ?? process.cwd());
const distDir = nextDistDir();
const rounds = Number(process.env.BENCH_ROUNDS ?? 3);
const secret = `bench-${Math.random().toString(36).slice(2)}-${Date.now()}`;

async function freePort(): Promise<number> {
  const probe = createServer();
  await new Promise<void>((resolve) => probe.listen(0, "127.0.0.1", resolve));
  const { port } = probe.address() as { port: number };
  await new Promise((resolve) => probe.close(resolve));
  return port;
}

const port = await freePort();
const base = `http://127.0.0.1:${port}`;

function startServer(): ChildProcess {
  const profile = process.env.BENCH_PROFILE_DIR ? ["--cpu-prof", `--cpu-prof-dir=${process.env.BENCH_PROFILE_DIR}`] : [];
  return spawn(path.join(dir, "node_modules/.bin/tsx"), [...profile, "--conditions=react-server", "scripts/serve.ts"], {
    cwd: dir,
    stdio: ["ignore", "ignore", "inherit"],
    env: {
      ...process.env,
      PORT: String(port),
      APP_URL: base,
      NEXTAUTH_URL: base,
      NEXTAUTH_SECRET: secret,
      NEXT_DIST_DIR: distDir,
      SERVE_QUIET: "1",
      API_RATE_LIMIT: "10000000", // one load generator is one client
      MAIL_CAPTURE_PORT: String(30000 + Math.floor(Math.random() * 2000)),
      DOI_FAKE_PORT: String(32000 + Math.floor(Math.random() * 1000)),
      DOI_FAKE_DATA_DIR: mkdtempSync(path.join(tmpdir(), "arrhenia-bench-doi-")),
    },
  });
}

async function waitForHealth(deadline = Date.now() + 120_000) {
  while (Date.now() < deadline) {
    const ok = await fetch(`${base}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) return;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error("the server did not answer /api/health within 2 minutes");
}

/** One health request: its latency, and the database round trip the server measured inside it (ms). */
type Sample = [number, number];

/** Samples GET /api/health back to back (a 10 ms pause between) until `until` settles. */
async function sampleHealth(until: Promise<unknown>): Promise<Sample[]> {
  return (await sampleHealthFrom(`${base}/api/health`, until)).map((s) => [s.ms, s.databaseMs]);
}

const pct = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))] ?? NaN;
};
const ms = (x: number) => (Number.isFinite(x) ? x.toFixed(0) : "-");

function pointsDocument(points: unknown[], title: string): string {
  return JSON.stringify({ ...structuredClone(EXAMPLE_DEPOSIT), title, points });
}

/** The editor's save action id, from the build's manifest of server actions. */
function saveActionId(): string {
  const manifest = JSON.parse(readFileSync(path.join(dir, distDir, "server/server-reference-manifest.json"), "utf8")) as {
    node: Record<string, { exportedName?: string; filename?: string }>;
  };
  const found = Object.entries(manifest.node).find(([, v]) => v.exportedName === "saveDraftAction");
  if (!found) throw new Error("saveDraftAction is not in the build's server-reference manifest");
  return found[0];
}

const server = startServer();
const stop = () => server.kill("SIGTERM");
process.on("exit", stop);
try {
  await waitForHealth();
  const user = await createUser({
    email: `bench-${Date.now()}@bench.arrhenia.invalid`,
    name: "Bench",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
  const { secret: token } = await createApiToken({ userId: user.id, name: "bench", scopes: ["deposit:write"] });
  const auth = { authorization: `Bearer ${token}` };
  const rows: string[][] = [["scenario", "samples", "p50 ms", "p95 ms", "max ms", "db max ms", "the loaded requests"]];
  const row = (name: string, samples: Sample[], note: string) => {
    const total = samples.map((s) => s[0]);
    const db = samples.map((s) => s[1]).filter(Number.isFinite);
    rows.push([name, String(total.length), ms(pct(total, 50)), ms(pct(total, 95)), ms(Math.max(...total)), ms(Math.max(...db)), note]);
  };

  // Warm-up: the first requests compile routes and start the analysis threads.
  for (let i = 0; i < 20; i++) await (await fetch(`${base}/api/health`)).arrayBuffer();

  let idleDone = () => {};
  const idleFor = new Promise<void>((resolve) => (idleDone = resolve));
  setTimeout(() => idleDone(), 4000);
  row("health, idle (4 s)", await sampleHealth(idleFor), "");

  // Ten documents of 100 000 bad points at once.
  const bad = Buffer.from(
    pointsDocument(
      Array.from({ length: 100_000 }, () => ({ T: "x", k: -1 })),
      "Bench bad",
    ),
  );
  const loaded: Sample[] = [];
  const postTimes: number[] = [];
  const statuses = new Map<number, number>();
  for (let r = 0; r < rounds; r++) {
    const posts = Promise.all(
      Array.from({ length: 10 }, async () => {
        const t0 = performance.now();
        const res = await fetch(`${base}/api/v1/datasets`, {
          method: "POST",
          headers: { ...auth, "content-type": "application/json" },
          body: bad,
        });
        await res.arrayBuffer();
        postTimes.push(performance.now() - t0);
        statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      }),
    );
    loaded.push(...(await sampleHealth(posts)));
    await posts;
  }
  const answered = [...statuses].map(([s, n]) => `${n}×${s}`).join(" ");
  row(
    `health, 10 × ${(bad.byteLength / 1e6).toFixed(1)} MB bad documents`,
    loaded,
    `${answered}; each ${ms(Math.min(...postTimes))}–${ms(Math.max(...postTimes))} ms`,
  );

  // The deposit editor saves a 20 000-point document over a draft (its server action).
  const created = await fetch(`${base}/api/v1/datasets`, {
    method: "POST",
    headers: { ...auth, "content-type": "application/json" },
    body: JSON.stringify({ ...EXAMPLE_DEPOSIT, title: "Bench editor" }),
  });
  const draft = ((await created.json()) as { data: { versionId: number; lockVersion: number } }).data;
  const session = await getUserForSession({ id: user.id });
  const cookie = await encode({
    secret,
    token: { sub: String(user.id), uid: user.id, role: user.role, gen: session!.sessionGeneration, email: user.email, name: user.name },
  });
  const actionId = saveActionId();
  const good = Array.from({ length: 20_000 }, (_, i) => ({
    T: 250 + (i % 500) * 0.5,
    k: 1e-12 * Math.exp(-1000 / (250 + (i % 500) * 0.5)),
  }));
  const saveTimes: number[] = [];
  const duringSave: Sample[] = [];
  let lockVersion = draft.lockVersion;
  for (let r = 0; r < rounds; r++) {
    const text = pointsDocument(good, `Bench editor ${r}`);
    const save = (async () => {
      const t0 = performance.now();
      const res = await fetch(`${base}/deposits/${draft.versionId}`, {
        method: "POST",
        headers: {
          "next-action": actionId,
          "content-type": "text/plain;charset=UTF-8",
          accept: "text/x-component",
          origin: base,
          cookie: `next-auth.session-token=${cookie}`,
        },
        body: JSON.stringify([draft.versionId, lockVersion, text]),
      });
      const answer = await res.text();
      saveTimes.push(performance.now() - t0);
      const saved = /"ok":true,"versionId":\d+,"lockVersion":(\d+)/.exec(answer);
      if (res.status !== 200 || !saved) throw new Error(`the editor's save answered ${res.status}: ${answer.slice(0, 300)}`);
      lockVersion = Number(saved[1]);
    })();
    duringSave.push(...(await sampleHealth(save)));
    await save;
  }
  row(
    `health, editor saves 20 000 points (${(Buffer.byteLength(pointsDocument(good, "x")) / 1e6).toFixed(1)} MB)`,
    duringSave,
    `save ${saveTimes.map(ms).join(", ")} ms`,
  );

  console.log(`Serving ${dir} (${distDir}), ${rounds} round(s) per loaded scenario\n`);
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  for (const r of rows)
    console.log(r.map((cell, c) => (c === 0 || c === 6 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join("  "));
} finally {
  stop();
}
process.exit(0);

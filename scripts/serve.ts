// Serves a built Arrhenia: the local mail capture (when SMTP_URL is unset), the local fake DOI
// registration service (when DOI_API_URL is unset), the background workers, and Next
// (scripts/inner-server.ts, answering only requests that carry the per-start key) on a private
// loopback port behind the front server (lib/auth/edge-proxy.ts) that listens on
// HOST:PORT and alone decides the client's address. Ctrl-C stops them all.
import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import postgres from "postgres";
import {
  appUrl,
  assertValidConfig,
  captureSmtpPort,
  ConfigError,
  databaseUrl,
  doiApiAuth,
  doiApiUrl,
  doiFakePort,
  fakeDoiDataDir,
  innerPort as configuredInnerPort,
  nextDistDir,
  nextHeapMb,
  renderAhead,
  orcidSettings,
  orcidStandInPort,
  serveQuiet,
  serverHost,
  serverPort,
  trustProxy,
  usesFakeDoiService,
  usesMailCapture,
} from "@/lib/config";
import { compileTrustProxy, freeLoopbackPort, startEdgeProxy } from "@/lib/auth/edge-proxy";
import { EDGE_KEY_HEADER } from "@/lib/auth/client-address";
import { CACHE_KEY_ENV, cacheInvalidationSender, forwardCacheInvalidations, settleOverdueInvalidations } from "@/lib/public-cache";
import { startFakeDoiService } from "@/lib/identifiers/fake-service";
import { startOrcidStandIn } from "@/lib/auth/orcid-stand-in";
import { doiPrefix } from "@/lib/identifiers/mint";
import { startWorkers } from "@/lib/jobs/worker";
import { isDatabaseOutage } from "@/lib/jobs/outage";
import { enqueuePendingIdentifierRegistrations } from "@/lib/identifiers/queue";
import { enqueueStaleRefits } from "@/lib/datasets/refit";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { startCaptureServer } from "@/lib/mail/capture-server";
import { DEMO_PASSWORD, demoAccounts } from "./seed/seed-data";
import { warmUpApp } from "./warm-up";
import { loadFrontRoutes } from "@/lib/http/front-routes";
import { PUBLIC_CACHE_SECONDS } from "@/lib/html-cache";
import { readPublicPagesMark, readTagMovesSince } from "@/db/public-pages-mark";
import { keptPagesInPostgres, sweepKeptPages } from "@/lib/kept-pages";
import { askFrontServer, READERS_BUSY_PER_SECOND, startRenderAhead } from "@/lib/render-ahead";
import { readFileSync } from "node:fs";
import path from "node:path";

// A bad setting stops here, before anything listens, with every problem listed.
try {
  assertValidConfig();
} catch (err) {
  if (!(err instanceof ConfigError)) throw err;
  console.error(`[arrhenia] ${err.message}`);
  process.exit(1);
}
const port = serverPort();
const host = serverHost();
const quiet = serveQuiet();

// Fails before anything starts when TRUST_PROXY cannot be read.
const trust = compileTrustProxy(trustProxy());
// A fresh secret per start: the inner server answers only requests that carry it (lib/auth/inner-gate.ts).
const edgeKey = randomBytes(24).toString("hex");
process.env.ARRHENIA_EDGE_KEY = edgeKey;
// Another per-start secret: the workers below tell Next which public data a re-fit changed (lib/public-cache.ts).
const cacheKey = randomBytes(24).toString("hex");
process.env[CACHE_KEY_ENV] = cacheKey;
// And one for the renders ahead of readers (lib/render-ahead.ts), which the front server keeps out of its memory.
const aheadKey = randomBytes(24).toString("hex");

const sql = postgres(databaseUrl(), { max: 2, onnotice: () => {} });
const capture = usesMailCapture() ? await startCaptureServer({ sql, port: captureSmtpPort() }) : null;
const fakeDoi = usesFakeDoiService()
  ? await startFakeDoiService({ port: doiFakePort(), dataDir: fakeDoiDataDir(), auth: doiApiAuth() })
  : null;
const orcid = orcidSettings();
// The callback address next-auth builds (NEXTAUTH_URL + /api/auth/callback/orcid): the stand-in accepts only it.
const orcidStandIn = orcid.standIn
  ? await startOrcidStandIn({
      port: orcidStandInPort(),
      clientId: orcid.clientId,
      clientSecret: orcid.clientSecret,
      redirectUri: `${(process.env.NEXTAUTH_URL ?? appUrl()).replace(/\/$/, "")}/api/auth/callback/orcid`,
      appUrl: appUrl(),
    })
  : null;
const workers = await startWorkers();
const pendingIdentifiers = await enqueuePendingIdentifierRegistrations();
const staleRefits = await enqueueStaleRefits();
if (quiet && staleRefits.engineMismatch)
  console.error(`[arrhenia] the database records engine ${staleRefits.engineMismatch}, this code is ${ENGINE_VERSION}: no re-fit queued`);

const innerPort = configuredInnerPort() ?? (await freeLoopbackPort());
// Without the react-server condition: Next's own server loads its vendored React as `next start` does.
forwardCacheInvalidations(cacheInvalidationSender({ port: innerPort, edgeKeyHeader: EDGE_KEY_HEADER, edgeKey, cacheKey }));
// Node itself with tsx's loader (`--import tsx`), not tsx's command, which would keep one more Node process (about 50 MB) only to relay signals.
const next = spawn(
  process.execPath,
  [`--max-old-space-size=${nextHeapMb()}`, "--import", "tsx", "scripts/inner-server.ts", String(innerPort)],
  {
    stdio: ["ignore", "inherit", "inherit"],
    // Two malloc arenas (glibc), as the front server's launchers set for it: see MALLOC_ARENA_MAX in scripts/start.sh.
    env: { MALLOC_ARENA_MAX: "2", ...process.env },
  },
);
// Set once the front server listens; stop() may run before that (Next exiting during warm-up).
const running: { edge?: Awaited<ReturnType<typeof startEdgeProxy>>; ahead?: ReturnType<typeof startRenderAhead> } = {};
let stopping = false;
async function stop(code: number) {
  if (stopping) return;
  stopping = true;
  const ahead = running.ahead?.stop();
  next.kill("SIGTERM");
  await Promise.allSettled([
    ahead,
    running.edge?.close(),
    workers.stop(),
    capture?.close(),
    fakeDoi?.close(),
    orcidStandIn?.close(),
    sql.end({ timeout: 2 }),
  ]);
  process.exit(code);
}
// A database restart under a running job must not end the site (lib/jobs/outage.ts); anything else unhandled still does.
process.on("unhandledRejection", (reason) => {
  if (isDatabaseOutage(reason)) {
    console.error(`[jobs] the database went out of reach while a job was being settled; pg-boss will hand it out again: ${String(reason)}`);
    return;
  }
  console.error("[arrhenia] unhandled rejection; stopping", reason);
  void stop(1);
});
process.on("SIGINT", () => void stop(0));
process.on("SIGTERM", () => void stop(0));
next.on("exit", (code) => void stop(code ?? 0));

// The front server opens once Next is up and every route's modules are loaded (scripts/warm-up.ts).
await Promise.all([warmUpApp({ port: innerPort, key: edgeKey, distDir: nextDistDir() }), loadFrontRoutes()]);
// The build id Next wrote, with the public address: pages kept by another build or address are not served.
const keptBuild = `${readFileSync(path.join(nextDistDir(), "BUILD_ID"), "utf8").trim()} ${new URL(appUrl()).origin}`;
const sweep = () =>
  sweepKeptPages({ build: keptBuild }).catch((e: unknown) =>
    console.error(`[pages] could not sweep the kept pages: ${e instanceof Error ? e.message : String(e)}`),
  );
void sweep();
setInterval(() => void sweep(), 60 * 60 * 1000).unref();
// Invalidations a change owed and never made (its process ended after the commit): made here.
setInterval(
  () =>
    void settleOverdueInvalidations().catch((e: unknown) =>
      console.error(`[cache] could not make the overdue invalidations: ${e instanceof Error ? e.message : String(e)}`),
    ),
  5_000,
).unref();

running.edge = await startEdgeProxy({
  host,
  port,
  upstreamPort: innerPort,
  trust,
  key: edgeKey,
  appOrigin: new URL(appUrl()).origin,
  // Search is answered in this process (lib/http/front-routes.ts): Next's thread is left to the pages.
  answersHere: true,
  // Public pages rendered for anonymous readers are replayed from this process's memory
  // (lib/html-cache.ts): at most 32 MiB of bodies, none over 4 MiB, each while the public pages'
  // mark stays and for PUBLIC_CACHE_SECONDS at most. A kept page never reaches Next's thread.
  pageCache: {
    maxBytes: 32 * 1024 * 1024,
    maxEntryBytes: 4 * 1024 * 1024,
    ttlMs: PUBLIC_CACHE_SECONDS * 1000,
    mark: readPublicPagesMark,
    // A page whose tags are known stays in memory across a move that touches none of them.
    movedSince: readTagMovesSince,
    // Dataset version, reaction and species pages are kept in the database as well (lib/kept-pages.ts),
    // by this build and public address.
    kept: keptPagesInPostgres({ build: keptBuild }),
    aheadKey,
  },
});
// Every public page without a kept copy is rendered ahead of its first reader, one at a time while
// no reader's page is rendering (lib/render-ahead.ts). RENDER_AHEAD=0 leaves it to the readers.
if (renderAhead()) {
  const edge = running.edge;
  running.ahead = startRenderAhead({
    build: keptBuild,
    ask: askFrontServer({ host, port: edge.port, key: aheadKey, publicHost: new URL(appUrl()).host }),
    // Readers first: nothing is rendered ahead while a reader's page renders, nor while readers' requests come fast (READERS_BUSY_PER_SECOND).
    busy: () => {
      const readers = edge.readers();
      return readers.rendering > 0 || readers.perSecond >= READERS_BUSY_PER_SECOND;
    },
  });
}

if (!quiet) {
  const width = Math.max(...demoAccounts.map((a) => a.email.length));
  console.log(`
  Arrhenia is running at http://${host}:${port}
  Mail: ${capture ? `captured locally (SMTP 127.0.0.1:${captureSmtpPort()}); admins read it at /admin/mail` : "sent through SMTP_URL"}
  ORCID sign-in: ${orcidStandIn ? `the local stand-in at ${orcidStandIn.url} (any iD with a right check digit)` : `through ${orcid.issuer}`}
  Identifiers (prefix ${doiPrefix()}): ${fakeDoi ? `registered with the local fake DOI service at ${fakeDoi.url}${fakeDoiDataDir() ? ` (records in ${fakeDoiDataDir()})` : ""}` : `registered through ${doiApiUrl()}`}${pendingIdentifiers ? ` — ${pendingIdentifiers} waiting, queued now` : ""}

  Fits: ${
    staleRefits.engineMismatch
      ? `the database records engine ${staleRefits.engineMismatch}, this code is ${ENGINE_VERSION}: no re-fit queued (run the migrations)`
      : staleRefits.queued
        ? `${staleRefits.queued} version(s) fitted by an older engine, re-fit queued`
        : "every version is fitted by the current engine"
  }

  Demo accounts (password for all: ${DEMO_PASSWORD})
${demoAccounts.map((a) => `    ${a.email.padEnd(width)}  ${a.role.padEnd(10)}  ${a.name}`).join("\n")}

  Ctrl-C stops the web server; \`npm run db:stop\` stops PostgreSQL.
`);
}

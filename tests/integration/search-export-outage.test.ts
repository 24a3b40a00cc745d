import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), unstable_cache: (fn: () => unknown) => fn }));

import { execFile } from "node:child_process";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { promisify } from "node:util";
import { sql } from "drizzle-orm";
// Next's own writer of a route handler's streamed body to the socket (what `next start` and
// scripts/inner-server.ts run for every Response), so this server streams as the real one does.
import { pipeToNodeResponse } from "next/dist/server/pipe-readable";
import { GET as getSearchExport } from "@/app/api/v1/search/export/route";
import { getDb } from "@/db/client";
import { databaseUrl } from "@/lib/config";
import { postgresEngine } from "@/lib/search/engines/postgres";
import type { DatasetHit, EngineQuery, SearchFacet, SearchResult } from "@/lib/search/types";

/**
 * A whole-search export when PostgreSQL goes away in the middle of the stream, over a real HTTP
 * connection: the reader gets the rows sent so far and then a connection closed before the end of
 * the chunked body (never a file that merely stops, never a connection left open), and once the
 * database is back the same server exports again. Needs the throwaway cluster of `npm test`
 * (TEST_PG_DIR, PGBIN), which it stops and starts, as tests/integration/db-restart.test.ts does.
 */

const run = promisify(execFile);
const dir = process.env.TEST_PG_DIR;
const pgBin = process.env.PGBIN;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function pgCtl(args: string[]) {
  const pgCtlPath = `${pgBin}/pg_ctl`;
  const [cmd, argv] = process.getuid?.() === 0 ? ["runuser", ["-u", "postgres", "--", pgCtlPath, ...args]] : [pgCtlPath, args];
  await run(cmd, argv, { cwd: "/", timeout: 60_000 });
}

/** The port the cluster listens on is a start option (scripts/env.sh), so a start after a stop passes it again. */
async function startAgain() {
  const port = new URL(databaseUrl()).port;
  await pgCtl(["-D", `${dir}/data`, "-o", `-p ${port}`, "-l", `${dir}/server.log`, "-w", "-t", "60", "start"]);
}

/** What one download saw. */
interface Download {
  status: number;
  bytes: number;
  /** The chunked body ended properly (its last chunk arrived). */
  complete: boolean;
  error: string | null;
  closedAt: number;
}

function download(port: number, path: string, onBytes?: (bytes: number) => void): Promise<Download> {
  return new Promise((resolve) => {
    const req = http.get({ host: "127.0.0.1", port, path, agent: false }, (res) => {
      let bytes = 0;
      let error: string | null = null;
      res.on("data", (chunk: Buffer) => {
        bytes += chunk.length;
        onBytes?.(bytes);
      });
      res.on("error", (err) => (error = (err as NodeJS.ErrnoException).code ?? err.message));
      res.on("aborted", () => (error ??= "aborted"));
      res.on("close", () => resolve({ status: res.statusCode ?? 0, bytes, complete: res.complete, error, closedAt: Date.now() }));
    });
    req.on("error", (err) =>
      resolve({ status: 0, bytes: 0, complete: false, error: (err as NodeJS.ErrnoException).code ?? err.message, closedAt: Date.now() }),
    );
    req.setTimeout(60_000, () => req.destroy(new Error("client timeout")));
  });
}

/** An invented hit (the rows' content does not matter here, only that each batch needs the database). */
function hit(i: number): DatasetHit {
  return {
    versionId: i + 1,
    datasetId: i + 1,
    versionNumber: 1,
    versionIdentifier: `10.5072/ARH-GEN0-${String(i).padStart(6, "0")}/1`,
    retracted: false,
    title: `Invented dataset ${i}, generated for the test`,
    equation: "A + B → C",
    reactionKey: "GENERATEDKEYXX-XXXXXXXXXX-N>>GENERATEDKEYYY-YYYYYYYYYY-N",
    reactionClass: "abstraction",
    methodCategory: "measured",
    tMin: 200,
    tMax: 400,
    pointCount: 5,
    ea: 1000,
    a: 1e-12,
    aUnit: "cm3 molecule-1 s-1",
    flags: [],
    creators: ["Invented, Person"],
    publishedAt: new Date(Date.UTC(2020, 0, 1)).toISOString(),
  };
}

describe.skipIf(!dir || !pgBin)("a search export when the database stops mid-stream", () => {
  let server: http.Server;
  let port: number;

  beforeAll(async () => {
    server = http.createServer(async (req, res) => {
      try {
        const response = await getSearchExport(new Request(`http://127.0.0.1${req.url}`), { params: Promise.resolve({}) });
        res.writeHead(response.status, Object.fromEntries(response.headers));
        if (response.body) await pipeToNodeResponse(response.body, res);
        else res.end();
      } catch (err) {
        // A stream that fails after its first bytes: Next logs it; the socket is already destroyed.
        console.warn("[test server]", (err as Error).message);
        if (!res.headersSent) res.writeHead(500).end();
      }
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    port = (server.address() as AddressInfo).port;
  });

  afterAll(async () => {
    vi.restoreAllMocks();
    await new Promise((r) => server.close(r));
  });

  it(
    "cuts the connection after the rows already sent, answers 503 while it is down, and exports again once it is back",
    { timeout: 120_000 },
    async () => {
      // Every batch reads the database (as the real engine does) before it answers 1000 invented rows; 500 000 rows in all.
      const TOTAL = 500_000;
      const spy = vi.spyOn(postgresEngine, "search").mockImplementation(async (query: EngineQuery): Promise<SearchResult> => {
        await getDb().execute(sql`select pg_sleep(0.02)`);
        const from = query.after === null ? 0 : Number(query.after);
        const to = Math.min(TOTAL, from + query.limit);
        return {
          view: "datasets",
          total: TOTAL,
          hits: Array.from({ length: to - from }, (_, k) => hit(from + k)),
          facets: {} as Record<SearchFacet, []>,
          nextAfter: to < TOTAL ? String(to) : null,
        };
      });
      let stoppedAt = 0;
      let restarted = false;
      try {
        // Stop the database once the first megabyte has arrived.
        let stopping: Promise<void> | null = null;
        const cut = await download(port, "/api/v1/search/export?format=csv", (bytes) => {
          if (bytes > 1_000_000 && !stopping) {
            stoppedAt = Date.now();
            stopping = pgCtl(["-D", `${dir}/data`, "-m", "fast", "-w", "-t", "60", "stop"]);
          }
        });
        await stopping;
        expect(cut.status).toBe(200);
        // Rows were received, far fewer than the whole result (about 300 bytes a row), and the body never ended properly.
        expect(cut.bytes).toBeGreaterThan(1_000_000);
        expect(cut.bytes).toBeLessThan(TOTAL * 100);
        expect(cut.complete).toBe(false);
        expect(cut.error).not.toBeNull();
        // The connection closed soon after the stop, not left open waiting for a database that is gone.
        expect(cut.closedAt - stoppedAt).toBeLessThan(15_000);

        // While it is down the same server answers at once: a 503 problem before any row.
        const down = await fetch(`http://127.0.0.1:${port}/api/v1/search/export?format=csv`);
        expect(down.status).toBe(503);
        expect(down.headers.get("content-type")).toMatch(/^application\/problem\+json/);
        expect(down.headers.get("retry-after")).toBeTruthy();

        await startAgain();
        restarted = true;
        spy.mockRestore();
        // Back: the real engine over the seeded data, a whole file with its last chunk.
        let again: Download | null = null;
        for (let attempt = 0; attempt < 20 && again?.status !== 200; attempt++) {
          if (attempt > 0) await sleep(500);
          again = await download(port, "/api/v1/search/export?format=csv&q=methane");
        }
        expect(again).toMatchObject({ status: 200, complete: true, error: null });
        console.info(
          `[search export outage] cut after ${cut.bytes} bytes, closed ${cut.closedAt - stoppedAt} ms after the stop (${cut.error}); then 503; after the restart a complete export of ${again!.bytes} bytes`,
        );
      } finally {
        spy.mockRestore();
        if (!restarted) await startAgain().catch(() => {});
      }
    },
  );
});

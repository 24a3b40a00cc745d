/**
 * Load for the web benchmark: autocannon at a fixed number of connections over a list of URLs
 * (each request takes the next one, so no single URL stays hot), exact latency percentiles from
 * every response, and the peak resident memory of a process tree sampled from /proc.
 */
import { readdirSync, readFileSync } from "node:fs";
import autocannon from "autocannon";

export interface ScenarioResult {
  name: string;
  kind: "search" | "page";
  p50: number;
  p95: number;
  p99: number;
  requestsPerSecond: number;
  requests: number;
  non2xx: number;
  errors: number;
  /** How the page answers were served (the server's `x-arrhenia-html-cache`: hit, kept, miss; "none" without it), with their own p95. */
  served: Record<string, { count: number; p95: number }>;
}

/** The response header that says how a page was served (lib/html-cache.ts HTML_CACHE_HEADER). */
const SERVED_HEADER = "x-arrhenia-html-cache";

function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

/** What the benchmark's requests accept as Content-Encoding: Chromium's Accept-Encoding. */
export const ACCEPT_ENCODING = "gzip, deflate, br, zstd";

/** Runs autocannon against `base` for `seconds`, each request on the next path of `paths`. */
export function drive(base: string, paths: string[], seconds: number, connections: number): Promise<Omit<ScenarioResult, "name" | "kind">> {
  let i = 0;
  const latencies: number[] = [];
  const byServed = new Map<string, number[]>();
  // autocannon calls a request's onResponse, with the headers, just before the client's
  // "response" event, with the time, for the same answer on the same connection.
  let served = "none";
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url: base,
        connections,
        duration: seconds,
        timeout: 30,
        // Compressed answers accepted, as every browser and crawler says (Chromium's list): the
        // answers are then the sizes readers receive; uncompressed, the load generator's own thread,
        // parsing ~100 MB/s of kept HTML, was what the "again" rows measured.
        headers: { "accept-encoding": ACCEPT_ENCODING },
        requests: [
          {
            method: "GET",
            setupRequest: (req) => ({ ...req, path: paths[i++ % paths.length] }),
            onResponse: (_status, _body, _context, headers) => {
              served = String(headers?.[SERVED_HEADER] ?? "none");
            },
          },
        ],
      },
      (err, result) => {
        if (err) return reject(err);
        latencies.sort((a, b) => a - b);
        const servedSummary: Record<string, { count: number; p95: number }> = {};
        for (const [how, times] of byServed)
          servedSummary[how] = {
            count: times.length,
            p95: percentile(
              times.sort((a, b) => a - b),
              95,
            ),
          };
        resolve({
          p50: percentile(latencies, 50),
          p95: percentile(latencies, 95),
          p99: percentile(latencies, 99),
          requestsPerSecond: result.requests.total / result.duration,
          requests: result.requests.total,
          non2xx: result.non2xx,
          errors: result.errors + result.timeouts,
          served: servedSummary,
        });
      },
    );
    instance.on("response", (_client, _status, _bytes, responseTime) => {
      latencies.push(responseTime);
      const times = byServed.get(served) ?? [];
      if (!times.length) byServed.set(served, times);
      times.push(responseTime);
      served = "none";
    });
  });
}

/** Every process whose ancestry reaches `root` (root included), from /proc. */
function processTree(root: number): number[] {
  const children = new Map<number, number[]>();
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      // Field 4 of /proc/<pid>/stat is the parent; the command name (field 2) may hold spaces, so read after its ")".
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      // the process ended while the list was read
    }
  }
  const tree: number[] = [];
  const queue = [root];
  while (queue.length) {
    const pid = queue.pop()!;
    tree.push(pid);
    queue.push(...(children.get(pid) ?? []));
  }
  return tree;
}

function rssBytes(pid: number): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) * 1024 : 0;
  } catch {
    return 0;
  }
}

/** Samples the summed resident memory of `root`'s process tree every `everyMs` until stopped; `peak` is the largest sum seen. */
export function sampleTreeMemory(root: number, everyMs = 250) {
  const state = { peak: 0, processes: 0, atPeak: [] as number[], phase: "start-up", peakPhase: "" };
  const sample = () => {
    const tree = processTree(root);
    const each = tree.map(rssBytes);
    const total = each.reduce((sum, b) => sum + b, 0);
    if (total > state.peak) {
      state.peak = total;
      state.atPeak = each;
      state.peakPhase = state.phase;
    }
    state.processes = tree.length;
  };
  sample();
  const timer = setInterval(sample, everyMs);
  return {
    get peak() {
      return state.peak;
    },
    get processes() {
      return state.processes;
    },
    /** Each process's RSS at the peak, largest first, and what the run was doing then. */
    get atPeak() {
      return { bytes: [...state.atPeak].sort((a, b) => b - a), phase: state.peakPhase };
    },
    /** Names what the run does from now on (reported with the peak). */
    set phase(name: string) {
      state.phase = name;
    },
    stop: () => clearInterval(timer),
  };
}

/** Plain-text table: first column left-aligned, the others right-aligned. */
export function formatTable(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => (r[c] ?? "").length)));
  return rows.map((r) => r.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join("  ")).join("\n");
}

// Next instantiates a route's modules on the first request that needs them: for the deposit
// routes and the editor's actions that took 0.5–1 s of the request thread, during which every
// other request (health included) waited. scripts/serve.ts therefore sends each route handler and
// each file of server actions one harmless request on Next's private port before the front
// server opens: OPTIONS to every route handler, an action call with no arguments (refused by its
// zod schema, so nothing happens) and a plain GET of each page that holds actions.
import { readFileSync } from "node:fs";
import path from "node:path";
import { EDGE_KEY_HEADER } from "@/lib/auth/client-address";

/** A concrete path for a route pattern: `/deposits/[id]` → `/deposits/1`, route groups removed. */
export function samplePath(route: string): string {
  const p = route
    .replace(/\/\([^/]+\)/g, "")
    .replace(/\[\[?\.\.\.[^\]]+\]\]?/g, "session")
    .replace(/\[[^\]]+\]/g, "1")
    .replace(/\/(page|route)$/, "");
  return p === "" ? "/" : p;
}

function readJson<T>(file: string): T | null {
  try {
    return JSON.parse(readFileSync(file, "utf8")) as T;
  } catch {
    return null;
  }
}

/** The warm-up requests for a build: [method, path, headers, body]. */
export function warmUpRequests(distDir: string): [string, string, Record<string, string>, string | undefined][] {
  const routes = Object.keys(readJson<Record<string, string>>(path.join(distDir, "server/app-paths-manifest.json")) ?? {});
  const actions = readJson<{ node?: Record<string, { workers?: Record<string, unknown>; filename?: string }> }>(
    path.join(distDir, "server/server-reference-manifest.json"),
  );
  const requests: [string, string, Record<string, string>, string | undefined][] = [];
  for (const route of routes) if (route.endsWith("/route")) requests.push(["OPTIONS", samplePath(route), {}, undefined]);
  const files = new Set<string>();
  const pages = new Set<string>();
  for (const [id, entry] of Object.entries(actions?.node ?? {})) {
    const worker = Object.keys(entry.workers ?? {})[0];
    if (!worker) continue;
    const page = samplePath(worker.replace(/^app/, ""));
    pages.add(page);
    if (entry.filename && files.has(entry.filename)) continue;
    if (entry.filename) files.add(entry.filename);
    requests.push(["POST", page, { "next-action": id, "content-type": "text/plain;charset=UTF-8" }, "[]"]);
  }
  for (const page of pages) requests.push(["GET", page, {}, undefined]);
  return requests;
}

/**
 * Waits (up to `timeoutMs`) until Next answers on `port`, then sends the warm-up requests one by
 * one. Never throws: a failed warm-up only means the first visitor pays the load instead.
 */
export async function warmUpApp({
  port,
  key,
  distDir,
  timeoutMs = 120_000,
}: {
  port: number;
  key: string;
  distDir: string;
  timeoutMs?: number;
}) {
  const base = `http://127.0.0.1:${port}`;
  const keyed = { [EDGE_KEY_HEADER]: key, origin: base };
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const up = await fetch(`${base}/api/health`, { headers: keyed }).then(
      (r) => r.arrayBuffer().then(() => true),
      () => false,
    );
    if (up) break;
    if (Date.now() > deadline) return { sent: 0 };
    await new Promise((r) => setTimeout(r, 200));
  }
  let sent = 0;
  for (const [method, p, headers, body] of warmUpRequests(distDir)) {
    await fetch(`${base}${p}`, { method, headers: { ...keyed, ...headers }, body, redirect: "manual", signal: AbortSignal.timeout(30_000) })
      .then((r) => r.arrayBuffer())
      .then(
        () => sent++,
        () => {},
      );
  }
  return { sent };
}

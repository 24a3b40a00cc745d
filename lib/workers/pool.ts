/**
 * A small pool of worker threads (piscina) for work that grows with the input — validating and
 * analysing a deposit, the stateless analysis — so that one large request never stalls the
 * thread that answers every other request. Bounded three ways: threads (ANALYSIS_THREADS), tasks
 * waiting (ANALYSIS_QUEUE_LIMIT, then 503 at once) and time per task (ANALYSIS_TIMEOUT_MS, then
 * the thread is stopped and the request gets a 503). Re-fits run on a background thread of lower
 * CPU priority.
 */
import path from "node:path";
import { Piscina } from "piscina";
import { analysisMemoryMb, analysisQueueLimit, analysisThreads, analysisTimeoutMs } from "@/lib/config";
import { AppError } from "@/lib/errors";
import type { TaskMessage, TaskName, Tasks } from "./tasks";

/** Seconds a client is asked to wait before retrying when the pool is full or a task timed out. */
const RETRY_AFTER_SECONDS = 5;

// One pool of each kind per process, kept on globalThis: the production build may bundle this
// module into several route chunks, and each copy must not start threads of its own.
const POOL_KEY = Symbol.for("arrhenia.analysisPool");
const BACKGROUND_POOL_KEY = Symbol.for("arrhenia.backgroundAnalysisPool");
const holder = globalThis as typeof globalThis & { [POOL_KEY]?: Piscina; [BACKGROUND_POOL_KEY]?: Piscina };

/**
 * The worker entry is found from the project folder, not from this module's location: the
 * production build bundles this module elsewhere, while the entry file is served from the source
 * tree as it is. Every way of running the app (npm start, npm test, tsx scripts) starts in it.
 */
export function analysisWorkerFile(): string {
  return path.join(process.cwd(), "lib", "workers", "analysis-worker.mjs");
}

/**
 * Work someone is waiting for (a deposit's validation, an analysis) runs at the request thread's
 * priority: at nice 10 it got a tenth of a core's share against each busy process of the machine,
 * and a 100 000-point document took 8–13 s to its 422 on a loaded machine instead of 0.2 s.
 * The request thread keeps a core of its own because the threads are at most cores − 1.
 */
function getPool(): Piscina {
  if (!holder[POOL_KEY]) {
    const threads = analysisThreads();
    holder[POOL_KEY] = new Piscina({
      filename: analysisWorkerFile(),
      minThreads: threads,
      maxThreads: threads,
      maxQueue: analysisQueueLimit(),
      // Threads stay up: starting one (loading the engine) costs far more than a typical task.
      idleTimeout: 10 * 60_000,
      resourceLimits: { maxOldGenerationSizeMb: analysisMemoryMb() },
    });
  }
  return holder[POOL_KEY];
}

/**
 * Work nobody waits for (re-fits queued after an engine upgrade) runs on its own thread at a lower
 * CPU priority (nice 10), so that a queue of re-fits yields to requests and to PostgreSQL. Linux
 * nice values are per thread (piscina sets it through @napi-rs/nice, its optional dependency;
 * without it the thread runs at normal priority). Started on first use, stopped when idle.
 */
function getBackgroundPool(): Piscina {
  holder[BACKGROUND_POOL_KEY] ??= new Piscina({
    filename: analysisWorkerFile(),
    minThreads: 0,
    maxThreads: 1,
    idleTimeout: 60_000,
    niceIncrement: 10,
    resourceLimits: { maxOldGenerationSizeMb: analysisMemoryMb() },
  });
  return holder[BACKGROUND_POOL_KEY];
}

/** Start the pool's threads now (at server start), so the first request does not wait for them. */
export function warmAnalysisPool(): void {
  getPool();
}

function busy(message: string): AppError {
  return new AppError("unavailable", message, [], RETRY_AFTER_SECONDS);
}

/** Run one task on a worker thread; 503 when the queue is full or the task runs out of time. */
export async function runAnalysisTask<N extends TaskName>(
  name: N,
  input: Parameters<Tasks[N]>[0],
  {
    transfer,
    background = false,
  }: {
    /** Moved to the worker, not copied (and unusable here afterwards). */ transfer?: ArrayBuffer[];
    /** Nobody waits for the answer (a re-fit): run at the lower priority of the background thread. */
    background?: boolean;
  } = {},
): Promise<ReturnType<Tasks[N]>> {
  const workers = background ? getBackgroundPool() : getPool();
  if (!background && workers.queueSize >= analysisQueueLimit()) {
    throw busy("The server is busy checking other submissions; try again in a few seconds.");
  }
  const timeoutMs = analysisTimeoutMs();
  const message: TaskMessage<N> = { name, input };
  try {
    return await workers.run(message, { signal: AbortSignal.timeout(timeoutMs), transferList: transfer });
  } catch (err) {
    const e = err as Error;
    if (e?.name === "AbortError" || e?.name === "TimeoutError") {
      throw busy(
        `Checking this submission took longer than ${Math.round(timeoutMs / 1000)} s and was stopped; try again later or split it.`,
      );
    }
    // The thread ran out of its heap (ANALYSIS_MEMORY_MB): piscina replaces it; the input was too much to take.
    if ((e as { code?: string })?.code === "ERR_WORKER_OUT_OF_MEMORY" || /out of memory/i.test(e?.message ?? ""))
      throw new AppError("validation_failed", "This input needs more memory than one check may use; split it into smaller parts.");
    if (/queue is at limit/i.test(e?.message ?? ""))
      throw busy("The server is busy checking other submissions; try again in a few seconds.");
    throw err;
  }
}

/** Stop the pool's threads (tests and orderly shutdown). */
export async function closeAnalysisPool(): Promise<void> {
  const pools = [holder[POOL_KEY], holder[BACKGROUND_POOL_KEY]];
  delete holder[POOL_KEY];
  delete holder[BACKGROUND_POOL_KEY];
  await Promise.all(pools.map((p) => p?.destroy()));
}

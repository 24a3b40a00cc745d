// Runs once when the Next.js server starts: a bad setting stops it with every problem listed, and
// the analysis worker threads start before the first request needs them (a thread takes a few
// seconds to load the engine).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { assertValidConfig } = await import("@/lib/config");
  assertValidConfig();
  const { warmAnalysisPool } = await import("@/lib/workers/pool");
  warmAnalysisPool();
}

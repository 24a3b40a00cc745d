// Runs once when the Next.js server starts: a bad setting stops it with every problem listed, and
// what the first requests would otherwise load on the request thread is loaded now: the analysis
// worker threads (a thread takes a few seconds to load the engine) and RDKit (≈ 0.5–1 s of
// WebAssembly start-up that stalled every request when the first deposit needed it).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { assertValidConfig } = await import("@/lib/config");
  assertValidConfig();
  const { warmAnalysisPool } = await import("@/lib/workers/pool");
  warmAnalysisPool();
  const { getRdkit } = await import("@/lib/chem");
  await getRdkit();
}

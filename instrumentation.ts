// Runs once when the server starts: start the analysis worker threads before the first request
// needs them (a thread takes a few seconds to load the engine).
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { warmAnalysisPool } = await import("@/lib/workers/pool");
  warmAnalysisPool();
}

// Runs once when the Next.js server starts: a bad setting stops it with every problem listed.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { assertValidConfig } = await import("@/lib/config");
  assertValidConfig();
}

import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// Two tiers: pure unit tests, and integration tests against the real PostgreSQL that
// scripts/test.sh starts (DATABASE_URL points at the throwaway cluster).
export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    alias: { "server-only": fileURLToPath(new URL("./tests/support/server-only.ts", import.meta.url)) },
  },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.ts", "lib/**/*.test.ts"],
          environment: "node",
          // Room for a shared, loaded machine: a timeout is a hang detector here, not a speed target.
          testTimeout: 20_000,
          // A failed test runs once more; npm test names every test that passed only then
          // (scripts/test-failures.mjs), so a flaky test is seen, not hidden.
          retry: 1,
        },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/integration/setup.ts"],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 60_000,
          retry: 1,
        },
      },
    ],
  },
});

import { defineConfig, devices } from "@playwright/test";

// End-to-end tests drive Debian's Chromium (no browser download) against the production build
// that scripts/test.sh made, served by the same script `npm start` uses.
const port = Number(process.env.E2E_PORT ?? 3100);
const baseURL = `http://127.0.0.1:${port}`;
// Next's private port behind the front server, fixed here so a test can knock on it directly.
const innerPort = Number(process.env.E2E_INNER_PORT ?? port + 1);

export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  // Once more after a failure; npm test names each test that passed only then (scripts/test-failures.mjs).
  retries: 1,
  // npm run bench:analyse repeats its one test; every other run takes each test once.
  repeatEach: Number(process.env.E2E_REPEAT_EACH ?? 1),
  timeout: 60_000,
  expect: { timeout: 10_000 },
  use: {
    baseURL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-dev-shm-usage",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--disable-quic",
      ],
    },
  },
  projects: [{ name: "chromium", use: { ...devices["Desktop Chrome"], channel: undefined } }],
  webServer: {
    command: "node_modules/.bin/tsx --conditions=react-server --max-old-space-size=384 scripts/serve.ts",
    url: `${baseURL}/api/health`,
    reuseExistingServer: false,
    // Start-up includes one warm-up request per route before the front server opens (scripts/warm-up.ts).
    timeout: 120_000,
    stdout: "pipe",
    stderr: "pipe",
    env: {
      PORT: String(port),
      INNER_PORT: String(innerPort),
      MAIL_CAPTURE_PORT: String(Number(process.env.E2E_MAIL_PORT ?? 2625)),
      // The fake DOI service on its own port and folder, so a running `npm start` is untouched.
      DOI_FAKE_PORT: String(Number(process.env.E2E_DOI_PORT ?? 5190)),
      // The ORCID stand-in on its own port too.
      ORCID_STAND_IN_PORT: String(Number(process.env.E2E_ORCID_PORT ?? 5390)),
      DOI_FAKE_DATA_DIR: `${process.env.TEST_REPORTS_DIR ?? ".data/test-reports"}/fake-doi`,
      NEXTAUTH_URL: baseURL,
      APP_URL: baseURL,
      SERVE_QUIET: "1",
    },
  },
});

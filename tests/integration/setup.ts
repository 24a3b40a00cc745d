// Integration tests run against the throwaway PostgreSQL that scripts/test.sh starts and migrates.
if (!process.env.DATABASE_URL) {
  throw new Error("DATABASE_URL is not set: run integration tests through `npm test`, which starts a throwaway PostgreSQL");
}
// Each test file gets its own capture port so a left-over server never collides.
process.env.MAIL_CAPTURE_PORT ??= String(26000 + Math.floor(Math.random() * 2000));
process.env.APP_URL ??= "http://127.0.0.1:3999";
delete process.env.SMTP_URL;
// Stands in for the key scripts/serve.ts shares with Next: tests set the client address the way
// the front server does (helpers.ts fromAddress).
process.env.ARRHENIA_EDGE_KEY ??= "integration-edge-key";
process.env.JOB_RETRY_DELAY_SECONDS ??= "1"; // retries within seconds, not minutes, in tests

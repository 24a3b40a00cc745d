// Names every failed test of a run, from the tiers' JSON reports, so the last lines of `npm test`
// (often all a CI log keeps) say what failed and where. Usage: node scripts/test-failures.mjs DIR
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";

const dir = process.argv[2];
const firstLine = (text) =>
  String(text ?? "")
    .replace(/\u001b\[[0-9;]*m/g, "")
    .split("\n")
    .map((l) => l.trim())
    .find((l) => l.length > 0)
    ?.slice(0, 300) ?? "";
const read = (name) => {
  const file = join(dir, name);
  if (!existsSync(file)) return null;
  try {
    return JSON.parse(readFileSync(file, "utf8"));
  } catch {
    return null;
  }
};

const lines = [];
for (const tier of ["unit", "integration"]) {
  const report = read(`${tier}.json`);
  if (!report) continue;
  for (const file of report.testResults ?? []) {
    const path = String(file.name ?? "").replace(/^.*?\/(tests|lib)\//, "$1/");
    const failed = (file.assertionResults ?? []).filter((t) => t.status === "failed");
    for (const t of failed) lines.push(`${tier}: ${path} › ${t.fullName} — ${firstLine(t.failureMessages?.[0])}`);
    if (failed.length === 0 && file.status === "failed") lines.push(`${tier}: ${path} — ${firstLine(file.message)}`);
  }
}
const e2e = read("e2e.json");
if (e2e) {
  const walk = (suite, file) => {
    for (const spec of suite.specs ?? []) {
      for (const test of spec.tests ?? []) {
        if (test.status !== "unexpected" && test.status !== "flaky") continue;
        const last = test.results?.[test.results.length - 1];
        const what = test.status === "flaky" ? "passed on retry" : firstLine(last?.error?.message);
        lines.push(`e2e: ${spec.file ?? file}:${spec.line} › ${spec.title} — ${what}`);
      }
    }
    for (const child of suite.suites ?? []) walk(child, suite.file ?? file);
  };
  for (const suite of e2e.suites ?? []) walk(suite, suite.file);
  for (const err of e2e.errors ?? []) lines.push(`e2e: ${firstLine(err.message)}`);
}
if (lines.length) {
  console.error("\nFailed tests:");
  for (const line of lines) console.error(`  ${line}`);
}

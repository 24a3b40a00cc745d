// Names every failed test of a run, and every test that passed only when run again (the tiers retry a
// failed test once), from the tiers' JSON reports, so the last lines of `npm test` (often all a CI
// log keeps) say what failed and where. Usage: node scripts/test-failures.mjs DIR
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
const retried = [];
for (const tier of ["unit", "integration"]) {
  const report = read(`${tier}.json`);
  if (!report) continue;
  for (const file of report.testResults ?? []) {
    const path = String(file.name ?? "").replace(/^.*?\/(tests|lib)\//, "$1/");
    const failed = (file.assertionResults ?? []).filter((t) => t.status === "failed");
    for (const t of failed) lines.push(`${tier}: ${path} › ${t.fullName} — ${firstLine(t.failureMessages?.[0])}`);
    for (const t of file.assertionResults ?? []) {
      if (t.status === "passed" && t.failureMessages?.length) {
        retried.push(`${tier}: ${path} › ${t.fullName} — first run: ${firstLine(t.failureMessages[0])}`);
      }
    }
    if (failed.length === 0 && file.status === "failed") lines.push(`${tier}: ${path} — ${firstLine(file.message)}`);
  }
}
const e2e = read("e2e.json");
if (e2e) {
  const walk = (suite, file) => {
    for (const spec of suite.specs ?? []) {
      for (const test of spec.tests ?? []) {
        const where = `e2e: ${spec.file ?? file}:${spec.line} › ${spec.title}`;
        if (test.status === "flaky") retried.push(`${where} — first run: ${firstLine(test.results?.[0]?.error?.message)}`);
        if (test.status !== "unexpected") continue;
        lines.push(`${where} — ${firstLine(test.results?.at(-1)?.error?.message)}`);
      }
    }
    for (const child of suite.suites ?? []) walk(child, suite.file ?? file);
  };
  for (const suite of e2e.suites ?? []) walk(suite, suite.file);
  for (const err of e2e.errors ?? []) lines.push(`e2e: ${firstLine(err.message)}`);
}
if (retried.length) {
  console.error("\nPassed only when run again (flaky — worth a look):");
  for (const line of retried) console.error(`  ${line}`);
}
if (lines.length) {
  console.error("\nFailed tests:");
  for (const line of lines) console.error(`  ${line}`);
}

#!/usr/bin/env bash
# npm run bench:analyse — how responsive /analyse stays while 100 000 pasted points are read, fitted
# and drawn: runs the end-to-end file tests/e2e/analyse-large.spec.ts (its own throwaway cluster and
# production build, through scripts/test.sh), each test BENCH_ROUNDS times (default 3), and prints one table of its
# figures against the target (no main-thread task and no gap between frames over 500 ms).
# Not a test: the test itself only fails on a freeze.
source "$(dirname "$0")/env.sh"
cd "$ROOT"
FIGURES="$(mktemp)"
trap 'rm -f "$FIGURES"' EXIT
rounds="${BENCH_ROUNDS:-3}"
E2E_REPEAT_EACH="$rounds" ANALYSE_FIGURES_FILE="$FIGURES" TEST_TIERS=e2e TEST_FILES="analyse-large" bash scripts/test.sh > /dev/null || exit 1
node - "$FIGURES" <<'JS'
const rows = require("node:fs").readFileSync(process.argv[2], "utf8").trim().split("\n").map((l) => JSON.parse(l));
const target = 500;
console.log("| round | read (ms) | read + fit + draw (ms) | long tasks | longest task (ms) | longest frame gap (ms) | target ≤ 500 ms |");
console.log("| --- | --- | --- | --- | --- | --- | --- |");
rows.forEach((r, i) => {
  const met = r.longestTask <= target && r.maxFrameGap <= target;
  console.log(`| ${i + 1} | ${r.read} | ${r.total} | ${r.longTasks} | ${Math.round(r.longestTask)} | ${Math.round(r.maxFrameGap)} | ${met ? "met" : "NOT met"} |`);
});
console.log(`load average: ${require("node:os").loadavg().map((x) => x.toFixed(2)).join(" ")}`);
JS

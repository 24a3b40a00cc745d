#!/usr/bin/env bash
# npm test: the same bootstrap as npm start, into a throwaway PostgreSQL cluster (own folder and
# port, removed afterwards), then every tier: lint, typecheck, unit, integration, end-to-end.
# The last line totals every tier as "N passed, N failed".
source "$(dirname "$0")/env.sh"
cd "$ROOT"
set +e
ensure_node_modules || exit 1
ensure_postgres || exit 1
ensure_chromium || exit 1

# Random ports lie below Linux's ephemeral range (32768–60999), where an outgoing connection could hold one.
TEST_PORT="${TEST_PGPORT:-$((20000 + RANDOM % 2000))}"
DIR="$(pg_state_dir "postgres-test-$$")"
REPORTS="$ROOT/.data/test-reports/$$"
mkdir -p "$REPORTS"; export TEST_REPORTS_DIR="$REPORTS"
cleanup() { pg_stop "$DIR" 2>/dev/null; rm -rf "$DIR"; }
trap cleanup EXIT INT TERM

pg_init "$DIR" fast && pg_start "$DIR" "$TEST_PORT" || exit 1
# The restart test drives this cluster with pg_ctl (PGBIN is exported by ensure_postgres).
export TEST_PG_DIR="$DIR"
# The app and the tests run as the runtime role; migrations as the schema owner.
DATABASE_URL="$(pg_url "$DIR" "$TEST_PORT")"; export DATABASE_URL
MIGRATION_DATABASE_URL="$(pg_owner_url "$DIR" "$TEST_PORT")"; export MIGRATION_DATABASE_URL
export NEXTAUTH_SECRET="test-secret-$(head -c 16 /dev/urandom | od -An -tx1 | tr -d ' \n')"
export BCRYPT_ROUNDS=4 # fast hashes in the throwaway cluster only
export API_RATE_LIMIT=1000000 # the suites share one client address; the 429 test spends a budget itself
export NEXT_DIST_DIR=.next-test # never the build that npm start serves
TSX=(node_modules/.bin/tsx --conditions=react-server)

# TEST_TIERS="unit e2e" runs a subset while developing; CI always runs every tier.
# TEST_FILES="consensus deposits-api" passes file filters to vitest (unit and integration tiers) and to
# Playwright (e2e tier: TEST_TIERS=e2e TEST_FILES=deposit-drafts).
read -r -a FILTERS <<< "${TEST_FILES:-}"
TIERS=" ${TEST_TIERS:-lint typecheck unit integration e2e} "
want() { [[ "$TIERS" == *" $1 "* ]]; }
passed=0; failed=0
tier() { # tier NAME PASSED FAILED
  printf '\033[1m%-12s %s passed, %s failed\033[0m\n' "$1" "$2" "$3" >&2
  passed=$((passed + $2)); failed=$((failed + $3))
  if [ "$3" -gt 0 ]; then failedTiers+=("$1"); fi
}
failedTiers=()
# single NAME COMMAND…: a one-test tier; its output goes to the log and to $REPORTS/NAME.log, named again at the end if it fails.
single() {
  local name="$1"; shift
  if "$@" > "$REPORTS/$name.log" 2>&1; then cat "$REPORTS/$name.log" >&2; echo "1 0"; else cat "$REPORTS/$name.log" >&2; echo "0 1"; fi
}

log "migrate + seed + runtime role's privileges"
read -r p f < <(single setup bash -c '"$@" scripts/migrate.ts && "$@" scripts/seed.ts && "$@" scripts/db-privileges.ts' _ "${TSX[@]}"); tier setup "$p" "$f"

want lint && { log "lint"; read -r p f < <(single lint bash -c "node_modules/.bin/eslint --max-warnings=0 . && node_modules/.bin/prettier --check . >/dev/null"); tier lint "$p" "$f"; }
want typecheck && { log "typecheck"; read -r p f < <(single typecheck node_modules/.bin/tsc --noEmit); tier typecheck "$p" "$f"; }

count_vitest() { node -e 'try{const r=require(process.argv[1]);console.log(r.numPassedTests,r.numFailedTests+(r.numRuntimeErrorTestSuites||0)+(r.success===false&&r.numFailedTests===0?1:0))}catch{console.log("0 1")}' "$1"; }

if want unit; then
log "unit tests"
node_modules/.bin/vitest run --project unit --passWithNoTests "${FILTERS[@]}" --reporter=default --reporter=json --outputFile.json="$REPORTS/unit.json" >&2
read -r p f < <(count_vitest "$REPORTS/unit.json"); tier unit "$p" "$f"
fi

if want integration; then
log "integration tests (PostgreSQL at 127.0.0.1:$TEST_PORT)"
node_modules/.bin/vitest run --project integration --passWithNoTests "${FILTERS[@]}" --reporter=default --reporter=json --outputFile.json="$REPORTS/integration.json" >&2
read -r p f < <(count_vitest "$REPORTS/integration.json"); tier integration "$p" "$f"
fi

if want e2e; then
log "production build"
if node_modules/.bin/next build > "$REPORTS/build.log" 2>&1; then
  tier build 1 0
  log "end-to-end tests (Chromium)"
  # Ports of its own, so two test runs (or a running npm start) on one machine never collide.
  export E2E_PORT="${E2E_PORT:-$((22000 + RANDOM % 2000))}" E2E_MAIL_PORT="${E2E_MAIL_PORT:-$((24000 + RANDOM % 2000))}" E2E_DOI_PORT="${E2E_DOI_PORT:-$((26000 + RANDOM % 2000))}" E2E_INNER_PORT="${E2E_INNER_PORT:-$((28000 + RANDOM % 2000))}" E2E_ORCID_PORT="${E2E_ORCID_PORT:-$((30000 + RANDOM % 2000))}"
  PLAYWRIGHT_JSON_OUTPUT_NAME="$REPORTS/e2e.json" node_modules/.bin/playwright test --reporter=list,json "${FILTERS[@]}" >&2
  read -r p f < <(node -e 'try{const s=require(process.argv[1]).stats;console.log(s.expected+s.flaky,s.unexpected+(s.expected+s.unexpected+s.flaky===0?1:0))}catch{console.log("0 1")}' "$REPORTS/e2e.json")
  tier e2e "$p" "$f"
else
  tail -n 40 "$REPORTS/build.log" >&2
  tier build 0 1
fi
fi

# Every failed test, and every test that passed only when run again, named last (often all a CI log
# keeps). Reports of a green run are not needed; a red run keeps them for reading.
node scripts/test-failures.mjs "$REPORTS"
# A failed one-step tier (setup, lint, typecheck, build) shows the end of what it printed.
for t in "${failedTiers[@]}"; do
  if [ -s "$REPORTS/$t.log" ]; then
    printf '\nThe %s tier failed; the last lines it printed:\n' "$t" >&2
    tail -n 25 "$REPORTS/$t.log" | sed 's/^/  /' >&2
  fi
done
[ "$failed" -eq 0 ] && rm -rf "$REPORTS"
echo "$passed passed, $failed failed"
[ "$failed" -eq 0 ]

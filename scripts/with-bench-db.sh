#!/usr/bin/env bash
# Runs a command against the web benchmark's own PostgreSQL cluster (.data/bench-postgres on
# 127.0.0.1:$BENCH_PGPORT, default 54489; never the project's or a test cluster): DATABASE_URL is its
# runtime role, MIGRATION_DATABASE_URL its schema owner, BENCH_ADMIN_URL its superuser (to drop and
# recreate the database). The cluster is a throwaway: fsync is off.
source "$(dirname "$0")/env.sh"
ensure_postgres
export BENCH_PGPORT="${BENCH_PGPORT:-54489}"
BENCH_PG_DIR="$(pg_state_dir bench-postgres)"; export BENCH_PG_DIR
pg_init "$BENCH_PG_DIR" fast
pg_start "$BENCH_PG_DIR" "$BENCH_PGPORT"
DATABASE_URL="$(pg_url "$BENCH_PG_DIR" "$BENCH_PGPORT")"; export DATABASE_URL
MIGRATION_DATABASE_URL="$(pg_owner_url "$BENCH_PG_DIR" "$BENCH_PGPORT")"; export MIGRATION_DATABASE_URL
BENCH_ADMIN_URL="postgres://arrhenia:$(cat "$BENCH_PG_DIR/password")@127.0.0.1:$BENCH_PGPORT/postgres"; export BENCH_ADMIN_URL
"$@"
status=$?
# Stopped afterwards unless asked to keep it (the filled database stays on disk for the next run).
[ -n "${BENCH_KEEP_DB:-}" ] || pg_stop "$BENCH_PG_DIR"
exit $status

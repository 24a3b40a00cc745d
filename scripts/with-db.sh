#!/usr/bin/env bash
# Runs a command with DATABASE_URL pointing at the project's local cluster (started if needed),
# unless DATABASE_URL is already set (e.g. a managed database).
source "$(dirname "$0")/env.sh"
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres
  DIR="$(pg_state_dir postgres)"
  pg_init "$DIR"; pg_start "$DIR" "$PGPORT"
  DATABASE_URL="$(pg_url "$DIR" "$PGPORT")"; export DATABASE_URL
fi
exec "$@"

#!/usr/bin/env bash
# Runs a command with DATABASE_URL pointing at the project's local cluster (started if needed),
# unless DATABASE_URL is already set (e.g. a managed database). DATABASE_URL is the app's runtime
# role; MIGRATION_DATABASE_URL the schema owner (used by scripts/migrate.ts only).
source "$(dirname "$0")/env.sh"
if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres
  DIR="$(pg_state_dir postgres)"
  pg_init "$DIR"; pg_start "$DIR" "$PGPORT"
  DATABASE_URL="$(pg_url "$DIR" "$PGPORT")"; export DATABASE_URL
  MIGRATION_DATABASE_URL="$(pg_owner_url "$DIR" "$PGPORT")"; export MIGRATION_DATABASE_URL
fi
exec "$@"

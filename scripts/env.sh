# Shared set-up for the project's shell scripts: source it, do not run it.
# Installs what a fresh Debian machine lacks and manages the project's own PostgreSQL cluster
# on 127.0.0.1 (never Debian's default cluster on 5432).
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export NEXT_TELEMETRY_DISABLED=1
export PGPORT="${PGPORT:-54329}"

log() { printf '\033[1;34m[arrhenia]\033[0m %s\n' "$*" >&2; }
die() { printf '\033[1;31m[arrhenia] %s\033[0m\n' "$*" >&2; exit 1; }

as_root() {
  if [ "$(id -u)" -eq 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else
    die "need root to run: $* (install it, or run as root)"; fi
}

apt_updated=0
apt_install() {
  if [ "$apt_updated" -eq 0 ]; then log "apt-get update"; as_root apt-get update -qq >/dev/null; apt_updated=1; fi
  log "installing Debian packages: $*"
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq "$@" >/dev/null
}

# npm dependencies: `npm ci` when node_modules is missing or older than the lockfile.
ensure_node_modules() {
  local stamp="$ROOT/node_modules/.package-lock.json"
  if [ ! -f "$stamp" ] || [ "$ROOT/package-lock.json" -nt "$stamp" ]; then
    log "installing npm dependencies (npm ci)"
    (cd "$ROOT" && npm ci --no-audit --no-fund)
  fi
}

pg_bindir() {
  local d
  for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
    if [ -x "$d/initdb" ]; then echo "$d"; return 0; fi
  done
  return 1
}

ensure_postgres() {
  if ! pg_bindir >/dev/null; then apt_install postgresql; fi
  PGBIN="$(pg_bindir)" || die "PostgreSQL server programs not found after install"
  export PGBIN
}

ensure_chromium() {
  if ! command -v chromium >/dev/null; then apt_install chromium; fi
}

# Where the cluster lives. As an ordinary user: .data/postgres in the checkout. As root the server
# runs as the `postgres` system user, which may not be able to enter the checkout (e.g. under
# /root): then a persistent folder that user can reach, one per checkout.
pg_state_dir() {
  local name="${1:-postgres}"
  if [ "$(id -u)" -ne 0 ]; then echo "$ROOT/.data/$name"; return; fi
  mkdir -p "$ROOT/.data"
  if runuser -u postgres -- test -x "$ROOT/.data" 2>/dev/null; then
    echo "$ROOT/.data/$name"
  else
    local slug; slug="$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
    echo "/var/lib/arrhenia/$slug/$name"
  fi
}

run_pg() { # run a server program as the right user
  # From / so the postgres user is not left in a folder it cannot enter.
  if [ "$(id -u)" -eq 0 ]; then (cd / && runuser -u postgres -- "$@"); else "$@"; fi
}

# pg_init DIR: create a cluster (once) with a generated password for the `arrhenia` role.
pg_init() {
  local dir="$1" fast="${2:-}"
  [ -f "$dir/data/PG_VERSION" ] && return 0
  log "creating PostgreSQL cluster in $dir"
  mkdir -p "$dir/data"
  local pw; pw="$(head -c 24 /dev/urandom | od -An -tx1 | tr -d ' \n')"
  printf '%s' "$pw" > "$dir/password"
  chmod 600 "$dir/password"
  local pwfile="$dir/.initpw"; printf '%s\n' "$pw" > "$pwfile"
  if [ "$(id -u)" -eq 0 ]; then
    chown postgres:postgres "$dir/data" "$pwfile"
    chmod 711 "$dir"; [ "$(dirname "$dir")" != "/" ] && chmod 711 "$(dirname "$dir")" || true
  fi
  chmod 700 "$dir/data"
  run_pg "$PGBIN/initdb" -D "$dir/data" -U arrhenia --pwfile="$pwfile" --auth-local=scram-sha-256 \
    --auth-host=scram-sha-256 -E UTF8 --locale=C.UTF-8 >/dev/null
  rm -f "$pwfile"
  {
    echo "listen_addresses = '127.0.0.1'"
    echo "unix_socket_directories = ''"
    echo "max_connections = 200"
    # fsync off: a throwaway cluster need not survive the machine crashing. synchronous_commit stays
    # on, so a commit is in the operating system's hands before it is acknowledged and survives a
    # server crash (pg_ctl -m immediate in the restart test), as a real server's does.
    if [ "$fast" = "fast" ]; then echo "fsync = off"; echo "full_page_writes = off"; fi
  } | run_pg tee -a "$dir/data/postgresql.conf" >/dev/null
}

pg_running() { local dir="$1"; run_pg "$PGBIN/pg_ctl" -D "$dir/data" status >/dev/null 2>&1; }

pg_start() {
  local dir="$1" port="$2"
  if pg_running "$dir"; then return 0; fi
  log "starting PostgreSQL on 127.0.0.1:$port"
  if [ "$(id -u)" -eq 0 ]; then touch "$dir/server.log"; chown postgres:postgres "$dir/server.log"; fi
  run_pg "$PGBIN/pg_ctl" -D "$dir/data" -o "-p $port" -l "$dir/server.log" -w -t 60 start >/dev/null \
    || { tail -n 20 "$dir/server.log" >&2; die "PostgreSQL did not start (log: $dir/server.log)"; }
}

pg_stop() {
  local dir="$1"
  if [ -f "$dir/data/PG_VERSION" ] && pg_running "$dir"; then
    log "stopping PostgreSQL ($dir)"
    run_pg "$PGBIN/pg_ctl" -D "$dir/data" -m fast -w stop >/dev/null
  fi
}

# Three roles. `arrhenia` is the cluster's superuser (created by initdb), used only by these
# scripts to administer roles. `arrhenia_owner` owns the database and every object in it and runs
# migrations. `arrhenia_app` is what the app connects as: not a superuser, owns nothing, only the
# row privileges scripts/migrate.ts grants, so it can neither disable the triggers that freeze
# published versions nor truncate, alter or drop anything.
OWNER_ROLE=arrhenia_owner
APP_ROLE=arrhenia_app

# pg_secret DIR NAME: a generated password kept in DIR/NAME (mode 600), made once.
pg_secret() {
  local file="$1/$2"
  if [ ! -s "$file" ]; then (umask 077; head -c 24 /dev/urandom | od -An -tx1 | tr -d ' \n' > "$file"); fi
  cat "$file"
}

pg_admin_psql() { # pg_admin_psql DIR PORT DB ARGS…: psql as the cluster superuser
  local dir="$1" port="$2" db="$3"; shift 3
  PGPASSWORD="$(cat "$dir/password")" "$PGBIN/psql" -h 127.0.0.1 -p "$port" -U arrhenia -d "$db" -X -q -tA -v ON_ERROR_STOP=1 "$@"
}

# pg_roles DIR PORT: creates (or upgrades, for clusters made by older checkouts) the owner and
# runtime roles and the `arrhenia` database owned by the owner role. Idempotent.
pg_roles() {
  local dir="$1" port="$2" opw apw
  opw="$(pg_secret "$dir" owner-password)"; apw="$(pg_secret "$dir" app-password)"
  pg_admin_psql "$dir" "$port" postgres -v opw="$opw" -v apw="$apw" <<SQL >/dev/null
SELECT format('CREATE ROLE %I', r) FROM unnest(ARRAY['$OWNER_ROLE', '$APP_ROLE']) r
  WHERE NOT EXISTS (SELECT 1 FROM pg_roles WHERE rolname = r) \gexec
ALTER ROLE $OWNER_ROLE WITH LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS PASSWORD :'opw';
ALTER ROLE $APP_ROLE WITH LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS NOINHERIT PASSWORD :'apw';
SELECT 'CREATE DATABASE arrhenia OWNER $OWNER_ROLE' WHERE NOT EXISTS (SELECT 1 FROM pg_database WHERE datname = 'arrhenia') \gexec
ALTER DATABASE arrhenia OWNER TO $OWNER_ROLE;
REVOKE ALL ON DATABASE arrhenia FROM PUBLIC;
REVOKE TEMPORARY ON DATABASE arrhenia FROM $APP_ROLE;
GRANT CONNECT ON DATABASE arrhenia TO $APP_ROLE;
SQL
  # Clusters from older checkouts: everything the superuser created moves to the owner role.
  pg_admin_psql "$dir" "$port" arrhenia <<SQL >/dev/null
DO \$\$
DECLARE r record;
BEGIN
  FOR r IN SELECT nspname FROM pg_namespace WHERE nspowner = 'arrhenia'::regrole AND nspname NOT LIKE 'pg\_%' AND nspname <> 'information_schema' LOOP
    EXECUTE format('ALTER SCHEMA %I OWNER TO $OWNER_ROLE', r.nspname);
  END LOOP;
  FOR r IN SELECT c.oid::regclass AS name, c.relkind FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
           WHERE c.relowner = 'arrhenia'::regrole AND c.relkind IN ('r', 'p', 'v', 'm', 'f') AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema' LOOP
    EXECUTE format('ALTER %s %s OWNER TO $OWNER_ROLE', CASE r.relkind WHEN 'v' THEN 'VIEW' WHEN 'm' THEN 'MATERIALIZED VIEW' WHEN 'f' THEN 'FOREIGN TABLE' ELSE 'TABLE' END, r.name);
  END LOOP;
  -- Sequences of identity and serial columns moved with their tables; these are the free-standing ones.
  FOR r IN SELECT c.oid::regclass AS name FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
           WHERE c.relowner = 'arrhenia'::regrole AND c.relkind = 'S' AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema' LOOP
    EXECUTE format('ALTER SEQUENCE %s OWNER TO $OWNER_ROLE', r.name);
  END LOOP;
  FOR r IN SELECT p.oid::regprocedure AS name FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
           WHERE p.proowner = 'arrhenia'::regrole AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema' LOOP
    EXECUTE format('ALTER ROUTINE %s OWNER TO $OWNER_ROLE', r.name);
  END LOOP;
  FOR r IN SELECT t.oid::regtype AS name FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
           WHERE t.typowner = 'arrhenia'::regrole AND t.typtype IN ('e', 'd', 'c') AND (t.typrelid = 0 OR (SELECT relkind FROM pg_class WHERE oid = t.typrelid) = 'c')
             AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema' LOOP
    EXECUTE format('ALTER TYPE %s OWNER TO $OWNER_ROLE', r.name);
  END LOOP;
END
\$\$;
SQL
}

# pg_url DIR PORT: the runtime role's connection URL (sets the roles and database up first).
pg_url() {
  local dir="$1" port="$2"
  pg_roles "$dir" "$port"
  echo "postgres://$APP_ROLE:$(cat "$dir/app-password")@127.0.0.1:$port/arrhenia"
}

# pg_owner_url DIR PORT: the owner role's URL, for migrations only (after pg_url).
pg_owner_url() {
  local dir="$1" port="$2"
  echo "postgres://$OWNER_ROLE:$(cat "$dir/owner-password")@127.0.0.1:$port/arrhenia"
}

#!/usr/bin/env bash
# npm start: everything a fresh Debian machine needs, then serve on http://127.0.0.1:$PORT.
source "$(dirname "$0")/env.sh"
cd "$ROOT"
export PORT="${PORT:-3000}"
ensure_node_modules

if [ -z "${DATABASE_URL:-}" ]; then
  ensure_postgres
  DIR="$(pg_state_dir postgres)"
  pg_init "$DIR"
  pg_start "$DIR" "$PGPORT"
  DATABASE_URL="$(pg_url "$DIR" "$PGPORT")"; export DATABASE_URL
  MIGRATION_DATABASE_URL="$(pg_owner_url "$DIR" "$PGPORT")"; export MIGRATION_DATABASE_URL
fi

# A signing secret for sessions, made once per checkout and kept out of git.
mkdir -p "$ROOT/.data"
if [ -z "${NEXTAUTH_SECRET:-}" ]; then
  [ -f "$ROOT/.data/auth-secret" ] || { head -c 32 /dev/urandom | base64 > "$ROOT/.data/auth-secret"; chmod 600 "$ROOT/.data/auth-secret"; }
  NEXTAUTH_SECRET="$(cat "$ROOT/.data/auth-secret")"; export NEXTAUTH_SECRET
fi
export NEXTAUTH_URL="${NEXTAUTH_URL:-http://127.0.0.1:$PORT}"

TSX=(node_modules/.bin/tsx --conditions=react-server)
"${TSX[@]}" scripts/migrate.ts
"${TSX[@]}" scripts/seed.ts
unset MIGRATION_DATABASE_URL # the server runs as the runtime role only

# What the production build is made of: every file but scripts/, tests/ and Markdown, as committed,
# as changed since and as newly added (contents, not names only), and the NEXT_PUBLIC_ variables.
# Empty when git cannot say (no checkout): the build is then always made.
build_stamp() {
  local paths=(-- . ':!scripts' ':!tests' ':!*.md') listing
  listing="$({ git ls-files --stage "${paths[@]}" && git diff HEAD "${paths[@]}" &&
    git ls-files -z --others --exclude-standard "${paths[@]}" | xargs -0 -r sha256sum; } 2>/dev/null)" || return 0
  printf '%s\n%s\n' "$listing" "$(env | grep '^NEXT_PUBLIC_' | sort || true)" | sha256sum | cut -d' ' -f1
}
DIST="$ROOT/${NEXT_DIST_DIR:-.next}"
STAMP=""
if git -C "$ROOT" rev-parse --git-dir >/dev/null 2>&1; then STAMP="$(build_stamp)"; fi
if [ "${SKIP_BUILD:-0}" = "1" ]; then
  :
elif [ -n "$STAMP" ] && [ -f "$DIST/BUILD_ID" ] && [ "$(cat "$DIST/arrhenia-build-stamp" 2>/dev/null)" = "$STAMP" ]; then
  # The same build id then serves the pages it kept in the database (lib/kept-pages.ts) again.
  log "reusing the production build in $DIST (nothing it is made from changed since it was made)"
else
  log "building (next build)"
  rm -f "$DIST/arrhenia-build-stamp"
  node_modules/.bin/next build >"$ROOT/.data/build.log" 2>&1 || { tail -n 40 "$ROOT/.data/build.log"; die "build failed (full log: .data/build.log)"; }
  [ -z "$STAMP" ] || echo "$STAMP" >"$DIST/arrhenia-build-stamp"
fi
# The front server's heap budget (FRONT_HEAP_MB, lib/config.ts frontHeapMb; serve.ts checks its range).
FRONT_HEAP_MB="${FRONT_HEAP_MB:-288}"
[[ "$FRONT_HEAP_MB" =~ ^[0-9]{1,5}$ ]] || die "FRONT_HEAP_MB must be a whole number of MB, 128–65536 (got “$FRONT_HEAP_MB”)"
# Two malloc arenas (glibc): off-heap buffers (gzip in libuv's threads, page bodies) otherwise spread
# over one arena per thread that keeps freed memory; the web benchmark's peak RSS was 1 030 MiB without.
export MALLOC_ARENA_MAX="${MALLOC_ARENA_MAX:-2}"
exec "${TSX[@]}" --max-old-space-size="$FRONT_HEAP_MB" scripts/serve.ts

#!/usr/bin/env bash
# npm run db:start | db:stop | db:reset — the project's PostgreSQL cluster on 127.0.0.1:$PGPORT.
source "$(dirname "$0")/env.sh"
cmd="${1:-start}"
ensure_postgres
DIR="$(pg_state_dir postgres)"
case "$cmd" in
  start)
    pg_init "$DIR"
    pg_start "$DIR" "$PGPORT"
    url="$(pg_url "$DIR" "$PGPORT")"
    log "PostgreSQL is running: $(echo "$url" | sed 's#:[^:@/]*@#:***@#')"
    ;;
  stop) pg_stop "$DIR" ;;
  url) pg_start "$DIR" "$PGPORT"; pg_url "$DIR" "$PGPORT" ;;
  reset)
    if [ "${CONFIRM:-}" != "yes" ]; then
      if [ ! -t 0 ]; then die "db:reset wipes every dataset and account in $DIR; run it in a terminal or with CONFIRM=yes"; fi
      read -r -p "This deletes every account, dataset and mail in $DIR. Type 'wipe' to continue: " answer
      [ "$answer" = "wipe" ] || die "nothing changed"
    fi
    pg_stop "$DIR"
    rm -rf "$DIR"
    log "cluster removed; the next npm start creates, migrates and seeds a new one"
    ;;
  *) die "usage: db.sh start|stop|url|reset" ;;
esac

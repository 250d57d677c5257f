#!/usr/bin/env bash
# A throwaway PostgreSQL server for the tests: a new cluster in DIR, trust authentication on
# loopback only, a free port on 127.0.0.1, its unix socket inside DIR, superuser role `cw`.
#
#   tests/pg/cluster.sh start DIR   # initdb + start (waits until it accepts connections); prints
#                                   # the URI, e.g. postgresql://cw@127.0.0.1:54321/postgres, and
#                                   # writes it to DIR/uri
#   tests/pg/cluster.sh stop DIR    # stops the server (fast shutdown) and removes DIR
#
# The server binaries are the newest Debian installation's (/usr/lib/postgresql/<version>/bin; the
# PG_BINDIR variable overrides). PostgreSQL refuses to run as root: when run as root the cluster
# belongs to `nobody` (PG_RUN_AS overrides) and initdb/pg_ctl run as that user; otherwise they run
# as the caller. Any failure exits non-zero with the tail of the server log on stderr.
set -euo pipefail

usage() { echo "usage: $0 start|stop DIR" >&2; exit 2; }
[ $# -eq 2 ] || usage
cmd=$1
dir=$2

bindir() {
  if [ -n "${PG_BINDIR:-}" ]; then echo "$PG_BINDIR"; return; fi
  local best="" v
  for candidate in /usr/lib/postgresql/*/bin/initdb; do
    [ -x "$candidate" ] || continue
    v=$(basename "$(dirname "$(dirname "$candidate")")")
    if [ -z "$best" ] || [ "$(printf '%s\n%s\n' "$best" "$v" | sort -V | tail -n 1)" = "$v" ]; then
      best=$v
    fi
  done
  [ -n "$best" ] || { echo "cluster.sh: no PostgreSQL server found (/usr/lib/postgresql/*/bin/initdb); install the package postgresql" >&2; exit 1; }
  echo "/usr/lib/postgresql/$best/bin"
}

# Runs a command as the cluster's owner.
as_owner() {
  if [ "$(id -u)" -eq 0 ]; then
    runuser -u "${PG_RUN_AS:-nobody}" -- "$@"
  else
    "$@"
  fi
}

log_tail() {
  if [ -f "$dir/server.log" ]; then
    echo "---- last lines of $dir/server.log" >&2
    tail -n 30 "$dir/server.log" >&2
  fi
}

port_free() {
  # A port is free when nothing listens on it (bash's /dev/tcp connects, it does not listen).
  ! (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null
}

start() {
  local bin
  bin=$(bindir)
  mkdir -p "$dir"
  dir=$(cd "$dir" && pwd)
  if [ "$(id -u)" -eq 0 ]; then
    chown "${PG_RUN_AS:-nobody}" "$dir"
  fi
  chmod 700 "$dir"
  as_owner test -w "$dir" ||
    { echo "cluster.sh: ${PG_RUN_AS:-nobody} cannot write to $dir (a parent folder closed to it?); use a folder under /tmp" >&2; exit 1; }
  as_owner "$bin/initdb" -D "$dir/data" -U cw --auth=trust --encoding=UTF8 --locale=C.UTF-8 \
    --no-sync >"$dir/initdb.log" 2>&1 ||
    { cat "$dir/initdb.log" >&2; echo "cluster.sh: initdb failed" >&2; exit 1; }
  # Trust on loopback only: no other host may connect, and the server listens on 127.0.0.1.
  as_owner sh -c "cat >'$dir/data/pg_hba.conf'" <<'EOF'
# TYPE  DATABASE  USER  ADDRESS        METHOD
local   all       all                  trust
host    all       all   127.0.0.1/32   trust
EOF
  local attempt port
  for attempt in 1 2 3 4 5 6 7 8 9 10; do
    port=$((20000 + (RANDOM * 32768 + RANDOM) % 40000))
    port_free "$port" || continue
    if as_owner "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 \
      -o "-p $port -k $dir -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=200" \
      start >"$dir/pg_ctl.log" 2>&1; then
      local uri="postgresql://cw@127.0.0.1:$port/postgres"
      echo "$uri" >"$dir/uri"
      echo "$uri"
      return 0
    fi
    # Taken between the check and the start, or another failure: the log says which.
    if ! grep -q "could not bind\|Address already in use" "$dir/server.log" 2>/dev/null; then
      cat "$dir/pg_ctl.log" >&2
      log_tail
      echo "cluster.sh: the server did not start (attempt $attempt, port $port)" >&2
      exit 1
    fi
  done
  log_tail
  echo "cluster.sh: no free port found after 10 attempts" >&2
  exit 1
}

stop() {
  [ -d "$dir" ] || return 0
  local bin
  bin=$(bindir)
  if [ -f "$dir/data/postmaster.pid" ]; then
    as_owner "$bin/pg_ctl" -D "$dir/data" -m fast -w -t 60 stop >/dev/null 2>&1 ||
      { log_tail; echo "cluster.sh: pg_ctl stop failed" >&2; }
  fi
  rm -rf "$dir"
}

case "$cmd" in
  start) start ;;
  stop) stop ;;
  *) usage ;;
esac

#!/usr/bin/env bash
# SPDX-License-Identifier: Apache-2.0
# The benchmark suite: builds in Release in its own folder, generates the benchmark stores (once;
# they are kept), then times each command as a whole process against a baseline in the same loop
# — the sqlite3 shell answering the equivalent indexed query on the same file, or the same
# command on the smallest store — and prints medians, ratios and a pass/miss mark per target.
# In-process figures (audit verify against a plain scan, run import against plain inserts)
# come from the Google Benchmark executable.
#
# With --backend postgresql the same commands run against PostgreSQL: each generated store is
# moved to its own database with `store copy` (once per server; the copy's time is reported), and
# the baselines are `psql` answering the same queries on that database; run import is compared
# with psql executing a prepared INSERT of the same result rows in one transaction into a table
# with the results table's indexes. The server is --pg URI (a role that may create databases) or,
# by default, a throwaway cluster started by tests/pg/cluster.sh and stopped at exit.
#
# Usage: tests/bench/run.sh [--sizes "10000 100000 1000000"] [--repeat N] [--import-repeat N]
#                          [--seed N] [--backend sqlite|postgresql] [--pg URI]
# Stores go to $CURVEWARDEN_BENCH_DIR (default build-bench/stores). Not run by ctest.
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)
build="${CURVEWARDEN_BENCH_BUILD_DIR:-$root/build-bench}"
stores="${CURVEWARDEN_BENCH_DIR:-$build/stores}"
sizes="10000 100000 1000000"
repeat=7
import_repeat=2
seed=1
backend=sqlite
pg_uri=""
while [ $# -gt 0 ]; do
  case "$1" in
    --sizes) sizes="$2"; shift 2 ;;
    --repeat) repeat="$2"; shift 2 ;;
    --import-repeat) import_repeat="$2"; shift 2 ;;
    --seed) seed="$2"; shift 2 ;;
    --backend) backend="$2"; shift 2 ;;
    --pg) pg_uri="$2"; shift 2 ;;
    *) echo "run.sh: error: unknown option '$1'" >&2; exit 2 ;;
  esac
done

case "$backend" in
  sqlite | postgresql) ;;
  *) echo "run.sh: error: --backend must be sqlite or postgresql, not '$backend'" >&2; exit 2 ;;
esac
if [ -n "$pg_uri" ] && [ "$backend" != postgresql ]; then
  echo "run.sh: error: --pg needs --backend postgresql" >&2; exit 2
fi

"$root/.ci/install-deps" >/dev/null
launcher=()
if command -v ccache >/dev/null 2>&1; then launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache); fi
cmake -S "$root" -B "$build" -DCMAKE_BUILD_TYPE=Release -DCURVEWARDEN_BUILD_TESTS=OFF \
  -DCURVEWARDEN_BUILD_BENCHMARKS=ON "${launcher[@]}" >/dev/null
cmake --build "$build" -j "$(nproc)" --target curvewarden curvewarden-bench-store \
  curvewarden-bench >/dev/null
cw="$build/curvewarden"
gen="$build/tests/bench/curvewarden-bench-store"
inproc="$build/tests/bench/curvewarden-bench"
mkdir -p "$stores"
smallest=$(echo $sizes | tr ' ' '\n' | sort -n | head -1)
largest=$(echo $sizes | tr ' ' '\n' | sort -n | tail -1)

export TZ=UTC CURVEWARDEN_USER=bench-analyst
work=$(mktemp -d)
pg_cluster=""
cleanup() {
  if [ -n "$pg_cluster" ]; then "$root/tests/pg/cluster.sh" stop "$pg_cluster" || true; fi
  rm -rf "$work"
}
trap cleanup EXIT

# ---------------------------------------------------------------- stores
for n in $sizes; do
  dir="$stores/$n-seed$seed"
  if [ ! -f "$dir/done" ]; then
    rm -rf "$dir" && mkdir -p "$dir"
    echo "generating the $n-curve store ..." >&2
    start=$EPOCHREALTIME
    "$gen" --out "$dir/lab.db" --curves "$n" --seed "$seed" --files "$dir" >"$dir/report.txt"
    echo "generated in $(awk -v a="$start" -v b="$EPOCHREALTIME" 'BEGIN{printf "%.1f", b-a}') s" \
      >>"$dir/report.txt"
    touch "$dir/done"
  fi
done

# ---------------------------------------------------------------- PostgreSQL databases
# uri_for DB: the server's URI with its database replaced by DB (query parameters kept).
uri_for() {
  local base="${pg_uri%%\?*}" query="" rest
  [[ "$pg_uri" == *\?* ]] && query="?${pg_uri#*\?}"
  rest="${base#*://}"
  echo "postgresql://${rest%%/*}/$1$query"
}
copy_report="$work/copies.txt"
: >"$copy_report"
if [ "$backend" = postgresql ]; then
  command -v psql >/dev/null || { echo "run.sh: psql not found (package postgresql-client)" >&2; exit 1; }
  if [ -z "$pg_uri" ]; then
    # Under /tmp: the cluster's owner (nobody, when run as root) must reach its folder.
    pg_cluster=$(mktemp -d /tmp/cw-bench-pg.XXXXXX)
    pg_uri=$("$root/tests/pg/cluster.sh" start "$pg_cluster")
  fi
  for n in $sizes; do
    name="cw_bench_${n}_seed$seed"
    exists=$(psql -X -q -A -t -d "$pg_uri" -c "SELECT count(*) FROM pg_database WHERE datname = '$name'")
    if [ "$exists" = 0 ]; then
      echo "copying the $n-curve store to PostgreSQL ..." >&2
      psql -X -q -d "$pg_uri" -c "CREATE DATABASE $name" >/dev/null
      start=$EPOCHREALTIME
      "$cw" store copy --from "$stores/$n-seed$seed/lab.db" --to "$(uri_for "$name")" >/dev/null
      echo "store $n copied to PostgreSQL in $(awk -v a="$start" -v b="$EPOCHREALTIME" 'BEGIN{printf "%.1f", b-a}') s" >>"$copy_report"
    fi
  done
fi

# ---------------------------------------------------------------- timing helpers
# time_once OUT CMD...: runs CMD, appends "milliseconds peak-KiB exit" to OUT.
time_once() {
  local out="$1"; shift
  local start end rc=0
  start=$EPOCHREALTIME
  /usr/bin/time -f "%M" -o "$work/rss" "$@" >/dev/null 2>"$work/stderr" || rc=$?
  end=$EPOCHREALTIME
  echo "$(awk -v a="$start" -v b="$end" 'BEGIN{printf "%.2f", (b-a)*1000}') $(tail -1 "$work/rss") $rc" >>"$out"
}
median() { awk '{print $1}' "$1" | sort -g | awk '{a[NR]=$1} END{print (NR%2 ? a[(NR+1)/2] : (a[NR/2]+a[NR/2+1])/2)}'; }
peak() { awk '{print $2}' "$1" | sort -g | tail -1; }
codes() { awk '{print $3}' "$1" | sort -u | tr '\n' ' '; }

results="$work/results.tsv"
: >"$results"
# record NAME SIZE FILE [BASE_NAME BASE_FILE]
record() {
  local base_median="-" base_file="${5:-}"
  [ -n "$base_file" ] && base_median=$(median "$base_file")
  printf "%s\t%s\t%s\t%s\t%s\t%s\t%s\n" "$1" "$2" "$(median "$3")" "$(peak "$3")" \
    "${4:--}" "$base_median" "$(codes "$3")" >>"$results"
}

# ---------------------------------------------------------------- command benchmarks
for n in $sizes; do
  dir="$stores/$n-seed$seed"
  db="$dir/lab.db"
  # shellcheck disable=SC1091
  . "$dir/store.env"
  export CURVEWARDEN_NOW="$BENCH_NOW"
  week=$(date -u -d "$BENCH_NOW + 7 days" +%Y-%m-%dT%H:%M:%SZ)
  echo "timing the $n-curve store ($BENCH_ENTRIES entries) ..." >&2
  if [ "$backend" = postgresql ]; then
    db=$(uri_for "cw_bench_${n}_seed$seed")
    export CURVEWARDEN_KEY="$dir/lab.db.key"
    base_tool=(psql -X -q -A -t -d "$db" -c)
    base_name="psql"
    checks_index=""
  else
    base_tool=(sqlite3 -readonly "$db")
    base_name="sqlite3"
    checks_index="INDEXED BY checks_by_time"
  fi
  c=(--db "$db")
  # The baselines: the sqlite3 shell (or psql) answering with an index what the command shows.
  expiring_sql="SELECT c.id, c.analyte, m.code, i.code, c.expires_at FROM curves c
    JOIN methods m ON m.id = c.method_id JOIN instruments i ON i.id = c.instrument_id
    WHERE c.expires_at >= '$BENCH_NOW' AND c.expires_at < '$week'
      AND c.acquired_at <= '$BENCH_NOW' ORDER BY c.expires_at, c.id;"
  status_sql="SELECT i.code, c.verdict, count(*) FROM instruments i
    JOIN curves c ON c.instrument_id = i.id AND c.expires_at > '$BENCH_NOW'
      AND c.acquired_at <= '$BENCH_NOW' GROUP BY i.code, c.verdict;
    $expiring_sql
    SELECT k.id, k.curve_id, k.occurred_at FROM checks k $checks_index
    WHERE k.passed = 0 AND k.occurred_at <= '$BENCH_NOW' ORDER BY k.occurred_at DESC LIMIT 250;"
  verify_sql="SELECT * FROM audit_log;"
  for f in expiring status verify expiring.base status.base verify.base; do : >"$work/$n.$f"; done
  for ((r = 0; r < repeat; r++)); do
    time_once "$work/$n.expiring" "$cw" "${c[@]}" expiring --within "7 days"
    time_once "$work/$n.expiring.base" "${base_tool[@]}" "$expiring_sql"
    time_once "$work/$n.status" "$cw" "${c[@]}" status
    time_once "$work/$n.status.base" "${base_tool[@]}" "$status_sql"
  done
  record expiring "$n" "$work/$n.expiring" "$base_name indexed query" "$work/$n.expiring.base"
  record status "$n" "$work/$n.status" "$base_name indexed queries" "$work/$n.status.base"
  for ((r = 0; r < (repeat > 3 ? 3 : repeat); r++)); do
    time_once "$work/$n.verify" "$cw" "${c[@]}" audit verify
    time_once "$work/$n.verify.base" "${base_tool[@]}" "$verify_sql"
  done
  record "audit verify" "$n" "$work/$n.verify" "$base_name scan of audit_log" "$work/$n.verify.base"

  # Reads and writes of one curve or calibration: compared across store sizes below.
  for f in show quantify check log list; do : >"$work/$n.$f"; done
  for ((r = 0; r < repeat; r++)); do
    time_once "$work/$n.show" "$cw" "${c[@]}" curve show "$BENCH_CURVE"
    time_once "$work/$n.quantify" "$cw" "${c[@]}" quantify --curve "$BENCH_CURVE" \
      --response 2.5 --sample "BENCH-$r"
    time_once "$work/$n.check" "$cw" "${c[@]}" check log --curve "$BENCH_CURVE" --nominal 10 \
      --response "$BENCH_CHECK_RESPONSE"
    time_once "$work/$n.log" "$cw" "${c[@]}" curve log --method "$BENCH_METHOD" \
      --instrument "$BENCH_INSTRUMENT" --lot "$BENCH_LOT" --points "$dir/points-30x12x3.csv"
    time_once "$work/$n.list" "$cw" "${c[@]}" curve list --state active \
      --instrument "$BENCH_INSTRUMENT"
  done
  record "curve show" "$n" "$work/$n.show"
  record quantify "$n" "$work/$n.quantify"
  record "check log" "$n" "$work/$n.check"
  record "curve log 30x12x3" "$n" "$work/$n.log"
  record "curve list --state active --instrument" "$n" "$work/$n.list"

  if [ "$n" = "$smallest" ] || [ "$n" = "$largest" ]; then
    : >"$work/$n.import"
    sha=$(sha256sum "$dir/run-100000.csv" | cut -d' ' -f1)
    for ((r = 0; r < import_repeat; r++)); do
      # The same file again needs --again (refused on a file never imported).
      again=()
      if [ "$("${base_tool[@]}" "SELECT count(*) FROM runs WHERE file_sha256 = '$sha'")" != 0 ]; then
        again=(--again --reason "benchmark repetition $r")
      fi
      time_once "$work/$n.import" "$cw" "${c[@]}" run import "$dir/run-100000.csv" \
        --method "$BENCH_METHOD" --instrument "$BENCH_INSTRUMENT" "${again[@]}"
    done
    record "run import 100000 rows" "$n" "$work/$n.import"
    if [ "$backend" = postgresql ]; then
      # The yardstick: psql executing a prepared INSERT of the same result rows (the values of
      # the in-process SQLite yardstick) in one transaction, into a table with the results
      # table's columns, checks and indexes (no foreign keys or triggers), dropped afterwards.
      plain_sql="$work/plain-inserts.sql"
      awk 'BEGIN {
        u = "{\"combined\":0.0123,\"components\":[{\"relative_u\":0.011,\"source\":\"calibration\"},{\"relative_u\":0.0025,\"source\":\"lot RM-1\"}],\"expanded\":0.0246,\"k\":2}"
        print "\\set ON_ERROR_STOP on"
        print "DROP TABLE IF EXISTS bench_plain_results;"
        print "CREATE TABLE bench_plain_results (LIKE results INCLUDING ALL);"
        print "PREPARE ins (bigint, text, bigint, float8, float8, float8, float8, float8, float8, text) AS"
        print "  INSERT INTO bench_plain_results (id, sample, analyte, status, curve_id, method_id,"
        print "    instrument_id, response, replicates, dilution, x0, sd_x0, concentration, ci_low,"
        print "    ci_high, flags, reasons, reason_details, analyst, occurred_at, uncertainty, audit_seq)"
        print "  VALUES ($1, $2, '"'"'nitrate'"'"', '"'"'reported'"'"', $3, 1, 1, $4, 1, 1, $5, $6, $7, $8, $9,"
        print "    '"'"'[]'"'"', '"'"'[]'"'"', '"'"'[]'"'"', '"'"'bench-analyst'"'"', '"'"'2026-12-01T12:00:00Z'"'"', $10, $1);"
        print "BEGIN;"
        for (i = 0; i < 100000; i++) {
          x = 1.0 + (i % 400) * 0.1
          printf "EXECUTE ins (%d, '"'"'W%d'"'"', %d, %.17g, %.17g, %.17g, %.17g, %.17g, %.17g, '"'"'%s'"'"');\n", \
            i + 1, int(i / 30), 1 + i % 30, 0.5 * x, x, 0.01 * x, x, 0.98 * x, 1.02 * x, u
        }
        print "COMMIT;"
        print "DROP TABLE bench_plain_results;"
      }' >"$plain_sql"
      : >"$work/$n.plain"
      for ((r = 0; r < import_repeat; r++)); do
        time_once "$work/$n.plain" psql -X -q -d "$db" -f "$plain_sql"
      done
      record "plain inserts 100000 rows" "$n" "$work/$n.plain"
    fi
  fi
done

# ---------------------------------------------------------------- in-process figures
: >"$work/inproc.csv"
if [ "$backend" = sqlite ]; then
  "$inproc" --store "$stores/$largest-seed$seed/lab.db" --benchmark_repetitions=3 \
    --benchmark_report_aggregates_only=true --benchmark_format=csv 2>/dev/null >"$work/inproc.csv"
fi

# ---------------------------------------------------------------- the table
echo
echo "Benchmarks ($backend backend) on $(uname -m), $(nproc) cores, $(awk -F': ' '/model name/ {print $2; exit}' /proc/cpuinfo); repeat $repeat; medians"
echo
printf "| %-40s | %9s | %10s | %9s | %-27s | %10s | %7s | %-34s | %-4s |\n" \
  benchmark curves "median ms" "peak MiB" baseline "base ms" ratio target mark
printf "|%s|%s|%s|%s|%s|%s|%s|%s|%s|\n" "$(printf -- '-%.0s' {1..42})" "-----------" \
  "------------" "-----------" "$(printf -- '-%.0s' {1..29})" "------------" "---------" \
  "$(printf -- '-%.0s' {1..36})" "------"
small_of() { awk -F'\t' -v b="$1" -v n="$smallest" '$1 == b && $2 == n {print $3}' "$results"; }
while IFS=$'\t' read -r name n med rss base base_med exits; do
  ratio="-" target="-" mark=""
  case "$name" in
    expiring | status)
      ratio=$(awk -v a="$med" -v b="$base_med" 'BEGIN{printf "%.1f", a/b}')
      target="≤ 1.5× $base_name (1 M store)"
      [ "$n" = "$largest" ] && mark=$(awk -v r="$ratio" 'BEGIN{print (r <= 1.5 ? "pass" : "miss")}') ;;
    "audit verify")
      ratio=$(awk -v a="$med" -v b="$base_med" 'BEGIN{printf "%.1f", a/b}')
      target="≤ 2× scan, ~1 s (1 M entries)"
      [ "$n" = "$largest" ] && mark=$(awk -v r="$ratio" -v m="$med" \
        'BEGIN{print (r <= 2 && m <= 1500 ? "pass" : "miss")}') ;;
    "curve show" | quantify | "check log" | "curve log 30x12x3" | "curve list"*)
      # curve list has no target of its own: shown for its growth.
      small=$(small_of "$name")
      base="same, $smallest-curve store"
      base_med="$small"
      ratio=$(awk -v a="$med" -v b="$small" 'BEGIN{printf "%.2f", a/b}')
      target="≤ 1.2× the $smallest-curve store"
      [ "$name" = "curve log 30x12x3" ] && target="$target; < 100 ms"
      [[ "$name" == "curve list"* ]] && target="(no target)"
      if [ "$n" = "$largest" ] && [ "$n" != "$smallest" ] && [[ "$name" != "curve list"* ]]; then
        mark=$(awk -v r="$ratio" -v m="$med" -v what="$name" \
          'BEGIN{ok = r <= 1.2; if (what ~ /curve log/) ok = ok && m < 100; print (ok ? "pass" : "miss")}')
      fi ;;
    "run import"*)
      target="≤ 64 MiB peak; throughput: below" ;;
    "plain inserts"*)
      target="(yardstick of run import)" ;;
  esac
  rss_mib=$(awk -v k="$rss" 'BEGIN{printf "%.0f", k/1024}')
  if [[ "$name" == "run import"* ]]; then
    mark=$(awk -v k="$rss" 'BEGIN{print (k <= 65536 ? "pass" : "miss")}')
  fi
  [ "$exits" = "0 " ] || mark="$mark (exit $exits)"
  printf "| %-40s | %9s | %10s | %9s | %-27s | %10s | %7s | %-34s | %-4s |\n" \
    "$name" "$n" "$med" "$rss_mib" "$base" "$base_med" "$ratio" "$target" "$mark"
done <"$results"

# Run import throughput against plain inserts, audit verify against a plain scan (in process).
imp=$(awk -F'\t' -v n="$largest" '$1 ~ /^run import/ && $2 == n {print $3}' "$results")
if [ "$backend" = sqlite ]; then
  plain=$(awk -F, '/BM_PlainResultInserts.*_median/ {print $3}' "$work/inproc.csv")
  plain_what="plain SQLite inserts of the same rows (in process)"
else
  plain=$(awk -F'\t' -v n="$largest" '$1 ~ /^plain inserts/ && $2 == n {print $3}' "$results")
  plain_what="psql executing a prepared insert of the same rows"
fi
verify_in=$(awk -F, '/BM_AuditVerify.*_median/ {print $3}' "$work/inproc.csv")
scan_in=$(awk -F, '/BM_AuditScan.*_median/ {print $3}' "$work/inproc.csv")
echo
if [ -n "$plain" ] && [ -n "$imp" ]; then
  awk -v i="$imp" -v p="$plain" -v w="$plain_what" 'BEGIN{r = p / i; printf "run import, 100 000 rows: %.0f ms whole process; %s: %.0f ms; throughput %.2f× plain (target ≥ 0.5×): %s\n", i, w, p, r, (r >= 0.5 ? "pass" : "miss")}'
fi
if [ -n "$verify_in" ] && [ -n "$scan_in" ]; then
  awk -v v="$verify_in" -v s="$scan_in" 'BEGIN{r = v / s; printf "audit verify in process: %.0f ms; plain scan of every column: %.0f ms; %.1f× (target ≤ 2×): %s\n", v, s, r, (r <= 2 ? "pass" : "miss")}'
fi
# Peak memory flat in the store's size: the largest store against the smallest, per command.
echo
echo "peak memory, $largest-curve store against the $smallest-curve store (target: flat, ≤ 1.2×):"
awk -F'\t' -v s="$smallest" -v l="$largest" '
  $2 == s {small[$1] = $4} $2 == l {large[$1] = $4}
  END {for (k in large) if (k in small) printf "  %-40s %6.1f MiB → %6.1f MiB  %s\n", k, small[k]/1024, large[k]/1024, (large[k] <= 1.2 * small[k] ? "pass" : "miss")}' \
  "$results" | sort
echo
for n in $sizes; do
  echo "store $n: $(tr '\n' ' ' <"$stores/$n-seed$seed/report.txt")"
done
cat "$copy_report"

#!/usr/bin/env bash
# SPDX-License-Identifier: Apache-2.0
# Smoke test of the benchmark store generator (no timing): a small store verifies, the status
# board and the expiring list read it, the same seed gives the same chain and another seed
# another one.
# Usage: smoke.sh GENERATOR CURVEWARDEN
set -euo pipefail
gen="$1"
cw="$2"
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT
export TZ=UTC CURVEWARDEN_USER=bench-reader CURVEWARDEN_NOW=2026-12-01T12:00:00Z

"$gen" --out "$dir/a.db" --curves 200 --seed 7 --files "$dir" --quiet >"$dir/a.txt"
"$gen" --out "$dir/b.db" --curves 200 --seed 7 --quiet >/dev/null
"$gen" --out "$dir/c.db" --curves 200 --seed 8 --quiet >/dev/null

fail() { echo "smoke: $*" >&2; exit 1; }
grep -q '^curves [0-9]' "$dir/a.txt" || fail "no curve count in the generator's report"
curves=$(awk '$1 == "curves" {print $2}' "$dir/a.txt")
[ "$curves" -ge 200 ] && [ "$curves" -lt 260 ] || fail "asked for 200 curves, got $curves"
for kind in runs checks results reviews; do
  n=$(awk -v k="$kind" '$1 == k {print $2}' "$dir/a.txt")
  [ "$n" -gt 0 ] || fail "no $kind generated"
done

verify() { "$cw" --db "$1" --json audit verify; }
a=$(verify "$dir/a.db") || fail "audit verify refused the generated store: $a"
echo "$a" | grep -q '"ok": *true' || fail "audit verify: $a"
entries=$(awk '$1 == "entries" {print $2}' "$dir/a.txt")
echo "$a" | grep -q "\"entries\": *$entries" || fail "expected $entries entries: $a"
b=$(verify "$dir/b.db")
[ "$a" = "$b" ] || fail "the same seed gave different chains: $a / $b"
c=$(verify "$dir/c.db")
[ "$a" != "$c" ] || fail "another seed gave the same chain"

"$cw" --db "$dir/a.db" status >"$dir/status.txt" || fail "status failed"
"$cw" --db "$dir/a.db" --json expiring --within "30 days" >/dev/null || fail "expiring failed"
. "$dir/store.env"
shown=$("$cw" --db "$dir/a.db" --json curve show "$BENCH_CURVE") || fail "curve show failed"
echo "$shown" | grep -q '"state": *"active"' ||
  fail "the anchor curve $BENCH_CURVE is not active at the end of the history"
[ -s "$dir/points-30x12x3.csv" ] && [ -s "$dir/run-100000.csv" ] || fail "no benchmark files"
# The run files are made for the wide method's curves: a short one imports with every check
# passing and every sample reported.
"$cw" --db "$dir/a.db" --json run import "$dir/run-310.csv" --method "$BENCH_METHOD" \
  --instrument "$BENCH_INSTRUMENT" >"$dir/run.json" ||
  fail "the generated run file did not import cleanly: $(cat "$dir/run.json")"
grep -q '"refused": *[1-9]' "$dir/run.json" && fail "samples refused: $(cat "$dir/run.json")"
"$cw" --db "$dir/a.db" --json curve log --method "$BENCH_METHOD" --instrument "$BENCH_INSTRUMENT" \
  --lot "$BENCH_LOT" --points "$dir/points-30x12x3.csv" >/dev/null ||
  fail "the generated points file was not accepted"
echo "smoke: ok ($curves curves, $entries entries)"

#!/usr/bin/env bash
# Installs missing packages, builds with warnings as errors and runs every test through ctest
# (the crash trials and the concurrency test among them). Then the proofs that need builds of
# their own: the parsers fuzzed for a fixed number of runs, and the unit and scenario suites
# again under AddressSanitizer and UndefinedBehaviorSanitizer. tests/proofs.sh adds the
# end-to-end suite under the sanitizers and longer fuzzing.
# A throwaway PostgreSQL server (tests/pg/cluster.sh) runs for the duration of ctest; its URI is
# exported as CURVEWARDEN_TEST_PG for the tests that run against PostgreSQL. When it cannot start
# the run fails: those tests are never skipped silently.
# Usage: tests/run.sh [extra ctest arguments]
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"
jobs=$(nproc)

"$root/.ci/install-deps"
"$root/.ci/configure" "$build"
cmake --build "$build" -j "$jobs"

pg_dir=$(mktemp -d "${TMPDIR:-/tmp}/curvewarden-pg.XXXXXX")
trap '"$root/tests/pg/cluster.sh" stop "$pg_dir"' EXIT
echo "== starting a throwaway PostgreSQL server in $pg_dir"
CURVEWARDEN_TEST_PG=$("$root/tests/pg/cluster.sh" start "$pg_dir") ||
  { echo "tests/run.sh: the PostgreSQL test server did not start (above); failing the run" >&2; exit 1; }
export CURVEWARDEN_TEST_PG
echo "CURVEWARDEN_TEST_PG=$CURVEWARDEN_TEST_PG"
(cd "$build" && ctest --output-on-failure -j "$jobs" "$@")
"$root/tests/pg/cluster.sh" stop "$pg_dir"
trap - EXIT
[ $# -eq 0 ] || exit 0

# The parsers of every input under libFuzzer with AddressSanitizer and UndefinedBehaviorSanitizer
# (clang, build-fuzz/): a fixed seed and a fixed number of runs from the seed corpus, so that every
# run of this script tries the same inputs. tests/proofs.sh fuzzes for longer, from a random seed.
echo "== fuzzing the parsers (libFuzzer, ASan + UBSan; seed 1, 50 000 runs each)"
launcher=()
if command -v ccache >/dev/null 2>&1; then launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache); fi
fuzz="$build-fuzz"
CXX=clang++ CC=clang cmake -S "$root" -B "$fuzz" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCURVEWARDEN_BUILD_TESTS=OFF -DCURVEWARDEN_FUZZ=ON "${launcher[@]}" >/dev/null
targets=(points run method values)
cmake --build "$fuzz" -j "$jobs" --target "${targets[@]/#/fuzz_}"
for t in "${targets[@]}"; do
  work=$(mktemp -d)
  echo "fuzz_$t: 50 000 runs from tests/fuzz/corpus/$t"
  UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 "$fuzz/tests/fuzz/fuzz_$t" -seed=1 -runs=50000 \
    -max_len=65536 -timeout=10 "$work" "$root/tests/fuzz/corpus/$t" 2>"$work.log" ||
    { tail -n 40 "$work.log"; echo "fuzz_$t found a failing input (above)"; exit 1; }
  grep -E '^Done' "$work.log" || true
  rm -rf "$work" "$work.log"
done

# The unit and scenario suites once more, built with AddressSanitizer and UndefinedBehaviorSanitizer
# (build-asan/, CURVEWARDEN_SANITIZE); the scenario tests run the sanitized binary. Left out: the
# crash trials and the 100 000-row run (they measure the product, not memory errors: the main
# suite above runs them), the benchmark smoke test (its generator is not built here) and the
# end-to-end suite (label e2e; tests/proofs.sh runs it).
echo "== the unit and scenario suites under ASan + UBSan (build-asan/)"
asan="$build-asan"
cmake -S "$root" -B "$asan" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCURVEWARDEN_WERROR=ON \
  -DCURVEWARDEN_BUILD_TESTS=ON -DCURVEWARDEN_SANITIZE=ON "${launcher[@]}" >/dev/null
unit_targets=(cli_tests core_tests domain_tests fitting_tests import_tests plot_tests report_tests rules_tests
  store_tests)
cmake --build "$asan" -j "$jobs" --target curvewarden scenario_tests "${unit_targets[@]}"
(cd "$asan" && ASAN_OPTIONS=detect_leaks=1:abort_on_error=0 \
  LSAN_OPTIONS="suppressions=$root/tests/sanitizers/lsan.supp" \
  UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 \
  ctest --output-on-failure -j "$jobs" -LE e2e -E 'NOT_BUILT|bench_|crash:|100 000 rows')

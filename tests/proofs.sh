#!/usr/bin/env bash
# Longer proofs than CI runs, after tests/run.sh: every suite, the end-to-end one included, under
# AddressSanitizer and UndefinedBehaviorSanitizer (build-asan/; tests/run.sh runs only the unit and
# scenario suites there), then the libFuzzer targets, each run for a bounded time from a random
# seed (build-fuzz/, clang).
# Usage: tests/proofs.sh
#        CURVEWARDEN_FUZZ_SECONDS=N   seconds per fuzz target (default 60)
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"
jobs=$(nproc)

"$root/.ci/install-deps"

launcher=()
if command -v ccache >/dev/null 2>&1; then launcher=(-DCMAKE_CXX_COMPILER_LAUNCHER=ccache); fi

echo "== the unit and scenario suites under ASan + UBSan"
asan="$build-asan"
cmake -S "$root" -B "$asan" -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCURVEWARDEN_WERROR=ON \
  -DCURVEWARDEN_BUILD_TESTS=ON -DCURVEWARDEN_SANITIZE=ON "${launcher[@]}" >/dev/null
cmake --build "$asan" -j "$jobs"
# The crash trials and the 100 000-row run measure the product, not the sanitizers: they run in
# the main suite above.
(cd "$asan" && ASAN_OPTIONS=detect_leaks=1 LSAN_OPTIONS="suppressions=$root/tests/sanitizers/lsan.supp" \
  UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 ctest --output-on-failure -j "$jobs" -E 'crash:|100 000 rows')

echo "== fuzzing the parsers (libFuzzer, ASan + UBSan)"
fuzz="$build-fuzz"
CXX=clang++ CC=clang cmake -S "$root" -B "$fuzz" -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCURVEWARDEN_BUILD_TESTS=OFF -DCURVEWARDEN_FUZZ=ON "${launcher[@]}" >/dev/null
targets=(points run method values)
cmake --build "$fuzz" -j "$jobs" --target "${targets[@]/#/fuzz_}"
seconds="${CURVEWARDEN_FUZZ_SECONDS:-60}"
for t in "${targets[@]}"; do
  work="$fuzz/corpus-$t"
  mkdir -p "$work"
  echo "fuzz_$t: ${seconds} s from tests/fuzz/corpus/$t"
  UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 "$fuzz/tests/fuzz/fuzz_$t" -max_total_time="$seconds" \
    -max_len=65536 -timeout=10 -print_final_stats=1 "$work" "$root/tests/fuzz/corpus/$t"
done

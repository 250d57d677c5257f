#!/usr/bin/env bash
# The proofs that need builds of their own, after tests/run.sh: the suites under AddressSanitizer
# and UndefinedBehaviorSanitizer (build-asan/), then the libFuzzer targets, each run for a bounded
# time from its seed corpus (build-fuzz/, clang). Not yet part of CI: see DEVELOPERS.md.
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
(cd "$asan" && ASAN_OPTIONS=detect_leaks=1 UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 \
  ctest --output-on-failure -j "$jobs" -E 'crash:|100 000 rows')

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

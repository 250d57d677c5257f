#!/usr/bin/env bash
# Installs missing packages, builds with warnings as errors and runs every test through ctest
# (the crash trials and the concurrency test among them). The proofs that need builds of their
# own (sanitizers, fuzzing) are in tests/proofs.sh.
# Usage: tests/run.sh [extra ctest arguments]
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"
jobs=$(nproc)

"$root/.ci/install-deps"
"$root/.ci/configure" "$build"
cmake --build "$build" -j "$jobs"
(cd "$build" && ctest --output-on-failure -j "$jobs" "$@")

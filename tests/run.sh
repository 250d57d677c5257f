#!/usr/bin/env bash
# Installs missing packages, builds with warnings as errors and runs every test through ctest.
# Usage: tests/run.sh [extra ctest arguments]
set -euo pipefail
root=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
build="${CURVEWARDEN_BUILD_DIR:-$root/build}"

"$root/.ci/install-deps"
"$root/.ci/configure" "$build"
cmake --build "$build" -j "$(nproc)"
cd "$build"
ctest --output-on-failure -j "$(nproc)" "$@"

#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Installs what is missing, builds sevenfold with its tests and runs every test through ctest:
# first the normal Release build (build/, with the Python module), then the whole suite again with AddressSanitizer and
# UndefinedBehaviorSanitizer (build-asan/, -O1; docs/robustness.md; without the Python module,
# which an uninstrumented interpreter cannot load). Any sanitizer report fails.
# SEVENFOLD_SKIP_SANITIZE=1 skips the second pass (for a quick local run; CI runs both).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/install-deps.sh --tests
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DSEVENFOLD_BUILD_TESTS=ON -DSEVENFOLD_BUILD_PYTHON=ON
cmake --build build -j "$(nproc)"
ctest --test-dir build --output-on-failure -j "$(nproc)"

if [[ "${SEVENFOLD_SKIP_SANITIZE:-0}" != "1" ]]; then
  cmake -S . -B build-asan -DCMAKE_BUILD_TYPE=RelWithDebInfo -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g" \
    -DSEVENFOLD_SANITIZE=ON -DSEVENFOLD_BUILD_TESTS=ON -DSEVENFOLD_BUILD_PYTHON=OFF
  cmake --build build-asan -j "$(nproc)"
  # halt_on_error: the first report fails the test; leaks are reported too (detect_leaks).
  ASAN_OPTIONS=halt_on_error=1:detect_leaks=1:abort_on_error=0 \
  UBSAN_OPTIONS=halt_on_error=1:print_stacktrace=1 \
    ctest --test-dir build-asan --output-on-failure -j "$(nproc)" --timeout 1500
fi

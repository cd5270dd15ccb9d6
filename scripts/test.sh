#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Installs what is missing, builds sevenfold with its tests and runs every test through ctest.
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/install-deps.sh --tests
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DSEVENFOLD_BUILD_TESTS=ON
cmake --build build -j "$(nproc)"
ctest --test-dir build --output-on-failure -j "$(nproc)"

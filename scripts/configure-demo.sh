#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Configures the build of the demo: the library and the command line only, no tests, so that the
# demo needs no test-only package (Catch2, python3-ase, chromium).
# usage: scripts/configure-demo.sh BUILD_DIR [extra cmake arguments...]
# A ctest (demo_configure_needs_no_test_package) runs it with Catch2 hidden from CMake.
set -euo pipefail
source_dir="$(cd "$(dirname "$0")/.." && pwd)"
build_dir=$1
shift
cmake -S "$source_dir" -B "$build_dir" -DCMAKE_BUILD_TYPE=Release -DSEVENFOLD_BUILD_TESTS=OFF "$@" >/dev/null

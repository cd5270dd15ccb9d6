#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Installs the build tree into a scratch prefix, builds the example of docs/library.md as an
# outside project against it (find_package(sevenfold 0.2)), and runs it on a demo species file.
# usage: tests/consumer/check.sh SOURCE_DIR BUILD_DIR
set -euo pipefail
source_dir=$1
build_dir=$2
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cmake --install "$build_dir" --prefix "$work/prefix" >/dev/null
# Only the public headers are installed: no reader, engine or fitter header.
test -f "$work/prefix/include/sevenfold/sevenfold.h"
if find "$work/prefix/include" -name 'species_reader.h' -o -name 'fitter.h' | grep -q .; then
  echo "an internal header was installed" >&2
  exit 1
fi
# The example is the first ```cpp block of docs/library.md.
awk '/^```cpp$/ {inside = 1; next} /^```$/ && inside {exit} inside {print}' \
  "$source_dir/docs/library.md" >"$work/main.cc"
test -s "$work/main.cc"
cmake -S "$source_dir/tests/consumer" -B "$work/build" -DCMAKE_PREFIX_PATH="$work/prefix" \
  -DCONSUMER_MAIN="$work/main.cc" >/dev/null
cmake --build "$work/build" >/dev/null
"$work/build/consumer" "$source_dir/species/h2-o2-core.yaml" "$work/out.entries"
test -s "$work/out.entries"

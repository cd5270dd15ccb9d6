#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Builds the libFuzzer targets (clang, ASan+UBSan) in build-fuzz/ and runs each for a given time.
# usage: scripts/fuzz.sh [seconds-per-target] [species_fuzzer|entries_fuzzer ...]
# Seeds: tests/data/bad-input/, species/*.yaml, tests/data/*.yaml and an entries file written by
# the fuzz build's own `sevenfold fit`. The growing corpus stays in build-fuzz/corpus/<target>;
# findings (crash-*, timeout-*, oom-*) land in build-fuzz/findings/<target>/ and make the script
# exit 1. Each target runs with one job at low priority (the machine is shared).
set -euo pipefail
cd "$(dirname "$0")/.."
seconds="${1:-60}"
shift || true
targets=("$@")
if [[ ${#targets[@]} -eq 0 ]]; then targets=(species_fuzzer entries_fuzzer); fi

build=build-fuzz
cmake -S . -B "$build" -DCMAKE_CXX_COMPILER=clang++ -DCMAKE_BUILD_TYPE=RelWithDebInfo \
  -DCMAKE_CXX_FLAGS_RELWITHDEBINFO="-O1 -g" -DSEVENFOLD_FUZZ=ON -DSEVENFOLD_BUILD_TESTS=OFF >/dev/null
nice cmake --build "$build" -j 2 --target species_fuzzer entries_fuzzer sevenfold_cli

# Seed corpora (copied, so the fuzzer's additions never touch the tree).
mkdir -p "$build/corpus/species_fuzzer" "$build/corpus/entries_fuzzer"
cp species/*.yaml tests/data/*.yaml "$build/corpus/species_fuzzer/"
for f in tests/data/bad-input/*.yaml; do cp "$f" "$build/corpus/species_fuzzer/bad-$(basename "$f")"; done
for f in tests/data/bad-input/*.entries; do cp "$f" "$build/corpus/entries_fuzzer/bad-$(basename "$f")"; done
if [[ ! -f "$build/corpus/entries_fuzzer/fitted.entries" ]]; then
  # A small fitted file in the current format (a fixed mid temperature keeps this quick).
  ASAN_OPTIONS=detect_leaks=0 "$build/sevenfold" fit tests/data/reference-species.yaml --mid 1000 \
    -q -o "$build/corpus/entries_fuzzer/fitted.entries" --allow-poor-fits
fi

status=0
for target in "${targets[@]}"; do
  findings="$build/findings/$target"
  mkdir -p "$findings"
  dict=()
  if [[ -f "fuzz/$target.dict" ]]; then dict=(-dict="fuzz/$target.dict"); fi
  echo "== $target for ${seconds}s" >&2
  # -timeout: an input taking longer than 5 s is a hang finding. -max_len: species files of
  # interest are small; the 16 MiB limit itself is covered by tests/bad_input_test.cc.
  if ! nice -n 10 "$build/fuzz/$target" "$build/corpus/$target" "${dict[@]}" \
      -max_total_time="$seconds" -timeout=5 -rss_limit_mb=2048 -max_len=16384 \
      -jobs=1 -workers=1 -print_final_stats=1 -artifact_prefix="$findings/" \
      2> >(tee "$build/$target.log" >&2); then
    status=1
  fi
  # With -jobs the driver writes fuzz-<n>.log; keep its tail visible.
  if ls fuzz-*.log >/dev/null 2>&1; then cat fuzz-*.log >> "$build/$target.log"; rm -f fuzz-*.log; fi
done
if compgen -G "$build/findings/*/*" >/dev/null; then
  echo "findings:" >&2
  ls -l "$build"/findings/*/ >&2
  status=1
fi
exit $status

#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# End-to-end speed of `sevenfold fit` on generated species (docs/performance.md).
# Builds a Release binary in build-perf (or uses $SEVENFOLD_BIN), generates 100, 1000 and 10000
# INVENTED species (scripts/generate-species.py, fixed seed), and runs
#   sevenfold fit FILE -o ENTRIES --jobs $JOBS --allow-poor-fits -q
# under /usr/bin/time -v, printing wall time, CPU time, peak memory and species per second.
# Then times `sevenfold check` on the demo scenario. Usage: scripts/benchmark.sh [COUNT...]
# Environment: JOBS (default 2), REPEAT (runs per size, the best is kept; default 3),
# SEVENFOLD_BIN (skip the build), WORK (scratch directory; default a fresh mktemp -d).
set -euo pipefail
cd "$(dirname "$0")/.."
root=$(pwd)
jobs=${JOBS:-2}
repeat=${REPEAT:-3}
counts=("$@")
[[ ${#counts[@]} -gt 0 ]] || counts=(100 1000 10000)

if [[ ! -x /usr/bin/time ]]; then
  echo "benchmark: /usr/bin/time is missing; installing the Debian package 'time'" >&2
  apt-get install -y time >/dev/null
fi
if [[ -z "${SEVENFOLD_BIN:-}" ]]; then
  cmake -S . -B build-perf -DCMAKE_BUILD_TYPE=Release >/dev/null
  cmake --build build-perf -j2 --target sevenfold_cli >/dev/null
  SEVENFOLD_BIN=$root/build-perf/sevenfold
fi
work=${WORK:-$(mktemp -d)}
mkdir -p "$work"
echo "binary: $SEVENFOLD_BIN; jobs: $jobs; best of $repeat runs; scratch: $work"
echo "machine: $(nproc) cores, load average $(cut -d' ' -f1-3 /proc/loadavg)"

# Runs a command under /usr/bin/time -v; prints "wall_s cpu_s max_rss_kb".
measure() {
  local log=$work/time.log
  /usr/bin/time -v -o "$log" "$@" >/dev/null 2>&1
  awk -F': ' '
    /Elapsed \(wall clock\)/ { n = split($2, p, ":"); wall = (n == 3) ? p[1]*3600 + p[2]*60 + p[3] : p[1]*60 + p[2] }
    /User time/ { user = $2 } /System time/ { sys = $2 }
    /Maximum resident set size/ { rss = $2 }
    END { printf "%.3f %.3f %d\n", wall, user + sys, rss }' "$log"
}

printf '%8s %9s %9s %10s %12s\n' species wall_s cpu_s max_rss_MB species_per_s
for n in "${counts[@]}"; do
  input=$work/generated-$n.yaml
  [[ -f $input ]] || /usr/bin/python3 scripts/generate-species.py "$n" "$input"
  best=""
  for ((r = 0; r < repeat; ++r)); do
    # exit 1 means "some fit missed its thresholds", expected for invented species.
    result=$(measure "$SEVENFOLD_BIN" fit "$input" -o "$work/generated-$n.entries" --jobs "$jobs" \
      --allow-poor-fits -q || true)
    if [[ -z $best ]] || awk -v a="$result" -v b="$best" 'BEGIN { split(a, x, " "); split(b, y, " "); exit !(x[1] < y[1]) }'; then
      best=$result
    fi
  done
  read -r wall cpu rss <<<"$best"
  awk -v n="$n" -v w="$wall" -v c="$cpu" -v m="$rss" \
    'BEGIN { printf "%8d %9.3f %9.3f %10.1f %12.0f\n", n, w, c, m / 1024, (w > 0 ? n / w : 0) }'
done

# check on the demo scenario: regenerate its entries once, then time the check.
demo=(species/*.yaml)
"$SEVENFOLD_BIN" fit "${demo[@]}" -o "$work/demo.entries" --jobs "$jobs" -q >/dev/null 2>&1 || true
best=""
for ((r = 0; r < repeat; ++r)); do
  result=$(measure "$SEVENFOLD_BIN" check "${demo[@]}" -e "$work/demo.entries" --jobs "$jobs" -q || true)
  if [[ -z $best ]] || awk -v a="$result" -v b="$best" 'BEGIN { split(a, x, " "); split(b, y, " "); exit !(x[1] < y[1]) }'; then
    best=$result
  fi
done
read -r wall cpu rss <<<"$best"
printf 'check on the demo scenario (%d files): wall %.3f s, cpu %.3f s, max RSS %.1f MB\n' \
  "${#demo[@]}" "$wall" "$cpu" "$(awk -v m="$rss" 'BEGIN { print m / 1024 }')"

#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Memory and time at scale (docs/robustness.md, "Scale"): `fit` and `check` of 10^5 INVENTED
# species, `report` of 10^4, and the refusal of a 16 MiB deeply nested YAML file. Prints wall
# time and peak RSS of each under /usr/bin/time -v. Usage: scripts/benchmark-scale.sh BINARY
# [FIT_COUNT [REPORT_COUNT]]; environment: JOBS (default 2), WORK (scratch; default mktemp -d).
set -euo pipefail
cd "$(dirname "$0")/.."
binary=${1:?usage: scripts/benchmark-scale.sh BINARY [FIT_COUNT [REPORT_COUNT]]}
fit_count=${2:-100000}
report_count=${3:-10000}
jobs=${JOBS:-2}
work=${WORK:-$(mktemp -d)}
mkdir -p "$work"
echo "binary: $binary; jobs: $jobs; scratch: $work"
echo "machine: $(nproc) cores, load average $(cut -d' ' -f1-3 /proc/loadavg)"

# Runs a command under /usr/bin/time -v; prints "label exit wall_s max_rss_MB".
measure() {
  local label=$1
  shift
  local log=$work/time.log status=0 errors=$work/stderr-${label// /-}.log
  /usr/bin/time -v -o "$log" "$@" >/dev/null 2>"$errors" || status=$?
  awk -F': ' -v label="$label" -v status="$status" '
    /Elapsed \(wall clock\)/ { n = split($2, p, ":"); wall = (n == 3) ? p[1]*3600 + p[2]*60 + p[3] : p[1]*60 + p[2] }
    /Maximum resident set size/ { rss = $2 }
    END { printf "%-34s exit %d  wall %8.2f s  max RSS %8.1f MB\n", label, status, wall, rss / 1024 }' "$log"
  # The last lines of its messages, which say why when the exit status is 2.
  [[ $status -ne 2 ]] || tail -n 3 "$errors" | cut -c1-300
}

fit_input=$work/generated-$fit_count.yaml
[[ -f $fit_input ]] || /usr/bin/python3 scripts/generate-species.py "$fit_count" "$fit_input"
# A species file is capped at 16 MiB (docs/robustness.md): split into files of 20000 species.
rm -f "$work"/part-*.yaml
/usr/bin/python3 - "$fit_input" "$work" <<'SPLIT'
import sys
lines = open(sys.argv[1]).read().splitlines(keepends=True)
start = lines.index("species:\n") + 1
header, blocks = lines[:start], []
for line in lines[start:]:
    if line.startswith("  ") and not line.startswith("   "):
        blocks.append([])
    blocks[-1].append(line)
for part in range(0, len(blocks), 20000):
    with open("%s/part-%03d.yaml" % (sys.argv[2], part // 20000), "w") as out:
        out.write("".join(header) + "".join("".join(b) for b in blocks[part:part + 20000]))
SPLIT
fit_parts=("$work"/part-*.yaml)
report_input=$work/generated-$report_count.yaml
[[ -f $report_input ]] || /usr/bin/python3 scripts/generate-species.py "$report_count" "$report_input"

# Exit 1 (some fit misses its thresholds) is expected for invented species.
measure "fit $fit_count species" "$binary" fit "${fit_parts[@]}" -o "$work/fit.entries" \
  --jobs "$jobs" --allow-poor-fits -q
measure "check $fit_count species" "$binary" check "${fit_parts[@]}" -e "$work/fit.entries" \
  --jobs "$jobs" --allow-poor-fits
# Exit 1 (poor fits listed) is expected here too.
measure "report $report_count species" "$binary" report "$report_input" -o "$work/report" \
  --jobs "$jobs"
du -sh "$work/report" | awk '{ print "report size: " $1 }'

# Just under 16 MiB of nested flow sequences: refused (exit 2) without building the tree.
nested=$work/nested.yaml
/usr/bin/python3 -c "
import sys
depth = 8 * 1024 * 1024 - 64
sys.stdout.write('sevenfold-species: 2\nspecies: ' + '[' * depth + ']' * depth + '\n')
" >"$nested"
measure "16 MiB nested YAML (refused)" "$binary" fit "$nested" -o "$work/nested.entries"

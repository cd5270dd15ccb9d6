#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# The extrapolation guard's cost in the fitted range (issue 14, docs/fitting.md "The guard"):
# fits the demo species (species/*.yaml) with the guard off, at the default 1.25:0.2 and at
# 1.5:0.1, and prints one markdown table, a row per species, of the worst normalised in-range
# error of each fit and the smallest Cp/R of its high range over [T_high, 1.5 T_high], both read
# from the entries the fit writes (docs/entries-format.md). Builds nothing; deterministic (the
# entries are byte-identical whatever the thread count).
# usage: scripts/guard-tradeoff.sh path/to/sevenfold [jobs]
set -euo pipefail
if [[ $# -lt 1 ]]; then
  echo "usage: $0 path/to/sevenfold [jobs]" >&2
  exit 2
fi
sevenfold=$(realpath "$1")
jobs=${2:-2}
cd "$(dirname "$0")/.."
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
settings=(off 1.25:0.2 1.5:0.1)
for setting in "${settings[@]}"; do
  # Exit 1 means some fits miss their thresholds (at the form's limit): expected on the demo.
  status=0
  "$sevenfold" fit species/*.yaml -o "$work/guard-$setting.entries" --allow-poor-fits \
    --extrapolation-guard "$setting" --jobs "$jobs" >/dev/null 2>"$work/guard-$setting.log" ||
    status=$?
  if [[ $status -ne 0 && $status -ne 1 ]]; then
    cat "$work/guard-$setting.log" >&2
    echo "error: fit with --extrapolation-guard $setting failed (exit $status)" >&2
    exit "$status"
  fi
done
/usr/bin/python3 - "$work" "${settings[@]}" <<'EOF'
import sys

work, settings = sys.argv[1], sys.argv[2:]


def read_entries(path):
    """Per species, in file order: the worst normalised in-range error and the smallest Cp/R of
    the high range above T_high (the entries' extrapolation-cp-over-r line)."""
    result, name, fields = {}, None, {}

    def finish():
        if name is None:
            return
        scales = dict(zip(fields["fit-error-scales"][0::2], map(float, fields["fit-error-scales"][1::2])))
        worst = 0.0
        for key, scale in (("cp-error", scales["cp"]), ("h-error", scales["h"]), ("s-error", scales["s"])):
            words = fields[key]
            # low max e at-k T rms e high max e at-k T rms e
            for side in ("low", "high"):
                i = words.index(side)
                assert words[i + 1] == "max"
                worst = max(worst, float(words[i + 2]) / scale)
        words = fields["extrapolation-cp-over-r"]
        above = words.index("above")
        assert words[above + 1] == "min"
        result[name] = (worst, float(words[above + 2]), words[0])

    with open(path, encoding="utf-8") as handle:
        for line in handle:
            if line.startswith('"'):
                finish()
                name, fields = line[1:line.index('"', 1)], {}
            elif line.startswith("  ") and name is not None:
                words = line.split()
                fields[words[0]] = words[1:]
    finish()
    return result


tables = [read_entries(f"{work}/guard-{setting}.entries") for setting in settings]
names = list(tables[0])
assert all(list(table) == names for table in tables), "species differ between runs"
head = ["species"] + [f"worst, guard {s}" for s in settings] + [f"min Cp/R above, guard {s}" for s in settings]
print("| " + " | ".join(head) + " |")
print("|" + " --- |" * len(head))
for name in names:
    worst = [f"{table[name][0]:.3f}" for table in tables]
    above = [f"{table[name][1]:.2f}" + ("" if table[name][2] == "sane" else " (outside band)") for table in tables]
    print("| " + " | ".join([name] + worst + above) + " |")
for i, setting in enumerate(settings[1:], start=1):
    costs = [tables[i][n][0] / tables[0][n][0] for n in names if tables[0][n][0] > 1e-6]
    print(f"\nguard {setting}: worst in-range error over the guard-off fit, median "
          f"{sorted(costs)[len(costs) // 2]:.3f}, largest {max(costs):.3f} ({len(costs)} species with a "
          f"non-zero error)")
EOF

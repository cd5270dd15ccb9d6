#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Regenerates the committed demo output from species/: output/h2-nh3-blend.entries and the
# report in output/report/. usage: scripts/regenerate-output.sh [path/to/sevenfold]
set -euo pipefail
cd "$(dirname "$0")/.."
sevenfold=${1:-build/sevenfold}
"$sevenfold" fit species/*.yaml -o output/h2-nh3-blend.entries
"$sevenfold" report species/*.yaml --entries output/h2-nh3-blend.entries -o output/report
echo "entries: output/h2-nh3-blend.entries"
echo "report:  output/report/index.html (summary: output/report/summary.md)"

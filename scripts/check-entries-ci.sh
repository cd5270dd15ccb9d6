#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# CI gate for a mechanism repository that keeps its thermochemistry as species YAML files plus a
# committed sevenfold entries file. Copy this script into your repository (for example as
# scripts/check-entries-ci.sh) and run it from the repository root in any CI job:
#
#   bash scripts/check-entries-ci.sh
#
# It regenerates every species in memory with `sevenfold check` and compares the result with the
# committed entries file: species without entry or entries without species, entries not
# regenerated after their species changed, other model options, curves that moved, fits that
# miss their quality thresholds. It writes a JUnit-style XML report for the CI to display,
# uploads nothing, and exits with check's status:
#   0  every entry matches its species      1  findings (listed on stdout)
#   2  bad input (a malformed species or entries file, a bad option), or sevenfold unavailable
#
# Settings (environment variables; defaults in brackets):
#   SEVENFOLD_SPECIES     shell glob of the species files             [species/*.yaml]
#   SEVENFOLD_ENTRIES     the committed entries file                  [mechanism.entries]
#   SEVENFOLD_JUNIT       where to write the JUnit report; empty: none [sevenfold-check.xml]
#   SEVENFOLD_CHECK_ARGS  further options, exactly as given to `sevenfold fit` when the entries
#                         were written, e.g. "--mid auto" or "--smooth-curvature"   []
#   SEVENFOLD             the sevenfold executable                    [sevenfold on PATH]
#   SEVENFOLD_SOURCE      a sevenfold source checkout to build when no executable is found; its
#                         scripts/install-deps.sh installs the missing Debian packages (as root,
#                         otherwise it prints the apt-get line)              []
#
# To refresh the entries after an intended change, run locally
#   sevenfold fit species/*.yaml -o mechanism.entries [same options]
# and commit the species files and the entries file together.
set -euo pipefail

species_glob="${SEVENFOLD_SPECIES:-species/*.yaml}"
entries="${SEVENFOLD_ENTRIES:-mechanism.entries}"
junit="${SEVENFOLD_JUNIT-sevenfold-check.xml}"
read -r -a extra_args <<<"${SEVENFOLD_CHECK_ARGS:-}"

fail_setup() {
  echo "check-entries-ci: $*" >&2
  exit 2
}

# Find sevenfold, or build it from a source checkout.
sevenfold="${SEVENFOLD:-}"
if [[ -z "$sevenfold" ]]; then
  if command -v sevenfold >/dev/null 2>&1; then
    sevenfold="$(command -v sevenfold)"
  elif [[ -n "${SEVENFOLD_SOURCE:-}" ]]; then
    [[ -f "$SEVENFOLD_SOURCE/CMakeLists.txt" ]] ||
      fail_setup "SEVENFOLD_SOURCE=$SEVENFOLD_SOURCE is not a sevenfold source checkout"
    bash "$SEVENFOLD_SOURCE/scripts/install-deps.sh" ||
      fail_setup "the Debian packages sevenfold needs are missing (see the message above)"
    build_dir="$SEVENFOLD_SOURCE/build-ci"
    cmake -S "$SEVENFOLD_SOURCE" -B "$build_dir" -DCMAKE_BUILD_TYPE=Release \
      -DSEVENFOLD_BUILD_TESTS=OFF >/dev/null
    cmake --build "$build_dir" -j "$(nproc)" --target sevenfold_cli >/dev/null
    sevenfold="$build_dir/sevenfold"
  else
    fail_setup "no sevenfold executable: put it on PATH, set SEVENFOLD to its path, or set" \
      "SEVENFOLD_SOURCE to a sevenfold source checkout to build it"
  fi
fi
[[ -x "$sevenfold" ]] || fail_setup "SEVENFOLD=$sevenfold is not an executable"

# Expand the species glob here, so that a glob matching nothing is an error, not a literal name.
shopt -s nullglob
# shellcheck disable=SC2206  # word splitting and globbing are intended
species_files=($species_glob)
shopt -u nullglob
[[ ${#species_files[@]} -gt 0 ]] || fail_setup "no species files match SEVENFOLD_SPECIES=$species_glob"
[[ -f "$entries" ]] || fail_setup "no entries file at SEVENFOLD_ENTRIES=$entries"

args=(check "${species_files[@]}" --entries "$entries" --quiet)
[[ -n "$junit" ]] && args+=(--junit "$junit")
args+=("${extra_args[@]}")

echo "check-entries-ci: $("$sevenfold" --version): ${#species_files[@]} species file(s) against $entries" >&2
status=0
"$sevenfold" "${args[@]}" || status=$?
if [[ -n "$junit" && -f "$junit" ]]; then
  echo "check-entries-ci: JUnit report in $junit" >&2
fi
exit "$status"

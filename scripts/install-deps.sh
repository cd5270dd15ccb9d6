#!/usr/bin/env bash
# SPDX-License-Identifier: MIT
# Installs the Debian packages sevenfold needs, only those missing, and only when run as root.
# usage: scripts/install-deps.sh [--tests]   (--tests adds what the test suite needs)
set -euo pipefail

packages=(g++ cmake make pkg-config libeigen3-dev libceres-dev libcli11-dev libyaml-cpp-dev libfmt-dev)
if [[ "${1:-}" == "--tests" ]]; then
  # catch2: the unit-test framework; python3-ase: the reference library the engine is checked against;
  # chromium: renders the report's HTML page headless, to check that a real browser draws every plot;
  # python3-yaml: scripts/upgrade-species-file.py, run by tests/species_test.cc;
  # pybind11-dev, python3-dev, python3-numpy: the Python module (docs/python.md), built by the
  # test command; python3-pytest runs its tests.
  packages+=(catch2 python3-ase chromium python3-yaml pybind11-dev python3-pybind11 python3-dev
             python3-numpy python3-pytest)
fi

missing=()
for package in "${packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$package" 2>/dev/null | grep -q "install ok installed"; then
    missing+=("$package")
  fi
done

if [[ ${#missing[@]} -eq 0 ]]; then
  exit 0
fi
if [[ $(id -u) -ne 0 ]]; then
  echo "missing Debian packages: ${missing[*]}" >&2
  echo "run as root, or: sudo apt-get install -y --no-install-recommends ${missing[*]}" >&2
  exit 1
fi
echo "installing: ${missing[*]}" >&2
export DEBIAN_FRONTEND=noninteractive
apt-get update -qq
apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null

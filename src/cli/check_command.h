// SPDX-License-Identifier: MIT
// `sevenfold check`: regenerate every species in memory and compare with a committed entries file;
// for CI gates. Exit 0 when everything matches, 1 when anything is found, 2 on bad input.
#pragma once

#include <string>
#include <vector>

#include <CLI/CLI.hpp>

namespace sevenfold::cli {

struct CheckCommandOptions {
  std::vector<std::string> species_files;
  std::string entries_path;
  std::string junit_path;   // empty: no JUnit report
  std::string mid;          // "" (each species' own), "auto", or a temperature in K
  std::string objective;            // "" (each species' own), "minimax" or "least-squares"
  std::string extrapolation_guard;  // "" (each species' own), "off" or "FACTOR:BAND"
  bool continuous_second_derivative = false;
  int num_jobs = 0;         // 0: hardware threads
  bool quiet = false;
  // Exit 0 even when a regenerated fit misses its thresholds (as fit --allow-poor-fits).
  bool allow_poor_fits = false;
};

// Adds the subcommand; when it runs, its exit status goes to exit_status.
void SetupCheckCommand(CLI::App& app, int& exit_status);
// Prints one line per finding and a count line on stdout, writes the JUnit report atomically when
// asked. Returns 0 when nothing was found, else 1. Throws Error on bad input (species or entries
// file malformed, bad --mid, an unwritable report).
int RunCheckCommand(const CheckCommandOptions& options);

}  // namespace sevenfold::cli

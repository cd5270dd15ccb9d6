// SPDX-License-Identifier: MIT
// `sevenfold fit`: regenerate the entries of every species into one entries file.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include <CLI/CLI.hpp>

namespace sevenfold::cli {

struct FitCommandOptions {
  std::vector<std::string> species_files;
  std::vector<std::string> species_names;  // empty: all
  std::string output_path;
  std::string mid;          // "" (each species' own), "auto", or a temperature in K
  std::string objective;            // "" (each species' own), "minimax" or "least-squares"
  std::string extrapolation_guard;  // "" (each species' own), "off" or "FACTOR:BAND"
  bool continuous_second_derivative = false;
  bool allow_poor_fits = false;
  bool keep_going = false;  // write the good entries, list the species that failed, exit 1
  int num_jobs = 0;         // 0: hardware threads
  bool quiet = false;
};

// Adds the subcommand; when it runs, its exit status goes to exit_status.
void SetupFitCommand(CLI::App& app, int& exit_status);
// Writes the entries file atomically. Returns 0, or 1 when a fit misses its thresholds (unless
// allow_poor_fits). Throws Error on bad input; the previous output file is then left untouched.
int RunFitCommand(const FitCommandOptions& options);

}  // namespace sevenfold::cli

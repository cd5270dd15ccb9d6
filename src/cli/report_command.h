// SPDX-License-Identifier: MIT
// `sevenfold report`: the fitted-versus-exact report of every species, as a self-contained HTML
// page with plots, a Markdown summary and a JSON file (docs/report.md).
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace sevenfold::cli {

struct ReportCommandOptions {
  std::vector<std::string> species_files;
  std::vector<std::string> species_names;  // empty: all
  std::string entries_path;                // empty: fit the species in this run
  std::string baseline_path;               // empty: no baseline
  std::string output_dir;
  std::string mid;   // "" (each species' own), "auto", or a temperature in K; fitting only
  std::string objective;            // "" (each species' own), "minimax" or "least-squares"
  std::string extrapolation_guard;  // "" (each species' own), "off" or "FACTOR:BAND"
  int num_jobs = 0;  // 0: hardware threads
  bool quiet = false;
};

// Adds the subcommand; when it runs, its exit status goes to exit_status.
void SetupReportCommand(CLI::App& app, int& exit_status);
// Writes DIR/index.html, DIR/summary.md and DIR/summary.json atomically (creating DIR when
// missing) and prints where the report is. Returns 0, or 1 when a fit misses its thresholds (the
// report is written all the same). Throws Error on bad input, before anything is written.
int RunReportCommand(const ReportCommandOptions& options);

}  // namespace sevenfold::cli

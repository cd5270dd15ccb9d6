// SPDX-License-Identifier: MIT
// Pieces shared by the subcommands: loading and selecting species, temperature lists.
#pragma once

#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "report/table_writer.h"
#include "mechanism/regenerate.h"
#include "species/species.h"

namespace sevenfold::cli {

// Reads the species files (on num_jobs threads: 0 means the machine's hardware threads) and keeps
// those named in `names` (all when empty), in file order. Throws Error for a name that no file
// defines.
std::vector<Species> LoadSpecies(const std::vector<std::string>& files,
                                 const std::vector<std::string>& names, int num_jobs = 1);

// Temperature selection shared by `table` and `eval`: --at, or --from/--to/--step, or nothing
// (then the default grid of each species).
struct TemperatureChoice {
  std::vector<double> at_k;
  double from_k = 0.0;
  double to_k = 0.0;
  double step_k = 0.0;  // > 0 when --from/--to/--step were given

  // The temperatures to use for a species whose range is [low_k, high_k].
  std::vector<double> For(double low_k, double high_k) const;
};

// Adds --at / --from / --to / --step bound to `choice`, and --format bound to `format`.
void AddTemperatureOptions(CLI::App& command, TemperatureChoice& choice);
void AddFormatOption(CLI::App& command, TableFormat& format);

// Adds --mid: "auto", a temperature in K, or absent (each species' own setting).
void AddMidOption(CLI::App& command, std::string& mid);
// Adds --jobs N (default: the machine's hardware threads).
void AddJobsOption(CLI::App& command, int& num_jobs);
// Adds --objective (minimax|least-squares) and --extrapolation-guard (off|FACTOR:BAND); both
// absent means each species' own setting (docs/fitting.md).
void AddObjectiveOptions(CLI::App& command, std::string& objective, std::string& guard);
// Turns --mid, --objective, --extrapolation-guard and --jobs into regeneration options. Throws
// Error for a malformed value.
RegenerateOptions MakeRegenerateOptions(const std::string& mid, const std::string& objective,
                                        const std::string& guard, int num_jobs);

// Prints each fit that misses its thresholds, or whose extrapolation leaves the sane band, on
// stderr naming the species and its file location. Returns 1 when a fit misses its thresholds
// and !allow_poor_fits, else 0.
int ReportPoorFits(const std::vector<SpeciesFit>& results, bool allow_poor_fits);

}  // namespace sevenfold::cli

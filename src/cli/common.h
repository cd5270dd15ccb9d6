// SPDX-License-Identifier: MIT
// Pieces shared by the subcommands: loading and selecting species, temperature lists.
#pragma once

#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "report/table_writer.h"
#include "species/species.h"

namespace sevenfold::cli {

// Reads the species files and keeps those named in `names` (all when empty), in file order.
// Throws Error for a name that no file defines.
std::vector<Species> LoadSpecies(const std::vector<std::string>& files,
                                 const std::vector<std::string>& names);

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

}  // namespace sevenfold::cli

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

// The positions in `available` of the names in `requested`, in the order requested (repeats
// kept once); all positions in order when `requested` is empty. `what` names the source in
// messages ("the given species files", "ENTRIES"). Throws Error for a name not in `available`,
// listing the close matches (same letters but for case, or at most two edits away).
std::vector<std::size_t> SelectByName(const std::vector<std::string>& available,
                                      const std::vector<std::string>& requested,
                                      const std::string& what);

// Reads the species files (on num_jobs threads: 0 means the machine's hardware threads) and keeps
// those named in `names` in that order (all, in file order, when empty); see SelectByName.
std::vector<Species> LoadSpecies(const std::vector<std::string>& files,
                                 const std::vector<std::string>& names, int num_jobs = 1);

// A number given on the command line: a plain decimal literal (std::from_chars: no leading
// space or "+", no hexadecimal, no "nan"/"inf"), finite. Throws Error "OPTION TEXT: expected
// EXPECTED" otherwise.
double ParseNumberOption(const std::string& option, const std::string& text,
                         const std::string& expected);

// Temperature selection shared by `table` and `eval`: --at, or --from/--to/--step, or nothing
// (then the default grid of each species). The option texts are kept as given and checked by
// Resolve, so that every bad value gets the same "error:" message and exit 2.
struct TemperatureChoice {
  std::vector<std::string> at_text;
  std::string from_text, to_text, step_text;

  // Which temperatures a command accepts: the exact engine's range (table), or any T > 0 at
  // which a polynomial can be evaluated (eval).
  enum class Limit { kEngineRange, kPositive };
  // Parses and checks the texts. Throws Error naming the option, the value and the rule.
  void Resolve(Limit limit);

  // The temperatures to use for a species whose range is [low_k, high_k] (after Resolve).
  std::vector<double> For(double low_k, double high_k) const;

 private:
  std::vector<double> at_k_;
  double from_k_ = 0.0, to_k_ = 0.0, step_k_ = 0.0;  // step_k_ > 0 when --from/--to/--step given
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

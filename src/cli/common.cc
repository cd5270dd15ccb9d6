// SPDX-License-Identifier: MIT
#include "cli/common.h"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <system_error>
#include <iostream>
#include <map>

#include <fmt/format.h>

#include "core/error.h"
#include "core/units.h"
#include "entries/entries.h"
#include "report/table_writer.h"
#include "species/species_reader.h"
#include "statmech/species_thermo.h"

namespace sevenfold::cli {

namespace {

// Levenshtein distance, stopping early above `limit` (names are short).
int EditDistance(const std::string& a, const std::string& b) {
  std::vector<int> previous(b.size() + 1), current(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) previous[j] = static_cast<int>(j);
  for (std::size_t i = 1; i <= a.size(); ++i) {
    current[0] = static_cast<int>(i);
    for (std::size_t j = 1; j <= b.size(); ++j) {
      current[j] = std::min({previous[j] + 1, current[j - 1] + 1,
                             previous[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1)});
    }
    std::swap(previous, current);
  }
  return previous[b.size()];
}

std::string Lower(std::string text) {
  for (char& c : text) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return text;
}

// A close match: the same name but for case, the same letters in another order ("HO2" for
// "H2O"), one edit away ("CO" for "CO2"), or for names of 4 characters or more two edits away.
bool IsCloseMatch(const std::string& candidate, const std::string& name) {
  std::string a = Lower(candidate), b = Lower(name);
  if (a == b) return true;
  const int distance = EditDistance(a, b);
  if (distance <= 1 || (std::min(a.size(), b.size()) >= 4 && distance <= 2)) return true;
  std::sort(a.begin(), a.end());
  std::sort(b.begin(), b.end());
  return a == b;
}

}  // namespace

std::vector<std::size_t> SelectByName(const std::vector<std::string>& available,
                                      const std::vector<std::string>& requested,
                                      const std::string& what) {
  std::vector<std::size_t> chosen;
  if (requested.empty()) {
    for (std::size_t i = 0; i < available.size(); ++i) chosen.push_back(i);
    return chosen;
  }
  for (const std::string& name : requested) {
    const auto found = std::find(available.begin(), available.end(), name);
    if (found == available.end()) {
      std::vector<std::string> close;
      for (const std::string& candidate : available) {
        if (IsCloseMatch(candidate, name)) {
          close.push_back(candidate);
        }
      }
      std::string hint = "no close match";
      if (!close.empty()) {
        hint = "close matches: ";
        for (std::size_t i = 0; i < close.size() && i < 5; ++i) {
          hint += (i == 0 ? "" : ", ") + close[i];
        }
      }
      throw Error(fmt::format("--species {}: no such species in {}; expected one of its {} "
                              "names ({})",
                              name, what, available.size(), hint));
    }
    const std::size_t index = static_cast<std::size_t>(found - available.begin());
    if (std::find(chosen.begin(), chosen.end(), index) == chosen.end()) chosen.push_back(index);
  }
  return chosen;
}

std::vector<Species> LoadSpecies(const std::vector<std::string>& files,
                                 const std::vector<std::string>& names, int num_jobs) {
  std::vector<Species> all = ReadSpeciesFiles(files, num_jobs);
  if (names.empty()) return all;
  std::vector<std::string> available;
  for (const Species& species : all) available.push_back(species.name);
  std::vector<Species> chosen;
  for (const std::size_t i : SelectByName(available, names, "the given species files")) {
    chosen.push_back(std::move(all[i]));
  }
  return chosen;
}

double ParseNumberOption(const std::string& option, const std::string& text,
                         const std::string& expected) {
  const std::optional<double> value = ParseStrictDecimal(text);
  if (!value) throw Error(fmt::format("{} '{}': expected {}", option, text, expected));
  return *value;
}

void TemperatureChoice::Resolve(Limit limit) {
  const bool engine = limit == Limit::kEngineRange;
  const std::string expected =
      engine ? fmt::format("a temperature in K, a decimal number within [{}, {}] (the exact "
                           "engine's range)",
                           kMinTemperatureK, kMaxTemperatureK)
             : std::string("a temperature in K, a decimal number above 0 (a polynomial can be "
                           "evaluated at any T > 0)");
  const auto temperature = [&](const std::string& option, const std::string& text) {
    const double t = ParseNumberOption(option, text, expected);
    const bool ok = engine ? t >= kMinTemperatureK && t <= kMaxTemperatureK : t > 0.0;
    if (!ok) throw Error(fmt::format("{} '{}': expected {}", option, text, expected));
    return t;
  };
  at_k_.clear();
  if (at_text.size() > static_cast<std::size_t>(kMaxEvaluationTemperatures)) {
    throw Error(fmt::format("--at: {} temperatures; expected at most {}", at_text.size(),
                            kMaxEvaluationTemperatures));
  }
  for (const std::string& text : at_text) at_k_.push_back(temperature("--at", text));
  step_k_ = 0.0;
  if (!step_text.empty()) {
    from_k_ = temperature("--from", from_text);
    to_k_ = temperature("--to", to_text);
    step_k_ = ParseNumberOption("--step", step_text, "a positive temperature step in K");
    if (!(step_k_ > 0.0)) {
      throw Error(fmt::format("--step '{}': expected a positive temperature step in K",
                              step_text));
    }
    if (!(to_k_ >= from_k_)) {
      throw Error(fmt::format("--to '{}': expected a temperature at or above --from '{}'",
                              to_text, from_text));
    }
    if ((to_k_ - from_k_) / step_k_ >= kMaxEvaluationTemperatures) {
      throw Error(fmt::format("--step '{}': from {} K to {} K gives more than {} temperatures; "
                              "expected a larger step",
                              step_text, from_text, to_text, kMaxEvaluationTemperatures));
    }
  }
}

std::vector<double> TemperatureChoice::For(double low_k, double high_k) const {
  if (!at_k_.empty()) return at_k_;
  if (step_k_ > 0.0) return SteppedTemperatures(from_k_, to_k_, step_k_);
  return DefaultTableTemperatures(low_k, high_k);
}

void AddTemperatureOptions(CLI::App& command, TemperatureChoice& choice) {
  auto* at = command.add_option("--at", choice.at_text, "Temperatures in K, comma separated")
                 ->delimiter(',');
  auto* from = command.add_option("--from", choice.from_text, "First temperature, K");
  auto* to = command.add_option("--to", choice.to_text, "Last temperature, K");
  auto* step = command.add_option("--step", choice.step_text, "Temperature step, K");
  from->needs(to)->needs(step)->excludes(at);
  to->needs(from);
  step->needs(from);
}

void AddFormatOption(CLI::App& command, TableFormat& format) {
  command
      .add_option_function<std::string>(
          "--format",
          [&format](const std::string& text) {
            const std::optional<TableFormat> parsed = ParseTableFormat(text);
            if (!parsed) {
              throw CLI::ValidationError("--format", "'" + text + "': expected text, csv or json");
            }
            format = *parsed;
          },
          "Output format: text, csv or json")
      ->default_str("text");
}

void AddMidOption(CLI::App& command, std::string& mid) {
  command.add_option("--mid", mid,
                     "Mid temperature: 'auto' or kelvin (default: each species' own setting)");
}

void AddJobsOption(CLI::App& command, int& num_jobs) {
  command.add_option("-j,--jobs", num_jobs, "Species fitted in parallel (default: hardware threads)")
      ->check(CLI::Range(1, 1024));
}

void AddObjectiveOptions(CLI::App& command, std::string& objective, std::string& guard) {
  command.add_option("--objective", objective,
                     "What the fit minimises: 'minimax' (the worst normalised error) or "
                     "'least-squares' (default: each species' own setting, else minimax)");
  command.add_option("--extrapolation-guard", guard,
                     "Keep fitted Cp within BAND of the exact model up to FACTOR x T_high and "
                     "down to T_low / FACTOR: 'off' or FACTOR:BAND (default: each species' own "
                     "setting, else 1.25:0.2)");
}

RegenerateOptions MakeRegenerateOptions(const std::string& mid, const std::string& objective,
                                        const std::string& guard, int num_jobs) {
  return ParseRegenerateOptions(mid, objective, guard, num_jobs);
}

int ReportPoorFits(const std::vector<SpeciesFit>& results, bool allow_poor_fits) {
  int num_poor = 0;
  for (const SpeciesFit& result : results) {
    const Species& species = *result.species;
    if (!result.fit.quality.MeetsThresholds()) {
      ++num_poor;
      for (const std::string& failure : result.fit.quality.threshold_failures) {
        std::cerr << fmt::format("{}: species '{}': poor fit: {}\n", species.location.ToString(),
                                 species.name, failure);
      }
      if (const std::string limit = DescribeFormLimit(result.fit.quality.form_limit); !limit.empty()) {
        std::cerr << fmt::format("{}: species '{}': poor fit: {}\n", species.location.ToString(),
                                 species.name, limit);
      }
    }
    if (!result.fit.quality.extrapolation.sane) {
      std::cerr << fmt::format("{}: species '{}': warning: extrapolation: {}\n",
                               species.location.ToString(), species.name,
                               result.fit.quality.extrapolation.message);
    }
  }
  if (num_poor == 0) return 0;
  std::cerr << fmt::format("{} of {} fits miss their quality thresholds{}\n", num_poor,
                           results.size(), allow_poor_fits ? " (allowed by --allow-poor-fits)" : "");
  return allow_poor_fits ? 0 : 1;
}

}  // namespace sevenfold::cli

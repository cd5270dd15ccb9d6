// SPDX-License-Identifier: MIT
#include "cli/common.h"

#include <algorithm>
#include <iostream>
#include <map>

#include <fmt/format.h>

#include "core/error.h"
#include "report/table_writer.h"
#include "species/species_reader.h"
#include "statmech/species_thermo.h"

namespace sevenfold::cli {

std::vector<Species> LoadSpecies(const std::vector<std::string>& files,
                                 const std::vector<std::string>& names, int num_jobs) {
  std::vector<Species> all = ReadSpeciesFiles(files, num_jobs);
  if (names.empty()) return all;
  for (const std::string& name : names) {
    const bool found = std::any_of(all.begin(), all.end(),
                                   [&](const Species& s) { return s.name == name; });
    if (!found) throw Error(fmt::format("--species {}: no such species in the given files", name));
  }
  std::vector<Species> chosen;
  for (Species& species : all) {
    if (std::find(names.begin(), names.end(), species.name) != names.end()) {
      chosen.push_back(std::move(species));
    }
  }
  return chosen;
}

std::vector<double> TemperatureChoice::For(double low_k, double high_k) const {
  if (!at_k.empty()) return at_k;
  if (step_k > 0.0) return SteppedTemperatures(from_k, to_k, step_k);
  return DefaultTableTemperatures(low_k, high_k);
}

void AddTemperatureOptions(CLI::App& command, TemperatureChoice& choice) {
  auto* at = command.add_option("--at", choice.at_k, "Temperatures in K, comma separated")
                 ->delimiter(',')
                 ->check(CLI::Range(kMinTemperatureK, kMaxTemperatureK));
  auto* from = command.add_option("--from", choice.from_k, "First temperature, K")
                   ->check(CLI::Range(kMinTemperatureK, kMaxTemperatureK));
  auto* to = command.add_option("--to", choice.to_k, "Last temperature, K")
                 ->check(CLI::Range(kMinTemperatureK, kMaxTemperatureK));
  auto* step = command.add_option("--step", choice.step_k, "Temperature step, K")
                   ->check(CLI::PositiveNumber);
  from->needs(to)->needs(step)->excludes(at);
  to->needs(from);
  step->needs(from);
}

void AddFormatOption(CLI::App& command, TableFormat& format) {
  const std::map<std::string, TableFormat> formats = {
      {"text", TableFormat::kText}, {"csv", TableFormat::kCsv}, {"json", TableFormat::kJson}};
  command.add_option("--format", format, "Output format: text, csv or json")
      ->transform(CLI::CheckedTransformer(formats))
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
  RegenerateOptions options;
  options.num_jobs = num_jobs;
  if (!objective.empty()) {
    options.objective_override = ParseFitObjective(objective);
    if (!options.objective_override) {
      throw Error(fmt::format("--objective {}: expected 'minimax' or 'least-squares'", objective));
    }
  }
  if (!guard.empty()) {
    options.extrapolation_guard_override = ParseExtrapolationGuard(guard);
    if (!options.extrapolation_guard_override) {
      throw Error(fmt::format(
          "--extrapolation-guard {}: expected 'off' or FACTOR:BAND with 1 < FACTOR <= 4 and "
          "0 < BAND <= 1, e.g. 1.25:0.2",
          guard));
    }
  }
  if (mid == "auto") {
    options.force_auto_mid = true;
  } else if (!mid.empty()) {
    double value = 0.0;
    size_t used = 0;
    try {
      value = std::stod(mid, &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (used != mid.size() || !(value >= kMinTemperatureK && value <= kMaxTemperatureK)) {
      throw Error(fmt::format("--mid {}: expected 'auto' or a temperature in K within [{}, {}]",
                              mid, kMinTemperatureK, kMaxTemperatureK));
    }
    options.t_mid_override_k = value;
  }
  return options;
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

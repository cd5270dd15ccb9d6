// SPDX-License-Identifier: MIT
#include "cli/eval_command.h"

#include <algorithm>
#include <cmath>
#include <iostream>
#include <memory>

#include <fmt/format.h>

#include "cli/common.h"
#include "core/error.h"
#include "entries/entries.h"
#include "report/entry_evaluation.h"

namespace sevenfold::cli {

void SetupEvalCommand(CLI::App& app, int& exit_status) {
  auto options = std::make_shared<EvalOptions>();
  CLI::App* command =
      app.add_subcommand("eval", "Evaluate the fitted polynomials of an entries file as a table");
  command->add_option("entries", options->entries_path, "Entries file")
      ->required()
      ->check(CLI::ExistingFile);
  command->add_option("--species", options->species_names, "Only this species (repeatable)");
  AddTemperatureOptions(*command, options->temperatures);
  AddFormatOption(*command, options->format);
  command->callback([options, &exit_status] { exit_status = RunEvalCommand(*options); });
}

int RunEvalCommand(const EvalOptions& options) {
  TemperatureChoice temperatures = options.temperatures;
  temperatures.Resolve(TemperatureChoice::Limit::kPositive);
  const EntriesFile file = ReadEntriesFile(options.entries_path);
  std::vector<std::string> names;
  for (const Entry& entry : file.entries) names.push_back(entry.name);
  std::vector<TableRow> rows;
  std::vector<std::string> warnings;
  for (const std::size_t i : SelectByName(names, options.species_names, options.entries_path)) {
    const Entry& entry = file.entries[i];
    const TwoRangePolynomial& p = entry.polynomial;
    int num_outside = 0;
    double lowest_k = 0.0, highest_k = 0.0;
    const std::vector<double> chosen = temperatures.For(p.t_low_k, p.t_high_k);
    const FormationModel::Series formation = EntryFormation(entry, file.entries, chosen);
    if (!formation.reason.empty()) {
      warnings.push_back("warning: formation properties left empty: " + formation.reason);
    }
    for (std::size_t k = 0; k < chosen.size(); ++k) {
      const double t = chosen[k];
      const ThermoPoint point = EvaluateEntry(entry, t);
      for (const double value : {point.cp_j_per_mol_k, point.s_j_per_mol_k, point.h_j_per_mol,
                                 point.h_minus_h298_j_per_mol, GibbsFunction(point)}) {
        if (!std::isfinite(value)) {
          throw Error(fmt::format(
              "{}: species '{}': the polynomial gives a non-finite Cp, S or H at {} K; expected "
              "temperatures at which it is finite",
              entry.location.ToString(), entry.name, t));
        }
      }
      const bool outside = t < p.t_low_k || t > p.t_high_k;
      if (outside) {
        lowest_k = num_outside == 0 ? t : std::min(lowest_k, t);
        highest_k = num_outside == 0 ? t : std::max(highest_k, t);
        ++num_outside;
      }
      rows.push_back({entry.name, entry.reference_pressure_pa, point, outside,
                      formation.points[k]});
    }
    if (num_outside > 0) {
      warnings.push_back(fmt::format(
          "{}: species '{}': warning: {} of {} temperatures ({} to {} K) outside the fitted "
          "range [{}, {}] K; the values there are extrapolations of the polynomial (marked {})",
          entry.location.ToString(), entry.name, num_outside, chosen.size(), lowest_k, highest_k,
          p.t_low_k, p.t_high_k,
          options.format == TableFormat::kText ? std::string("with ") + kOutsideRangeMarker
                                               : std::string(kOutsideRangeColumn) + " true"));
    }
  }
  std::cout << FormatTable(rows, options.format);
  for (const std::string& warning : warnings) std::cerr << warning << "\n";
  return 0;
}

}  // namespace sevenfold::cli

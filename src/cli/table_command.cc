// SPDX-License-Identifier: MIT
#include "cli/table_command.h"

#include <iostream>
#include <memory>

#include "formation/formation.h"
#include "statmech/species_thermo.h"

namespace sevenfold::cli {

void SetupTableCommand(CLI::App& app, int& exit_status) {
  auto options = std::make_shared<TableOptions>();
  CLI::App* command = app.add_subcommand(
      "table", "Print exact ideal-gas Cp, S, H tables computed from species files");
  command->add_option("files", options->species_files, "Species YAML files")
      ->required()
      ->check(CLI::ExistingFile);
  command->add_option("--species", options->species_names,
                      "Only this species (repeatable)");
  AddTemperatureOptions(*command, options->temperatures);
  AddFormatOption(*command, options->format);
  command->callback([options, &exit_status] { exit_status = RunTableCommand(*options); });
}

int RunTableCommand(const TableOptions& options) {
  TemperatureChoice choice = options.temperatures;
  choice.Resolve(TemperatureChoice::Limit::kEngineRange);
  // Every species of the files replaces the built-in reference state of its label, also when
  // --species leaves it out of the table (docs/cli.md).
  const std::vector<Species> all = LoadSpecies(options.species_files, {});
  const std::vector<Species> species = LoadSpecies(options.species_files, options.species_names);
  const FormationModel formation(all);
  std::vector<TableRow> rows;
  std::vector<std::string> warnings;
  for (const Species& one : species) {
    const SpeciesThermo thermo(one);
    const std::vector<double> temperatures =
        choice.For(one.temperatures.low_k, one.temperatures.high_k);
    const FormationModel::Series series = formation.Tabulate(one, thermo, temperatures);
    const std::vector<ThermoPoint> points = thermo.Tabulate(temperatures);
    for (std::size_t i = 0; i < points.size(); ++i) {
      rows.push_back({one.name, one.standard_pressure_pa, points[i], std::nullopt,
                      series.points[i]});
    }
    if (!series.reason.empty()) {
      warnings.push_back("warning: formation properties left empty: " + series.reason);
    }
  }
  std::cout << FormatTable(rows, options.format);
  for (const std::string& warning : warnings) std::cerr << warning << "\n";
  return 0;
}

}  // namespace sevenfold::cli

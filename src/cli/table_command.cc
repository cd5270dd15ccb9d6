// SPDX-License-Identifier: MIT
#include "cli/table_command.h"

#include <iostream>
#include <memory>

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
  const std::vector<Species> species = LoadSpecies(options.species_files, options.species_names);
  std::vector<TableRow> rows;
  for (const Species& one : species) {
    const SpeciesThermo thermo(one);
    const std::vector<double> temperatures =
        choice.For(one.temperatures.low_k, one.temperatures.high_k);
    for (const ThermoPoint& point : thermo.Tabulate(temperatures)) {
      rows.push_back({one.name, one.standard_pressure_pa, point, std::nullopt});
    }
  }
  std::cout << FormatTable(rows, options.format);
  return 0;
}

}  // namespace sevenfold::cli

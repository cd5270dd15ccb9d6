// SPDX-License-Identifier: MIT
#include "cli/eval_command.h"

#include <algorithm>
#include <iostream>
#include <memory>

#include <fmt/format.h>

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
  const EntriesFile file = ReadEntriesFile(options.entries_path);
  for (const std::string& name : options.species_names) {
    const bool found = std::any_of(file.entries.begin(), file.entries.end(),
                                   [&](const Entry& entry) { return entry.name == name; });
    if (!found) {
      throw Error(fmt::format("--species {}: no such entry in {}", name, options.entries_path));
    }
  }
  std::vector<TableRow> rows;
  for (const Entry& entry : file.entries) {
    if (!options.species_names.empty() &&
        std::find(options.species_names.begin(), options.species_names.end(), entry.name) ==
            options.species_names.end()) {
      continue;
    }
    const TwoRangePolynomial& p = entry.polynomial;
    for (const double t : options.temperatures.For(p.t_low_k, p.t_high_k)) {
      rows.push_back({entry.name, entry.reference_pressure_pa, EvaluateEntry(entry, t)});
    }
  }
  std::cout << FormatTable(rows, options.format);
  return 0;
}

}  // namespace sevenfold::cli

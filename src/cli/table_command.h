// SPDX-License-Identifier: MIT
// `sevenfold table`: exact thermodynamic tables from species files.
#pragma once

#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "cli/common.h"
#include "report/table_writer.h"

namespace sevenfold::cli {

struct TableOptions {
  std::vector<std::string> species_files;
  std::vector<std::string> species_names;  // empty: all
  TemperatureChoice temperatures;
  TableFormat format = TableFormat::kText;
};

// Adds the subcommand; when it runs, its exit status goes to exit_status.
void SetupTableCommand(CLI::App& app, int& exit_status);
// Prints the table on stdout; returns the exit status. Throws Error on bad input.
int RunTableCommand(const TableOptions& options);

}  // namespace sevenfold::cli

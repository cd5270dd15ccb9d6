// SPDX-License-Identifier: MIT
// `sevenfold eval`: evaluate the polynomials of an entries file as a table (same columns as
// `sevenfold table`, so fitted and exact tables can be compared with ordinary tools).
#pragma once

#include <string>
#include <vector>

#include <CLI/CLI.hpp>

#include "cli/common.h"
#include "report/table_writer.h"

namespace sevenfold::cli {

struct EvalOptions {
  std::string entries_path;
  std::vector<std::string> species_names;  // empty: all
  TemperatureChoice temperatures;
  TableFormat format = TableFormat::kText;
};

void SetupEvalCommand(CLI::App& app, int& exit_status);
int RunEvalCommand(const EvalOptions& options);

}  // namespace sevenfold::cli

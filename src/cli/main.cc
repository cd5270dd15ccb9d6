// SPDX-License-Identifier: MIT
// The sevenfold command line: parses options and hands over to one subcommand. All output
// decisions live in cli/; the library never prints.
#include <exception>
#include <iostream>

#include <CLI/CLI.hpp>

#include "cli/check_command.h"
#include "cli/eval_command.h"
#include "cli/fit_command.h"
#include "cli/interrupt.h"
#include "cli/report_command.h"
#include "cli/table_command.h"
#include "core/error.h"
#include "core/output_text.h"

int main(int argc, char** argv) {
  sevenfold::cli::InstallInterruptCleanup();
  CLI::App app{
      "sevenfold: exact ideal-gas thermochemistry from molecular constants, and two-range "
      "NASA 7-coefficient polynomials fitted to it"};
  app.set_version_flag("--version", std::string("sevenfold ") + SEVENFOLD_VERSION);
  app.set_help_all_flag("--help-all", "Show help for every subcommand");
  app.require_subcommand(1);
  int exit_status = 0;
  sevenfold::cli::SetupTableCommand(app, exit_status);
  sevenfold::cli::SetupFitCommand(app, exit_status);
  sevenfold::cli::SetupEvalCommand(app, exit_status);
  sevenfold::cli::SetupReportCommand(app, exit_status);
  sevenfold::cli::SetupCheckCommand(app, exit_status);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    // Usage errors are bad input too: exit 2 with the same "error:" prefix as every other input
    // error (help and version exit 0).
    if (e.get_exit_code() == 0) return app.exit(e);
    std::cerr << "error: " << e.what() << "\n(run with --help or --help-all for the options)\n";
    return 2;
  } catch (const sevenfold::Error& e) {
    std::cerr << "error: " << sevenfold::VisibleControls(e.what()) << "\n";
    return 2;
  } catch (const std::exception& e) {
    std::cerr << "internal error: " << sevenfold::VisibleControls(e.what()) << "\n";
    return 70;
  }
  return exit_status;
}

// SPDX-License-Identifier: MIT
#include "cli/fit_command.h"

#include <iostream>
#include <memory>

#include <fmt/format.h>

#include "cli/common.h"
#include "cli/progress.h"
#include "core/atomic_file.h"
#include "core/error.h"
#include "entries/entries.h"
#include "mechanism/regenerate.h"

namespace sevenfold::cli {

void SetupFitCommand(CLI::App& app, int& exit_status) {
  auto options = std::make_shared<FitCommandOptions>();
  CLI::App* command = app.add_subcommand(
      "fit", "Fit two-range NASA 7-coefficient polynomials to the exact curves of every species "
             "and write them to an entries file");
  command->add_option("files", options->species_files, "Species YAML files")
      ->required()
      ->check(CLI::ExistingFile);
  command->add_option("-o,--output", options->output_path, "Entries file to write")->required();
  command->add_option("--species", options->species_names, "Only this species (repeatable)");
  AddMidOption(*command, options->mid);
  AddObjectiveOptions(*command, options->objective, options->extrapolation_guard);
  command->add_flag("--smooth-curvature", options->continuous_second_derivative,
                    "Also make d2Cp/dT2 continuous at the mid temperature");
  command->add_flag("--allow-poor-fits", options->allow_poor_fits,
                    "Exit 0 even when a fit misses its quality thresholds (still marked failing)");
  command->add_flag("--keep-going", options->keep_going,
                    "Write the entries that could be computed and list the species that could "
                    "not (exit 1); by default any such species fails the whole run");
  AddJobsOption(*command, options->num_jobs);
  command->add_flag("-q,--quiet", options->quiet, "No progress bar");
  command->callback([options, &exit_status] { exit_status = RunFitCommand(*options); });
}

int RunFitCommand(const FitCommandOptions& options) {
  RefuseOutputThatIsAnInput(options.output_path, options.species_files);
  const std::vector<Species> species =
      LoadSpecies(options.species_files, options.species_names, options.num_jobs);
  RegenerateOptions regenerate = MakeRegenerateOptions(options.mid, options.objective, options.extrapolation_guard,
                            options.num_jobs);
  regenerate.continuous_second_derivative = options.continuous_second_derivative;
  ProgressBar progress("fit", options.quiet);
  regenerate.progress = progress.Callback();
  std::vector<std::string> failures;
  const std::vector<SpeciesFit> results =
      options.keep_going ? FitAllSpecies(species, regenerate, &failures)
                         : FitAllSpecies(species, regenerate);
  progress.Finish();
  const EntriesFile entries = MakeEntriesFile(results, regenerate);
  WriteFileAtomically(options.output_path, FormatEntries(entries));
  const int poor_status = ReportPoorFits(results, options.allow_poor_fits);
  for (const std::string& failure : failures) std::cerr << "error: " << failure << "\n";
  if (!failures.empty()) {
    std::cerr << fmt::format("{} of {} species could not be computed and are not in {}\n",
                             failures.size(), species.size(), options.output_path);
    return 1;
  }
  return poor_status;
}

}  // namespace sevenfold::cli

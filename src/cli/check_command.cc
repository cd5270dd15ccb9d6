// SPDX-License-Identifier: MIT
#include "cli/check_command.h"

#include <algorithm>

#include <iostream>
#include <memory>

#include <fmt/format.h>

#include "cli/common.h"
#include "cli/progress.h"
#include "core/atomic_file.h"
#include "core/output_text.h"
#include "entries/entries.h"
#include "mechanism/check.h"
#include "mechanism/regenerate.h"

namespace sevenfold::cli {

void SetupCheckCommand(CLI::App& app, int& exit_status) {
  auto options = std::make_shared<CheckCommandOptions>();
  CLI::App* command = app.add_subcommand(
      "check", "Regenerate every species in memory and compare with a committed entries file "
               "(exit 0: all match, 1: findings, 2: bad input)");
  command->add_option("files", options->species_files, "Species YAML files")
      ->required()
      ->check(CLI::ExistingFile);
  command->add_option("-e,--entries", options->entries_path, "Committed entries file to check")
      ->required()
      ->check(CLI::ExistingFile);
  command->add_option("--junit", options->junit_path,
                      "Also write a JUnit-style XML report here (one test case per species)");
  AddMidOption(*command, options->mid);
  AddObjectiveOptions(*command, options->objective, options->extrapolation_guard);
  command->add_flag("--smooth-curvature", options->continuous_second_derivative,
                    "Regenerate with d2Cp/dT2 continuous at the mid temperature (as fit does)");
  command->add_flag("--allow-poor-fits", options->allow_poor_fits,
                    "Exit 0 even when a regenerated fit misses its quality thresholds (as fit)");
  AddJobsOption(*command, options->num_jobs);
  command->add_flag("-q,--quiet", options->quiet, "No progress bar");
  command->callback([options, &exit_status] { exit_status = RunCheckCommand(*options); });
}

int RunCheckCommand(const CheckCommandOptions& options) {
  RefuseOutputThatIsAnInput(options.junit_path, options.species_files, options.entries_path);
  // Read both inputs before the long part, so a malformed file fails fast.
  const std::vector<Species> species = LoadSpecies(options.species_files, {}, options.num_jobs);
  const EntriesFile committed = ReadEntriesFile(options.entries_path);
  RegenerateOptions regenerate = MakeRegenerateOptions(options.mid, options.objective, options.extrapolation_guard,
                            options.num_jobs);
  regenerate.continuous_second_derivative = options.continuous_second_derivative;
  RecordCommittedSettings(committed, &regenerate);
  ProgressBar progress("check", options.quiet);
  regenerate.progress = progress.Callback();
  const std::vector<SpeciesFit> results = FitAllSpecies(species, regenerate);
  progress.Finish();

  CheckResult result = CheckEntries(results, committed, regenerate);
  if (options.allow_poor_fits) {  // poor fits are findings unless allowed, as in fit
    std::vector<Finding>& findings = result.findings;
    findings.erase(std::remove_if(findings.begin(), findings.end(),
                                  [](const Finding& f) { return f.kind == FindingKind::kFitFails; }),
                   findings.end());
  }
  for (const Finding& finding : result.findings) {
    const std::string where = finding.location.ToString();
    std::cout << VisibleControls(fmt::format("{}{}: {}: {}", where.empty() ? "" : where + ": ",
                                             finding.species, ToString(finding.kind),
                                             finding.message), false)
              << "\n";
  }
  if (!options.junit_path.empty()) {
    // After the findings, so that a JUnit file that cannot be written hides none of them.
    WriteFileAtomically(options.junit_path,
                        FormatJUnitReport(result, "sevenfold check " + options.entries_path));
  }
  if (result.Passed()) {
    std::cout << fmt::format("check: {} species, {} entries in {}: all match\n",
                             result.names.size(), committed.entries.size(), options.entries_path);
    return 0;
  }
  std::size_t num_names_with_findings = 0;
  for (std::size_t i = 0; i < result.findings.size(); ++i) {
    if (i == 0 || result.findings[i].species != result.findings[i - 1].species) {
      ++num_names_with_findings;
    }
  }
  std::cout << fmt::format("check: {} finding{} for {} of {} species in {}\n",
                           result.findings.size(), result.findings.size() == 1 ? "" : "s",
                           num_names_with_findings, result.names.size(), options.entries_path);
  return 1;
}

}  // namespace sevenfold::cli

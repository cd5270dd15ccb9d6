// SPDX-License-Identifier: MIT
#include "cli/report_command.h"

#include <fmt/format.h>

#include <iostream>
#include <memory>

#include "cli/common.h"
#include "cli/progress.h"
#include "core/output_text.h"
#include "report/build_report.h"

namespace sevenfold::cli {

void SetupReportCommand(CLI::App& app, int& exit_status) {
  auto options = std::make_shared<ReportCommandOptions>();
  CLI::App* command = app.add_subcommand(
      "report",
      "Write an HTML page with plots of fitted versus exact curves, a Markdown summary "
      "and a JSON file of every figure");
  command->add_option("files", options->species_files, "Species YAML files")
      ->required()
      ->check(CLI::ExistingFile);
  command
      ->add_option("-o,--output",
                   options->output_dir,
                   "Directory to write index.html, summary.md and summary.json into")
      ->required();
  command->add_option("--species", options->species_names, "Only this species (repeatable)");
  auto* entries =
      command
          ->add_option(
              "--entries", options->entries_path, "Report on this entries file instead of fitting")
          ->check(CLI::ExistingFile);
  command
      ->add_option("--baseline",
                   options->baseline_path,
                   "An older entries file whose curves are drawn for comparison")
      ->check(CLI::ExistingFile);
  AddMidOption(*command, options->mid);
  AddObjectiveOptions(*command, options->objective, options->extrapolation_guard);
  command->get_option("--mid")->excludes(entries);
  AddJobsOption(*command, options->num_jobs);
  command->add_flag("-q,--quiet", options->quiet, "No progress bar");
  command->callback([options, &exit_status] { exit_status = RunReportCommand(*options); });
}

int RunReportCommand(const ReportCommandOptions& options) {
  ReportJob job;
  job.tool_version = SEVENFOLD_VERSION;
  job.species_files = options.species_files;
  job.species_were_selected = !options.species_names.empty();
  job.entries_path = options.entries_path;
  job.baseline_path = options.baseline_path;
  job.mid_setting = options.mid;
  job.output_dir = options.output_dir;
  RefuseReportOverInputs(job);
  job.regenerate = MakeRegenerateOptions(
      options.mid, options.objective, options.extrapolation_guard, options.num_jobs);
  ProgressBar progress("report", options.quiet);
  job.progress = progress.Callback();

  const ReportOutcome outcome = BuildReport(
      LoadSpecies(options.species_files, options.species_names, options.num_jobs), job);
  progress.Finish();
  std::cout << "report written to " << VisibleControls(outcome.index_path) << "\n";
  if (outcome.num_failing > 0) {
    std::cerr << fmt::format("{} of {} fits miss their quality thresholds (see {})\n",
                             outcome.num_failing,
                             outcome.num_species,
                             VisibleControls(outcome.summary_path));
  }
  return outcome.num_failing > 0 ? 1 : 0;
}

}  // namespace sevenfold::cli

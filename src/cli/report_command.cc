// SPDX-License-Identifier: MIT
#include "cli/report_command.h"

#include <fmt/format.h>

#include <filesystem>
#include <iostream>
#include <memory>
#include <system_error>

#include "cli/common.h"
#include "cli/progress.h"
#include "core/atomic_file.h"
#include "core/error.h"
#include "entries/entries.h"
#include "mechanism/regenerate.h"
#include "report/report_data.h"
#include "report/report_document.h"

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
  const std::vector<Species> species =
      LoadSpecies(options.species_files, options.species_names, options.num_jobs);
  const RegenerateOptions regenerate = MakeRegenerateOptions(options.mid, options.objective, options.extrapolation_guard,
                            options.num_jobs);

  ReportInput input;
  input.tool_version = SEVENFOLD_VERSION;
  input.species_files = options.species_files;
  input.entries_file = options.entries_path;
  input.baseline_file = options.baseline_path;
  input.mid_setting = options.mid;

  EntriesFile entries;
  if (options.entries_path.empty()) {
    RegenerateOptions fitting = regenerate;
    ProgressBar progress("fit", options.quiet);
    fitting.progress = progress.Callback();
    const std::vector<SpeciesFit> results = FitAllSpecies(species, fitting);
    progress.Finish();
    entries = MakeEntriesFile(results, regenerate);
  } else {
    entries = ReadEntriesFile(options.entries_path);
  }
  EntriesFile baseline;
  if (!options.baseline_path.empty()) baseline = ReadEntriesFile(options.baseline_path);
  PairSpeciesWithEntries(species,
                         entries,
                         options.entries_path.empty() ? "the fitted entries" : options.entries_path,
                         options.baseline_path.empty() ? nullptr : &baseline,
                         !options.species_names.empty(),
                         input);

  ReportOptions report_options;
  report_options.num_jobs = options.num_jobs;
  ProgressBar progress("report", options.quiet);
  report_options.progress = progress.Callback();
  const ReportData data = AnalyseReport(input, report_options);
  progress.Finish();

  const std::string html = FormatReportHtml(data);
  const std::string markdown = FormatReportMarkdown(data);
  const std::string json = FormatReportJson(data);

  const std::filesystem::path dir(options.output_dir);
  std::error_code error;
  std::filesystem::create_directories(dir, error);
  if (error) {
    throw Error(fmt::format(
        "{}: cannot create the report directory: {}", options.output_dir, error.message()));
  }
  WriteFileAtomically((dir / "summary.json").string(), json);
  WriteFileAtomically((dir / "summary.md").string(), markdown);
  WriteFileAtomically((dir / "index.html").string(), html);
  std::cout << "report written to " << (dir / "index.html").string() << "\n";

  const int num_failing = data.NumFailing();
  if (num_failing > 0) {
    std::cerr << fmt::format("{} of {} fits miss their quality thresholds (see {})\n",
                             num_failing,
                             data.species.size(),
                             (dir / "summary.md").string());
  }
  return num_failing > 0 ? 1 : 0;
}

}  // namespace sevenfold::cli

// SPDX-License-Identifier: MIT
#include "report/build_report.h"

#include <fmt/format.h>
#include <sys/stat.h>

#include <filesystem>
#include <system_error>

#include "core/atomic_file.h"
#include "core/error.h"
#include "entries/entries.h"
#include "report/report_data.h"
#include "report/report_document.h"

namespace sevenfold {
namespace {

std::string InFolder(const std::string& dir, const char* name) {
  return (std::filesystem::path(dir) / name).string();
}

}  // namespace

void RefuseReportOverInputs(const ReportJob& job) {
  struct stat info;
  if (stat(job.output_dir.c_str(), &info) == 0 && !S_ISDIR(info.st_mode)) {
    throw Error(job.output_dir + ": the report folder exists and is not a folder");
  }
  std::vector<std::string> inputs = job.species_files;
  inputs.push_back(job.entries_path);
  inputs.push_back(job.baseline_path);
  for (const char* name : kReportFileNames) {
    RefuseOutputThatIsAnInput(InFolder(job.output_dir, name), inputs);
  }
}

ReportOutcome BuildReport(const std::vector<Species>& species, const ReportJob& job) {
  ReportInput input;
  input.tool_version = job.tool_version;
  input.species_files = job.species_files;
  input.entries_file = job.entries_path;
  input.baseline_file = job.baseline_path;
  input.mid_setting = job.mid_setting;

  EntriesFile entries;
  if (job.entries_path.empty()) {
    RegenerateOptions fitting = job.regenerate;
    fitting.progress = job.progress;
    entries = MakeEntriesFile(FitAllSpecies(species, fitting), job.regenerate);
  } else {
    entries = ReadEntriesFile(job.entries_path);
  }
  EntriesFile baseline;
  if (!job.baseline_path.empty()) baseline = ReadEntriesFile(job.baseline_path);
  PairSpeciesWithEntries(species,
                         entries,
                         job.entries_path.empty() ? "the fitted entries" : job.entries_path,
                         job.baseline_path.empty() ? nullptr : &baseline,
                         job.species_were_selected,
                         input);

  ReportOptions report_options;
  report_options.num_jobs = job.regenerate.num_jobs;
  report_options.progress = job.progress;
  const ReportData data = AnalyseReport(input, report_options);
  const std::string documents[] = {
      FormatReportJson(data), FormatReportMarkdown(data), FormatReportHtml(data)};

  std::error_code error;
  std::filesystem::create_directories(job.output_dir, error);
  if (error) {
    throw Error(fmt::format(
        "{}: cannot create the report folder: {}", job.output_dir, error.message()));
  }
  OutputBatch batch;
  for (int i = 0; i < 3; ++i) batch.Add(InFolder(job.output_dir, kReportFileNames[i]), documents[i]);
  batch.Commit();

  ReportOutcome outcome;
  outcome.index_path = InFolder(job.output_dir, "index.html");
  outcome.summary_path = InFolder(job.output_dir, "summary.md");
  outcome.num_species = static_cast<int>(data.species.size());
  outcome.num_failing = data.NumFailing();
  return outcome;
}

}  // namespace sevenfold

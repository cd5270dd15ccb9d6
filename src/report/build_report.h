// SPDX-License-Identifier: MIT
// The whole `sevenfold report` job after the species are read: fit them (or read an entries
// file), pair them with their entries and the baseline, measure, format the three documents and
// write them into the report folder all at once.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "mechanism/regenerate.h"
#include "species/species.h"

namespace sevenfold {

struct ReportJob {
  std::string tool_version;
  std::vector<std::string> species_files;  // as given: the provenance and the same-file check
  bool species_were_selected = false;      // --species given: unmatched entries are not listed
  std::string entries_path;                // "" to fit the species in this run
  std::string baseline_path;               // "" for no baseline
  std::string mid_setting;                 // --mid as given, for the provenance
  RegenerateOptions regenerate;            // how to fit (when fitting) and how many threads
  std::string output_dir;                  // created when missing
  // Called after each species of the fit and then of the measurement, from worker threads.
  std::function<void(int num_done, int num_total)> progress;
};

// The file names of a report inside its folder, in the order they are staged (largest last, so a
// full disk is met before anything is replaced).
inline const char* const kReportFileNames[] = {"summary.json", "summary.md", "index.html"};

struct ReportOutcome {
  std::string index_path;    // output_dir/index.html
  std::string summary_path;  // output_dir/summary.md
  int num_species = 0;
  int num_failing = 0;  // fits missing their thresholds
};

// Throws Error when the report folder exists and is not a folder, or when one of the report's
// files is the same file as an input (species files, entries, baseline). Call before any work.
void RefuseReportOverInputs(const ReportJob& job);

// Does the job for `species` (already read and selected). Writes DIR/summary.json,
// DIR/summary.md and DIR/index.html as one OutputBatch (core/atomic_file.h): all new or all old.
// Throws Error on bad input (a species without an entry, an unreadable entries file), before
// anything is written.
ReportOutcome BuildReport(const std::vector<Species>& species, const ReportJob& job);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// The figures of the fit report: each species' fitted entry measured against the exact curves
// of its species data, the curves to plot, and the optional baseline entry. Plain data in, plain
// data out; report_document.h turns the result into HTML, Markdown and JSON (docs/report.md).
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "entries/entries.h"
#include "fit/quality.h"
#include "species/species.h"

namespace sevenfold {

// One species to report on: its data and the entry to judge (fitted in this run or read from a
// file), plus the entry of the baseline file when one was given and it holds the species.
struct ReportSpeciesInput {
  const Species* species = nullptr;  // points into the caller's vector
  Entry entry;
  std::optional<Entry> baseline;
};

// Everything the report is built from. File names are kept as given (no absolute paths, no
// dates), so the same command gives the same bytes.
struct ReportInput {
  std::string tool_version;
  std::vector<std::string> species_files;
  std::string entries_file;   // "" when the entries were fitted in this run
  std::string baseline_file;  // "" when no baseline was given
  std::string mid_setting;    // --mid as given: "" (each species' own), "auto" or kelvin
  std::vector<ReportSpeciesInput> species;
  // Names in the entries / baseline file with no species in the species files (listed in the
  // report, not judged).
  std::vector<std::string> entries_without_species;
  std::vector<std::string> baseline_entries_without_species;
};

// Which figure of a fit is furthest from its threshold.
struct WorstFigure {
  std::string quantity;     // "cp", "h" or "s"
  std::string range;        // "low" or "high"
  double t_k = 0.0;         // where it sits
  double normalised = 0.0;  // figure / threshold
};

// An entry measured against the exact curves on the fit grid of its own temperature range.
struct EntryAssessment {
  TwoRangePolynomial polynomial;
  // threshold_failures as ThresholdFailures (fit/fitter.h); form_limit as recorded by the fit
  // (it needs the fitter: the report does not recompute it).
  FitQuality quality;
  double max_normalised_error = 0.0;            // largest figure / threshold over Cp, H, S
  WorstFigure worst;
};

// Curves for the plots, sampled at t_k (log-spaced over [0.5 t_low, 1.5 t_high] of the entry,
// plus the range limits, the mid temperature and the engine limits where inside). NaN marks
// "not available": the exact model outside [kMinTemperatureK, kMaxTemperatureK], or no baseline.
struct CurveSet {
  std::vector<double> cp_j_per_mol_k;
  std::vector<double> h_minus_h298_kj_per_mol;
  std::vector<double> s_j_per_mol_k;
  std::vector<double> gibbs_function_j_per_mol_k;  // -(G - H298)/T
};
struct ErrorCurves {
  std::vector<double> cp_percent;  // 100 (Cp_fit - Cp_exact) / Cp_exact
  std::vector<double> h_over_rt;   // (H_fit - H_exact) / (R T), absolute enthalpies
  std::vector<double> s_over_r;    // (S_fit - S_exact) / R
  std::vector<double> g_over_rt;   // (G_fit - G_exact) / (R T)
};
struct ReportCurves {
  std::vector<double> t_k;
  CurveSet exact;
  CurveSet fitted;
  CurveSet baseline;  // all NaN without a baseline
  ErrorCurves fitted_error;
  ErrorCurves baseline_error;
};

struct SpeciesReport {
  std::string name;
  std::string source;        // "file:line" of the species' block
  std::string input_sha256;  // of the species' input now
  std::string entry_sha256;  // the input digest recorded in the entry
  QualityThresholds thresholds;
  double reference_pressure_pa = 1.0e5;
  std::string model;  // the entry's model description
  EntryAssessment fit;
  std::optional<EntryAssessment> baseline;
  ReportCurves curves;
  // Findings that do not change the verdict: the entry's range differs from the species file's,
  // a stale input digest, the recorded verdict disagrees with the measurement, an extrapolation
  // outside the sane band, the exact curve cut at the engine's limits, no baseline entry.
  std::vector<std::string> notes;
};

struct ReportData {
  std::string tool_version;
  std::vector<std::string> species_files;
  std::string entries_file;
  std::string baseline_file;
  std::string mid_setting;
  std::vector<std::string> entries_without_species;
  std::vector<std::string> baseline_entries_without_species;
  // In input order: the order of --species when given, else file order.
  std::vector<SpeciesReport> species;

  int NumFailing() const;
  int NumExtrapolationWarnings() const;
};

struct ReportOptions {
  // Worker threads for the species; 0 means the machine's hardware threads. The result does
  // not depend on it.
  int num_jobs = 0;
  // Points of the plotted curves (log-spaced) before the special temperatures are added.
  int num_curve_points = 241;
  // Called after each species, from a worker thread (must be thread-safe).
  std::function<void(int num_done, int num_total)> progress;
};

// What the report says about the form's limit (fit/quality.h FormLimit), "" when it was not
// computed: "at the form's limit: ..." with the best achievable figure and the widest passing
// range, or "a better fit of the form exists: ..." when the best reaches the thresholds.
std::string FormLimitText(const FormLimit& limit);

// Measures every entry against its species' exact curves and samples the plot curves.
// Throws Error naming the species and its file when the exact model cannot be evaluated.
ReportData AnalyseReport(const ReportInput& input, const ReportOptions& options);

// Measures one entry against the exact curves of `species` on FitGrid of the entry's range
// (the grid the fitter uses, so a fresh fit measures exactly as FitTwoRange reported it), with
// the species' thresholds. Throws Error when the range leaves the exact model's limits.
EntryAssessment AssessEntry(const Species& species, const Entry& entry);

// Pairs each species with its entry in `entries` (by name) and, when `baseline` is given, with
// its baseline entry. Throws Error naming the species, its file and `entries_file` when a
// species has no entry. Fills `entries_without_species` / `baseline_entries_without_species`
// with the names no species has, unless `species_were_selected` (then those lists stay empty:
// the user asked for a subset).
void PairSpeciesWithEntries(const std::vector<Species>& species,
                            const EntriesFile& entries,
                            const std::string& entries_file,
                            const EntriesFile* baseline,
                            bool species_were_selected,
                            ReportInput& input);

}  // namespace sevenfold

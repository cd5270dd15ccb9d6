// SPDX-License-Identifier: MIT
#include "report/report_data.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>

#include "core/constants.h"
#include "core/error.h"
#include "core/parallel.h"
#include "fit/fitter.h"
#include "report/entry_evaluation.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

// AssessEntry with the species' exact model already built (it is the costly part).
EntryAssessment AssessEntryWith(const SpeciesThermo& thermo,
                                const Species& species,
                                const Entry& entry);

namespace {

using constants::kGasConstant;
using constants::kReferenceTemperature;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// The plot's temperature range: half the lowest and 1.5 times the highest fitted temperature,
// the same margins the extrapolation check covers (fit/quality.h).
constexpr double kPlotLowFactor = 0.5;
constexpr double kPlotHighFactor = 1.5;

bool InEngineRange(double t_k) { return t_k >= kMinTemperatureK && t_k <= kMaxTemperatureK; }

std::vector<double> CurveTemperatures(const TwoRangePolynomial& p, int num_points) {
  const double low = kPlotLowFactor * p.t_low_k;
  const double high = kPlotHighFactor * p.t_high_k;
  std::vector<double> t;
  const int n = std::max(2, num_points);
  for (int i = 0; i < n; ++i) {
    t.push_back(low * std::pow(high / low, static_cast<double>(i) / (n - 1)));
  }
  t.front() = low;
  t.back() = high;
  for (const double special : {p.t_low_k,
                               p.t_mid_k,
                               p.t_high_k,
                               kMinTemperatureK,
                               kMaxTemperatureK,
                               kReferenceTemperature}) {
    if (special > low && special < high) t.push_back(special);
  }
  std::sort(t.begin(), t.end());
  t.erase(std::unique(t.begin(), t.end()), t.end());
  return t;
}

void AppendPoint(CurveSet& set, const ThermoPoint& point) {
  set.cp_j_per_mol_k.push_back(point.cp_j_per_mol_k);
  set.h_minus_h298_kj_per_mol.push_back(point.h_minus_h298_j_per_mol / 1000.0);
  set.s_j_per_mol_k.push_back(point.s_j_per_mol_k);
  set.gibbs_function_j_per_mol_k.push_back(point.s_j_per_mol_k -
                                           point.h_minus_h298_j_per_mol / point.t_k);
}

void AppendNaN(CurveSet& set) {
  set.cp_j_per_mol_k.push_back(kNaN);
  set.h_minus_h298_kj_per_mol.push_back(kNaN);
  set.s_j_per_mol_k.push_back(kNaN);
  set.gibbs_function_j_per_mol_k.push_back(kNaN);
}

void AppendError(ErrorCurves& errors, const ThermoPoint* exact, const ThermoPoint* fitted) {
  if (exact == nullptr || fitted == nullptr) {
    errors.cp_percent.push_back(kNaN);
    errors.h_over_rt.push_back(kNaN);
    errors.s_over_r.push_back(kNaN);
    errors.g_over_rt.push_back(kNaN);
    return;
  }
  const double rt = kGasConstant * exact->t_k;
  const double dh = (fitted->h_j_per_mol - exact->h_j_per_mol) / rt;
  const double ds = (fitted->s_j_per_mol_k - exact->s_j_per_mol_k) / kGasConstant;
  errors.cp_percent.push_back(100.0 * (fitted->cp_j_per_mol_k - exact->cp_j_per_mol_k) /
                              exact->cp_j_per_mol_k);
  errors.h_over_rt.push_back(dh);
  errors.s_over_r.push_back(ds);
  errors.g_over_rt.push_back(dh - ds);
}

// An entry's absolute enthalpy is the polynomial's; EvaluateEntry gives it in h_j_per_mol.
ReportCurves SampleCurves(const SpeciesThermo& thermo,
                          const Entry& entry,
                          const Entry* baseline,
                          int num_points) {
  ReportCurves curves;
  curves.t_k = CurveTemperatures(entry.polynomial, num_points);
  for (const double t : curves.t_k) {
    std::optional<ThermoPoint> exact;
    if (InEngineRange(t)) exact = thermo.At(t);
    const ThermoPoint fitted = EvaluateEntry(entry, t);
    std::optional<ThermoPoint> old;
    if (baseline != nullptr) old = EvaluateEntry(*baseline, t);
    if (exact) {
      AppendPoint(curves.exact, *exact);
    } else {
      AppendNaN(curves.exact);
    }
    AppendPoint(curves.fitted, fitted);
    if (old) {
      AppendPoint(curves.baseline, *old);
    } else {
      AppendNaN(curves.baseline);
    }
    AppendError(curves.fitted_error, exact ? &*exact : nullptr, &fitted);
    AppendError(curves.baseline_error, exact ? &*exact : nullptr, old ? &*old : nullptr);
  }
  return curves;
}

void ConsiderWorst(WorstFigure& worst,
                   const char* quantity,
                   const char* range,
                   double figure,
                   double threshold,
                   double t_k) {
  const double normalised = figure / threshold;
  // Strictly greater: the first of equal figures (low before high; Cp, H, S) wins.
  if (normalised > worst.normalised || worst.quantity.empty()) {
    worst = WorstFigure{quantity, range, t_k, normalised};
  }
}

std::string FormatNumber(double value) { return fmt::format("{:g}", value); }

SpeciesReport AnalyseSpecies(const ReportSpeciesInput& in, const ReportOptions& options) {
  const Species& species = *in.species;
  SpeciesReport report;
  report.name = species.name;
  report.source = species.location.ToString();
  report.input_sha256 = species.input_digest;
  report.entry_sha256 = in.entry.provenance.input_sha256;
  report.thresholds = species.thresholds;
  report.reference_pressure_pa = species.standard_pressure_pa;
  report.model = in.entry.provenance.model_options;
  try {
    const SpeciesThermo thermo(species);
    report.fit = AssessEntryWith(thermo, species, in.entry);
    if (in.baseline) report.baseline = AssessEntryWith(thermo, species, *in.baseline);
    report.curves = SampleCurves(
        thermo, in.entry, in.baseline ? &*in.baseline : nullptr, options.num_curve_points);
  } catch (const Error& e) {
    if (!e.location().file.empty()) throw;
    throw Error(species.location, fmt::format("species '{}': {}", species.name, e.what()));
  }

  // Findings that do not change the verdict.
  const TwoRangePolynomial& p = in.entry.polynomial;
  if (p.t_low_k != species.temperatures.low_k || p.t_high_k != species.temperatures.high_k) {
    report.notes.push_back(fmt::format(
        "the entry covers {} K to {} K but the species file asks for {} K to {} K; the figures "
        "are measured over the entry's range",
        FormatNumber(p.t_low_k),
        FormatNumber(p.t_high_k),
        FormatNumber(species.temperatures.low_k),
        FormatNumber(species.temperatures.high_k)));
  }
  if (!report.entry_sha256.empty() && report.entry_sha256 != report.input_sha256) {
    report.notes.push_back(
        "the entry's input digest differs from the species data now: the entry was made from "
        "other data (stale, or another model)");
  }
  if (in.entry.quality.MeetsThresholds() != report.fit.quality.MeetsThresholds()) {
    report.notes.push_back(fmt::format(
        "the entry records the verdict '{}' but measured against the species data now it {}",
        in.entry.quality.MeetsThresholds() ? "pass" : "fail",
        report.fit.quality.MeetsThresholds() ? "passes" : "fails"));
  }
  if (!report.fit.quality.extrapolation.sane) {
    report.notes.push_back("extrapolation: " + report.fit.quality.extrapolation.message);
  }
  const double plot_low = kPlotLowFactor * p.t_low_k, plot_high = kPlotHighFactor * p.t_high_k;
  if (plot_low < kMinTemperatureK || plot_high > kMaxTemperatureK) {
    report.notes.push_back(
        fmt::format("the exact curve is drawn only within the model's limits, {} K to {} K",
                    FormatNumber(kMinTemperatureK),
                    FormatNumber(kMaxTemperatureK)));
  }
  return report;
}

}  // namespace

std::string FormLimitText(const FormLimit& limit) {
  if (!limit.computed) return "";
  const std::string range =
      limit.passing_range_found
          ? fmt::format("the widest range that passes is {} K to {} K",
                        FormatNumber(limit.passing_t_low_k),
                        FormatNumber(limit.passing_t_high_k))
          : std::string("no range tried passes");
  if (limit.AtFormLimit()) {
    return fmt::format(
        "at the form's limit: the best 7-coefficient fit over this range reaches {:.2f} of its "
        "thresholds; {}",
        limit.best_threshold_ratio,
        range);
  }
  return fmt::format(
      "a better fit of the form exists: the best 7-coefficient fit over this range reaches {:.2f} "
      "of its thresholds",
      limit.best_threshold_ratio);
}

int ReportData::NumFailing() const {
  return static_cast<int>(std::count_if(species.begin(), species.end(), [](const SpeciesReport& s) {
    return !s.fit.quality.MeetsThresholds();
  }));
}

int ReportData::NumExtrapolationWarnings() const {
  return static_cast<int>(std::count_if(species.begin(), species.end(), [](const SpeciesReport& s) {
    return !s.fit.quality.extrapolation.sane;
  }));
}

EntryAssessment AssessEntry(const Species& species, const Entry& entry) {
  return AssessEntryWith(SpeciesThermo(species), species, entry);
}

EntryAssessment AssessEntryWith(const SpeciesThermo& thermo,
                                const Species& species,
                                const Entry& entry) {
  const TwoRangePolynomial& p = entry.polynomial;
  ExactCurves exact;
  exact.t_k = FitGrid(p.t_low_k, p.t_high_k);
  for (const double t : exact.t_k) {
    const ThermoPoint point = thermo.At(t);
    exact.cp_over_r.push_back(point.cp_j_per_mol_k / kGasConstant);
    exact.h_over_rt.push_back(point.h_j_per_mol / (kGasConstant * t));
    exact.s_over_r.push_back(point.s_j_per_mol_k / kGasConstant);
  }
  const size_t split = static_cast<size_t>(
      std::lower_bound(exact.t_k.begin(), exact.t_k.end(), p.t_mid_k) - exact.t_k.begin());

  EntryAssessment a;
  a.polynomial = p;
  a.quality.low_range = MeasureRangeQuality(p.low, exact, 0, split);
  a.quality.high_range = MeasureRangeQuality(p.high, exact, split, exact.t_k.size());
  a.quality.threshold_failures = ThresholdFailures(a.quality.low_range, a.quality.high_range, species.thresholds);
  const QualityThresholds& thr = species.thresholds;
  for (const auto& [name, q] :
       {std::pair<const char*, const RangeQuality*>{"low", &a.quality.low_range},
        std::pair<const char*, const RangeQuality*>{"high", &a.quality.high_range}}) {
    if (q->num_points == 0) continue;
    ConsiderWorst(
        a.worst, "cp", name, q->max_cp_relative, thr.max_cp_relative, q->max_cp_error_t_k);
    ConsiderWorst(a.worst, "h", name, q->max_h_over_rt, thr.max_h_over_rt, q->max_h_error_t_k);
    ConsiderWorst(a.worst, "s", name, q->max_s_over_r, thr.max_s_over_r, q->max_s_error_t_k);
  }
  a.max_normalised_error = a.worst.normalised;
  a.quality.form_limit = entry.quality.form_limit;
  // The same sane band as the fitter's (fit/fitter.cc): classical limit of the species' atoms.
  a.quality.extrapolation =
      CheckExtrapolation(p, ClassicalLimitCpOverR(species.NumAtoms()) + kExtrapolationUpperMargin);
  return a;
}

void PairSpeciesWithEntries(const std::vector<Species>& species,
                            const EntriesFile& entries,
                            const std::string& entries_file,
                            const EntriesFile* baseline,
                            bool species_were_selected,
                            ReportInput& input) {
  std::map<std::string, const Entry*> by_name, baseline_by_name;
  for (const Entry& entry : entries.entries) by_name[entry.name] = &entry;
  if (baseline != nullptr) {
    for (const Entry& entry : baseline->entries) baseline_by_name[entry.name] = &entry;
  }
  std::string missing;
  for (const Species& s : species) {
    const auto found = by_name.find(s.name);
    if (found == by_name.end()) {
      if (!missing.empty()) missing += "\n";
      missing += fmt::format(
          "{}: species '{}' has no entry in {}", s.location.ToString(), s.name, entries_file);
      continue;
    }
    ReportSpeciesInput item;
    item.species = &s;
    item.entry = *found->second;
    if (const auto old = baseline_by_name.find(s.name); old != baseline_by_name.end()) {
      item.baseline = *old->second;
    }
    input.species.push_back(std::move(item));
  }
  if (!missing.empty()) throw Error(missing);
  if (species_were_selected) return;
  const auto has_species = [&](const std::string& name) {
    return std::any_of(
        species.begin(), species.end(), [&](const Species& s) { return s.name == name; });
  };
  for (const Entry& entry : entries.entries) {
    if (!has_species(entry.name)) input.entries_without_species.push_back(entry.name);
  }
  if (baseline != nullptr) {
    for (const Entry& entry : baseline->entries) {
      if (!has_species(entry.name)) input.baseline_entries_without_species.push_back(entry.name);
    }
  }
}

ReportData AnalyseReport(const ReportInput& input, const ReportOptions& options) {
  ReportData data;
  data.tool_version = input.tool_version;
  data.species_files = input.species_files;
  data.entries_file = input.entries_file;
  data.baseline_file = input.baseline_file;
  data.mid_setting = input.mid_setting;
  data.entries_without_species = input.entries_without_species;
  data.baseline_entries_without_species = input.baseline_entries_without_species;

  const int num_species = static_cast<int>(input.species.size());
  std::vector<SpeciesReport> reports(input.species.size());
  std::vector<std::string> errors(input.species.size());
  ParallelFor(
      num_species, options.num_jobs,
      [&](int i) {
        try {
          reports[i] = AnalyseSpecies(input.species[i], options);
          if (!input.baseline_file.empty() && !input.species[i].baseline) {
            reports[i].notes.push_back("no entry in the baseline file: no baseline curve");
          }
        } catch (const Error& e) {
          errors[i] = e.what();
        }
      },
      options.progress);

  ThrowJoinedErrors(errors);

  // In the order of the input: the order asked for with --species, else file order (issue 12:
  // every command lists species the same way). Each page still ranks nothing by position; the
  // summary marks failing fits and the form's limit per row.
  std::vector<int> order(reports.size());
  for (size_t i = 0; i < order.size(); ++i) order[i] = static_cast<int>(i);
  for (const int i : order) data.species.push_back(std::move(reports[i]));
  return data;
}

}  // namespace sevenfold

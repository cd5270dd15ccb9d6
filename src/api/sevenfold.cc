// SPDX-License-Identifier: MIT
// The public API: thin calls into the readers, the engine, the fitter and the entries module.
#include "api/sevenfold.h"

#include <cmath>

#include <fmt/format.h>

#include "core/atomic_file.h"
#include "mechanism/regenerate.h"
#include "report/entry_evaluation.h"
#include "species/species_reader.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

std::vector<Species> LoadSpecies(const std::string& path, int jobs) {
  return ReadSpeciesFiles({path}, jobs);
}

std::vector<Species> LoadSpeciesFromText(const std::string& text, const std::string& file_name) {
  return ReadSpeciesText(text, file_name);
}

std::vector<ThermoPoint> ExactTable(const Species& species, const std::vector<double>& t_k) {
  for (const double t : t_k) {
    if (!(t >= kMinTemperatureK && t <= kMaxTemperatureK)) {
      throw Error(fmt::format("species '{}': temperature {} K is outside the engine's range "
                              "[{}, {}] K",
                              species.name, t, kMinTemperatureK, kMaxTemperatureK));
    }
  }
  return SpeciesThermo(species).Tabulate(t_k);
}

EntriesFile Fit(const std::vector<Species>& species, const FitSettings& settings) {
  RegenerateOptions options = ParseRegenerateOptions(settings.mid, settings.objective,
                                                     settings.extrapolation_guard, settings.jobs);
  options.continuous_second_derivative = settings.smooth_curvature;
  return MakeEntriesFile(FitAllSpecies(species, options), options);
}

EntriesFile ReadEntries(const std::string& path) { return ReadEntriesFile(path); }

void WriteEntries(const EntriesFile& entries, const std::string& path) {
  WriteFileAtomically(path, FormatEntries(entries));
}

std::vector<EntryValue> Evaluate(const Entry& entry, const std::vector<double>& t_k) {
  std::vector<EntryValue> values;
  values.reserve(t_k.size());
  for (const double t : t_k) {
    if (!(t > 0.0 && std::isfinite(t))) {
      throw Error(fmt::format("entry '{}': temperature {} K; expected a finite temperature > 0",
                              entry.name, t));
    }
    EntryValue value;
    value.point = EvaluateEntry(entry, t);
    value.g_j_per_mol = value.point.h_j_per_mol - t * value.point.s_j_per_mol_k;
    value.outside_range = t < entry.polynomial.t_low_k || t > entry.polynomial.t_high_k;
    values.push_back(value);
  }
  return values;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "mechanism/regenerate.h"

#include <algorithm>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "core/parallel.h"
#include "core/units.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

using constants::kGasConstant;

RegenerateOptions ParseRegenerateOptions(const std::string& mid, const std::string& objective,
                                         const std::string& guard, int num_jobs) {
  RegenerateOptions options;
  options.num_jobs = num_jobs;
  if (!objective.empty()) {
    options.objective_override = ParseFitObjective(objective);
    if (!options.objective_override) {
      throw Error(fmt::format("--objective {}: expected 'minimax' or 'least-squares'", objective));
    }
  }
  if (!guard.empty()) {
    options.extrapolation_guard_override = ParseExtrapolationGuard(guard);
    if (!options.extrapolation_guard_override || guard.find_first_of(" \t") != std::string::npos) {
      throw Error(fmt::format(
          "--extrapolation-guard {}: expected 'off' or FACTOR:BAND with 1 < FACTOR <= 4 and "
          "0 < BAND <= 1, e.g. 1.25:0.2",
          guard));
    }
  }
  if (mid == "auto") {
    options.force_auto_mid = true;
  } else if (!mid.empty()) {
    // A plain decimal and nothing else: no spaces, no hexadecimal (" 1000" and "0x3e8" refused).
    const std::optional<double> value = ParseStrictDecimal(mid);
    if (!value || !(*value >= constants::kMinTemperatureK && *value <= constants::kMaxTemperatureK)) {
      throw Error(fmt::format(
          "--mid '{}': expected 'auto' or a temperature in K, a decimal number within [{}, {}]",
          mid, constants::kMinTemperatureK, constants::kMaxTemperatureK));
    }
    options.t_mid_override_k = *value;
  }
  return options;
}

void RecordCommittedSettings(const EntriesFile& committed, RegenerateOptions* options) {
  for (const Entry& entry : committed.entries) {
    options->recorded[entry.name] = RecordedFit{entry.fit_settings, entry.polynomial.t_mid_k};
  }
}

FitOptions FitOptionsFor(const Species& species, const RegenerateOptions& options) {
  FitOptions fit_options;
  const FitRequest& request = species.fit_request;
  const auto found = options.recorded.find(species.name);
  const RecordedFit* recorded = found == options.recorded.end() ? nullptr : &found->second;
  if (options.t_mid_override_k) {
    fit_options.t_mid_k = options.t_mid_override_k;
  } else if (options.force_auto_mid) {
    fit_options.t_mid_k.reset();
  } else if (!request.mid_given && recorded != nullptr) {
    if (recorded->settings.t_mid_fixed) fit_options.t_mid_k = recorded->t_mid_k;
  } else {
    fit_options.t_mid_k = species.temperatures.mid_k;
  }
  fit_options.continuous_second_derivative =
      options.continuous_second_derivative ||
      (recorded != nullptr && recorded->settings.continuous_second_derivative);
  const auto pick = [&](const auto& override_value, const auto& file_value, const auto* record,
                        const auto& fallback) {
    if (override_value) return *override_value;
    if (file_value) return *file_value;
    if (record != nullptr) return *record;
    return fallback;
  };
  const EntryFitSettings* settings = recorded != nullptr ? &recorded->settings : nullptr;
  fit_options.objective = pick(options.objective_override, request.objective,
                               settings ? &settings->objective : nullptr, fit_options.objective);
  fit_options.extrapolation_guard =
      pick(options.extrapolation_guard_override, request.extrapolation_guard,
           settings ? &settings->extrapolation_guard : nullptr, fit_options.extrapolation_guard);
  fit_options.error_scales =
      pick(options.error_scales_override, request.error_scales,
           settings ? &settings->error_scales : nullptr, fit_options.error_scales);
  return fit_options;
}

ExactCurves ExactCurvesFor(const Species& species, const ExtrapolationGuard& guard,
                           double* formation_enthalpy_j_per_mol) {
  // Exact up to the top of the guard (or of the fit grid), and no further: hindered-rotor ladders
  // then stop there. Guard points beyond the engine's range [kMinTemperatureK, kMaxTemperatureK]
  // are left out: the guard then holds only where the exact model exists.
  const std::vector<double> guard_t_k =
      GuardGrid(species.temperatures.low_k, species.temperatures.high_k, guard);
  const double top_k = std::min(
      kMaxTemperatureK, guard_t_k.empty() ? species.temperatures.high_k : guard_t_k.back());
  const SpeciesThermo thermo(species, std::max(top_k, species.temperatures.high_k));
  if (formation_enthalpy_j_per_mol != nullptr) {
    *formation_enthalpy_j_per_mol = thermo.FormationEnthalpy298JPerMol();
  }
  ExactCurves curves;
  curves.classical_limit_cp_over_r = ClassicalLimitCpOverR(species.NumAtoms());
  for (const double t : guard_t_k) {
    if (t < kMinTemperatureK || t > kMaxTemperatureK) continue;
    curves.guard_t_k.push_back(t);
    curves.guard_cp_over_r.push_back(thermo.At(t).cp_j_per_mol_k / kGasConstant);
  }
  curves.t_k = FitGrid(species.temperatures.low_k, species.temperatures.high_k);
  for (const double t : curves.t_k) {
    const ThermoPoint point = thermo.At(t);
    curves.cp_over_r.push_back(point.cp_j_per_mol_k / kGasConstant);
    curves.h_over_rt.push_back(point.h_j_per_mol / (kGasConstant * t));
    curves.s_over_r.push_back(point.s_j_per_mol_k / kGasConstant);
  }
  return curves;
}

std::string ModelDescription(const Species& species) {
  if (species.tabulated) {
    return fmt::format("tabulated Cp ({} rows, {}-{} K): shape-preserving cubic, integrated "
                       "exactly; Wilhoit extrapolation outside",
                       species.tabulated->t_k.size(), species.tabulated->t_k.front(),
                       species.tabulated->t_k.back());
  }
  std::string model = "ideal gas; translation; electronic levels";
  if (!species.diatomic_states.empty()) {
    model += "; diatomic rovibrational direct sum";
  } else if (species.shape != Shape::kAtom) {
    model += "; rigid rotor (explicit sum + matched asymptotic tail); harmonic vibrations";
    if (species.frequency_scale != 1.0) model += fmt::format(" scaled by {}", species.frequency_scale);
  }
  if (species.nuclear_spin) model += "; nuclear-spin statistics " + ToString(species.nuclear_spin->mixture);
  if (!species.torsions.empty()) model += fmt::format("; {} hindered rotor(s)", species.torsions.size());
  // An ion's formation enthalpy depends on how the electron is counted (docs/species-schema.md).
  if (species.charge != 0) {
    model += "; ion: formation enthalpy in the " + ToString(species.electron_convention) +
             " electron convention";
  }
  return model;
}

std::vector<SpeciesFit> FitAllSpecies(const std::vector<Species>& species,
                                      const RegenerateOptions& options) {
  return FitAllSpecies(species, options, nullptr);
}

std::vector<SpeciesFit> FitAllSpecies(const std::vector<Species>& species,
                                      const RegenerateOptions& options,
                                      std::vector<std::string>* failures) {
  const int num_species = static_cast<int>(species.size());
  std::vector<SpeciesFit> results(species.size());
  std::vector<std::string> errors(species.size());
  ParallelFor(
      num_species, options.num_jobs,
      [&](int i) {
        SpeciesFit& result = results[i];
        result.species = &species[i];
        try {
          const FitOptions fit_options = FitOptionsFor(species[i], options);
          result.exact = ExactCurvesFor(species[i], fit_options.extrapolation_guard,
                                        &result.formation_enthalpy_j_per_mol);
          result.fit = FitTwoRange(result.exact, fit_options, species[i].thresholds);
        } catch (const Error& e) {
          errors[i] = e.location().file.empty()
                          ? fmt::format("{}: species '{}': {}", species[i].location.ToString(),
                                        species[i].name, e.what())
                          : e.what();
        }
      },
      options.progress);

  if (failures != nullptr) {
    std::vector<SpeciesFit> good;
    for (int i = 0; i < num_species; ++i) {
      if (errors[i].empty()) {
        good.push_back(std::move(results[i]));
      } else {
        failures->push_back(errors[i]);
      }
    }
    return good;
  }
  ThrowJoinedErrors(errors);
  return results;
}

Entry MakeEntry(const SpeciesFit& result, const RegenerateOptions& options) {
  const Species& species = *result.species;
  Entry entry;
  entry.name = species.name;
  entry.composition = species.composition;
  entry.charge = species.charge;
  entry.polynomial = result.fit.polynomial;
  entry.formation_enthalpy_j_per_mol = result.formation_enthalpy_j_per_mol;
  entry.reference_pressure_pa = species.standard_pressure_pa;
  entry.quality = result.fit.quality;
  const FitOptions fit_options = FitOptionsFor(species, options);
  EntryFitSettings& settings = entry.fit_settings;
  settings.objective = fit_options.objective;
  settings.error_scales = fit_options.error_scales;
  settings.extrapolation_guard = fit_options.extrapolation_guard;
  settings.t_mid_fixed = fit_options.t_mid_k.has_value();
  settings.continuous_second_derivative = fit_options.continuous_second_derivative;
  entry.provenance.input_sha256 = species.input_digest;
  entry.provenance.tool_version = SEVENFOLD_VERSION;
  entry.provenance.model_options = ModelDescription(species);
  entry.provenance.source_file = species.location.file;
  return entry;
}

EntriesFile MakeEntriesFile(const std::vector<SpeciesFit>& results,
                            const RegenerateOptions& options) {
  EntriesFile file;
  for (const SpeciesFit& result : results) file.entries.push_back(MakeEntry(result, options));
  return file;
}

}  // namespace sevenfold

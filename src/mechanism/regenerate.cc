// SPDX-License-Identifier: MIT
#include "mechanism/regenerate.h"

#include <algorithm>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "core/parallel.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

using constants::kGasConstant;

FitOptions FitOptionsFor(const Species& species, const RegenerateOptions& options) {
  FitOptions fit_options;
  if (options.t_mid_override_k) {
    fit_options.t_mid_k = options.t_mid_override_k;
  } else if (!options.force_auto_mid) {
    fit_options.t_mid_k = species.temperatures.mid_k;
  }
  fit_options.continuous_second_derivative = options.continuous_second_derivative;
  const FitRequest& request = species.fit_request;
  fit_options.objective = options.objective_override.value_or(
      request.objective.value_or(fit_options.objective));
  fit_options.extrapolation_guard = options.extrapolation_guard_override.value_or(
      request.extrapolation_guard.value_or(fit_options.extrapolation_guard));
  fit_options.error_scales = options.error_scales_override.value_or(
      request.error_scales.value_or(fit_options.error_scales));
  fit_options.num_atoms = species.NumAtoms();
  return fit_options;
}

ExactCurves ExactCurvesFor(const Species& species, const ExtrapolationGuard& guard) {
  // Exact up to the top of the guard (or of the fit grid), and no further: hindered-rotor ladders
  // then stop there. Guard points beyond the engine's range [kMinTemperatureK, kMaxTemperatureK]
  // are left out: the guard then holds only where the exact model exists.
  const std::vector<double> guard_t_k =
      GuardGrid(species.temperatures.low_k, species.temperatures.high_k, guard);
  const double top_k = std::min(
      kMaxTemperatureK, guard_t_k.empty() ? species.temperatures.high_k : guard_t_k.back());
  const SpeciesThermo thermo(species, std::max(top_k, species.temperatures.high_k));
  ExactCurves curves;
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

std::string ModelDescription(const Species& species, const FitOptions& options) {
  std::string model = "ideal gas; translation; electronic levels";
  if (!species.diatomic_states.empty()) {
    model += "; diatomic rovibrational direct sum";
  } else if (species.shape != Shape::kAtom) {
    model += "; rigid rotor (explicit sum + matched asymptotic tail); harmonic vibrations";
    if (species.frequency_scale != 1.0) model += fmt::format(" scaled by {}", species.frequency_scale);
  }
  if (species.nuclear_spin) model += "; nuclear-spin statistics " + ToString(species.nuclear_spin->mixture);
  if (!species.torsions.empty()) model += fmt::format("; {} hindered rotor(s)", species.torsions.size());
  model += options.t_mid_k ? fmt::format("; fit t_mid fixed at {} K", *options.t_mid_k)
                           : std::string("; fit t_mid auto");
  if (options.continuous_second_derivative) model += "; d2Cp/dT2 continuous";
  if (options.pin_reference_state) model += "; H and S pinned at 298.15 K";
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
          result.exact = ExactCurvesFor(species[i], fit_options.extrapolation_guard);
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
  std::string message;
  for (const std::string& error : errors) {
    if (error.empty()) continue;
    if (!message.empty()) message += "\n";
    message += error;
  }
  if (!message.empty()) throw Error(message);
  return results;
}

Entry MakeEntry(const SpeciesFit& result, const RegenerateOptions& options) {
  const Species& species = *result.species;
  Entry entry;
  entry.name = species.name;
  entry.composition = species.composition;
  entry.charge = species.charge;
  entry.polynomial = result.fit.polynomial;
  entry.formation_enthalpy_j_per_mol = species.formation_enthalpy_j_per_mol;
  entry.reference_pressure_pa = species.standard_pressure_pa;
  entry.quality = result.fit.quality;
  entry.provenance.input_sha256 = species.input_digest;
  entry.provenance.tool_version = SEVENFOLD_VERSION;
  entry.provenance.model_options = ModelDescription(species, FitOptionsFor(species, options));
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

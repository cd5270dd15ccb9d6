// SPDX-License-Identifier: MIT
#include "statmech/species_thermo.h"

#include "statmech/formation_enthalpy.h"

#include <cmath>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "statmech/diatomic.h"
#include "statmech/harmonic.h"
#include "statmech/level_sum.h"
#include "statmech/nuclear_spin.h"
#include "statmech/rotor.h"
#include "statmech/tabulated_cp.h"
#include "statmech/torsion.h"
#include "statmech/translation.h"

namespace sevenfold {

using constants::kGasConstant;
using constants::kReferenceTemperature;
using constants::kWavenumberToKelvin;

// cm^-1 or better always matches, distinct modes of a real molecule rarely lie this close.

struct SpeciesThermo::Model {
  std::string name;
  SourceLocation location;
  double molar_mass_kg_per_mol = 0.0;
  double pressure_pa = 0.0;
  double formation_enthalpy_j_per_mol = 0.0;
  double ln_optical_isomers = 0.0;
  std::vector<Level> electronic_levels;
  std::optional<RotorContribution> rotor;
  // Diatomic rovibrational direct sum, or a linear rigid rotor with nuclear-spin statistics.
  std::optional<ParityLevelSum> parity_sum;
  std::vector<double> vibration_theta_k;
  std::vector<TorsionContribution> torsions;
  // Set for a species given by tabulated-cp: then it alone gives the curves.
  std::optional<TabulatedCurves> tabulated;
  double h298_minus_h0_j_per_mol = 0.0;

  // Sum of the internal and translational moments at t_k.
  Moments TotalMoments(double t_k) const {
    Moments total = TranslationMoments(molar_mass_kg_per_mol, pressure_pa, t_k);
    total += LevelSumMoments(electronic_levels, t_k);
    if (rotor) total += rotor->At(t_k);
    if (parity_sum) total += parity_sum->At(t_k);
    total += HarmonicMoments(vibration_theta_k, t_k);
    for (const TorsionContribution& torsion : torsions) total += torsion.At(t_k);
    total.ln_q += ln_optical_isomers;
    return total;
  }

  // H(T) - H(0) in J/mol: the moments' energy plus p V = R T of the ideal gas.
  double EnthalpyAboveZero(const Moments& total, double t_k) const {
    return kGasConstant * (total.mean_energy_k + t_k);
  }
};

SpeciesThermo::SpeciesThermo(const Species& species, double highest_temperature_k)
    : model_(std::make_unique<Model>()) {
  Model& model = *model_;
  model.name = species.name;
  model.location = species.location;
  const auto fail = [&](const std::string& message) {
    throw Error(species.location, fmt::format("species '{}': {}", species.name, message));
  };
  model.molar_mass_kg_per_mol = species.MolarMassKgPerMol();
  if (!(model.molar_mass_kg_per_mol > 0.0)) fail("molar mass must be positive");
  model.pressure_pa = species.standard_pressure_pa;
  model.formation_enthalpy_j_per_mol = species.formation_enthalpy_j_per_mol;
  model.ln_optical_isomers = std::log(species.optical_isomers);
  if (species.tabulated) {
    if (species.formation_enthalpy_0k_j_per_mol) {
      fail("a tabulated species gives its formation enthalpy at 298.15 K (formation-enthalpy)");
    }
    model.tabulated.emplace(species);
    model.h298_minus_h0_j_per_mol = model.tabulated->H298MinusH0JPerMol();
    return;
  }

  // Electronic levels are measured from the lowest one, so that H(0) is the ground level.
  double lowest_cm1 = species.electronic_levels.empty() ? 0.0
                                                        : species.electronic_levels.front().energy_cm1;
  for (const ElectronicLevel& level : species.electronic_levels) {
    lowest_cm1 = std::min(lowest_cm1, level.energy_cm1);
  }
  for (const ElectronicLevel& level : species.electronic_levels) {
    model.electronic_levels.push_back(
        {(level.energy_cm1 - lowest_cm1) * kWavenumberToKelvin, level.degeneracy});
  }
  if (model.electronic_levels.empty()) model.electronic_levels.push_back({0.0, 1.0});

  if (species.nuclear_spin && species.shape != Shape::kLinear) {
    fail("nuclear-spin statistics need a linear molecule (shape linear)");
  }
  if (species.nuclear_spin && species.symmetry_number != 2.0) {
    fail(fmt::format("nuclear-spin weights replace the symmetry number 2 of a centrosymmetric "
                     "linear molecule; got symmetry number {}",
                     species.symmetry_number));
  }

  if (!species.diatomic_states.empty()) {
    // The direct sum replaces the rigid rotor, the harmonic vibration and the electronic list.
    if (species.shape != Shape::kLinear || species.NumAtoms() != 2) {
      fail("diatomic constants need a diatomic (shape linear, 2 atoms)");
    }
    ParityLevels levels;
    try {
      levels = DiatomicLevels(species.diatomic_states);
    } catch (const Error& error) {
      fail(error.what());
    }
    if (species.nuclear_spin) {
      model.parity_sum.emplace(std::move(levels), *species.nuclear_spin);
    } else {
      model.parity_sum.emplace(std::move(levels), species.symmetry_number);
    }
    // Several states carry their own energies and degeneracies (the reader mirrors them into
    // electronic_levels, which is then ignored). With a single state, further listed electronic
    // levels share its rovibrational ladder (a common approximation); the ground degeneracy is
    // already in the state, so the list enters relative to its first level.
    model.electronic_levels = {{0.0, 1.0}};
    if (species.diatomic_states.size() == 1 && !species.electronic_levels.empty()) {
      const ElectronicLevel ground = species.electronic_levels.front();
      model.electronic_levels.clear();
      for (const ElectronicLevel& level : species.electronic_levels) {
        model.electronic_levels.push_back(
            {(level.energy_cm1 - ground.energy_cm1) * kWavenumberToKelvin,
             level.degeneracy / ground.degeneracy});
      }
    }
  } else {
    const std::vector<double>& constants_cm1 = species.rotational_constants_cm1;
    switch (species.shape) {
      case Shape::kAtom:
        break;
      case Shape::kLinear:
        if (constants_cm1.size() != 1) fail("a linear rotor needs one rotational constant");
        if (!(constants_cm1[0] > 0.0)) fail("the rotational constant must be positive");
        if (species.nuclear_spin) {
          // Explicit sum at every temperature: the even/odd split has no simple tail.
          model.parity_sum.emplace(
              LinearRotorParityLevels(constants_cm1[0] * kWavenumberToKelvin,
                                      species.centrifugal_distortion_cm1 * kWavenumberToKelvin,
                                      RotorOptions{}.level_cut_factor * kMaxTemperatureK),
              *species.nuclear_spin);
        } else {
          model.rotor = RotorContribution::Linear(constants_cm1[0], species.symmetry_number,
                                                  species.centrifugal_distortion_cm1);
        }
        break;
      case Shape::kNonlinear:
        if (constants_cm1.size() != 3) fail("a nonlinear rotor needs three rotational constants");
        model.rotor = RotorContribution::Nonlinear(
            {constants_cm1[0], constants_cm1[1], constants_cm1[2]}, species.symmetry_number);
        break;
    }

    // Each torsion takes the place of the harmonic mode it names.
    std::vector<double> modes_cm1 = species.vibrations_cm1;
    std::vector<bool> replaced(modes_cm1.size(), false);
    if (!species.torsions.empty() && species.shape != Shape::kNonlinear) {
      fail("torsions need a nonlinear molecule");
    }
    for (std::size_t i = 0; i < species.torsions.size(); ++i) {
      const Torsion& torsion = species.torsions[i];
      // The reader resolved the mode (Torsion::mode_index); the engine only checks the index.
      const int index = torsion.mode_index;
      if (index < 0 || index >= static_cast<int>(modes_cm1.size()) ||
          replaced[static_cast<std::size_t>(index)]) {
        fail(fmt::format("torsion {} (replaces {} cm^-1) has mode index {}, which is not an "
                         "unreplaced one of the {} vibrations",
                         i, torsion.replaces_cm1, index, modes_cm1.size()));
      }
      replaced[static_cast<std::size_t>(index)] = true;
      if (!(torsion.rotational_constant_cm1 > 0.0) || torsion.symmetry < 1) {
        fail(fmt::format("torsion {}: rotational constant must be positive and symmetry at least 1 "
                         "(got {} cm^-1, {})",
                         i, torsion.rotational_constant_cm1, torsion.symmetry));
      }
      std::vector<std::pair<int, double>> fourier_k;
      for (const auto& [k, v_j_per_mol] : torsion.fourier_j_per_mol) {
        if (k < 1) fail(fmt::format("torsion {}: Fourier order {} must be at least 1", i, k));
        fourier_k.emplace_back(k, v_j_per_mol / kGasConstant);
      }
      try {
        TorsionOptions torsion_options;
        torsion_options.top_temperature_k = highest_temperature_k;
        model.torsions.emplace_back(torsion.rotational_constant_cm1 * kWavenumberToKelvin,
                                    torsion.symmetry, fourier_k, torsion_options);
      } catch (const Error& error) {
        fail(fmt::format("torsion {}: {}", i, error.what()));
      }
    }
    for (std::size_t k = 0; k < modes_cm1.size(); ++k) {
      if (replaced[k]) continue;
      model.vibration_theta_k.push_back(modes_cm1[k] * species.frequency_scale * kWavenumberToKelvin);
    }
  }

  model.h298_minus_h0_j_per_mol =
      model.EnthalpyAboveZero(model.TotalMoments(kReferenceTemperature), kReferenceTemperature);
  // The one place a formation enthalpy given at 0 K becomes the 298.15 K value (the species
  // module cannot do it: it needs this model's H(298.15) - H(0)).
  if (species.formation_enthalpy_0k_j_per_mol) {
    model.formation_enthalpy_j_per_mol = FormationEnthalpy298FromZeroK(
        species, *species.formation_enthalpy_0k_j_per_mol, model.h298_minus_h0_j_per_mol);
  }
}

double SpeciesThermo::FormationEnthalpy298JPerMol() const {
  return model_->formation_enthalpy_j_per_mol;
}

double SpeciesThermo::H298MinusH0JPerMol() const { return model_->h298_minus_h0_j_per_mol; }

SpeciesThermo::~SpeciesThermo() = default;
SpeciesThermo::SpeciesThermo(SpeciesThermo&&) noexcept = default;
SpeciesThermo& SpeciesThermo::operator=(SpeciesThermo&&) noexcept = default;

ThermoPoint SpeciesThermo::At(double t_k) const {
  const Model& model = *model_;
  if (!(t_k >= kMinTemperatureK && t_k <= kMaxTemperatureK)) {
    throw Error(model.location,
                fmt::format("species '{}': temperature {} K is outside the supported range "
                            "[{}, {}] K",
                            model.name, t_k, kMinTemperatureK, kMaxTemperatureK));
  }
  if (model.tabulated) return model.tabulated->At(t_k);
  const Moments total = model.TotalMoments(t_k);
  ThermoPoint point;
  point.t_k = t_k;
  // Cp = Cv + R for the ideal gas; Cv from the energy fluctuation Var(E) / (k T^2).
  point.cp_j_per_mol_k = kGasConstant * (total.energy_variance_k2 / (t_k * t_k) + 1.0);
  // S = R (ln q + 1 + <E>/T): the +1 is Stirling's ln N! for indistinguishable molecules.
  point.s_j_per_mol_k = kGasConstant * (total.ln_q + 1.0 + total.mean_energy_k / t_k);
  point.h_minus_h298_j_per_mol = model.EnthalpyAboveZero(total, t_k) - model.h298_minus_h0_j_per_mol;
  point.h_j_per_mol = model.formation_enthalpy_j_per_mol + point.h_minus_h298_j_per_mol;
  return point;
}

std::vector<ThermoPoint> SpeciesThermo::Tabulate(const std::vector<double>& t_k) const {
  std::vector<ThermoPoint> table;
  table.reserve(t_k.size());
  for (const double t : t_k) table.push_back(At(t));
  return table;
}

}  // namespace sevenfold

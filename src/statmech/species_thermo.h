// SPDX-License-Identifier: MIT
// Exact ideal-gas Cp, S and H of one species from its molecular data by statistical mechanics.
#pragma once

#include <memory>
#include <vector>

#include "core/constants.h"
#include "species/species.h"
#include "statmech/thermo_point.h"

namespace sevenfold {

// The engine's temperature limits, in core/constants.h, under their old names here.
using constants::kMaxTemperatureK;
using constants::kMinTemperatureK;

// Exact thermodynamic functions of one species: sums of the contributions of translation,
// electronic levels, rotation (with nuclear-spin statistics when given), vibration, hindered
// internal rotors (each replacing one harmonic mode) and, for a diatomic with Dunham-type
// constants, the rovibrational direct sum that replaces rotor, vibration and electronic list
// (docs/theory.md). Construction does the temperature-independent work (all level lists and
// diagonalisations); evaluation is only exponentials, and thread-safe.
class SpeciesThermo {
 public:
  // Throws Error (naming the species and its file location) when the model cannot be built.
  // Exact to rounding up to highest_temperature_k; above it hindered rotors use their matched
  // asymptotic tail (statmech/torsion.h), which is cheaper to build: a fit passes its own
  // highest temperature.
  explicit SpeciesThermo(const Species& species, double highest_temperature_k = kMaxTemperatureK);
  ~SpeciesThermo();
  SpeciesThermo(SpeciesThermo&&) noexcept;
  SpeciesThermo& operator=(SpeciesThermo&&) noexcept;

  // Thermodynamic functions at t_k. Throws Error outside [kMinTemperatureK, kMaxTemperatureK].
  ThermoPoint At(double t_k) const;
  std::vector<ThermoPoint> Tabulate(const std::vector<double>& t_k) const;

  // dfH(298.15 K), J/mol: as the species gives it, or converted from its 0 K value
  // (statmech/formation_enthalpy.h) with this model's H(298.15) - H(0).
  double FormationEnthalpy298JPerMol() const;
  // H(298.15 K) - H(0) of the model, J/mol.
  double H298MinusH0JPerMol() const;

 private:
  struct Model;
  std::unique_ptr<Model> model_;
};

}  // namespace sevenfold

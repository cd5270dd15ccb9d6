// SPDX-License-Identifier: MIT
#include "statmech/translation.h"

#include <cmath>

#include "core/constants.h"

namespace sevenfold {

Moments TranslationMoments(double molar_mass_kg_per_mol, double pressure_pa, double t_k) {
  using namespace constants;
  const double mass_kg = molar_mass_kg_per_mol / kAvogadro;
  const double thermal = 2.0 * kPi * mass_kg * kBoltzmann * t_k / (kPlanck * kPlanck);
  Moments moments;
  moments.ln_q = 1.5 * std::log(thermal) + std::log(kBoltzmann * t_k / pressure_pa);
  moments.mean_energy_k = 1.5 * t_k;
  moments.energy_variance_k2 = 1.5 * t_k * t_k;
  return moments;
}

}  // namespace sevenfold

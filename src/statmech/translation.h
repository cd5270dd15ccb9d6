// SPDX-License-Identifier: MIT
// Translational contribution of an ideal gas at a standard pressure.
#pragma once

#include "statmech/moments.h"

namespace sevenfold {

// Moments of translation for molecules of molar mass molar_mass_kg_per_mol at pressure_pa:
//   ln q = ln[(2 pi m k T / h^2)^(3/2) k T / p],  <E> = 3/2 T,  Var(E) = 3/2 T^2.
// With the +1 of ln N! this gives the Sackur-Tetrode entropy [McQuarrie2000, eq. 5-20].
Moments TranslationMoments(double molar_mass_kg_per_mol, double pressure_pa, double t_k);

}  // namespace sevenfold

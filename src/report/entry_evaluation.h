// SPDX-License-Identifier: MIT
// Thermodynamic functions evaluated from a fitted entry, in the same units as the exact tables.
#pragma once

#include "entries/entries.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

// Cp, S, H - H(298.15 K) and H of the entry's polynomial at t_k (SI per mole). H - H298 uses
// the polynomial's own value at 298.15 K. Outside [t_low, t_high] this extrapolates.
ThermoPoint EvaluateEntry(const Entry& entry, double t_k);

}  // namespace sevenfold

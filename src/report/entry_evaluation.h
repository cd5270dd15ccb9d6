// SPDX-License-Identifier: MIT
// Thermodynamic functions evaluated from a fitted entry, in the same units as the exact tables.
#pragma once

#include <vector>

#include "entries/entries.h"
#include "formation/formation.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

// Cp, S, H - H(298.15 K) and H of the entry's polynomial at t_k (SI per mole). H - H298 uses
// the polynomial's own value at 298.15 K. Outside [t_low, t_high] this extrapolates.
ThermoPoint EvaluateEntry(const Entry& entry, double t_k);

// Formation properties of `entry` from its polynomial and its elements' reference-state entries
// among `available`: for each element, the entry labelled as the built-in reference state (H2,
// O2, N2, F2, Cl2, C(gr); formation/formation.h) with that element alone in its composition
// (docs/cli.md). A point is missing where an element has no such entry, for an ion, or where t_k
// lies outside a reference entry's fitted range (no extrapolation of a reference, whose phase
// may change there); `reason` names the first such cause.
FormationModel::Series EntryFormation(const Entry& entry, const std::vector<Entry>& available,
                                      const std::vector<double>& temperatures_k);

}  // namespace sevenfold

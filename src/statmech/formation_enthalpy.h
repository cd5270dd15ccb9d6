// SPDX-License-Identifier: MIT
// The formation enthalpy at 298.15 K from the one at 0 K: the species' own H(298.15) - H(0) and
// that of the elements in their reference states (and of the electron, for ions).
#pragma once

#include <optional>
#include <string>

#include "species/species.h"

namespace sevenfold {

// H(298.15 K) - H(0) of an element in its reference state, J/mol per mole of atoms (half the
// value of H2, O2, N2, the halogens), or nullopt for an element without a value here.
// Source: CODATA Key Values for Thermodynamics (Cox, Wagman, Medvedev 1989), values written from
// memory; docs/species-schema.md lists them.
std::optional<double> ElementH298MinusH0JPerMol(const std::string& symbol);

// H(298.15 K) - H(0) of the electron in `convention`: 5/2 R T (an ideal gas of electrons, as JANAF
// tables take it) for kThermal, 0 for kStationary; J/mol.
double ElectronH298MinusH0JPerMol(ElectronConvention convention);

// dfH(298.15 K) = dfH(0) + [H298 - H0](species) - sum_i n_i [H298 - H0](element i)
//                 + charge [H298 - H0](electron)
// (the formation reaction of an ion of charge q releases q electrons). `h298_minus_h0_j_per_mol`
// is the species' own value from its exact model. Throws Error at the species' location for an
// element without a reference value.
double FormationEnthalpy298FromZeroK(const Species& species,
                                     double formation_enthalpy_0k_j_per_mol,
                                     double h298_minus_h0_j_per_mol);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Physical bounds that every reader of user input applies (species files, entries files), so
// that what one reader accepts the other accepts too.
#pragma once

namespace sevenfold {

// Atoms of one element in a species: gas-phase species in mechanisms have tens (common practice);
// the bound keeps 3N-6 and the atom total far from integer overflow.
inline constexpr int kMaxAtomCount = 1000;
// |net charge| of an ion, elementary charges: gas-phase ions in mechanisms carry a few charges
// at most (common practice); the bound keeps the electron-mass correction physical.
inline constexpr int kMaxChargeMagnitude = 100;
// |formation enthalpy|, J/mol: gas-phase ions of light elements reach about 1e4 kJ/mol
// (He2+: 7.6e3 kJ/mol from its ionisation energies, from memory).
inline constexpr double kMaxFormationEnthalpyJPerMol = 1.0e8;

}  // namespace sevenfold

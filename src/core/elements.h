// SPDX-License-Identifier: MIT
// Standard atomic weights of the elements (and the hydrogen isotopes D, T) by symbol.
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace sevenfold {

// Atomic weight in g/mol (numerically the relative atomic mass) of an element symbol such as
// "C" or "Cl" (case-sensitive), or of the isotopes "D" (2H) and "T" (3H). nullopt if unknown.
// Elements: IUPAC 2021 abridged standard atomic weights (conventional values where IUPAC gives an
// interval), for H..Xe without Tc, plus Cs, Ba, W, Pt, Au, Hg, Pb, Bi, U.
std::optional<double> AtomicWeightGPerMol(const std::string& symbol);

// Atomic number Z (protons, and electrons of the neutral atom) of an element symbol from H (1) to
// U (92), D and T (1); nullopt if unknown. Periodic table order (common practice).
std::optional<int> AtomicNumber(const std::string& symbol);

// Every symbol AtomicWeightGPerMol knows, in table order (for messages and tests).
const std::vector<std::string>& KnownElementSymbols();

}  // namespace sevenfold

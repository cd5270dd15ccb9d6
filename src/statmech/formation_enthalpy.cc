// SPDX-License-Identifier: MIT
#include "statmech/formation_enthalpy.h"

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"

namespace sevenfold {
namespace {

struct ElementReference {
  const char* symbol;
  double h298_minus_h0_kj_per_mol;  // per mole of atoms
};

// CODATA Key Values for Thermodynamics (Cox, Wagman, Medvedev, Hemisphere 1989), H(298.15 K) -
// H(0) of the reference states, from memory (kJ/mol of the substance; halved for diatomic gases):
// H2(g) 8.468, He/Ne/Ar/Kr/Xe(g) 6.197 (5/2 R T), C(graphite) 1.050, N2(g) 8.670, O2(g) 8.683,
// F2(g) 8.825, Si(cr) 3.217, P(cr, white) 5.360, S(cr, rhombic) 4.412, Cl2(g) 9.181,
// Br2(l) 24.51, I2(cr) 13.196.
constexpr ElementReference kReferences[] = {
    {"H", 8.468 / 2.0},  {"He", 6.197},  {"C", 1.050},         {"N", 8.670 / 2.0},
    {"O", 8.683 / 2.0},  {"F", 8.825 / 2.0}, {"Ne", 6.197},    {"Si", 3.217},
    {"P", 5.360},        {"S", 4.412},   {"Cl", 9.181 / 2.0},  {"Ar", 6.197},
    {"Br", 24.51 / 2.0}, {"Kr", 6.197},  {"I", 13.196 / 2.0},  {"Xe", 6.197},
};

}  // namespace

std::optional<double> ElementH298MinusH0JPerMol(const std::string& symbol) {
  for (const ElementReference& reference : kReferences) {
    if (symbol == reference.symbol) return reference.h298_minus_h0_kj_per_mol * 1.0e3;
  }
  return std::nullopt;
}

double ElectronH298MinusH0JPerMol(ElectronConvention convention) {
  return convention == ElectronConvention::kThermal
             ? 2.5 * constants::kGasConstant * constants::kReferenceTemperature
             : 0.0;
}

double FormationEnthalpy298FromZeroK(const Species& species,
                                     double formation_enthalpy_0k_j_per_mol,
                                     double h298_minus_h0_j_per_mol) {
  double elements_j_per_mol = 0.0;
  for (const auto& [symbol, count] : species.composition) {
    const std::optional<double> reference = ElementH298MinusH0JPerMol(symbol);
    if (!reference) {
      throw Error(species.location,
                  fmt::format("species '{}': formation-enthalpy-0k: no H(298.15) - H(0) of the "
                              "reference state of {} is known (docs/species-schema.md lists "
                              "them); expected formation-enthalpy at 298.15 K instead",
                              species.name,
                              symbol));
    }
    elements_j_per_mol += count * *reference;
  }
  return formation_enthalpy_0k_j_per_mol + h298_minus_h0_j_per_mol - elements_j_per_mol +
         species.charge * ElectronH298MinusH0JPerMol(species.electron_convention);
}

}  // namespace sevenfold

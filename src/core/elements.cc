// SPDX-License-Identifier: MIT
#include "core/elements.h"

#include <utility>

namespace sevenfold {
namespace {

struct ElementWeight {
  const char* symbol;
  double weight_g_per_mol;
};

// IUPAC (CIAAW) 2021 table of abridged standard atomic weights, five significant figures at most,
// with the conventional value for elements whose standard atomic weight is an interval
// (H, Li, B, C, N, O, Mg, Si, S, Cl, Ar, Br, Pb). Written from memory; checked against
// python3-ase's IUPAC 2016 table in tests/core_test.cc. Tc has no standard atomic weight and is
// left out on purpose.
constexpr ElementWeight kElements[] = {
    {"H", 1.008},
    {"He", 4.0026},
    {"Li", 6.94},
    {"Be", 9.0122},
    {"B", 10.81},
    {"C", 12.011},
    {"N", 14.007},
    {"O", 15.999},
    {"F", 18.998},
    {"Ne", 20.180},
    {"Na", 22.990},
    {"Mg", 24.305},
    {"Al", 26.982},
    {"Si", 28.085},
    {"P", 30.974},
    {"S", 32.06},
    {"Cl", 35.45},
    {"Ar", 39.95},
    {"K", 39.098},
    {"Ca", 40.078},
    {"Sc", 44.956},
    {"Ti", 47.867},
    {"V", 50.942},
    {"Cr", 51.996},
    {"Mn", 54.938},
    {"Fe", 55.845},
    {"Co", 58.933},
    {"Ni", 58.693},
    {"Cu", 63.546},
    {"Zn", 65.38},
    {"Ga", 69.723},
    {"Ge", 72.630},
    {"As", 74.922},
    {"Se", 78.971},
    {"Br", 79.904},
    {"Kr", 83.798},
    {"Rb", 85.468},
    {"Sr", 87.62},
    {"Y", 88.906},
    {"Zr", 91.224},
    {"Nb", 92.906},
    {"Mo", 95.95},
    {"Ru", 101.07},
    {"Rh", 102.91},
    {"Pd", 106.42},
    {"Ag", 107.87},
    {"Cd", 112.41},
    {"In", 114.82},
    {"Sn", 118.71},
    {"Sb", 121.76},
    {"Te", 127.60},
    {"I", 126.90},
    {"Xe", 131.29},
    {"Cs", 132.91},
    {"Ba", 137.33},
    {"W", 183.84},
    {"Pt", 195.08},
    {"Au", 196.97},
    {"Hg", 200.59},
    {"Pb", 207.2},
    {"Bi", 208.98},
    {"U", 238.03},
    // Isotopic atomic masses, not standard atomic weights: Atomic Mass Evaluation AME 2020
    // (Wang et al., Chinese Physics C 45, 030003, 2021), from memory. Cross-checked in
    // tests/core_test.cc against CODATA 2018 deuteron and triton masses.
    {"D", 2.014101777844},
    {"T", 3.016049281320},
};

}  // namespace

std::optional<double> AtomicWeightGPerMol(const std::string& symbol) {
  for (const ElementWeight& element : kElements) {
    if (symbol == element.symbol) return element.weight_g_per_mol;
  }
  return std::nullopt;
}

const std::vector<std::string>& KnownElementSymbols() {
  static const std::vector<std::string> symbols = [] {
    std::vector<std::string> list;
    for (const ElementWeight& element : kElements) list.emplace_back(element.symbol);
    return list;
  }();
  return symbols;
}

std::optional<int> AtomicNumber(const std::string& symbol) {
  // Z = 1 .. 92 in periodic table order (common practice).
  static const char* const kSymbolsByZ[] = {
      "H",  "He", "Li", "Be", "B",  "C",  "N",  "O",  "F",  "Ne", "Na", "Mg", "Al", "Si",
      "P",  "S",  "Cl", "Ar", "K",  "Ca", "Sc", "Ti", "V",  "Cr", "Mn", "Fe", "Co", "Ni",
      "Cu", "Zn", "Ga", "Ge", "As", "Se", "Br", "Kr", "Rb", "Sr", "Y",  "Zr", "Nb", "Mo",
      "Tc", "Ru", "Rh", "Pd", "Ag", "Cd", "In", "Sn", "Sb", "Te", "I",  "Xe", "Cs", "Ba",
      "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb",
      "Lu", "Hf", "Ta", "W",  "Re", "Os", "Ir", "Pt", "Au", "Hg", "Tl", "Pb", "Bi", "Po",
      "At", "Rn", "Fr", "Ra", "Ac", "Th", "Pa", "U"};
  if (symbol == "D" || symbol == "T") return 1;
  for (std::size_t z = 0; z < sizeof kSymbolsByZ / sizeof kSymbolsByZ[0]; ++z) {
    if (symbol == kSymbolsByZ[z]) return static_cast<int>(z) + 1;
  }
  return std::nullopt;
}

}  // namespace sevenfold

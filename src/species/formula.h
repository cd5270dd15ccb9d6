// SPDX-License-Identifier: MIT
// Chemical formulas as written in species files: "CH4", "C2H5OH", "(CH3)2CO", "HCO+", "O2-",
// "He+2". Element counts are summed per element and kept in order of first appearance.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace sevenfold {

// Most atoms of one element a formula may hold: gas-phase species in mechanisms have tens
// (common practice); the bound keeps 3N-6 and the atom total far from integer overflow.
inline constexpr int kMaxAtomsPerElement = 1000;
// Largest |charge| a formula may carry: multiply charged gas-phase ions beyond a few charges are
// outside what an ideal-gas thermo entry is used for (common practice).
inline constexpr int kMaxFormulaCharge = 20;

struct ParsedFormula {
  std::vector<std::pair<std::string, int>> counts;  // element symbol, atoms; first-seen order
  int charge = 0;                                   // in elementary charges
};

// Where and why a formula is malformed: `offset` is the 0-based byte offset of the offending
// character in the text (the text's size when something is missing at the end).
struct FormulaError {
  std::size_t offset = 0;
  std::string found;
  std::string expected;
};

// Parses `text` by the grammar of docs/species-schema.md:
//   formula := part+ charge?      part := element count? | "(" part+ ")" count?
//   element := an upper-case letter, optionally one lower-case letter, that AtomicWeightGPerMol
//              knows (D and T included)
//   count   := digits without a leading zero      charge := "+"+ | "-"+ | ("+"|"-") count
// Returns nullopt and fills *error on the first problem (also: an atom count above
// kMaxAtomsPerElement, a charge above kMaxFormulaCharge).
std::optional<ParsedFormula> ParseFormula(std::string_view text, FormulaError* error);

// The formula text of element counts and a charge, the inverse of ParseFormula for flat formulas:
// counts of 1 are omitted, a charge of +-1 is a bare sign, others sign and digits ("CO2", "NO+",
// "He+2").
std::string FormatFormula(const std::vector<std::pair<std::string, int>>& counts, int charge);

}  // namespace sevenfold

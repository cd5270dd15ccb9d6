// SPDX-License-Identifier: MIT
// Parsing of quantities written with a unit, e.g. "-110.53 kJ/mol" or "1 atm", into SI per mole.
#pragma once

#include <optional>
#include <string>

#include "core/error.h"

namespace sevenfold {

// Molar energy in J/mol from "<number> [unit]". Units: kJ/mol, kcal/mol (thermochemical calorie,
// 4.184 J), J/mol, eV (per molecule, times e N_A), cm^-1 (times h c N_A). A bare number is kJ/mol.
// Throws Error at `where` for an unknown unit, a malformed or non-finite number.
double ParseEnergyJPerMol(const std::string& text, const SourceLocation& where);

// Pressure in Pa from "<number> [unit]". Units: bar, atm (101325 Pa), Pa, kPa. A bare number is
// bar. Throws Error at `where` for an unknown unit, a malformed, non-finite or non-positive number.
double ParsePressurePa(const std::string& text, const SourceLocation& where);

// Non-throwing forms for readers that build their own messages. On failure they return nullopt and
// set *problem to "<what was found>; expected <what>", e.g.
//   "'3 kJ' has unknown unit 'kJ'; expected a number with one of kJ/mol, kcal/mol, ...".
std::optional<double> TryParseEnergyJPerMol(const std::string& text, std::string* problem);
std::optional<double> TryParsePressurePa(const std::string& text, std::string* problem);

// A plain decimal number (C locale, no unit). nullopt when malformed, trailing text or not finite.
std::optional<double> ParsePlainNumber(const std::string& text);
// The same without any tolerance, for command-line values: no surrounding spaces, no sign '+',
// no hexadecimal; the whole text is one finite decimal number (" 1000" and "0x3e8" give nullopt).
std::optional<double> ParseStrictDecimal(const std::string& text);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "core/units.h"

#include <charconv>
#include <cmath>
#include <utility>
#include <vector>

#include "core/constants.h"

namespace sevenfold {
namespace {

struct Unit {
  const char* name;
  double factor;  // to SI
};

// 1 eV per molecule in J/mol: e * N_A (both exact in SI 2019).
constexpr double kElectronVoltToJoulePerMol = constants::kElementaryCharge * constants::kAvogadro;

const std::vector<Unit>& EnergyUnits() {
  static const std::vector<Unit> units = {
      {"kJ/mol", 1.0e3},
      {"kcal/mol", 1.0e3 * constants::kCalorie},
      {"J/mol", 1.0},
      {"eV", kElectronVoltToJoulePerMol},
      {"cm^-1", constants::kWavenumberToJoulePerMol},
  };
  return units;
}

const std::vector<Unit>& PressureUnits() {
  static const std::vector<Unit> units = {
      {"bar", 1.0e5},
      {"atm", constants::kStandardPressureAtm},
      {"Pa", 1.0},
      {"kPa", 1.0e3},
  };
  return units;
}

std::string Trim(const std::string& text) {
  const char* space = " \t\r\n";
  const auto first = text.find_first_not_of(space);
  if (first == std::string::npos) return "";
  const auto last = text.find_last_not_of(space);
  return text.substr(first, last - first + 1);
}

std::string UnitList(const std::vector<Unit>& units) {
  std::string list;
  for (const Unit& unit : units) {
    if (!list.empty()) list += ", ";
    list += unit.name;
  }
  return list;
}

// Splits "<number> <unit>" (space optional) and converts with `units`. A bare number is read in
// `bare_unit`, a documented choice per quantity.
std::optional<double> ParseQuantity(const std::string& text,
                                    const std::vector<Unit>& units,
                                    const char* bare_unit,
                                    const char* quantity,
                                    std::string* problem) {
  const std::string trimmed = Trim(text);
  const std::string expected = std::string("; expected a ") + quantity +
                               " as a number followed by one of " + UnitList(units) +
                               " (a bare number means " + bare_unit + ")";
  const char* begin = trimmed.data();
  const char* end = begin + trimmed.size();
  // std::from_chars rejects a leading '+', which people do write.
  if (begin != end && *begin == '+') ++begin;
  double value = 0.0;
  const auto [number_end, ec] = std::from_chars(begin, end, value);
  if (ec != std::errc() || number_end == begin) {
    *problem = "'" + text + "' does not start with a number" + expected;
    return std::nullopt;
  }
  if (!std::isfinite(value)) {
    *problem = "'" + text + "' is not a finite number" + expected;
    return std::nullopt;
  }
  const std::string unit_text = Trim(std::string(number_end, end));
  const std::string unit_name = unit_text.empty() ? std::string(bare_unit) : unit_text;
  for (const Unit& unit : units) {
    if (unit_name != unit.name) continue;
    // A finite number can still overflow in the conversion (1e308 kJ/mol).
    const double si = value * unit.factor;
    if (!std::isfinite(si)) {
      *problem = "'" + text + "' overflows when converted to SI units" + expected;
      return std::nullopt;
    }
    return si;
  }
  *problem = "'" + text + "' has unknown unit '" + unit_text + "'" + expected;
  return std::nullopt;
}

}  // namespace

std::optional<double> ParsePlainNumber(const std::string& text) {
  const std::string trimmed = Trim(text);
  const char* begin = trimmed.data();
  const char* end = begin + trimmed.size();
  if (begin != end && *begin == '+') ++begin;
  double value = 0.0;
  const auto [number_end, ec] = std::from_chars(begin, end, value);
  if (ec != std::errc() || number_end != end || begin == end || !std::isfinite(value)) {
    return std::nullopt;
  }
  return value;
}

std::optional<double> ParseStrictDecimal(const std::string& text) {
  double value = 0.0;
  const char* begin = text.data();
  const char* end = begin + text.size();
  const auto [stop, error] = std::from_chars(begin, end, value);
  if (text.empty() || error != std::errc() || stop != end || !std::isfinite(value)) {
    return std::nullopt;
  }
  return value;
}

std::optional<double> TryParseEnergyJPerMol(const std::string& text, std::string* problem) {
  return ParseQuantity(text, EnergyUnits(), "kJ/mol", "molar energy", problem);
}

std::optional<double> TryParsePressurePa(const std::string& text, std::string* problem) {
  std::optional<double> pressure_pa =
      ParseQuantity(text, PressureUnits(), "bar", "pressure", problem);
  if (pressure_pa && *pressure_pa <= 0.0) {
    *problem = "'" + text + "' is not positive; expected a pressure above zero";
    return std::nullopt;
  }
  return pressure_pa;
}

double ParseEnergyJPerMol(const std::string& text, const SourceLocation& where) {
  std::string problem;
  const std::optional<double> value = TryParseEnergyJPerMol(text, &problem);
  if (!value) throw Error(where, problem);
  return *value;
}

double ParsePressurePa(const std::string& text, const SourceLocation& where) {
  std::string problem;
  const std::optional<double> value = TryParsePressurePa(text, &problem);
  if (!value) throw Error(where, problem);
  return *value;
}

}  // namespace sevenfold

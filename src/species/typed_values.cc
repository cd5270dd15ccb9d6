// SPDX-License-Identifier: MIT
// FileParser's typed value readers: a checked map, numbers, ranges, texts, molar energies,
// pressures and lists of rotational constants with their units.
#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/constants.h"
#include "core/elements.h"
#include "core/units.h"
#include "species/file_parser.h"
#include "species/formula.h"
#include "species/geometry.h"

namespace sevenfold::detail {

std::optional<Entries> FileParser::ReadEntries(const YAML::Node& map,
                                               const std::string& key,
                                               const std::vector<std::string>& allowed) {
  if (!map.IsMap()) {
    Fail(map, key, Describe(map), "a map with keys " + JoinWords(allowed));
    return std::nullopt;
  }
  Entries entries;
  std::vector<std::string> seen;
  for (auto it = map.begin(); it != map.end(); ++it) {
    const YAML::Node key_node = it->first;
    const std::string prefix = key.empty() ? "" : key + ".";
    if (!key_node.IsScalar()) {
      Fail(key_node, key, Describe(key_node) + " as a key", "one of " + JoinWords(allowed));
      continue;
    }
    const std::string name = key_node.Scalar();
    if (std::find(allowed.begin(), allowed.end(), name) == allowed.end()) {
      Fail(key_node, prefix + name, "unknown key", "one of " + JoinWords(allowed));
      continue;
    }
    if (std::find(seen.begin(), seen.end(), name) != seen.end()) {
      const Entry* first = entries.Find(name);
      Fail(key_node,
           prefix + name,
           "given twice (first at " + Where(first->key_node).ToString() + ")",
           "each key once");
      continue;
    }
    seen.push_back(name);
    entries.Add(Entry{name, key_node, it->second});
  }
  return entries;
}

std::optional<double> FileParser::ReadNumber(const YAML::Node& value,
                                             const std::string& key,
                                             const std::string& expected) {
  if (value.IsScalar()) {
    if (const std::optional<double> number = ParsePlainNumber(value.Scalar())) return number;
  }
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<double> FileParser::ReadPositive(const YAML::Node& value,
                                               const std::string& key,
                                               const std::string& what) {
  const std::optional<double> number = ReadNumber(value, key, "a positive " + what);
  if (!number) return std::nullopt;
  if (*number <= 0.0) {
    Fail(value, key, Number(*number) + " is not positive", "a positive " + what);
    return std::nullopt;
  }
  return number;
}

std::optional<double> FileParser::ReadAtLeast(const YAML::Node& value,
                                              const std::string& key,
                                              double minimum,
                                              const std::string& what) {
  const std::string expected = what + " of at least " + Number(minimum);
  const std::optional<double> number = ReadNumber(value, key, expected);
  if (!number) return std::nullopt;
  if (*number < minimum) {
    Fail(value, key, Number(*number), expected);
    return std::nullopt;
  }
  return number;
}

std::optional<double> FileParser::ReadInRange(const YAML::Node& value,
                                              const std::string& key,
                                              double minimum,
                                              double maximum,
                                              const std::string& what) {
  const std::string expected = what + " within [" + Number(minimum) + ", " + Number(maximum) + "]";
  const std::optional<double> number = ReadNumber(value, key, expected);
  if (!number) return std::nullopt;
  if (*number < minimum || *number > maximum) {
    Fail(value, key, Number(*number), expected);
    return std::nullopt;
  }
  return number;
}

std::optional<int> FileParser::ReadInteger(const YAML::Node& value,
                                           const std::string& key,
                                           const std::string& expected) {
  // Integers beyond this are never meaningful here and would overflow int.
  constexpr double kMaxMagnitude = 1.0e9;
  if (value.IsScalar()) {
    const std::optional<double> number = ParsePlainNumber(value.Scalar());
    if (number && std::floor(*number) == *number && std::fabs(*number) < kMaxMagnitude) {
      return static_cast<int>(*number);
    }
  }
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<std::string> FileParser::ReadString(const YAML::Node& value,
                                                  const std::string& key,
                                                  const std::string& expected) {
  if (value.IsScalar()) return value.Scalar();
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<double> FileParser::ReadEnergy(const YAML::Node& value, const std::string& key) {
  if (!value.IsScalar()) {
    Fail(value,
         key,
         Describe(value),
         "a molar energy such as '-110.53 kJ/mol' (kJ/mol, kcal/mol, J/mol, eV, cm^-1; a bare "
         "number means kJ/mol)");
    return std::nullopt;
  }
  std::string problem;
  const std::optional<double> energy = TryParseEnergyJPerMol(value.Scalar(), &problem);
  if (!energy) FailText(value.Mark(), key, problem);
  return energy;
}


std::optional<double> FileParser::ReadStandardPressure(const YAML::Node& value,
                                                       const std::string& key) {
  const std::string expected = "'1 bar' or '1 atm' (the two standard-state conventions)";
  if (!value.IsScalar()) {
    Fail(value, key, Describe(value), expected);
    return std::nullopt;
  }
  std::string problem;
  const std::optional<double> pressure_pa = TryParsePressurePa(value.Scalar(), &problem);
  if (!pressure_pa) {
    FailText(value.Mark(), key, problem);
    return std::nullopt;
  }
  for (const double standard : {constants::kStandardPressureBar, constants::kStandardPressureAtm}) {
    if (std::fabs(*pressure_pa - standard) <= kPressureRelativeTolerance * standard) {
      return standard;
    }
  }
  Fail(value, key, Describe(value) + " (" + Number(*pressure_pa) + " Pa)", expected);
  return std::nullopt;
}

std::optional<std::vector<double>> FileParser::ReadRotationalList(const YAML::Node& value,
                                                                  const std::string& key,
                                                                  bool moments) {
  // Unit factors to the stored unit: cm^-1 for constants (a frequency nu in Hz is
  // B = nu / (100 c) cm^-1), amu angstrom^2 for moments.
  struct Unit {
    const char* name;
    double factor;
  };
  constexpr double kHzToCm1 = 1.0 / (100.0 * constants::kSpeedOfLight);
  static const Unit kConstantUnits[] = {{"cm^-1", 1.0}, {"GHz", 1.0e9 * kHzToCm1},
                                        {"MHz", 1.0e6 * kHzToCm1}};
  static const Unit kMomentUnits[] = {{"amu*A^2", 1.0},
                                      {"amu A^2", 1.0},
                                      {"amu*angstrom^2", 1.0},
                                      {"kg*m^2", 1.0 / constants::kAmuAngstrom2},
                                      {"kg m^2", 1.0 / constants::kAmuAngstrom2}};
  const std::string what = moments ? "moment of inertia (a number in amu*A^2, or with one of "
                                     "the units amu*A^2, kg*m^2)"
                                   : "rotational constant (a number in cm^-1, or with one of the "
                                     "units cm^-1, GHz, MHz)";
  if (!IsSequence(value, key, "a list of positive values, each a " + what)) return std::nullopt;
  std::vector<double> numbers;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string item_key = key + "[" + std::to_string(i) + "]";
    std::optional<double> number;
    if (item.IsScalar()) {
      const std::string& text = item.Scalar();
      number = ParsePlainNumber(text);
      if (!number) {
        const std::size_t split = text.find_first_of(" akgcGM");
        const std::optional<double> magnitude =
            split == std::string::npos ? std::nullopt : ParsePlainNumber(text.substr(0, split));
        std::string unit = split == std::string::npos ? "" : text.substr(split);
        unit.erase(0, unit.find_first_not_of(' '));
        if (magnitude) {
          const Unit* begin = moments ? std::begin(kMomentUnits) : std::begin(kConstantUnits);
          const Unit* end = moments ? std::end(kMomentUnits) : std::end(kConstantUnits);
          for (const Unit* known = begin; known != end; ++known) {
            if (unit == known->name) number = *magnitude * known->factor;
          }
        }
      }
    }
    if (!number || !std::isfinite(*number)) {
      Fail(item, item_key, Describe(item), "a positive " + what);
      ok = false;
    } else if (*number <= 0.0) {
      Fail(item, item_key, Describe(item) + " is not positive", "a positive " + what);
      ok = false;
    } else {
      numbers.push_back(*number);
    }
  }
  if (!ok) return std::nullopt;
  return numbers;
}

}  // namespace sevenfold::detail

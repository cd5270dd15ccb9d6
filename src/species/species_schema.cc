// SPDX-License-Identifier: MIT
#include "species/species_schema.h"

#include <fmt/format.h>

#include "core/fit_settings.h"
#include "species/formula.h"
#include "species/species.h"

namespace sevenfold {
namespace {

using namespace schema;

std::string Band(double low, double high, const std::string& unit) {
  return fmt::format("{} to {}{}", low, high, unit.empty() ? "" : " " + unit);
}
std::string AtMost(double high, const std::string& unit) {
  return fmt::format("magnitude at most {}{}", high, unit.empty() ? "" : " " + unit);
}
std::string Triple(double cp, double enthalpy, double entropy) {
  return fmt::format("cp {}, enthalpy {}, entropy {}", cp, enthalpy, entropy);
}

std::vector<KeySpec> BuildTable() {
  const TemperatureRanges ranges;
  const QualityThresholds thresholds;
  const ErrorScales scales;
  const std::string temperatures = fmt::format("low {}, mid auto, high {}", ranges.low_k, ranges.high_k);
  const std::string temperature_band = Band(kMinTemperatureK, kMaxTemperatureK, "K");
  const std::string guard_rule = "off, or 1 < FACTOR <= 4 and 0 < BAND <= 1";
  const std::string rotational_band = Band(kMinRotationalConstantCm1, kMaxRotationalConstantCm1, "cm^-1");
  const std::string enthalpy_band = AtMost(kMaxFormationEnthalpyJPerMol * 1.0e-3, "kJ/mol");
  const std::string spectroscopic_band = AtMost(kMaxSpectroscopicConstantCm1, "cm^-1");
  const std::string weight_band = fmt::format(">= 0, at most {}", kMaxDegeneracy);
  using S = KeySection;
  std::vector<KeySpec> table = {
      {S::kTop, std::string(kFormatKey), "layout version", "", std::to_string(kFormatVersion), "",
       "yes, the first key", ""},
      {S::kTop, "defaults", "map", "", "", "", "no", ""},
      {S::kTop, "species", "map: label to species", "", "", "", "yes", ""},

      {S::kDefaults, "fit-temperatures", "map", "K", temperature_band, "", "no", temperatures},
      {S::kDefaults, "standard-pressure", "pressure", "bar; atm, Pa, kPa", "1 bar or 1 atm", "",
       "no", "1 bar"},
      {S::kDefaults, "fit-thresholds", "map", "", "> 0", "", "no",
       Triple(thresholds.max_cp_relative, thresholds.max_h_over_rt, thresholds.max_s_over_r)},
      {S::kDefaults, "fit-objective", "minimax or least-squares", "", "", "", "no",
       ToString(FitObjective::kMinimax)},
      {S::kDefaults, "fit-extrapolation-guard", "off or FACTOR:BAND", "", guard_rule, "", "no",
       ToString(ExtrapolationGuard{})},
      {S::kDefaults, "fit-error-scales", "map", "", "> 0", "", "no",
       Triple(scales.cp_relative, scales.h_over_rt, scales.s_over_r)},

      {S::kSpecies, "formula", "chemical formula", "", 
       fmt::format("at most {} atoms per element, charge magnitude at most {}", kMaxAtomsPerElement,
                   kMaxFormulaCharge),
       "all", "yes", ""},
      {S::kSpecies, "formation-enthalpy", "molar energy", "kJ/mol; kcal/mol, J/mol, eV, cm^-1",
       enthalpy_band, "all", "this or formation-enthalpy-0k", ""},
      {S::kSpecies, "formation-enthalpy-0k", "molar energy", "kJ/mol; kcal/mol, J/mol, eV, cm^-1",
       enthalpy_band, "all", "this or formation-enthalpy", ""},
      {S::kSpecies, "shape", "atom, linear or nonlinear", "", "", "all", "yes", ""},
      {S::kSpecies, "symmetry-number", "number", "", ">= 1; linear: 1 or 2; atom: 1",
       "all", "linear, nonlinear", "atom: 1"},
      {S::kSpecies, "rotational-constants", "list", "cm^-1; GHz, MHz", rotational_band,
       "linear, nonlinear", "one of rotational-constants, moments-of-inertia, structure", ""},
      {S::kSpecies, "moments-of-inertia", "list", "amu*A^2; kg*m^2", "as rotational-constants",
       "linear, nonlinear", "one of rotational-constants, moments-of-inertia, structure", ""},
      {S::kSpecies, "structure", "list of [symbol, x, y, z]", "angstrom",
       AtMost(kMaxCoordinateAngstrom, "angstrom"), "linear, nonlinear",
       "one of rotational-constants, moments-of-inertia, structure", ""},
      {S::kSpecies, "vibrations", "list", "cm^-1", Band(kMinWavenumberCm1, kMaxWavenumberCm1, "cm^-1"),
       "linear, nonlinear", "yes, unless rovibrational-constants", ""},
      {S::kSpecies, "frequency-scale", "number", "", Band(kMinFrequencyScale, kMaxFrequencyScale, ""),
       "linear, nonlinear", "no", "1"},
      {S::kSpecies, "electronic-levels", "list of [energy, degeneracy]", "cm^-1",
       fmt::format("degeneracy > 0, at most {}", kMaxDegeneracy), "all",
       "odd electron count: this or spin-multiplicity", "[[0, 1]]"},
      {S::kSpecies, "spin-multiplicity", "whole number 2S+1", "",
       fmt::format("1 to {}", kMaxDegeneracy), "all",
       "odd electron count: this or electronic-levels", ""},
      {S::kSpecies, "optical-isomers", "number", "", ">= 1", "all", "no", "1"},
      {S::kSpecies, "centrifugal-distortion", "number", "cm^-1", ">= 0", "linear", "no", "0"},
      {S::kSpecies, "fit-temperatures", "map", "K", temperature_band, "all", "no", "defaults"},
      {S::kSpecies, "standard-pressure", "pressure", "bar; atm, Pa, kPa", "1 bar or 1 atm", "all",
       "no", "defaults"},
      {S::kSpecies, "fit-thresholds", "map", "", "> 0", "all", "no", "defaults"},
      {S::kSpecies, "fit-objective", "minimax or least-squares", "", "", "all", "no", "defaults"},
      {S::kSpecies, "fit-extrapolation-guard", "off or FACTOR:BAND", "", guard_rule, "all", "no",
       "defaults"},
      {S::kSpecies, "fit-error-scales", "map", "", "> 0", "all", "no", "defaults"},
      {S::kSpecies, "rovibrational-constants", "map, or list of maps", "cm^-1", spectroscopic_band,
       "diatomic", "no", ""},
      {S::kSpecies, "spin-statistics", "map", "", weight_band, "homonuclear diatomic", "no", ""},
      {S::kSpecies, "hindered-rotors", "list of maps", "", "", "nonlinear", "no", ""},
      {S::kSpecies, "tabulated-cp", "map", "", "", "all", "no (replaces the molecular data)", ""},

      {S::kFitTemperatures, "low", "number", "K", temperature_band, "", "no",
       fmt::format("{}", ranges.low_k)},
      {S::kFitTemperatures, "mid", "number or auto", "K", temperature_band, "", "no", "auto"},
      {S::kFitTemperatures, "high", "number", "K", temperature_band, "", "no",
       fmt::format("{}", ranges.high_k)},

      {S::kFitThresholds, "cp", "number", "", "> 0", "", "no",
       fmt::format("{}", thresholds.max_cp_relative)},
      {S::kFitThresholds, "enthalpy", "number", "", "> 0", "", "no",
       fmt::format("{}", thresholds.max_h_over_rt)},
      {S::kFitThresholds, "entropy", "number", "", "> 0", "", "no",
       fmt::format("{}", thresholds.max_s_over_r)},

      {S::kFitErrorScales, "cp", "number", "", "> 0", "", "no", fmt::format("{}", scales.cp_relative)},
      {S::kFitErrorScales, "enthalpy", "number", "", "> 0", "", "no",
       fmt::format("{}", scales.h_over_rt)},
      {S::kFitErrorScales, "entropy", "number", "", "> 0", "", "no",
       fmt::format("{}", scales.s_over_r)},
  };
  // The Dunham-type constants of a state: map form, then the list form's two extra keys.
  const KeySpec dunham[] = {
      {S::kRovibrationalMap, "we", "number", "cm^-1", "> 0", "", "yes", ""},
      {S::kRovibrationalMap, "wexe", "number", "cm^-1", spectroscopic_band, "", "no", "0"},
      {S::kRovibrationalMap, "weye", "number", "cm^-1", spectroscopic_band, "", "no", "0"},
      {S::kRovibrationalMap, "Be", "number", "cm^-1", "> 0", "", "yes", ""},
      {S::kRovibrationalMap, "alphae", "number", "cm^-1", spectroscopic_band, "", "no", "0"},
      {S::kRovibrationalMap, "gammae", "number", "cm^-1", spectroscopic_band, "", "no", "0"},
      {S::kRovibrationalMap, "De", "number", "cm^-1",
       fmt::format(">= 0, below {} Be", kMaxCentrifugalToRotational), "", "no", "0"},
      {S::kRovibrationalMap, "dissociation-energy", "number", "cm^-1", "> 0", "", "yes", ""},
  };
  for (const KeySpec& spec : dunham) table.push_back(spec);
  table.push_back({S::kRovibrationalState, "energy", "number", "cm^-1", ">= 0, first state 0", "",
                   "no", "0"});
  table.push_back({S::kRovibrationalState, "degeneracy", "number", "",
                   fmt::format("> 0, at most {}", kMaxDegeneracy), "", "no", "1"});
  for (KeySpec spec : dunham) {
    spec.section = S::kRovibrationalState;
    table.push_back(spec);
  }
  const KeySpec rest[] = {
      {S::kSpinStatistics, "even-j", "number", "", weight_band, "", "yes", ""},
      {S::kSpinStatistics, "odd-j", "number", "", weight_band + "; not both 0", "", "yes", ""},
      {S::kSpinStatistics, "mixture", "equilibrium or normal", "", "", "", "no",
       ToString(SpinMixture::kEquilibrium)},
      {S::kHinderedRotor, "replaces", "number", "cm^-1",
       fmt::format("within {} cm^-1 of a vibration not replaced by another rotor",
                   kTorsionMatchToleranceCm1),
       "", "yes", ""},
      {S::kHinderedRotor, "reduced-moment", "number", "amu*A^2", "> 0", "",
       "this or rotational-constant", ""},
      {S::kHinderedRotor, "rotational-constant", "number", "cm^-1", rotational_band, "",
       "this or reduced-moment", ""},
      {S::kHinderedRotor, "symmetry-number", "whole number", "", ">= 1", "", "no", "1"},
      {S::kHinderedRotor, "barrier-height", "molar energy", "kJ/mol; kcal/mol, J/mol, eV, cm^-1",
       fmt::format(">= 0, at most {} kJ/mol", kMaxTorsionBarrierJPerMol * 1.0e-3), "",
       "this or cosine-terms", ""},
      {S::kHinderedRotor, "cosine-terms", "list of [k, V_k]", "kJ/mol; kcal/mol, J/mol, eV, cm^-1",
       AtMost(kMaxTorsionBarrierJPerMol * 1.0e-3, "kJ/mol"), "", "this or barrier-height", ""},
  };
  for (const KeySpec& spec : rest) table.push_back(spec);
  const std::string cp_band = fmt::format("Cp >= 0, at most {} J/(mol K)", kMaxTabulatedCpJPerMolK);
  const KeySpec tabulated[] = {
      {S::kTabulatedCp, "points", "list of [T, Cp] or [T, Cp, H-H298, S]",
       "K, J/(mol K), kJ/mol, J/(mol K)",
       fmt::format("T increasing, {} to {} rows; {}", kMinTabulatedPoints, kMaxTabulatedPoints,
                   cp_band),
       "", "yes", ""},
      {S::kTabulatedCp, "reference-entropy", "[T, S]", "K, J/(mol K)",
       fmt::format("S > 0, at most {} J/(mol K)", kMaxTabulatedEntropyJPerMolK), "",
       "with rows of two columns", ""},
      {S::kTabulatedCp, "cp-zero", "number", "J/(mol K)", ">= 0 (0 for a solid), below cp-infinity", "", "no",
       "2.5 R atom, 3.5 R linear, 4 R nonlinear"},
      {S::kTabulatedCp, "cp-infinity", "number", "J/(mol K)", "> cp-zero", "", "no",
       "2.5 R atom, (3N - 1.5) R linear, (3N - 2) R nonlinear"},
  };
  for (const KeySpec& spec : tabulated) table.push_back(spec);
  return table;
}

}  // namespace

std::string ToString(KeySection section) {
  switch (section) {
    case KeySection::kTop:
      return "top level";
    case KeySection::kDefaults:
      return "defaults";
    case KeySection::kSpecies:
      return "species";
    case KeySection::kFitTemperatures:
      return "fit-temperatures";
    case KeySection::kFitThresholds:
      return "fit-thresholds";
    case KeySection::kFitErrorScales:
      return "fit-error-scales";
    case KeySection::kRovibrationalMap:
      return "rovibrational-constants";
    case KeySection::kRovibrationalState:
      return "rovibrational-constants[i]";
    case KeySection::kSpinStatistics:
      return "spin-statistics";
    case KeySection::kHinderedRotor:
      return "hindered-rotors[i]";
    case KeySection::kTabulatedCp:
      return "tabulated-cp";
  }
  return "";
}

const std::vector<KeySpec>& KeyTable() {
  static const std::vector<KeySpec> table = BuildTable();
  return table;
}

const std::vector<std::string>& KeysOf(KeySection section) {
  static const std::vector<std::vector<std::string>> by_section = [] {
    std::vector<std::vector<std::string>> keys(static_cast<std::size_t>(KeySection::kTabulatedCp) + 1);
    for (const KeySpec& spec : KeyTable()) {
      keys[static_cast<std::size_t>(spec.section)].push_back(spec.key);
    }
    return keys;
  }();
  return by_section[static_cast<std::size_t>(section)];
}

}  // namespace sevenfold

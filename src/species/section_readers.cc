// SPDX-License-Identifier: MIT
// FileParser's section readers: defaults and fit settings, formula, rotation, vibrations,
// electronic levels and spin, rovibrational constants, spin statistics, hindered rotors, and the
// Kramers check. Each records its problems with file:line:column and fills the draft.
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

bool FileParser::ReadTemperatures(const YAML::Node& value,
                                  const std::string& key,
                                  TemperatureRanges* ranges) {
  const std::size_t before = problems_->size();
  const std::optional<Entries> entries = ReadEntries(value, key, kTemperatureKeys);
  if (!entries) return false;
  const std::string range_text = "a temperature in kelvin within [" + Number(kMinTemperatureK) +
                                 ", " + Number(kMaxTemperatureK) + "]";
  auto read_kelvin = [&](const Entry& entry) -> std::optional<double> {
    const std::string sub_key = key + "." + entry.key;
    const std::optional<double> t_k = ReadNumber(
        entry.value, sub_key, entry.key == "mid" ? range_text + " or 'auto'" : range_text);
    if (!t_k) return std::nullopt;
    if (*t_k < kMinTemperatureK || *t_k > kMaxTemperatureK) {
      Fail(entry.value, sub_key, Number(*t_k) + " K", range_text);
      return std::nullopt;
    }
    return t_k;
  };
  if (const Entry* low = entries->Find("low")) {
    if (const auto t_k = read_kelvin(*low)) ranges->low_k = *t_k;
  }
  if (const Entry* high = entries->Find("high")) {
    if (const auto t_k = read_kelvin(*high)) ranges->high_k = *t_k;
  }
  if (const Entry* mid = entries->Find("mid")) {
    if (mid->value.IsScalar() && mid->value.Scalar() == "auto") {
      ranges->mid_k.reset();
    } else if (const auto t_k = read_kelvin(*mid)) {
      ranges->mid_k = *t_k;
    }
  }
  if (problems_->size() != before) return false;
  if (ranges->low_k >= ranges->high_k) {
    Fail(value,
         key,
         "low " + Number(ranges->low_k) + " K is not below high " + Number(ranges->high_k) + " K",
         "low < high");
    return false;
  }
  if (ranges->mid_k && (*ranges->mid_k <= ranges->low_k || *ranges->mid_k >= ranges->high_k)) {
    Fail(value,
         key,
         "mid " + Number(*ranges->mid_k) + " K is outside (" + Number(ranges->low_k) + ", " +
             Number(ranges->high_k) + ") K",
         "low < mid < high, or mid: auto");
    return false;
  }
  return true;
}

bool FileParser::ReadThresholds(const YAML::Node& value,
                                const std::string& key,
                                QualityThresholds* thresholds) {
  const std::optional<Entries> entries = ReadEntries(value, key, kThresholdKeys);
  if (!entries) return false;
  bool ok = true;
  const std::pair<const char*, double*> fields[] = {{"cp", &thresholds->max_cp_relative},
                                                    {"enthalpy", &thresholds->max_h_over_rt},
                                                    {"entropy", &thresholds->max_s_over_r}};
  for (const auto& [name, field] : fields) {
    if (const Entry* entry = entries->Find(name)) {
      const auto threshold = ReadPositive(entry->value, key + "." + name, "dimensionless number");
      if (threshold) {
        *field = *threshold;
      } else {
        ok = false;
      }
    }
  }
  return ok;
}

std::optional<Defaults> FileParser::ReadDefaults(const YAML::Node& node) {
  context_ = "defaults";
  Defaults defaults;
  const std::optional<Entries> entries = ReadEntries(node, "", kDefaultsKeys);
  if (entries) {
    if (const Entry* entry = entries->Find("fit-temperatures")) {
      ReadTemperatures(entry->value, "fit-temperatures", &defaults.temperatures);
      if (entry->value.IsMap() && entry->value["mid"]) defaults.fit_request.mid_given = true;
    }
    if (const Entry* entry = entries->Find("standard-pressure")) {
      if (const auto pressure_pa = ReadStandardPressure(entry->value, "standard-pressure")) {
        defaults.pressure_pa = *pressure_pa;
      }
    }
    if (const Entry* entry = entries->Find("fit-thresholds")) {
      ReadThresholds(entry->value, "fit-thresholds", &defaults.thresholds);
    }
    ReadFitRequest(*entries, &defaults.fit_request);
  }
  context_.clear();
  return defaults;
}

bool FileParser::ReadFormula(const YAML::Node& value, Species* species) {
  const std::string expected = "a chemical formula such as CH4, C2H5OH, (CH3)2CO or HCO+";
  if (!value.IsScalar()) {
    Fail(value, "formula", Describe(value), expected);
    return false;
  }
  FormulaError error;
  const std::optional<ParsedFormula> formula = ParseFormula(value.Scalar(), &error);
  if (!formula) {
    // Point at the offending character: the value's column, past an opening quote.
    YAML::Mark mark = value.Mark();
    const bool quoted = value.Tag() == "!";
    if (!mark.is_null()) mark.column += static_cast<int>(error.offset) + (quoted ? 1 : 0);
    FailText(mark,
             "formula",
             "'" + value.Scalar() + "': " + error.found + " at character " +
                 std::to_string(error.offset + 1) + "; expected " + error.expected);
    return false;
  }
  species->composition = formula->counts;
  species->charge = formula->charge;
  return true;
}

std::optional<std::vector<GeometryAtom>> FileParser::ReadGeometry(const YAML::Node& value) {
  const std::string expected_atom = "[symbol, x, y, z] with coordinates in angstrom";
  if (!IsSequence(value, "structure", "a list of atoms, each " + expected_atom)) {
    return std::nullopt;
  }
  if (value.size() == 0) {
    Fail(value, "structure", "an empty list", "a list of atoms, each " + expected_atom);
    return std::nullopt;
  }
  std::vector<GeometryAtom> atoms;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string key = "structure[" + std::to_string(i) + "]";
    if (!item.IsSequence() || item.size() != 4) {
      Fail(item, key, Describe(item), expected_atom);
      ok = false;
      continue;
    }
    GeometryAtom atom;
    const YAML::Node symbol = item[0];
    if (!symbol.IsScalar() || !AtomicWeightGPerMol(symbol.Scalar())) {
      Fail(symbol,
           key,
           "unknown element " + Describe(symbol),
           "one of " + JoinWords(KnownElementSymbols()));
      ok = false;
    } else {
      atom.element = symbol.Scalar();
    }
    double* coordinates[] = {&atom.x_angstrom, &atom.y_angstrom, &atom.z_angstrom};
    for (int k = 0; k < 3; ++k) {
      const auto coordinate = ReadInRange(item[k + 1],
                                          key,
                                          -kMaxCoordinateAngstrom,
                                          kMaxCoordinateAngstrom,
                                          "a coordinate in angstrom");
      if (coordinate) {
        *coordinates[k] = *coordinate;
      } else {
        ok = false;
      }
    }
    atoms.push_back(atom);
  }
  if (!ok) return std::nullopt;
  return atoms;
}

void FileParser::ReadRotation(SpeciesDraft* draft) {
  const YAML::Node& block = draft->label;
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  const bool has_diatomic = draft->has_rovibrational;
  Species* species = &draft->species;
  const Entry* constants_entry = entries.Find("rotational-constants");
  const Entry* moments_entry = entries.Find("moments-of-inertia");
  const Entry* geometry_entry = entries.Find("structure");
  if (!shape_ok) return;  // counts and consistency depend on the shape

  if (species->shape == Shape::kAtom) {
    for (const Entry* entry : {constants_entry, moments_entry, geometry_entry}) {
      if (entry) {
        Fail(entry->key_node,
             entry->key,
             "given for an atom",
             "no rotational data for shape 'atom'");
      }
    }
    return;
  }
  const bool linear = species->shape == Shape::kLinear;
  const std::size_t num_expected = linear ? 1 : 3;
  const std::string count_rule =
      linear ? "1 value (B) for a linear species" : "3 values (A, B, C) for a nonlinear species";
  if (!constants_entry && !moments_entry && !geometry_entry) {
    if (has_diatomic) return;  // B comes from the diatomic constants
    Fail(block,
         "rotational-constants",
         "missing (none of rotational-constants, moments-of-inertia, structure given)",
         "one of them for a " + ToString(species->shape) + " species");
    return;
  }
  if (constants_entry && moments_entry) {
    Fail(moments_entry->key_node,
         "moments-of-inertia",
         "given together with rotational-constants",
         "only one of the two");
    return;
  }

  // Explicit constants (or moments) win over the geometry, which is then only a cross-check.
  std::optional<std::vector<double>> explicit_cm1;
  const Entry* explicit_entry = constants_entry ? constants_entry : moments_entry;
  if (explicit_entry) {
    const bool moments = explicit_entry == moments_entry;
    const auto values = ReadRotationalList(explicit_entry->value, explicit_entry->key, moments);
    if (values && values->size() != num_expected) {
      Fail(explicit_entry->value, explicit_entry->key, NumberList(*values), count_rule);
    } else if (values) {
      explicit_cm1 = *values;
      if (moments) {
        for (double& value : *explicit_cm1) {
          value = constants::kRotationalConstantTimesInertia / value;
        }
      }
      std::sort(explicit_cm1->begin(), explicit_cm1->end(), std::greater<double>());
    }
  }

  std::optional<std::vector<double>> geometry_cm1;
  if (geometry_entry) {
    const std::optional<std::vector<GeometryAtom>> atoms = ReadGeometry(geometry_entry->value);
    if (atoms) {
      species->geometry = *atoms;
      std::map<std::string, int> geometry_counts;
      for (const GeometryAtom& atom : *atoms) ++geometry_counts[atom.element];
      std::map<std::string, int> composition_counts(species->composition.begin(),
                                                    species->composition.end());
      if (composition_ok && geometry_counts != composition_counts) {
        Fail(geometry_entry->value,
             "structure",
             "atoms " + CompositionText(geometry_counts),
             "the atoms of the formula " + FormatFormula(species->composition, 0));
      } else if (composition_ok) {
        const RigidRotor rotor = AnalyzeGeometry(*atoms);
        if (rotor.shape == Shape::kAtom) {
          Fail(geometry_entry->value,
               "structure",
               "all atoms at one point",
               "distinct atomic positions");
        } else if (rotor.shape != species->shape) {
          Fail(geometry_entry->value,
               "structure",
               rotor.shape == Shape::kLinear ? "collinear atoms (a linear geometry)"
                                             : "atoms not on one line (a nonlinear geometry)",
               "a structure matching shape '" + ToString(species->shape) + "'");
        } else {
          geometry_cm1 = rotor.rotational_constants_cm1;
        }
      }
    }
  }

  // Both sources end in rotational constants; check those against the plausibility band.
  const std::string band = "rotational constants within [" + Number(kMinRotationalConstantCm1) +
                           ", " + Number(kMaxRotationalConstantCm1) + "] cm^-1";
  const auto outside_band = [](const std::vector<double>& values_cm1) {
    return std::any_of(values_cm1.begin(), values_cm1.end(), [](double b) {
      return !(b >= kMinRotationalConstantCm1 && b <= kMaxRotationalConstantCm1);
    });
  };
  if (explicit_cm1 && outside_band(*explicit_cm1)) {
    Fail(explicit_entry->value,
         explicit_entry->key,
         "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") + " cm^-1",
         band);
    explicit_cm1.reset();
  }
  // A rigid body has I_C <= I_A + I_B, i.e. 1/C <= 1/A + 1/B (equality when planar). Ground-state
  // constants exceed it by the inertia defect, a few percent for light planar molecules (H2O:
  // 2.8 % with A, B, C = 27.88, 14.51, 9.28 cm^-1, from memory of NIST CCCBDB); the 25 % margin
  // only stops constants no molecule can have, on which the engine's sums give nonsense (a
  // negative Cp; docs/robustness.md).
  constexpr double kInertiaDefectMargin = 0.25;
  if (explicit_cm1 && explicit_cm1->size() == 3) {
    const double a = (*explicit_cm1)[0], b = (*explicit_cm1)[1], c = (*explicit_cm1)[2];
    if (1.0 / c > (1.0 / a + 1.0 / b) * (1.0 + kInertiaDefectMargin)) {
      Fail(explicit_entry->value,
           explicit_entry->key,
           "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") +
               " cm^-1 with 1/C above 1/A + 1/B by " +
               fmt::format("{:.3g}", 100.0 * (c * (1.0 / a + 1.0 / b) < 1.0
                                                  ? 1.0 / (c * (1.0 / a + 1.0 / b)) - 1.0
                                                  : 0.0)) +
               " %",
           "constants of a rigid body: 1/C <= 1/A + 1/B (within " +
               Number(100.0 * kInertiaDefectMargin) + " % for the inertia defect)");
      explicit_cm1.reset();
    }
  }
  if (geometry_cm1 && outside_band(*geometry_cm1)) {
    Fail(geometry_entry->value,
         "structure",
         "rotational constants " + NumberList(*geometry_cm1, "{:.6g}") + " cm^-1",
         band);
    geometry_cm1.reset();
  }
  if (explicit_cm1 && geometry_cm1) {
    double worst = 0.0;
    for (std::size_t k = 0; k < explicit_cm1->size(); ++k) {
      worst =
          std::max(worst, std::fabs((*explicit_cm1)[k] - (*geometry_cm1)[k]) / (*geometry_cm1)[k]);
    }
    if (worst > kGeometryConstantsRelativeTolerance) {
      Fail(explicit_entry->value,
           explicit_entry->key,
           "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") +
               " cm^-1 differ from the structure's " + NumberList(*geometry_cm1, "{:.6g}") +
               " cm^-1 by up to " + fmt::format("{:.3g}", 100.0 * worst) + " %",
           "agreement within " + Number(100.0 * kGeometryConstantsRelativeTolerance) + " %");
    }
  }
  if (explicit_cm1) {
    species->rotational_constants_cm1 = *explicit_cm1;
  } else if (geometry_cm1) {
    species->rotational_constants_cm1 = *geometry_cm1;
  }
}

void FileParser::ReadVibrations(SpeciesDraft* draft) {
  const YAML::Node& block = draft->label;
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  const bool has_diatomic = draft->has_rovibrational;
  Species* species = &draft->species;
  const Entry* entry = entries.Find("vibrations");
  const int num_atoms = species->NumAtoms();
  if (!entry) {
    if (shape_ok && composition_ok && species->shape != Shape::kAtom && !has_diatomic) {
      Fail(block,
           "vibrations",
           "missing",
           "a list of " + ShapeCountRule(species->shape, num_atoms) +
               " harmonic wavenumbers in cm^-1");
    }
    return;
  }
  const std::string expected = "a positive wavenumber in cm^-1";
  if (!IsSequence(entry->value, "vibrations", "a list of harmonic wavenumbers in cm^-1")) return;
  bool ok = true;
  std::vector<double> wavenumbers;
  for (std::size_t i = 0; i < entry->value.size(); ++i) {
    const YAML::Node item = entry->value[i];
    const std::string key = "vibrations[" + std::to_string(i) + "]";
    const std::optional<double> wavenumber = ReadNumber(item, key, expected);
    if (!wavenumber) {
      ok = false;
    } else if (*wavenumber < 0.0) {
      Fail(item,
           key,
           Number(*wavenumber) +
               " cm^-1 is negative, an imaginary mode (a saddle point such as a transition "
               "state, not a minimum)",
           expected);
      ok = false;
    } else if (*wavenumber == 0.0) {
      Fail(item, key, "0 cm^-1", expected + " (translations and rotations are not listed)");
      ok = false;
    } else if (*wavenumber < kMinWavenumberCm1 || *wavenumber > kMaxWavenumberCm1) {
      Fail(item,
           key,
           Number(*wavenumber) + " cm^-1",
           "a wavenumber within [" + Number(kMinWavenumberCm1) + ", " +
               Number(kMaxWavenumberCm1) + "] cm^-1");
      ok = false;
    } else {
      wavenumbers.push_back(*wavenumber);
    }
  }
  if (shape_ok && composition_ok) {
    const int num_expected = species->shape == Shape::kAtom     ? 0
                             : species->shape == Shape::kLinear ? 3 * num_atoms - 5
                                                                : 3 * num_atoms - 6;
    if (num_expected >= 0 && static_cast<int>(entry->value.size()) != num_expected) {
      Fail(entry->value,
           "vibrations",
           Plural(entry->value.size(), "wavenumber"),
           ShapeCountRule(species->shape, num_atoms));
      ok = false;
    }
  }
  if (ok) species->vibrations_cm1 = wavenumbers;
}

void FileParser::ReadElectronicLevels(const YAML::Node& value, Species* species) {
  const std::string expected_level = "[energy in cm^-1, degeneracy]";
  if (!IsSequence(value, "electronic-levels", "a list of levels, each " + expected_level)) return;
  if (value.size() == 0) {
    Fail(value, "electronic-levels", "an empty list", "at least the ground level [0, g]");
    return;
  }
  std::vector<ElectronicLevel> levels;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string key = "electronic-levels[" + std::to_string(i) + "]";
    if (!item.IsSequence() || item.size() != 2) {
      Fail(item, key, Describe(item), expected_level);
      ok = false;
      continue;
    }
    ElectronicLevel level;
    const auto energy = ReadNumber(item[0], key, "an energy in cm^-1");
    const auto degeneracy = ReadNumber(item[1], key, "a positive degeneracy");
    if (!energy || !degeneracy) {
      ok = false;
      continue;
    }
    if (i == 0 && *energy != 0.0) {
      Fail(item[0],
           key,
           "ground level at " + Number(*energy) + " cm^-1",
           "the first level at 0 cm^-1 (energies are measured from the ground level)");
      ok = false;
    } else if (*energy < 0.0) {
      Fail(item[0],
           key,
           Number(*energy) + " cm^-1, below the ground level",
           "an energy of at least 0 cm^-1");
      ok = false;
    }
    if (*degeneracy < 0.0) {
      Fail(item[1], key, "negative degeneracy " + Number(*degeneracy), "a positive degeneracy");
      ok = false;
    } else if (*degeneracy == 0.0) {
      Fail(item[1], key, "degeneracy 0", "a positive degeneracy");
      ok = false;
    } else if (*degeneracy > kMaxDegeneracy) {
      Fail(item[1],
           key,
           "degeneracy " + Number(*degeneracy),
           "a degeneracy of at most " + Number(kMaxDegeneracy));
      ok = false;
    }
    level.energy_cm1 = *energy;
    level.degeneracy = *degeneracy;
    levels.push_back(level);
  }
  if (ok) species->electronic_levels = levels;
}

std::optional<DiatomicState> FileParser::ReadDiatomicState(const YAML::Node& value,
                                                           const std::string& key,
                                                           bool list_form) {
  const std::size_t before = problems_->size();
  const auto entries = ReadEntries(value, key, list_form ? kDiatomicStateKeys : kDiatomicKeys);
  if (!entries) return std::nullopt;
  DiatomicState state;
  DiatomicConstants& c = state.constants;
  struct Field {
    const char* name;
    double* target;
    bool required;
    int sign;  // 1: must be > 0; 0: >= 0; -1: any finite value
  };
  const Field fields[] = {
      {"we", &c.we_cm1, true, 1},
      {"wexe", &c.wexe_cm1, false, -1},
      {"weye", &c.weye_cm1, false, -1},
      {"Be", &c.be_cm1, true, 1},
      {"alphae", &c.alphae_cm1, false, -1},
      {"gammae", &c.gammae_cm1, false, -1},
      {"De", &c.de_cm1, false, 0},
      {"dissociation-energy", &c.dissociation_cm1, true, 1},
      {"energy", &state.energy_cm1, false, 0},
      {"degeneracy", &state.degeneracy, false, 1},
  };
  for (const Field& field : fields) {
    const std::string sub_key = key + "." + field.name;
    const Entry* entry = entries->Find(field.name);
    if (!entry) {
      if (field.required) {
        Fail(value, sub_key, "missing", field.sign > 0 ? "a positive value in cm^-1" : "a value");
      }
      continue;
    }
    const std::string unit =
        std::string(field.name) == "degeneracy" ? "degeneracy" : "value in cm^-1";
    std::optional<double> number;
    if (field.sign > 0) {
      number = ReadPositive(entry->value, sub_key, unit);
    } else if (field.sign == 0) {
      number = ReadAtLeast(entry->value, sub_key, 0.0, "a " + unit);
    } else {
      number = ReadNumber(entry->value, sub_key, "a " + unit);
    }
    const double bound =
        std::string(field.name) == "degeneracy" ? kMaxDegeneracy : kMaxSpectroscopicConstantCm1;
    if (number && std::fabs(*number) > bound) {
      Fail(entry->value,
           sub_key,
           Number(*number),
           "a " + unit + " of magnitude at most " + Number(bound));
    } else if (number) {
      *field.target = *number;
    }
  }
  // A centrifugal constant comparable to Be leaves no bound rotational ladder worth the name
  // (real molecules have De/Be ~ 4 Be^2/we^2 < 1e-3; H2, the extreme, 8e-4): the engine would
  // silently treat the species as structureless.
  if (problems_->size() == before && c.de_cm1 > kMaxCentrifugalToRotational * c.be_cm1) {
    if (const Entry* de = entries->Find("De")) {
      Fail(de->value, key + ".De", Number(c.de_cm1),
           "a value below " + Number(kMaxCentrifugalToRotational) + " Be = " +
               Number(kMaxCentrifugalToRotational * c.be_cm1) + " cm^-1");
    }
  }
  if (problems_->size() != before) return std::nullopt;
  return state;
}

void FileParser::ReadDiatomic(const Entry& entry, SpeciesDraft* draft) {
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  Species* species = &draft->species;
  if (composition_ok && shape_ok &&
      (species->shape != Shape::kLinear || species->NumAtoms() != 2)) {
    Fail(entry.key_node,
         "rovibrational-constants",
         "given for " + ShapePhrase(species->shape) +
             (species->shape == Shape::kAtom ? "" : " of " + Plural(species->NumAtoms(), "atom")),
         "a diatomic (shape linear, 2 atoms)");
    return;
  }
  if (entry.value.IsMap()) {
    std::optional<DiatomicState> state =
        ReadDiatomicState(entry.value, "rovibrational-constants", /*list_form=*/false);
    if (!state) return;
    // Map form: the ground electronic state; its degeneracy is that of the ground level.
    state->degeneracy = species->electronic_levels.front().degeneracy;
    species->diatomic_states = {*state};
    return;
  }
  if (!IsSequence(entry.value,
                  "rovibrational-constants",
                  "a map of constants, or a list of maps, one per electronic state")) {
    return;
  }
  if (entry.value.size() == 0) {
    Fail(entry.value, "rovibrational-constants", "an empty list", "at least the ground state");
    return;
  }
  if (const Entry* levels = entries.Find("electronic-levels")) {
    Fail(levels->key_node,
         "electronic-levels",
         "given together with the list form of rovibrational-constants",
         "the electronic states only in rovibrational-constants (energy, degeneracy)");
  }
  std::vector<DiatomicState> states;
  bool ok = true;
  for (std::size_t i = 0; i < entry.value.size(); ++i) {
    const std::string key = "rovibrational-constants[" + std::to_string(i) + "]";
    const auto state = ReadDiatomicState(entry.value[i], key, /*list_form=*/true);
    if (!state) {
      ok = false;
      continue;
    }
    if (i == 0 && state->energy_cm1 != 0.0) {
      Fail(entry.value[i],
           key + ".energy",
           "ground state at " + Number(state->energy_cm1) + " cm^-1",
           "the first state at energy 0 cm^-1");
      ok = false;
    }
    states.push_back(*state);
  }
  if (!ok) return;
  species->diatomic_states = states;
  species->electronic_levels.clear();
  for (const DiatomicState& state : states) {
    species->electronic_levels.push_back(ElectronicLevel{state.energy_cm1, state.degeneracy});
  }
}

void FileParser::ReadNuclearSpin(const Entry& entry, SpeciesDraft* draft) {
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  Species* species = &draft->species;
  if (composition_ok && shape_ok &&
      (species->shape != Shape::kLinear || species->composition.size() != 1 ||
       species->composition.front().second != 2)) {
    Fail(entry.key_node,
         "spin-statistics",
         "given for a species that is not a homonuclear diatomic",
         "spin-statistics only for a homonuclear diatomic such as H2 or D2");
    return;
  }
  const auto entries = ReadEntries(entry.value, "spin-statistics", kNuclearSpinKeys);
  if (!entries) return;
  NuclearSpin spin;
  bool ok = true;
  for (const auto& [name, target] :
       {std::pair<const char*, double*>{"even-j", &spin.even_weight}, {"odd-j", &spin.odd_weight}}) {
    const Entry* weight = entries->Find(name);
    const std::string key = std::string("spin-statistics.") + name;
    if (!weight) {
      Fail(entry.value, key, "missing", "a nuclear-spin weight of at least 0");
      ok = false;
      continue;
    }
    const auto value =
        ReadInRange(weight->value, key, 0.0, kMaxDegeneracy, "a nuclear-spin weight");
    if (value) {
      *target = *value;
    } else {
      ok = false;
    }
  }
  if (ok && spin.even_weight == 0.0 && spin.odd_weight == 0.0) {
    Fail(entry.value, "spin-statistics", "both weights 0", "at least one positive weight");
    ok = false;
  }
  if (const Entry* mixture = entries->Find("mixture")) {
    const auto text = ReadString(mixture->value, "spin-statistics.mixture", "equilibrium or normal");
    const std::optional<SpinMixture> parsed = text ? ParseSpinMixture(*text) : std::nullopt;
    if (text && !parsed) {
      Fail(mixture->value,
           "spin-statistics.mixture",
           Describe(mixture->value),
           "equilibrium or normal");
    }
    if (parsed) {
      spin.mixture = *parsed;
    } else {
      ok = false;
    }
  }
  if (ok) species->nuclear_spin = spin;
}

void FileParser::ReadTorsions(const Entry& entry, SpeciesDraft* draft) {
  const bool shape_ok = draft->shape_ok;
  // Modes can be matched only when the vibrations and the atom count behind them read cleanly.
  const bool vibrations_ok = draft->vibrations_ok && draft->formula_ok;
  Species* species = &draft->species;
  if (shape_ok && species->shape != Shape::kNonlinear) {
    Fail(entry.key_node,
         "hindered-rotors",
         "given for " + ShapePhrase(species->shape),
         "hindered-rotors only for a nonlinear species");
    return;
  }
  if (!IsSequence(entry.value, "hindered-rotors", "a list of maps with keys " + JoinWords(kTorsionKeys))) {
    return;
  }
  std::vector<bool> replaced(species->vibrations_cm1.size(), false);
  std::vector<Torsion> torsions;
  bool all_ok = true;
  for (std::size_t i = 0; i < entry.value.size(); ++i) {
    const YAML::Node item = entry.value[i];
    const std::string key = "hindered-rotors[" + std::to_string(i) + "]";
    const std::size_t before = problems_->size();
    const auto entries = ReadEntries(item, key, kTorsionKeys);
    if (!entries) {
      all_ok = false;
      continue;
    }
    Torsion torsion;
    if (const Entry* replaces = entries->Find("replaces")) {
      const auto wavenumber =
          ReadPositive(replaces->value, key + ".replaces", "wavenumber in cm^-1");
      if (wavenumber) {
        torsion.replaces_cm1 = *wavenumber;
        if (vibrations_ok) {
          // The closest listed vibration not yet taken by another torsion.
          std::optional<std::size_t> match;
          for (std::size_t k = 0; k < species->vibrations_cm1.size(); ++k) {
            const double distance = std::fabs(species->vibrations_cm1[k] - *wavenumber);
            if (!replaced[k] && distance <= kTorsionMatchToleranceCm1 &&
                (!match || distance < std::fabs(species->vibrations_cm1[*match] - *wavenumber))) {
              match = k;
            }
          }
          if (match) {
            replaced[*match] = true;
            torsion.mode_index = static_cast<int>(*match);
          } else {
            Fail(replaces->value,
                 key + ".replaces",
                 Number(*wavenumber) + " cm^-1 matches no vibration (or one already replaced)",
                 "one of the wavenumbers listed in vibrations, within " +
                     Number(kTorsionMatchToleranceCm1) + " cm^-1");
          }
        }
      }
    } else {
      Fail(item, key + ".replaces", "missing", "the wavenumber of the vibration it replaces");
    }

    const Entry* moment = entries->Find("reduced-moment");
    const Entry* constant = entries->Find("rotational-constant");
    if (moment && constant) {
      Fail(constant->key_node,
           key + ".rotational-constant",
           "given together with reduced-moment",
           "only one of the two");
    } else if (moment) {
      const auto i_red = ReadPositive(
          moment->value, key + ".reduced-moment", "reduced moment of inertia in amu*angstrom^2");
      if (i_red) {
        const double b_cm1 = constants::kRotationalConstantTimesInertia / *i_red;
        if (b_cm1 < kMinRotationalConstantCm1 || b_cm1 > kMaxRotationalConstantCm1) {
          Fail(moment->value,
               key + ".reduced-moment",
               Number(*i_red) + " amu*angstrom^2 (B = " + fmt::format("{:.6g}", b_cm1) +
                   " cm^-1)",
               "a reduced moment giving B within [" + Number(kMinRotationalConstantCm1) + ", " +
                   Number(kMaxRotationalConstantCm1) + "] cm^-1");
        } else {
          torsion.rotational_constant_cm1 = b_cm1;
        }
      }
    } else if (constant) {
      const auto b = ReadInRange(constant->value,
                                 key + ".rotational-constant",
                                 kMinRotationalConstantCm1,
                                 kMaxRotationalConstantCm1,
                                 "a rotational constant in cm^-1");
      if (b) torsion.rotational_constant_cm1 = *b;
    } else {
      Fail(item,
           key + ".reduced-moment",
           "missing (neither reduced-moment nor rotational-constant)",
           "one of the two");
    }

    if (const Entry* symmetry = entries->Find("symmetry-number")) {
      const auto n =
          ReadInteger(symmetry->value, key + ".symmetry-number", "a whole number of at least 1");
      if (n && *n < 1) {
        Fail(
            symmetry->value, key + ".symmetry-number", std::to_string(*n), "a whole number of at least 1");
      } else if (n) {
        torsion.symmetry = *n;
      }
    }

    const Entry* barrier = entries->Find("barrier-height");
    const Entry* fourier = entries->Find("cosine-terms");
    if (barrier && fourier) {
      Fail(fourier->key_node,
           key + ".cosine-terms",
           "given together with barrier-height",
           "only one of the two");
    } else if (barrier) {
      const auto v0 = ReadEnergy(barrier->value, key + ".barrier-height");
      if (v0 && *v0 < 0.0) {
        Fail(barrier->value,
             key + ".barrier-height",
             Describe(barrier->value) + " is negative",
             "a barrier height of at least 0");
      } else if (v0 && *v0 > kMaxTorsionBarrierJPerMol) {
        Fail(barrier->value,
             key + ".barrier-height",
             Describe(barrier->value),
             "a barrier height of at most " + Number(kMaxTorsionBarrierJPerMol * 1.0e-3) +
                 " kJ/mol");
      } else if (v0) {
        torsion.fourier_j_per_mol = {{torsion.symmetry, *v0}};
      }
    } else if (fourier) {
      const std::string term_text = "[k, V_k] with k a whole number >= 1 and V_k a molar energy";
      if (IsSequence(fourier->value, key + ".cosine-terms", "a list of terms " + term_text)) {
        for (std::size_t t = 0; t < fourier->value.size(); ++t) {
          const YAML::Node term = fourier->value[t];
          const std::string term_key = key + ".cosine-terms[" + std::to_string(t) + "]";
          if (!term.IsSequence() || term.size() != 2) {
            Fail(term, term_key, Describe(term), term_text);
            continue;
          }
          const auto k = ReadInteger(term[0], term_key, "a whole number of at least 1");
          const auto v_k = ReadEnergy(term[1], term_key);
          if (k && *k < 1) {
            Fail(term[0], term_key, std::to_string(*k), "a whole number of at least 1");
          } else if (v_k && std::fabs(*v_k) > kMaxTorsionBarrierJPerMol) {
            Fail(term[1],
                 term_key,
                 Describe(term[1]),
                 "a term of magnitude at most " + Number(kMaxTorsionBarrierJPerMol * 1.0e-3) +
                     " kJ/mol");
          } else if (k && v_k) {
            const bool repeated =
                std::any_of(torsion.fourier_j_per_mol.begin(),
                            torsion.fourier_j_per_mol.end(),
                            [&](const auto& existing) { return existing.first == *k; });
            if (repeated) {
              Fail(term[0], term_key, "k = " + std::to_string(*k) + " given twice", "each k once");
            } else {
              torsion.fourier_j_per_mol.emplace_back(*k, *v_k);
            }
          }
        }
      }
    } else {
      Fail(item,
           key + ".barrier-height",
           "missing (neither barrier-height nor cosine-terms)",
           "one of the two (barrier-height: 0 for a free rotor)");
    }
    if (problems_->size() != before) {
      all_ok = false;
    } else {
      torsions.push_back(torsion);
    }
  }
  if (all_ok) species->torsions = torsions;
}

void FileParser::ReadFitRequest(const Entries& entries, FitRequest* request) {
  if (const Entry* entry = entries.Find("fit-objective")) {
    const std::string expected = "minimax or least-squares";
    const auto text = ReadString(entry->value, entry->key, expected);
    const std::optional<FitObjective> objective = text ? ParseFitObjective(*text) : std::nullopt;
    if (objective) {
      request->objective = objective;
    } else if (text) {
      Fail(entry->value, entry->key, Describe(entry->value), expected);
    }
  }
  if (const Entry* entry = entries.Find("fit-extrapolation-guard")) {
    const std::string expected =
        "off, or FACTOR:BAND such as 1.25:0.2 (1 < FACTOR <= 4, 0 < BAND <= 1)";
    const auto text = ReadString(entry->value, entry->key, expected);
    const std::optional<ExtrapolationGuard> guard =
        text ? ParseExtrapolationGuard(*text) : std::nullopt;
    if (guard) {
      request->extrapolation_guard = guard;
    } else if (text) {
      Fail(entry->value, entry->key, Describe(entry->value), expected);
    }
  }
  if (const Entry* entry = entries.Find("fit-error-scales")) {
    const std::optional<Entries> scales = ReadEntries(entry->value, entry->key, kErrorScaleKeys);
    if (!scales) return;
    ErrorScales merged = request->error_scales.value_or(ErrorScales{});
    bool ok = true;
    const std::pair<const char*, double*> fields[] = {{"cp", &merged.cp_relative},
                                                      {"enthalpy", &merged.h_over_rt},
                                                      {"entropy", &merged.s_over_r}};
    for (const auto& [name, field] : fields) {
      if (const Entry* scale = scales->Find(name)) {
        const auto value = ReadPositive(scale->value, entry->key + "." + name, "dimensionless weight");
        if (value) {
          *field = *value;
        } else {
          ok = false;
        }
      }
    }
    if (ok) request->error_scales = merged;
  }
}

void FileParser::ReadSpinMultiplicity(const Entry& entry, const Entries& entries, Species* species) {
  if (entries.Find("electronic-levels")) {
    Fail(entry.key_node,
         entry.key,
         "given together with electronic-levels (its first level is the ground level)",
         "only one of the two: spin-multiplicity is a single ground level of degeneracy 2S+1");
    return;
  }
  if (const Entry* states = entries.Find("rovibrational-constants");
      states && states->value.IsSequence()) {
    Fail(entry.key_node,
         entry.key,
         "given together with the list form of rovibrational-constants",
         "the ground-state degeneracy only in rovibrational-constants[0].degeneracy");
    return;
  }
  const auto multiplicity = ReadInteger(entry.value, entry.key, "a whole number 2S+1 of at least 1");
  if (!multiplicity) return;
  if (*multiplicity < 1 || *multiplicity > kMaxDegeneracy) {
    Fail(entry.value,
         entry.key,
         std::to_string(*multiplicity),
         "a whole number 2S+1 within [1, " + Number(kMaxDegeneracy) + "]");
    return;
  }
  species->electronic_levels = {ElectronicLevel{0.0, static_cast<double>(*multiplicity)}};
}

void FileParser::CheckKramers(const YAML::Node& label_node,
                              const Entries& entries,
                              const Species& species) {
  const int electrons = species.NumElectrons();
  if (electrons % 2 == 0 || species.electronic_levels.empty() ||
      species.electronic_levels.front().degeneracy != 1.0) {
    return;
  }
  // Point at what set the ground level: the explicit level, the multiplicity, or the label.
  YAML::Node at = label_node;
  std::string key = "electronic-levels";
  std::string how = "(by default)";
  if (const Entry* levels = entries.Find("electronic-levels");
      levels && levels->value.IsSequence() && levels->value.size() > 0) {
    at = levels->value[0];
    key = "electronic-levels[0]";
    how = "(given)";
  } else if (const Entry* multiplicity = entries.Find("spin-multiplicity")) {
    at = multiplicity->value;
    key = "spin-multiplicity";
    how = "(given)";
  } else if (const Entry* states = entries.Find("rovibrational-constants");
             states && states->value.IsSequence() && states->value.size() > 0) {
    at = states->value[0];
    key = "rovibrational-constants[0].degeneracy";
  }
  Fail(at,
       key,
       "ground-level degeneracy 1 " + how + " for a species of " + std::to_string(electrons) +
           " electrons (an odd number: by Kramers' theorem every level is at least doubly "
           "degenerate)",
       "an odd-electron species needs its ground-state degeneracy: add electronic-levels or "
       "spin-multiplicity (2 for a doublet radical such as CH3)");
}

void FileParser::ReadTabulated(const Entry& entry, SpeciesDraft* draft) {
  const std::size_t before = problems_->size();
  const auto entries = ReadEntries(entry.value, "tabulated-cp", kTabulatedKeys);
  if (!entries) return;
  TabulatedCp table;
  const Entry* points = entries->Find("points");
  if (!points) {
    Fail(entry.value, "tabulated-cp.points", "missing", "a list of [T, Cp] rows");
    return;
  }
  const std::string row_rule = "a row [T, Cp] or [T, Cp, H-H298, S] (K, J/(mol K), kJ/mol, "
                               "J/(mol K)), every row as wide as the first";
  if (!IsSequence(points->value, "tabulated-cp.points", "a list of rows, each " + row_rule)) return;
  const std::size_t num_rows = points->value.size();
  if (num_rows < kMinTabulatedPoints || num_rows > kMaxTabulatedPoints) {
    Fail(points->value,
         "tabulated-cp.points",
         Plural(num_rows, "row"),
         fmt::format("{} to {} rows (three at least: the interpolant's end slopes and the "
                     "Wilhoit extrapolation are matched to three-point formulas)",
                     kMinTabulatedPoints, kMaxTabulatedPoints));
    return;
  }
  std::size_t width = 0;
  for (std::size_t i = 0; i < num_rows; ++i) {
    const YAML::Node row = points->value[i];
    const std::string key = "tabulated-cp.points[" + std::to_string(i) + "]";
    const bool shaped = row.IsSequence() && (row.size() == 2 || row.size() == 4) &&
                        (width == 0 || row.size() == width);
    if (!shaped) {
      Fail(row, key, Describe(row), row_rule);
      return;
    }
    width = row.size();
    const auto t_k = ReadInRange(row[0], key + "[0]", kMinTemperatureK, kMaxTemperatureK,
                                 "a temperature in K");
    const auto cp = ReadInRange(row[1], key + "[1]", 0.0, kMaxTabulatedCpJPerMolK,
                                "a heat capacity Cp in J/(mol K)");
    if (!t_k || !cp) return;
    if (!table.t_k.empty() && !(*t_k > table.t_k.back())) {
      Fail(row[0],
           key + "[0]",
           fmt::format("{} K after {} K in the row before", *t_k, table.t_k.back()),
           "temperatures strictly increasing from row to row");
      return;
    }
    table.t_k.push_back(*t_k);
    table.cp_j_per_mol_k.push_back(*cp);
    table.row_locations.push_back(Where(row));
    if (width == 4) {
      const double max_h_kj = kMaxTabulatedEnthalpyJPerMol * 1.0e-3;
      const auto h_kj = ReadInRange(row[2], key + "[2]", -max_h_kj, max_h_kj,
                                    "H(T) - H(298.15 K) in kJ/mol");
      const auto s = ReadInRange(row[3], key + "[3]", 0.0, kMaxTabulatedEntropyJPerMolK,
                                 "an entropy in J/(mol K)");
      if (!h_kj || !s) return;
      table.h_minus_h298_j_per_mol.push_back(*h_kj * 1.0e3);
      table.s_j_per_mol_k.push_back(*s);
    }
  }
  const Entry* reference = entries->Find("reference-entropy");
  if (width == 4) {
    if (reference) {
      Fail(reference->key_node,
           "tabulated-cp.reference-entropy",
           "given with rows that have an S column",
           "the entropy from the rows only (the first row anchors it)");
      return;
    }
    table.entropy_t_k = table.t_k.front();
    table.entropy_j_per_mol_k = table.s_j_per_mol_k.front();
  } else if (!reference) {
    Fail(entry.value,
         "tabulated-cp.reference-entropy",
         "missing",
         "[T, S]: the entropy at one temperature (K, J/(mol K)), as rows of [T, Cp] carry none");
    return;
  } else {
    const YAML::Node value = reference->value;
    const std::string key = "tabulated-cp.reference-entropy";
    if (!value.IsSequence() || value.size() != 2) {
      Fail(value, key, Describe(value), "[T, S] in K and J/(mol K)");
      return;
    }
    const auto t_k = ReadInRange(value[0], key + "[0]", kMinTemperatureK, kMaxTemperatureK,
                                 "a temperature in K");
    const auto s = ReadInRange(value[1], key + "[1]", 0.0, kMaxTabulatedEntropyJPerMolK,
                               "an entropy in J/(mol K)");
    if (!t_k || !s) return;
    table.entropy_t_k = *t_k;
    table.entropy_j_per_mol_k = *s;
  }
  for (const auto& [name, target] :
       {std::pair<const char*, std::optional<double>*>{"cp-zero", &table.cp_zero_j_per_mol_k},
        {"cp-infinity", &table.cp_infinity_j_per_mol_k}}) {
    if (const Entry* limit = entries->Find(name)) {
      const std::string key = std::string("tabulated-cp.") + name;
      if (const auto value = ReadInRange(limit->value, key, 0.0, kMaxTabulatedCpJPerMolK,
                                         "a heat capacity in J/(mol K)")) {
        *target = *value;
      }
    }
  }
  if (table.cp_zero_j_per_mol_k && table.cp_infinity_j_per_mol_k &&
      !(*table.cp_zero_j_per_mol_k < *table.cp_infinity_j_per_mol_k)) {
    const Entry* limit = entries->Find("cp-infinity");
    Fail(limit->value,
         "tabulated-cp.cp-infinity",
         fmt::format("{} J/(mol K), not above cp-zero {} J/(mol K)",
                     *table.cp_infinity_j_per_mol_k, *table.cp_zero_j_per_mol_k),
         "cp-infinity above cp-zero (the Wilhoit form rises from one to the other)");
  }
  if (problems_->size() == before) draft->species.tabulated = std::move(table);
}

}  // namespace sevenfold::detail

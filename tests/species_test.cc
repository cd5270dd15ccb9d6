// SPDX-License-Identifier: MIT
// Tests of the species module: the YAML schema, its validation messages, rigid-body geometry and
// molar masses.
#include "species/species.h"

#include <unistd.h>

#include <algorithm>
#include <catch2/catch.hpp>
#include <fmt/format.h>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <sstream>
#include <string>
#include <vector>

#include "core/constants.h"
#include "core/elements.h"
#include "core/error.h"
#include "species/formula.h"
#include "species/geometry.h"
#include "species/species_reader.h"
#include "species/species_schema.h"
#include "species/text_checks.h"
#include "fit/fitter.h"
#include "run_binary.h"

namespace sevenfold {
namespace {

using Catch::Contains;
using Catch::Matchers::WithinRel;

// Values read from text must come back as the same double: only the unit factor rounds.
constexpr double kReadRelativeTolerance = 1.0e-14;
// Eigen's symmetric 3x3 eigensolver is backward stable: moments good to a few hundred ulps of the
// largest one.
constexpr double kEigenRelativeTolerance = 1.0e-12;

std::string Join(const std::vector<std::string>& lines) {
  std::string text;
  for (const std::string& line : lines) text += line + "\n";
  return text;
}

// The Error text of reading `text` as "f.yaml", or "" when it reads without error.
std::string ErrorOf(const std::string& text) {
  try {
    ReadSpeciesText(text, "f.yaml");
  } catch (const Error& error) {
    return error.what();
  }
  return "";
}

int NumProblems(const std::string& text) {
  const std::string message = ErrorOf(text);
  if (message.empty()) return 0;
  return 1 + static_cast<int>(std::count(message.begin(), message.end(), '\n'));
}

// A valid linear species. CO2 constants from memory (B0 from its infrared spectrum, fundamentals
// nu1, nu2 (twice), nu3; formation enthalpy CODATA key value); the validation tests below only
// edit one line at a time. Value columns: key length + 7 (4 spaces of indent, ": ").
std::vector<std::string> Co2Lines() {
  return {
      "sevenfold-species: 2",                            // 1
      "species:",                                        // 2
      "  CO2:",                                          // 3, label at column 3
      "    formula: CO2",                                // 4, value at column 14
      "    formation-enthalpy: -393.51 kJ/mol",          // 5, column 25
      "    shape: linear",                               // 6, column 12
      "    symmetry-number: 2",                          // 7, column 22
      "    rotational-constants: [0.39021]",             // 8, column 27
      "    vibrations: [1333.0, 667.4, 667.4, 2349.0]",  // 9, column 17
  };
}

// A valid nonlinear species: H2O ground-state rotational constants A, B, C (written out of order
// on purpose) and fundamentals nu1, nu2, nu3, from memory; formation enthalpy of the gas, CODATA
// key value, from memory.
std::vector<std::string> WaterLines() {
  return {
      "sevenfold-species: 2",                                  // 1
      "species:",                                              // 2
      "  H2O:",                                                // 3
      "    formula: H2O",                                      // 4
      "    formation-enthalpy: -241.826",                      // 5
      "    shape: nonlinear",                                  // 6
      "    symmetry-number: 2",                                // 7
      "    rotational-constants: [14.5216, 27.8806, 9.2778]",  // 8, column 27
      "    vibrations: [3657, 1595, 3756]",                    // 9, column 17
  };
}

std::vector<std::string> With(std::vector<std::string> lines,
                              std::size_t line_number,
                              const std::string& replacement) {
  lines.at(line_number - 1) = replacement;
  return lines;
}

std::vector<std::string> Without(std::vector<std::string> lines, std::size_t line_number) {
  lines.erase(lines.begin() + static_cast<long>(line_number) - 1);
  return lines;
}

// The species items of a file's lines: everything after the format key and "species:".
std::vector<std::string> Items(std::vector<std::string> lines) {
  lines.erase(lines.begin(), lines.begin() + 2);
  return lines;
}

std::vector<std::string> Plus(std::vector<std::string> lines, const std::string& extra) {
  lines.push_back(extra);
  return lines;
}

// A scratch directory for file-based tests, removed at the end of the test.
class TempDir {
 public:
  TempDir() {
    path_ = std::filesystem::temp_directory_path() /
            ("sevenfold_species_test_" + std::to_string(::getpid()));
    std::filesystem::create_directories(path_);
  }
  ~TempDir() { std::filesystem::remove_all(path_); }
  std::string Write(const std::string& name, const std::string& text) const {
    const std::string file = (path_ / name).string();
    std::ofstream(file) << text;
    return file;
  }
  std::string Path(const std::string& name) const { return (path_ / name).string(); }

 private:
  std::filesystem::path path_;
};

const char* const kFullExample =
    R"(# Constants below are from memory (spectroscopic compilations and thermochemical key values);
# this test checks only how they are read, not their physics.
sevenfold-species: 2
defaults:
  fit-temperatures: {low: 200, mid: auto, high: 6000}
  standard-pressure: 1 bar
  fit-thresholds: {cp: 0.005, enthalpy: 0.002, entropy: 0.002}
species:
  Ar:
    formula: Ar
    formation-enthalpy: 0
    shape: atom
  CO2:
    formula: CO2
    formation-enthalpy: -393.51 kJ/mol
    shape: linear
    symmetry-number: 2
    rotational-constants: [0.39021]
    structure: [[C, 0, 0, 0], [O, 0, 0, 1.16], [O, 0, 0, -1.16]]
    vibrations: [1333.0, 667.4, 667.4, 2349.0]
    fit-temperatures: {low: 200, mid: 1000, high: 3500}
    fit-thresholds: {cp: 0.003}
  H2O:
    formula: H2O
    formation-enthalpy: -57.798 kcal/mol
    shape: nonlinear
    symmetry-number: 2
    rotational-constants: [14.5216, 27.8806, 9.2778]
    vibrations: [3657, 1595, 3756]
    frequency-scale: 0.98
    electronic-levels: [[0, 1]]
    standard-pressure: 1 atm
  HCN:
    formula: HCN
    formation-enthalpy: 135.1
    shape: linear
    symmetry-number: 1
    moments-of-inertia: [11.404]
    vibrations: [3311, 2097, 712, 712]
    centrifugal-distortion: 2.9e-6
  C2H6:
    formula: C2H6
    formation-enthalpy: -83.8 kJ/mol
    shape: nonlinear
    symmetry-number: 6
    rotational-constants: [0.6621, 2.681, 0.6621]
    vibrations: [2954, 1388, 995, 289, 2896, 1379, 2969, 2969, 1468, 1468, 1190, 1190,
                 2985, 2985, 1469, 1469, 822, 822]
    hindered-rotors: [{replaces: 289, reduced-moment: 1.57, symmetry-number: 3,
                       barrier-height: 12.0 kJ/mol}]
  H2:
    formula: H2
    formation-enthalpy: 0 kJ/mol
    shape: linear
    symmetry-number: 2
    rovibrational-constants: {we: 4401.21, wexe: 121.34, Be: 60.853, alphae: 3.062, De: 0.0471,
                              dissociation-energy: 36118.07}
    spin-statistics: {even-j: 1, odd-j: 3, mixture: normal}
  O2:
    formula: O2
    formation-enthalpy: 0
    shape: linear
    symmetry-number: 2
    rotational-constants: [1.4377]
    rovibrational-constants:
      - {energy: 0, degeneracy: 3, we: 1580.19, wexe: 11.98, Be: 1.44563, alphae: 0.0159,
         De: 4.839e-6, dissociation-energy: 41268}
      - {energy: 7882.4, degeneracy: 2, we: 1483.5, wexe: 12.9, Be: 1.4264, alphae: 0.0171,
         dissociation-energy: 33386}
  NO+:
    formula: NO+
    formation-enthalpy: 990.8
    shape: linear
    symmetry-number: 1
    rotational-constants: [1.9972]
    vibrations: [2376.4]
    optical-isomers: 1
)";

const Species& Find(const std::vector<Species>& list, const std::string& name) {
  for (const Species& species : list) {
    if (species.name == name) return species;
  }
  FAIL("species " << name << " not read");
  return list.front();
}

}  // namespace

TEST_CASE("a full example file is read into species with every field filled", "[species]") {
  const std::vector<Species> list = ReadSpeciesText(kFullExample, "full.yaml");
  REQUIRE(list.size() == 8);
  CHECK(list[0].name == "Ar");
  CHECK(list[7].name == "NO+");

  const Species& ar = Find(list, "Ar");
  CHECK(ar.shape == Shape::kAtom);
  CHECK(ar.rotational_constants_cm1.empty());
  CHECK(ar.vibrations_cm1.empty());
  CHECK(ar.symmetry_number == 1.0);
  CHECK(ar.location.ToString() == "full.yaml:9:3");
  CHECK_FALSE(ar.temperatures.mid_k.has_value());
  CHECK(ar.temperatures.low_k == 200.0);
  CHECK(ar.temperatures.high_k == 6000.0);
  CHECK(ar.standard_pressure_pa == constants::kStandardPressureBar);

  const Species& co2 = Find(list, "CO2");
  CHECK(co2.composition == std::vector<std::pair<std::string, int>>{{"C", 1}, {"O", 2}});
  CHECK_THAT(co2.formation_enthalpy_j_per_mol, WithinRel(-393510.0, kReadRelativeTolerance));
  CHECK(co2.shape == Shape::kLinear);
  CHECK(co2.symmetry_number == 2.0);
  // Explicit constants win over the geometry, which only cross-checks them.
  CHECK(co2.rotational_constants_cm1 == std::vector<double>{0.39021});
  REQUIRE(co2.geometry.size() == 3);
  CHECK(co2.geometry[1].element == "O");
  CHECK(co2.geometry[1].z_angstrom == 1.16);
  CHECK(co2.vibrations_cm1 == std::vector<double>{1333.0, 667.4, 667.4, 2349.0});
  CHECK(co2.temperatures.mid_k == 1000.0);
  CHECK(co2.temperatures.high_k == 3500.0);
  // fit-thresholds override per key; the other two keep the file defaults.
  CHECK(co2.thresholds.max_cp_relative == 0.003);
  CHECK(co2.thresholds.max_h_over_rt == 0.002);
  CHECK(co2.thresholds.max_s_over_r == 0.002);
  CHECK(co2.location.ToString() == "full.yaml:13:3");
  CHECK(co2.input_digest.size() == 64);

  const Species& water = Find(list, "H2O");
  // -57.798 kcal/mol with the thermochemical calorie (4.184 J, exact).
  CHECK_THAT(water.formation_enthalpy_j_per_mol,
             WithinRel(-57.798 * 4184.0, kReadRelativeTolerance));
  // Nonlinear constants are stored sorted A >= B >= C.
  CHECK(water.rotational_constants_cm1 == std::vector<double>{27.8806, 14.5216, 9.2778});
  CHECK(water.frequency_scale == 0.98);
  CHECK(water.standard_pressure_pa == constants::kStandardPressureAtm);
  REQUIRE(water.electronic_levels.size() == 1);
  CHECK(water.electronic_levels[0].degeneracy == 1.0);

  const Species& hcn = Find(list, "HCN");
  REQUIRE(hcn.rotational_constants_cm1.size() == 1);
  // moments-of-inertia become B = h / (8 pi^2 c I).
  CHECK_THAT(
      hcn.rotational_constants_cm1[0],
      WithinRel(constants::kRotationalConstantTimesInertia / 11.404, kReadRelativeTolerance));
  CHECK(hcn.centrifugal_distortion_cm1 == 2.9e-6);
  CHECK(hcn.composition.front().first == "H");  // order as written

  const Species& ethane = Find(list, "C2H6");
  CHECK(ethane.vibrations_cm1.size() == 18);
  CHECK(ethane.rotational_constants_cm1 == std::vector<double>{2.681, 0.6621, 0.6621});
  REQUIRE(ethane.torsions.size() == 1);
  const Torsion& torsion = ethane.torsions[0];
  CHECK(torsion.replaces_cm1 == 289.0);
  CHECK(torsion.mode_index == 3);  // 289 is the fourth vibration listed
  CHECK(torsion.symmetry == 3);
  CHECK_THAT(torsion.rotational_constant_cm1,
             WithinRel(constants::kRotationalConstantTimesInertia / 1.57, kReadRelativeTolerance));
  // A plain barrier V0 becomes the single Fourier term k = n.
  REQUIRE(torsion.fourier_j_per_mol.size() == 1);
  CHECK(torsion.fourier_j_per_mol[0].first == 3);
  CHECK_THAT(torsion.fourier_j_per_mol[0].second, WithinRel(12000.0, kReadRelativeTolerance));

  const Species& h2 = Find(list, "H2");
  CHECK(h2.vibrations_cm1.empty());  // may be omitted with diatomic-constants
  REQUIRE(h2.diatomic_states.size() == 1);
  CHECK(h2.diatomic_states[0].constants.we_cm1 == 4401.21);
  CHECK(h2.diatomic_states[0].constants.wexe_cm1 == 121.34);
  CHECK(h2.diatomic_states[0].constants.be_cm1 == 60.853);
  CHECK(h2.diatomic_states[0].constants.alphae_cm1 == 3.062);
  CHECK(h2.diatomic_states[0].constants.de_cm1 == 0.0471);
  CHECK(h2.diatomic_states[0].constants.dissociation_cm1 == 36118.07);
  CHECK(h2.diatomic_states[0].energy_cm1 == 0.0);
  // Without rotational data, the rigid-rotor B is B_0 = B_e - alpha_e / 2.
  REQUIRE(h2.rotational_constants_cm1.size() == 1);
  CHECK_THAT(h2.rotational_constants_cm1[0],
             WithinRel(60.853 - 3.062 / 2.0, kReadRelativeTolerance));
  REQUIRE(h2.nuclear_spin.has_value());
  CHECK(h2.nuclear_spin->even_weight == 1.0);
  CHECK(h2.nuclear_spin->odd_weight == 3.0);
  CHECK(h2.nuclear_spin->mixture == SpinMixture::kNormal);

  const Species& o2 = Find(list, "O2");
  REQUIRE(o2.diatomic_states.size() == 2);
  CHECK(o2.diatomic_states[1].energy_cm1 == 7882.4);
  CHECK(o2.diatomic_states[1].degeneracy == 2.0);
  CHECK(o2.diatomic_states[1].constants.be_cm1 == 1.4264);
  CHECK(o2.diatomic_states[0].constants.de_cm1 == 4.839e-6);
  // The list form also fills the electronic levels.
  REQUIRE(o2.electronic_levels.size() == 2);
  CHECK(o2.electronic_levels[0].degeneracy == 3.0);
  CHECK(o2.electronic_levels[1].energy_cm1 == 7882.4);
  CHECK(o2.rotational_constants_cm1 == std::vector<double>{1.4377});

  const Species& nop = Find(list, "NO+");
  CHECK(nop.charge == 1);
}

TEST_CASE("shape and spin-mixture names round-trip through text", "[species]") {
  for (Shape shape : {Shape::kAtom, Shape::kLinear, Shape::kNonlinear}) {
    CHECK(ParseShape(ToString(shape)) == shape);
  }
  for (SpinMixture mixture : {SpinMixture::kEquilibrium, SpinMixture::kNormal}) {
    CHECK(ParseSpinMixture(ToString(mixture)) == mixture);
  }
  CHECK_FALSE(ParseShape("Linear").has_value());
  CHECK_FALSE(ParseSpinMixture("frozen").has_value());
}

TEST_CASE("YAML syntax errors are reported at the parser's mark", "[species]") {
  // yaml-cpp notices the unclosed flow sequence of line 8 at the ':' after the next key (line 9,
  // column 15), where a flow sequence cannot continue.
  const std::string text = Join(With(Co2Lines(), 8, "    rotational-constants: [0.39021"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(text, "f.yaml"),
                      Contains("f.yaml:9:15: invalid YAML (end of sequence flow not found); "
                               "expected a well-formed YAML document"));
  CHECK(NumProblems(text) == 1);
  REQUIRE_THROWS_WITH(ReadSpeciesText("sevenfold-species: 2\nspecies: [\n", "f.yaml"),
                      Contains("f.yaml:3:1: invalid YAML"));
}

TEST_CASE("values of the wrong type are reported with what was found", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 9, "    vibrations: 1333")), "f.yaml"),
      Contains("f.yaml:9:17: species 'CO2': vibrations: '1333'; expected a list of harmonic "
               "wavenumbers in cm^-1"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 4, "    formula: {C: 1, O: 2}")), "f.yaml"),
      Contains("f.yaml:4:14: species 'CO2': formula: a map; expected a chemical formula such as "
               "CH4, C2H5OH, (CH3)2CO or HCO+"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 5, "    formation-enthalpy: -393.51 kJ")), "f.yaml"),
      Contains("f.yaml:5:25: species 'CO2': formation-enthalpy: '-393.51 kJ' has unknown unit "
               "'kJ'; expected a molar energy"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 6, "    shape: bent")), "f.yaml"),
      Contains("f.yaml:6:12: species 'CO2': shape: 'bent'; expected atom, linear or nonlinear"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText("sevenfold-species: 2\nspecies:\n  CO2: [1, 2]\n", "f.yaml"),
      Contains("f.yaml:3:8: species 'CO2': a list of 2 items; expected a map with keys formula, "));
}

TEST_CASE("unknown keys are reported with the allowed ones", "[species]") {
  const std::string text = Join(Plus(Co2Lines(), "    vibration: [1]"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(text, "f.yaml"),
      Contains("f.yaml:10:5: species 'CO2': vibration: unknown key; expected one of formula, "
               "formation-enthalpy, formation-enthalpy-0k, shape,") &&
          Contains("spin-statistics, hindered-rotors"));
  CHECK(NumProblems(text) == 1);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText("sevenfold-species: 2\ndefaults:\n  pressure: 1 bar\nspecies: {}\n",
                      "f.yaml"),
      Contains("f.yaml:3:3: defaults: pressure: unknown key; expected one of fit-temperatures, "
               "standard-pressure, fit-thresholds"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText("sevenfold-species: 2\nspecie:\n  CO2: {}\n", "f.yaml"),
      Contains("f.yaml:2:1: specie: unknown key; expected one of sevenfold-species, defaults, "
               "species"));
}

TEST_CASE("the first key declares the format and its version", "[species]") {
  const std::vector<std::string> co2 = Co2Lines();
  CHECK(ReadSpeciesText(Join(co2), "f.yaml").size() == 1);
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(Without(co2, 1)), "f.yaml"),
                      Contains("f.yaml:1:1: sevenfold-species: missing; expected "
                               "'sevenfold-species: 2' as the first key (the format and its "
                               "version)"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(With(co2, 1, "sevenfold-species: 3")), "f.yaml"),
                      Contains("f.yaml:1:20: sevenfold-species: version '3'; expected version 2 "
                               "(the version this build reads)"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(Plus(Without(co2, 1), "sevenfold-species: 2")),
                                      "f.yaml"),
                      Contains("f.yaml:9:1: sevenfold-species: not the first key; expected the "
                               "format key first"));
  // A file of the first layout is named as such, with the script that converts it.
  const std::string first_layout =
      "species:\n  - name: CO2\n    composition: {C: 1, O: 2}\n    formation-enthalpy: -393.51\n";
  REQUIRE_THROWS_WITH(ReadSpeciesText(first_layout, "f.yaml"),
                      Contains("f.yaml:1:1: a species file of the first layout") &&
                          Contains("convert the file with scripts/upgrade-species-file.py"));
  CHECK(NumProblems(first_layout) == 1);
}

TEST_CASE("formulas are read in the trade's notation into element counts and a charge",
          "[species]") {
  FormulaError error;
  const auto counts = [&](const std::string& text) {
    const std::optional<ParsedFormula> formula = ParseFormula(text, &error);
    REQUIRE(formula.has_value());
    return formula->counts;
  };
  using Counts = std::vector<std::pair<std::string, int>>;
  CHECK(counts("CH4") == Counts{{"C", 1}, {"H", 4}});
  // Repeated elements are summed, in order of first appearance.
  CHECK(counts("C2H5OH") == Counts{{"C", 2}, {"H", 6}, {"O", 1}});
  CHECK(counts("(CH3)2CO") == Counts{{"C", 3}, {"H", 6}, {"O", 1}});
  CHECK(counts("CO") == Counts{{"C", 1}, {"O", 1}});  // carbon and oxygen, not cobalt
  CHECK(counts("Co") == Counts{{"Co", 1}});
  CHECK(counts("D2O") == Counts{{"D", 2}, {"O", 1}});
  const auto charge = [&](const std::string& text) {
    const std::optional<ParsedFormula> formula = ParseFormula(text, &error);
    REQUIRE(formula.has_value());
    return formula->charge;
  };
  CHECK(charge("HCO+") == 1);
  CHECK(charge("O2-") == -1);
  CHECK(charge("He++") == 2);
  CHECK(charge("He+2") == 2);
  CHECK(charge("CH4") == 0);
  CHECK(FormatFormula({{"N", 1}, {"O", 1}}, 1) == "NO+");
  CHECK(FormatFormula({{"He", 1}}, 2) == "He+2");
  CHECK(FormatFormula({{"C", 1}, {"O", 2}}, 0) == "CO2");

  // A malformed formula names the offending character's position.
  const auto offset = [&](const std::string& text) {
    REQUIRE_FALSE(ParseFormula(text, &error).has_value());
    return error.offset;
  };
  CHECK(offset("co2") == 0);
  CHECK(offset("CH_4") == 2);
  CHECK(offset("CXx") == 1);
  CHECK(offset("C0") == 1);
  CHECK(offset("(CH3") == 4);
  CHECK(offset("CH3)") == 3);
  CHECK(offset("") == 0);
  CHECK(offset("C1001") == 1);
  CHECK(offset("(C500)3") == 0);
}

TEST_CASE("formula errors point at the bad character in the file", "[species]") {
  const std::string unknown = Join(With(Co2Lines(), 4, "    formula: COo2"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(unknown, "f.yaml"),
                      Contains("f.yaml:4:15: species 'CO2': formula: 'COo2': unknown element "
                               "'Oo' at character 2; expected an element symbol"));
  CHECK(NumProblems(unknown) == 1);  // no follow-up complaints about the atom count
  // In quotes the column still points at the character.
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 4, "    formula: \"CO 2\"")), "f.yaml"),
      Contains("f.yaml:4:17: species 'CO2': formula: 'CO 2': ' ' at character 3"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 4, "    formula: CO0")), "f.yaml"),
      Contains("f.yaml:4:16: species 'CO2': formula: 'CO0': '0' at character 3; expected a "
               "count of at least 1 without a leading zero"));
  // The charge comes from the formula.
  const std::vector<Species> ion =
      ReadSpeciesText(Join(Plus(With(With(Co2Lines(), 3, "  CO2+:"), 4, "    formula: CO2+"),
                                "    spin-multiplicity: 2")),
                      "f.yaml");
  REQUIRE(ion.size() == 1);
  CHECK(ion[0].charge == 1);
  CHECK(ion[0].name == "CO2+");
}

TEST_CASE("missing required keys are reported at the species label", "[species]") {
  const std::vector<std::string> co2 = Co2Lines();
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(Without(co2, 4)), "f.yaml"),
                      Contains("f.yaml:3:3: species 'CO2': formula: missing; expected a chemical "
                               "formula"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(Without(co2, 5)), "f.yaml"),
                      Contains("f.yaml:3:3: species 'CO2': formation-enthalpy: missing; expected "
                               "the enthalpy of formation at 298.15 K"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Without(co2, 6)), "f.yaml"),
      Contains("f.yaml:3:3: species 'CO2': shape: missing; expected atom, linear or nonlinear"));
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(Without(co2, 7)), "f.yaml"),
                      Contains("f.yaml:3:3: species 'CO2': symmetry-number: missing; expected the "
                               "external symmetry number for a linear species"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Without(co2, 8)), "f.yaml"),
      Contains("f.yaml:3:3: species 'CO2': rotational-constants: missing (none of "
               "rotational-constants, moments-of-inertia, structure given); expected one of them "
               "for a linear species"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Without(co2, 9)), "f.yaml"),
      Contains("f.yaml:3:3: species 'CO2': vibrations: missing; expected a list of 4 (3N-5 for a "
               "linear species of 3 atoms) harmonic wavenumbers in cm^-1"));
}

TEST_CASE("rotational data is forbidden for atoms", "[species]") {
  const std::vector<std::string> argon = {
      "sevenfold-species: 2",
      "species:",
      "  Ar:",
      "    formula: Ar",
      "    formation-enthalpy: 0",
      "    shape: atom",
  };
  CHECK(ReadSpeciesText(Join(argon), "f.yaml").size() == 1);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(argon, "    rotational-constants: [1.0]")), "f.yaml"),
      Contains("f.yaml:7:5: species 'Ar': rotational-constants: given for an atom; expected no "
               "rotational data for shape 'atom'"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(argon, "    vibrations: [100]")), "f.yaml"),
      Contains("f.yaml:7:17: species 'Ar': vibrations: 1 wavenumber; expected none for an atom"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(argon, 4, "    formula: Ar2")), "f.yaml"),
      Contains("f.yaml:6:12: species 'Ar': shape: 'atom' for a formula of 2 atoms; expected "
               "exactly 1 atom for shape 'atom'"));
}

TEST_CASE("the number of rotational constants must fit the shape", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 8, "    rotational-constants: [27.8806, 14.5216]")),
                      "f.yaml"),
      Contains("f.yaml:8:27: species 'H2O': rotational-constants: [27.8806, 14.5216]; expected 3 "
               "values (A, B, C) for a nonlinear species"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 8, "    rotational-constants: [0.39021, 0.39021]")),
                      "f.yaml"),
      Contains("f.yaml:8:27: species 'CO2': rotational-constants: [0.39021, 0.39021]; expected 1 "
               "value (B) for a linear species"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 8, "    rotational-constants: [-0.39021]")), "f.yaml"),
      Contains("f.yaml:8:28: species 'CO2': rotational-constants[0]: '-0.39021' is not positive; "
               "expected a positive rotational constant (a number in cm^-1, or with one of the "
               "units cm^-1, GHz, MHz)"));
}

TEST_CASE("the number of vibrations must be 3N-5 or 3N-6", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 9, "    vibrations: [3657, 1595]")), "f.yaml"),
      Contains("f.yaml:9:17: species 'H2O': vibrations: 2 wavenumbers; expected 3 (3N-6 for a "
               "nonlinear species of 3 atoms)"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 9, "    vibrations: [1333.0, 667.4, 2349.0]")),
                      "f.yaml"),
      Contains("f.yaml:9:17: species 'CO2': vibrations: 3 wavenumbers; expected 4 (3N-5 for a "
               "linear species of 3 atoms)"));
}

TEST_CASE("non-positive and non-finite wavenumbers are rejected, imaginary modes by name",
          "[species]") {
  // Column 24 is the second list item in "    vibrations: [3657, X, 3756]".
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 9, "    vibrations: [3657, -1595, 3756]")), "f.yaml"),
      Contains("f.yaml:9:24: species 'H2O': vibrations[1]: -1595 cm^-1 is negative, an imaginary "
               "mode (a saddle point such as a transition state, not a minimum); expected a "
               "positive wavenumber in cm^-1"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 9, "    vibrations: [3657, 0, 3756]")), "f.yaml"),
      Contains("f.yaml:9:24: species 'H2O': vibrations[1]: 0 cm^-1; expected a positive "
               "wavenumber in cm^-1"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 9, "    vibrations: [3657, .nan, 3756]")), "f.yaml"),
      Contains("f.yaml:9:24: species 'H2O': vibrations[1]: '.nan'; expected a positive "
               "wavenumber in cm^-1"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(WaterLines(), 9, "    vibrations: [3657, inf, 3756]")), "f.yaml"),
      Contains("f.yaml:9:24: species 'H2O': vibrations[1]: 'inf'; expected a positive "
               "wavenumber in cm^-1"));
}

TEST_CASE("symmetry numbers below 1, or impossible for a linear species, are rejected",
          "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 7, "    symmetry-number: 0")), "f.yaml"),
      Contains("f.yaml:7:22: species 'CO2': symmetry-number: 0; expected a symmetry number of at "
               "least 1"));
  // A linear molecule belongs to C_inf_v (sigma 1) or D_inf_h (sigma 2); common practice.
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 7, "    symmetry-number: 3")), "f.yaml"),
      Contains("f.yaml:7:22: species 'CO2': symmetry-number: 3 for a linear species; expected 1 "
               "(no centre of symmetry) or 2 (centrosymmetric)"));
}

TEST_CASE("temperature ranges must be ordered and within 10 to 20000 K", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-temperatures: {low: 3000, high: 1000}")),
                      "f.yaml"),
      Contains("f.yaml:10:23: species 'CO2': fit-temperatures: low 3000 K is not below high 1000 K; "
               "expected low < high"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-temperatures: {low: 300, mid: 200, high: 1000}")),
                      "f.yaml"),
      Contains("f.yaml:10:23: species 'CO2': fit-temperatures: mid 200 K is outside (300, 1000) K; "
               "expected low < mid < high, or mid: auto"));
  // The species' low overrides the default 200 K while high stays at the default 6000 K.
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-temperatures: {low: 5, mid: auto}")), "f.yaml"),
      Contains("f.yaml:10:29: species 'CO2': fit-temperatures.low: 5 K; expected a temperature in "
               "kelvin within [10, 20000]"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText("sevenfold-species: 2\ndefaults:\n  fit-temperatures: {low: 200, high: 30000}\nspecies: {}\n",
                      "f.yaml"),
      Contains("f.yaml:3:38: defaults: fit-temperatures.high: 30000 K; expected a temperature in "
               "kelvin within [10, 20000]"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-temperatures: {mid: hot}")), "f.yaml"),
      Contains("f.yaml:10:29: species 'CO2': fit-temperatures.mid: 'hot'; expected a temperature in "
               "kelvin within [10, 20000] or 'auto'"));
}

TEST_CASE("duplicate species labels are reported with both locations", "[species]") {
  std::vector<std::string> lines = Co2Lines();
  for (const std::string& line : Items(Co2Lines())) lines.push_back(line);  // lines 10..16
  REQUIRE_THROWS_WITH(ReadSpeciesText(Join(lines), "f.yaml"),
                      Contains("f.yaml:10:3: species 'CO2': label 'CO2' given twice, here and at "
                               "f.yaml:3:3; expected each label once across all species files "
                               "read together"));
  CHECK(NumProblems(Join(lines)) == 1);

  TempDir dir;
  const std::string first = dir.Write("first.yaml", Join(Co2Lines()));
  const std::string second = dir.Write("second.yaml", Join(Co2Lines()));
  REQUIRE_THROWS_WITH(ReadSpeciesFiles({first, second}),
                      Contains(second + ":3:3: species 'CO2': label 'CO2' given twice, here and "
                                        "at " +
                               first + ":3:3"));
  // Distinct labels across files read fine, in file order.
  const std::string water = dir.Write("water.yaml", Join(WaterLines()));
  const std::vector<Species> both = ReadSpeciesFiles({first, water});
  REQUIRE(both.size() == 2);
  CHECK(both[0].name == "CO2");
  CHECK(both[1].name == "H2O");
  CHECK(both[1].location.ToString() == water + ":3:3");
}

TEST_CASE("a shape that contradicts the geometry is rejected", "[species]") {
  // CO2 declared linear, but one O is displaced off the axis by 0.1 angstrom (test input only).
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(
          Join(With(
              Co2Lines(), 8, "    structure: [[C, 0, 0, 0], [O, 0, 0.1, 1.16], [O, 0, 0, -1.16]]")),
          "f.yaml"),
      Contains("f.yaml:8:16: species 'CO2': structure: atoms not on one line (a nonlinear "
               "geometry); expected a structure matching shape 'linear'"));
  // Water declared nonlinear with its three atoms on one line (test input only).
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(
          Join(With(WaterLines(),
                    8,
                    "    structure: [[O, 0, 0, 0], [H, 0, 0, 0.9572], [H, 0, 0, -0.9572]]")),
          "f.yaml"),
      Contains("f.yaml:8:16: species 'H2O': structure: collinear atoms (a linear geometry); "
               "expected a structure matching shape 'nonlinear'"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 8, "    structure: [[C, 0, 0, 0], [O, 0, 0, 1.16]]")),
                      "f.yaml"),
      Contains("f.yaml:8:16: species 'CO2': structure: atoms CO; expected the atoms of the "
               "formula CO2"));
}

TEST_CASE("rotational constants must agree with a geometry given beside them", "[species]") {
  // C=O 1.1600 angstrom (from memory, equilibrium bond length) gives B = 0.39152 cm^-1; the
  // measured B0 = 0.39021 cm^-1 (from memory) lies within 1 %, 0.40 does not (2.2 % off).
  const std::vector<std::string> with_geometry =
      Plus(Co2Lines(), "    structure: [[C, 0, 0, 0], [O, 0, 0, 1.16], [O, 0, 0, -1.16]]");
  CHECK(ReadSpeciesText(Join(with_geometry), "f.yaml").size() == 1);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(with_geometry, 8, "    rotational-constants: [0.40]")), "f.yaml"),
      Contains("f.yaml:8:27: species 'CO2': rotational-constants: rotational constants [0.4] cm^-1 "
               "differ from the structure's [0.391523] cm^-1 by up to 2.17 %; expected agreement "
               "within 1 %"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    moments-of-inertia: [43.2]")), "f.yaml"),
      Contains("f.yaml:10:5: species 'CO2': moments-of-inertia: given together with "
               "rotational-constants; expected only one of the two"));
}

TEST_CASE("electronic levels need positive degeneracies and a ground level at 0", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    electronic-levels: [[0, 1], [1000, -2]]")),
                      "f.yaml"),
      Contains("f.yaml:10:40: species 'CO2': electronic-levels[1]: negative degeneracy -2; "
               "expected a positive degeneracy"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    electronic-levels: [[100, 1]]")), "f.yaml"),
      Contains("f.yaml:10:26: species 'CO2': electronic-levels[0]: ground level at 100 cm^-1; "
               "expected the first level at 0 cm^-1 (energies are measured from the ground "
               "level)"));
}

TEST_CASE("beyond-rigid-rotor options are checked against the species", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    spin-statistics: {even-j: 1, odd-j: 0}")), "f.yaml"),
      Contains("f.yaml:10:5: species 'CO2': spin-statistics: given for a species that is not a "
               "homonuclear diatomic; expected spin-statistics only for a homonuclear diatomic"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(
          Join(Plus(Co2Lines(), "    rovibrational-constants: {we: 1, Be: 1, dissociation-energy: 1}")),
          "f.yaml"),
      Contains("f.yaml:10:5: species 'CO2': rovibrational-constants: given for a linear species of 3 "
               "atoms; expected a diatomic (shape linear, 2 atoms)"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(WaterLines(),
                                "    hindered-rotors: [{replaces: 300, rotational-constant: 5, "
                                "barrier-height: 1}]")),
                      "f.yaml"),
      Contains("f.yaml:10:34: species 'H2O': hindered-rotors[0].replaces: 300 cm^-1 matches no vibration "
               "(or one already replaced); expected one of the wavenumbers listed in vibrations"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(WaterLines(), "    hindered-rotors: [{replaces: 1595, barrier-height: 1}]")),
                      "f.yaml"),
      Contains("f.yaml:10:23: species 'H2O': hindered-rotors[0].reduced-moment: missing (neither "
               "reduced-moment nor rotational-constant); expected one of the two"));
}

TEST_CASE("a torsion may give its potential as a Fourier series", "[species]") {
  const std::vector<Species> list = ReadSpeciesText(
      Join(Plus(WaterLines(),
                "    hindered-rotors: [{replaces: 1595, rotational-constant: 5.5, symmetry-number: 2, "
                "cosine-terms: [[2, 10.0 kJ/mol], [4, -0.5 kcal/mol]]}]")),
      "f.yaml");
  REQUIRE(list.size() == 1);
  REQUIRE(list[0].torsions.size() == 1);
  const Torsion& torsion = list[0].torsions[0];
  CHECK(torsion.rotational_constant_cm1 == 5.5);
  CHECK(torsion.symmetry == 2);
  REQUIRE(torsion.fourier_j_per_mol.size() == 2);
  CHECK(torsion.fourier_j_per_mol[0].first == 2);
  CHECK_THAT(torsion.fourier_j_per_mol[0].second, WithinRel(10000.0, kReadRelativeTolerance));
  CHECK(torsion.fourier_j_per_mol[1].first == 4);
  CHECK_THAT(torsion.fourier_j_per_mol[1].second, WithinRel(-0.5 * 4184.0, kReadRelativeTolerance));
}

TEST_CASE("all problems of a file are reported together, in file order", "[species]") {
  std::vector<std::string> lines = With(With(Co2Lines(), 7, "    symmetry-number: 0"),
                                        9,
                                        "    vibrations: [1333.0, -667.4, 667.4, 2349.0]");
  for (const std::string& line :
       Items(With(WaterLines(), 4, "    formula: H2Q"))) {
    lines.push_back(line);  // the water species is lines 10..16, its formula on line 11
  }
  const std::string text = Join(lines);
  const std::string expected =
      "f.yaml:7:22: species 'CO2': symmetry-number: 0; expected a symmetry number of at least 1\n"
      "f.yaml:9:26: species 'CO2': vibrations[1]: -667.4 cm^-1 is negative, an imaginary mode "
      "(a saddle point such as a transition state, not a minimum); expected a positive "
      "wavenumber in cm^-1\n"
      "f.yaml:11:16: species 'H2O': formula: 'H2Q': unknown element 'Q' at character 3; "
      "expected an element symbol";
  REQUIRE_THROWS_WITH(ReadSpeciesText(text, "f.yaml"), Catch::StartsWith(expected));
  CHECK(NumProblems(text) == 3);
}

TEST_CASE("a flood of problems is cut after 100 lines with a count of the rest", "[species]") {
  std::string vibrations = "    vibrations: [";
  for (int i = 0; i < 150; ++i) vibrations += (i > 0 ? ", " : "") + std::string("-1");
  const std::string text = Join(With(WaterLines(), 9, vibrations + "]"));
  // 150 imaginary modes plus the wrong count (150 instead of 3): 151 problems, 100 shown.
  REQUIRE_THROWS_WITH(ReadSpeciesText(text, "f.yaml"),
                      Catch::EndsWith("\n... and 51 more problems not shown"));
  CHECK(NumProblems(text) == 101);
}

TEST_CASE("unreadable and oversized files are refused with the path and the reason", "[species]") {
  TempDir dir;
  const std::string missing = dir.Path("missing.yaml");
  REQUIRE_THROWS_WITH(ReadSpeciesFiles({missing}),
                      Contains(missing + ": cannot open species file: No such file or directory"));
  const std::string huge = dir.Path("huge.yaml");
  std::ofstream(huge) << "sevenfold-species: 2\nspecies: {}\n";
  std::filesystem::resize_file(huge, kMaxSpeciesFileBytes + 1);
  REQUIRE_THROWS_WITH(ReadSpeciesFiles({huge}),
                      Contains(huge + ": species file is larger than 16 MiB, refused before "
                                      "parsing"));
  REQUIRE_THROWS_WITH(ReadSpeciesFiles({dir.Path("")}),
                      Contains(": cannot read species file: Is a directory"));
  REQUIRE_THROWS_WITH(ReadSpeciesText("", "empty.yaml"),
                      Contains("empty.yaml:1:1: the file holds no data; expected a map "
                               "starting with 'sevenfold-species: 2'"));
}

TEST_CASE("the input digest ignores comments and layout but not content", "[species]") {
  const std::string plain = Join(Co2Lines());
  const std::string digest = ReadSpeciesText(plain, "f.yaml").at(0).input_digest;
  std::vector<std::string> commented = Co2Lines();
  commented[4] += "   # CODATA key value";
  commented.insert(commented.begin(), "# carbon dioxide");
  commented[3] = "  \"CO2\":   # quoted label, same text";
  commented[8] = "    rotational-constants:   [ 0.39021 ]";
  CHECK(ReadSpeciesText(Join(commented), "g.yaml").at(0).input_digest == digest);
  // The label is part of the content.
  CHECK(ReadSpeciesText(Join(With(Co2Lines(), 3, "  CO2-a:")), "f.yaml").at(0).input_digest !=
        digest);

  const std::string changed =
      Join(With(Co2Lines(), 9, "    vibrations: [1333.0, 667.4, 667.4, 2349.1]"));
  CHECK(ReadSpeciesText(changed, "f.yaml").at(0).input_digest != digest);
  const std::string with_defaults =
      "sevenfold-species: 2\ndefaults:\n  standard-pressure: 1 atm\nspecies:\n" +
      Join(Items(Co2Lines()));
  CHECK(ReadSpeciesText(with_defaults, "f.yaml").at(0).input_digest != digest);
}

TEST_CASE("water's geometry gives the principal moments of a bent triatomic", "[species]") {
  // Equilibrium structure of H2O: r(OH) = 0.9572 angstrom, angle HOH = 104.52 degrees (from
  // memory, the classic experimental r_e structure).
  const double r = 0.9572;
  const double half_angle = 0.5 * 104.52 * constants::kPi / 180.0;
  const double s = std::sin(half_angle), c = std::cos(half_angle);
  const std::vector<GeometryAtom> water = {
      {"O", 0.0, 0.0, 0.0}, {"H", r * s, 0.0, r * c}, {"H", -r * s, 0.0, r * c}};
  const RigidRotor rotor = AnalyzeGeometry(water);
  REQUIRE(rotor.shape == Shape::kNonlinear);

  // Analytically, with the molecule in the xz plane and its C2 axis along z:
  // I_z = 2 m_H (r s)^2, I_x = 2 m_H m_O (r c)^2 / M, and I_y = I_x + I_z (planar).
  const double m_h = AtomicWeightGPerMol("H").value();
  const double m_o = AtomicWeightGPerMol("O").value();
  const double total = m_o + 2.0 * m_h;
  std::vector<double> expected = {
      2.0 * m_h * r * r * s * s, 2.0 * m_h * m_o * r * r * c * c / total, 0.0};
  expected[2] = expected[0] + expected[1];
  std::sort(expected.begin(), expected.end());
  for (int k = 0; k < 3; ++k) {
    CHECK_THAT(rotor.moments_amu_angstrom2[k], WithinRel(expected[k], kEigenRelativeTolerance));
  }
  // python3-ase 3.22.1, Atoms("OH2", same positions).get_moments_of_inertia() with its IUPAC 2016
  // masses (equal to ours for H and O), printed to 10 significant figures.
  constexpr double kTenFigures = 1.0e-9;
  CHECK_THAT(rotor.moments_amu_angstrom2[0], WithinRel(0.6145678266, kTenFigures));
  CHECK_THAT(rotor.moments_amu_angstrom2[1], WithinRel(1.155115177, kTenFigures));
  CHECK_THAT(rotor.moments_amu_angstrom2[2], WithinRel(1.769683003, kTenFigures));
  // A = K / I_a >= B >= C.
  REQUIRE(rotor.rotational_constants_cm1.size() == 3);
  CHECK_THAT(
      rotor.rotational_constants_cm1[0],
      WithinRel(constants::kRotationalConstantTimesInertia / expected[0], kEigenRelativeTolerance));
  CHECK(rotor.rotational_constants_cm1[0] > rotor.rotational_constants_cm1[1]);
  CHECK(rotor.rotational_constants_cm1[1] > rotor.rotational_constants_cm1[2]);
}

TEST_CASE("CO2's geometry is linear with I = 2 m_O r^2", "[species]") {
  // r(C=O) = 1.1600 angstrom (from memory, equilibrium bond length).
  const double r = 1.16;
  const RigidRotor rotor =
      AnalyzeGeometry({{"C", 0.0, 0.0, 0.0}, {"O", 0.0, 0.0, r}, {"O", 0.0, 0.0, -r}});
  REQUIRE(rotor.shape == Shape::kLinear);
  const double expected = 2.0 * AtomicWeightGPerMol("O").value() * r * r;
  CHECK(rotor.moments_amu_angstrom2[0] <= kLinearMomentRelativeTolerance * expected);
  CHECK_THAT(rotor.moments_amu_angstrom2[1], WithinRel(expected, kEigenRelativeTolerance));
  CHECK_THAT(rotor.moments_amu_angstrom2[2], WithinRel(expected, kEigenRelativeTolerance));
  REQUIRE(rotor.rotational_constants_cm1.size() == 1);
  CHECK_THAT(
      rotor.rotational_constants_cm1[0],
      WithinRel(constants::kRotationalConstantTimesInertia / expected, kEigenRelativeTolerance));
  // python3-ase 3.22.1 gives 43.0565088 amu angstrom^2 for the same atoms (printed to 9 figures).
  CHECK_THAT(rotor.moments_amu_angstrom2[2], WithinRel(43.0565088, 1.0e-8));

  const RigidRotor atom = AnalyzeGeometry({{"Ar", 1.0, 2.0, 3.0}});
  CHECK(atom.shape == Shape::kAtom);
  CHECK(atom.rotational_constants_cm1.empty());
  REQUIRE_THROWS_WITH(AnalyzeGeometry({{"Xx", 0.0, 0.0, 0.0}}),
                      Contains("geometry[0]: unknown element 'Xx'"));
}

TEST_CASE("molar mass sums IUPAC atomic weights and corrects for the electrons", "[species]") {
  // IUPAC 2021 conventional atomic weights C 12.011, O 15.999 (from memory): CO2 = 44.009 g/mol.
  // The sum is exact to rounding: 1e-14 relative.
  constexpr double kSumTolerance = 1.0e-14;
  Species co2;
  co2.name = "CO2";
  co2.composition = {{"C", 1}, {"O", 2}};
  CHECK_THAT(co2.MolarMassKgPerMol(), WithinRel(44.009e-3, kSumTolerance));
  CHECK(co2.NumAtoms() == 3);

  // A cation lacks electrons, an anion carries extra ones (electron mass: CODATA 2018,
  // 5.48579909065e-4 u).
  Species cation = co2;
  cation.charge = 1;
  CHECK_THAT(cation.MolarMassKgPerMol(),
             WithinRel((44.009 - 5.48579909065e-4) * 1e-3, kSumTolerance));
  Species anion = co2;
  anion.charge = -2;
  CHECK_THAT(anion.MolarMassKgPerMol(),
             WithinRel((44.009 + 2.0 * 5.48579909065e-4) * 1e-3, kSumTolerance));

  // D2O with the AME 2020 deuterium mass 2.014101777844 u (from memory).
  Species heavy_water;
  heavy_water.composition = {{"D", 2}, {"O", 1}};
  CHECK_THAT(heavy_water.MolarMassKgPerMol(),
             WithinRel((2.0 * 2.014101777844 + 15.999) * 1e-3, kSumTolerance));
}

// Every field of two readings of one species, compared exactly: reading item by item must give
// the whole-document reading's values bit for bit, location and digest included.
void CheckSameSpecies(const Species& a, const Species& b) {
  INFO("species " << a.name << " at " << a.location.ToString());
  CHECK(a.name == b.name);
  CHECK(a.composition == b.composition);
  CHECK(a.charge == b.charge);
  CHECK(a.formation_enthalpy_j_per_mol == b.formation_enthalpy_j_per_mol);
  CHECK(a.shape == b.shape);
  CHECK(a.symmetry_number == b.symmetry_number);
  CHECK(a.rotational_constants_cm1 == b.rotational_constants_cm1);
  CHECK(a.vibrations_cm1 == b.vibrations_cm1);
  CHECK(a.frequency_scale == b.frequency_scale);
  REQUIRE(a.electronic_levels.size() == b.electronic_levels.size());
  for (std::size_t i = 0; i < a.electronic_levels.size(); ++i) {
    CHECK(a.electronic_levels[i].energy_cm1 == b.electronic_levels[i].energy_cm1);
    CHECK(a.electronic_levels[i].degeneracy == b.electronic_levels[i].degeneracy);
  }
  CHECK(a.optical_isomers == b.optical_isomers);
  CHECK(a.centrifugal_distortion_cm1 == b.centrifugal_distortion_cm1);
  CHECK(a.temperatures.low_k == b.temperatures.low_k);
  CHECK(a.temperatures.mid_k == b.temperatures.mid_k);
  CHECK(a.temperatures.high_k == b.temperatures.high_k);
  CHECK(a.standard_pressure_pa == b.standard_pressure_pa);
  CHECK(a.thresholds.max_cp_relative == b.thresholds.max_cp_relative);
  CHECK(a.thresholds.max_h_over_rt == b.thresholds.max_h_over_rt);
  CHECK(a.thresholds.max_s_over_r == b.thresholds.max_s_over_r);
  CHECK(a.formation_enthalpy_0k_j_per_mol == b.formation_enthalpy_0k_j_per_mol);
  CHECK(a.fit_request.mid_given == b.fit_request.mid_given);
  CHECK(a.fit_request.objective == b.fit_request.objective);
  CHECK(a.fit_request.extrapolation_guard.has_value() ==
        b.fit_request.extrapolation_guard.has_value());
  if (a.fit_request.extrapolation_guard && b.fit_request.extrapolation_guard) {
    CHECK(ToString(*a.fit_request.extrapolation_guard) ==
          ToString(*b.fit_request.extrapolation_guard));
  }
  CHECK(a.fit_request.error_scales.has_value() == b.fit_request.error_scales.has_value());
  if (a.fit_request.error_scales && b.fit_request.error_scales) {
    CHECK(a.fit_request.error_scales->cp_relative == b.fit_request.error_scales->cp_relative);
    CHECK(a.fit_request.error_scales->h_over_rt == b.fit_request.error_scales->h_over_rt);
    CHECK(a.fit_request.error_scales->s_over_r == b.fit_request.error_scales->s_over_r);
  }
  REQUIRE(a.diatomic_states.size() == b.diatomic_states.size());
  for (std::size_t i = 0; i < a.diatomic_states.size(); ++i) {
    const DiatomicState& x = a.diatomic_states[i];
    const DiatomicState& y = b.diatomic_states[i];
    CHECK(x.energy_cm1 == y.energy_cm1);
    CHECK(x.degeneracy == y.degeneracy);
    CHECK(x.constants.we_cm1 == y.constants.we_cm1);
    CHECK(x.constants.wexe_cm1 == y.constants.wexe_cm1);
    CHECK(x.constants.weye_cm1 == y.constants.weye_cm1);
    CHECK(x.constants.be_cm1 == y.constants.be_cm1);
    CHECK(x.constants.alphae_cm1 == y.constants.alphae_cm1);
    CHECK(x.constants.gammae_cm1 == y.constants.gammae_cm1);
    CHECK(x.constants.de_cm1 == y.constants.de_cm1);
    CHECK(x.constants.dissociation_cm1 == y.constants.dissociation_cm1);
  }
  REQUIRE(a.nuclear_spin.has_value() == b.nuclear_spin.has_value());
  if (a.nuclear_spin) {
    CHECK(a.nuclear_spin->even_weight == b.nuclear_spin->even_weight);
    CHECK(a.nuclear_spin->odd_weight == b.nuclear_spin->odd_weight);
    CHECK(a.nuclear_spin->mixture == b.nuclear_spin->mixture);
  }
  REQUIRE(a.torsions.size() == b.torsions.size());
  for (std::size_t i = 0; i < a.torsions.size(); ++i) {
    CHECK(a.torsions[i].replaces_cm1 == b.torsions[i].replaces_cm1);
    CHECK(a.torsions[i].mode_index == b.torsions[i].mode_index);
    CHECK(a.torsions[i].rotational_constant_cm1 == b.torsions[i].rotational_constant_cm1);
    CHECK(a.torsions[i].symmetry == b.torsions[i].symmetry);
    CHECK(a.torsions[i].fourier_j_per_mol == b.torsions[i].fourier_j_per_mol);
  }
  REQUIRE(a.geometry.size() == b.geometry.size());
  for (std::size_t i = 0; i < a.geometry.size(); ++i) {
    CHECK(a.geometry[i].element == b.geometry[i].element);
    CHECK(a.geometry[i].x_angstrom == b.geometry[i].x_angstrom);
    CHECK(a.geometry[i].y_angstrom == b.geometry[i].y_angstrom);
    CHECK(a.geometry[i].z_angstrom == b.geometry[i].z_angstrom);
  }
  CHECK(a.location.file == b.location.file);
  CHECK(a.location.line == b.location.line);
  CHECK(a.location.column == b.location.column);
  CHECK(a.input_digest == b.input_digest);
}

void CheckSameSpeciesLists(const std::vector<Species>& a, const std::vector<Species>& b) {
  REQUIRE(a.size() == b.size());
  for (std::size_t i = 0; i < a.size(); ++i) CheckSameSpecies(a[i], b[i]);
}

// A text read as one document and read with the item-by-item split allowed (on 2 threads).
struct TwoReadings {
  std::vector<Species> whole;
  std::vector<Species> split;
  bool split_used = false;
};

TwoReadings ReadBothWays(const std::string& text, const std::string& file_name) {
  TwoReadings readings;
  bool whole_split_used = true;
  readings.whole = detail::ReadSpeciesTextForTesting(text, file_name, false, 1, &whole_split_used);
  CHECK_FALSE(whole_split_used);
  readings.split =
      detail::ReadSpeciesTextForTesting(text, file_name, true, 2, &readings.split_used);
  return readings;
}

// The Error text of reading `text` either way, and whether the split was used.
std::string ErrorReadingAs(const std::string& text, bool allow_split, bool* split_used) {
  try {
    detail::ReadSpeciesTextForTesting(text, "f.yaml", allow_split, 2, split_used);
  } catch (const Error& error) {
    return error.what();
  }
  return "";
}

std::string ReadWholeFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  REQUIRE(in);
  return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

TEST_CASE("reading species item by item gives exactly the whole-document species", "[species]") {
  const std::string source_dir = SEVENFOLD_SOURCE_DIR;
  for (const char* file : {"species/carbon-impurities.yaml",
                           "species/cryogenic-and-quantum.yaml",
                           "species/h2-o2-core.yaml",
                           "species/nitrogen-chemistry.yaml",
                           "tests/data/reference-species.yaml"}) {
    INFO(file);
    const TwoReadings readings = ReadBothWays(ReadWholeFile(source_dir + "/" + file), file);
    CHECK(readings.split_used);
    CheckSameSpeciesLists(readings.whole, readings.split);
  }

  TempDir dir;
  const std::string generated = dir.Path("generated.yaml");
  REQUIRE(std::system(("/usr/bin/python3 " + source_dir + "/scripts/generate-species.py 300 " +
                       generated + " > /dev/null")
                          .c_str()) == 0);
  const std::string text = ReadWholeFile(generated);
  const TwoReadings readings = ReadBothWays(text, generated);
  CHECK(readings.split_used);
  REQUIRE(readings.whole.size() == 300);
  CheckSameSpeciesLists(readings.whole, readings.split);
  // The thread count changes nothing, also through the file interface.
  bool split_used = false;
  CheckSameSpeciesLists(readings.split,
                        detail::ReadSpeciesTextForTesting(text, generated, true, 1, &split_used));
  CHECK(split_used);
  CheckSameSpeciesLists(readings.split, ReadSpeciesFiles({generated}, 0));
}

TEST_CASE("tricky but valid layouts read item by item as in the whole document, or fall back",
          "[species]") {
  const std::string co2 = Join(Items(Co2Lines()));
  const std::string water = Join(Items(WaterLines()));
  struct Layout {
    const char* what;
    std::string text;
    bool split;  // whether the item-by-item reading applies
  };
  const std::string head = "sevenfold-species: 2\n";
  const std::vector<Layout> layouts = {
      {"comments between items, at column 0 and deeper",
       head + "species:  # the map\n# atoms first\n" + co2 + "\n  # ---- next\n# column 0\n" +
           water + "# end\n",
       true},
      {"flow-style items, one over two lines",
       head + "species:\n  CO2: {formula: CO2, formation-enthalpy: -393.51,\n"
              "     shape: linear, symmetry-number: 2, rotational-constants: [0.39021],\n"
              "     vibrations: [1333.0, 667.4, 667.4, 2349.0]}\n"
              "  Ar: {formula: Ar, formation-enthalpy: 0, shape: atom}\n",
       true},
      {"nested block lists and a flow list over several lines",
       head + "species:\n  H2O:\n    formula: H2O\n"
              "    formation-enthalpy: -241.826\n    shape: nonlinear\n    symmetry-number: 2\n"
              "    rotational-constants:\n      - 14.5216\n      - 27.8806\n      - 9.2778\n"
              "    vibrations: [3657,\n                 1595, 3756]\n"
              "    electronic-levels:\n      - [0, 1]\n      -\n        - 60000\n        - 3\n" +
           co2,
       true},
      {"defaults after species",
       head + "species:\n" + co2 + "defaults:\n  standard-pressure: 1 atm\n",
       true},
      {"CRLF line endings",
       "sevenfold-species: 2\r\ndefaults:\r\n  standard-pressure: 1 atm\r\nspecies:\r\n  CO2:\r\n"
       "    formula: CO2\r\n    formation-enthalpy: -393.51 kJ/mol\r\n"
       "    shape: linear\r\n    symmetry-number: 2\r\n    rotational-constants: [0.39021]\r\n"
       "    vibrations: [1333.0, 667.4, 667.4, 2349.0]\r\n",
       true},
      {"a document start marker", "--- # species\n" + head + "species:\n" + co2 + water, true},
      {"items indented by four",
       head + "species:\n    Ar:\n        formula: Ar\n        formation-enthalpy: 0\n"
              "        shape: atom\n    He:\n        formula: He\n        formation-enthalpy: 0\n"
              "        shape: atom\ndefaults: {standard-pressure: 1 bar}\n",
       true},
      {"quoted scalars, one holding '#'",
       head + "species:\n  \"Ar#1\":\n    formula: 'Ar'\n    formation-enthalpy: '0'\n"
              "    shape: \"atom\"  # quoted\n" +
           co2,
       true},
      {"an anchor and an alias",
       head + "species:\n  Ar:\n    formula: &single Ar\n    formation-enthalpy: 0\n"
              "    shape: atom\n  Ar2:\n    formula: *single\n    formation-enthalpy: 1\n"
              "    shape: atom\n",
       false},
      {"a tab before a comment", head + "species:\n" + co2 + "    optical-isomers: 1\t# one\n",
       false},
      {"a flow list continued at the items' indentation",
       head + "species:\n  CO2:\n    formula: CO2\n"
              "    formation-enthalpy: -393.51 kJ/mol\n    shape: linear\n    symmetry-number: 2\n"
              "    rotational-constants: [0.39021]\n    vibrations: [1333.0, 667.4,\n"
              "  667.4, 2349.0]\n" +
           water,
       false},
      {"a document end marker", head + "species:\n" + co2 + "...\n", false},
  };
  for (const Layout& layout : layouts) {
    INFO(layout.what);
    const TwoReadings readings = ReadBothWays(layout.text, "f.yaml");
    CHECK(readings.split_used == layout.split);
    CHECK_FALSE(readings.whole.empty());
    CheckSameSpeciesLists(readings.whole, readings.split);
  }

  // Line endings and the place of `defaults` are layout: the species and their digests stay.
  const std::string lf = head + "defaults:\n  standard-pressure: 1 atm\nspecies:\n" + co2;
  std::string crlf;
  for (const char c : lf) crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  CheckSameSpeciesLists(ReadSpeciesText(lf, "f.yaml"), ReadSpeciesText(crlf, "f.yaml"));
  const std::string after = head + "species:\n" + co2 + "defaults:\n  standard-pressure: 1 atm\n";
  CHECK(ReadSpeciesText(after, "f.yaml").at(0).input_digest ==
        ReadSpeciesText(lf, "f.yaml").at(0).input_digest);
}

TEST_CASE("bad input reads with the split allowed report exactly the whole-document errors",
          "[species]") {
  const std::string co2 = Join(Items(Co2Lines()));
  const std::string water = Join(Items(WaterLines()));
  struct Case {
    const char* what;
    std::string text;
    bool split;  // whether the split reading gives the result (duplicates are checked after it)
  };
  const std::string head = "sevenfold-species: 2\n";
  const std::vector<Case> cases = {
      {"a bad value in the second item",
       head + "species:\n" + co2 +
           Join(With(Items(WaterLines()), 7, "    vibrations: [3657, 1595]")),
       false},
      {"a YAML syntax error inside an item",
       head + "species:\n" + co2 + "  H2O: [\n    shape: nonlinear\n",
       false},
      {"a duplicate label in two items", head + "species:\n" + co2 + co2, true},
      {"an unknown top-level key after the items",
       head + "species:\n" + co2 + water + "specie: {}\n",
       false},
      {"bad defaults", head + "defaults:\n  standard-pressure: 2 bar\nspecies:\n" + co2, false},
      {"an item with an unknown key",
       head + "species:\n" + co2 + water + "    colour: blue\n",
       false},
      {"no format key", "species:\n" + co2, false},
  };
  for (const Case& one : cases) {
    INFO(one.what);
    bool whole_split_used = true;
    bool split_used = !one.split;
    const std::string whole = ErrorReadingAs(one.text, false, &whole_split_used);
    CHECK_FALSE(whole.empty());
    CHECK(ErrorReadingAs(one.text, true, &split_used) == whole);
    CHECK_FALSE(whole_split_used);
    CHECK(split_used == one.split);
  }
}

TEST_CASE("the input digest ignores flow or block style and quoting but not content", "[species]") {
  const std::string digest = ReadSpeciesText(Join(Co2Lines()), "f.yaml").at(0).input_digest;
  const std::string block_style =
      "sevenfold-species: 2\nspecies:\n  \"CO2\":\n    formula: 'CO2'\n"
      "    formation-enthalpy: -393.51 kJ/mol\n    shape: linear\n    symmetry-number: 2\n"
      "    rotational-constants:\n      - 0.39021\n"
      "    vibrations:\n      - 1333.0\n      - 667.4\n      - 667.4\n      - 2349.0\n";
  CHECK(ReadSpeciesText(block_style, "f.yaml").at(0).input_digest == digest);
  std::string changed = block_style;
  changed.replace(changed.find("2349.0"), 6, "2349.1");
  CHECK(ReadSpeciesText(changed, "f.yaml").at(0).input_digest != digest);
  // The same number written differently is different text, and so different content.
  changed = block_style;
  changed.replace(changed.find("2349.0"), 6, "2349");
  CHECK(ReadSpeciesText(changed, "f.yaml").at(0).input_digest != digest);

  const std::string items = "species:\n" + Join(Items(Co2Lines()));
  const std::string flow_defaults =
      "sevenfold-species: 2\n"
      "defaults: {fit-temperatures: {low: 300, high: 5000}, standard-pressure: 1 bar}\n" +
      items;
  const std::string block_defaults =
      "sevenfold-species: 2\ndefaults:\n  fit-temperatures:\n    low: 300\n    high: 5000  # K\n"
      "  standard-pressure: '1 bar'\n" +
      items;
  const std::string with_defaults = ReadSpeciesText(flow_defaults, "f.yaml").at(0).input_digest;
  CHECK(with_defaults != digest);
  CHECK(ReadSpeciesText(block_defaults, "f.yaml").at(0).input_digest == with_defaults);
  std::string other_defaults = block_defaults;
  other_defaults.replace(other_defaults.find("5000"), 4, "5500");
  CHECK(ReadSpeciesText(other_defaults, "f.yaml").at(0).input_digest != with_defaults);
}

TEST_CASE("fit settings in the defaults and per species reach the fit request", "[species]") {
  const std::string text =
      "sevenfold-species: 2\n"
      "defaults:\n"
      "  fit-objective: least-squares\n"
      "  fit-error-scales: {cp: 0.01, entropy: 0.004}\n"
      "species:\n" +
      Join(Items(Co2Lines())) +
      "    fit-extrapolation-guard: 1.5:0.1\n"
      "    fit-error-scales: {enthalpy: 0.003}\n"
      "    fit-temperatures: {mid: 1200}\n" +
      Join(Items(WaterLines())) + "    fit-objective: minimax\n    fit-extrapolation-guard: off\n";
  const std::vector<Species> list = ReadSpeciesText(text, "f.yaml");
  REQUIRE(list.size() == 2);
  const FitRequest& co2 = list[0].fit_request;
  CHECK(co2.objective == FitObjective::kLeastSquares);  // from the defaults
  REQUIRE(co2.extrapolation_guard.has_value());
  CHECK(co2.extrapolation_guard->enabled);
  CHECK(co2.extrapolation_guard->factor == 1.5);
  CHECK(co2.extrapolation_guard->band == 0.1);
  REQUIRE(co2.error_scales.has_value());
  // Merged key by key: cp and entropy from the defaults, enthalpy from the species.
  CHECK(co2.error_scales->cp_relative == 0.01);
  CHECK(co2.error_scales->h_over_rt == 0.003);
  CHECK(co2.error_scales->s_over_r == 0.004);
  CHECK(co2.mid_given);
  CHECK(list[0].temperatures.mid_k == 1200.0);
  const FitRequest& water = list[1].fit_request;
  CHECK(water.objective == FitObjective::kMinimax);
  REQUIRE(water.extrapolation_guard.has_value());
  CHECK_FALSE(water.extrapolation_guard->enabled);
  CHECK(water.error_scales->h_over_rt == ErrorScales{}.h_over_rt);
  CHECK_FALSE(water.mid_given);
  // A file that says nothing leaves the request empty; `mid: auto` counts as given.
  const Species plain = ReadSpeciesText(Join(Co2Lines()), "f.yaml").at(0);
  CHECK_FALSE(plain.fit_request.objective.has_value());
  CHECK_FALSE(plain.fit_request.extrapolation_guard.has_value());
  CHECK_FALSE(plain.fit_request.error_scales.has_value());
  CHECK_FALSE(plain.fit_request.mid_given);
  CHECK(ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-temperatures: {mid: auto}")), "f.yaml")
            .at(0)
            .fit_request.mid_given);

  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-objective: best")), "f.yaml"),
      Contains("f.yaml:10:20: species 'CO2': fit-objective: 'best'; expected minimax or "
               "least-squares"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-extrapolation-guard: 0.5:0.1")), "f.yaml"),
      Contains("f.yaml:10:30: species 'CO2': fit-extrapolation-guard: '0.5:0.1'; expected off, "
               "or FACTOR:BAND such as 1.25:0.2"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    fit-error-scales: {cp: 0}")), "f.yaml"),
      Contains("f.yaml:10:28: species 'CO2': fit-error-scales.cp: 0 is not positive; expected a "
               "positive dimensionless weight"));
}

// The ground levels of CH3 (a doublet radical, 9 electrons): from memory, for the messages only.
std::vector<std::string> MethylLines() {
  return {
      "sevenfold-species: 2",                                      // 1
      "species:",                                                  // 2
      "  CH3:",                                                    // 3
      "    formula: CH3",                                          // 4
      "    formation-enthalpy: 146.7",                             // 5
      "    shape: nonlinear",                                      // 6
      "    symmetry-number: 6",                                    // 7
      "    rotational-constants: [9.578, 9.578, 4.742]",           // 8
      "    vibrations: [3004.4, 606.5, 3160.8, 3160.8, 1396, 1396]",  // 9
  };
}

TEST_CASE("an odd-electron species needs a degenerate ground level (Kramers)", "[species]") {
  // Electrons from the formula and the charge: CH3 has 9, CH3+ 8, NO 15.
  CHECK(ReadSpeciesText(Join(Plus(MethylLines(), "    spin-multiplicity: 2")), "f.yaml")
            .at(0)
            .NumElectrons() == 9);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(MethylLines()), "f.yaml"),
      Contains("f.yaml:3:3: species 'CH3': electronic-levels: ground-level degeneracy 1 (by "
               "default) for a species of 9 electrons") &&
          Contains("expected an odd-electron species needs its ground-state degeneracy: add "
                   "electronic-levels or spin-multiplicity"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(MethylLines(), "    electronic-levels: [[0, 1], [100, 2]]")),
                      "f.yaml"),
      Contains("f.yaml:10:25: species 'CH3': electronic-levels[0]: ground-level degeneracy 1 "
               "(given)"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(MethylLines(), "    spin-multiplicity: 1")), "f.yaml"),
      Contains("f.yaml:10:24: species 'CH3': spin-multiplicity: ground-level degeneracy 1"));
  // The cation has an even count and reads with the default singlet.
  const Species cation = ReadSpeciesText(
      Join(With(With(MethylLines(), 3, "  CH3+:"), 4, "    formula: CH3+")), "f.yaml").at(0);
  CHECK(cation.NumElectrons() == 8);
  CHECK(cation.electronic_levels.front().degeneracy == 1.0);

  const Species doublet =
      ReadSpeciesText(Join(Plus(MethylLines(), "    spin-multiplicity: 2")), "f.yaml").at(0);
  REQUIRE(doublet.electronic_levels.size() == 1);
  CHECK(doublet.electronic_levels[0].energy_cm1 == 0.0);
  CHECK(doublet.electronic_levels[0].degeneracy == 2.0);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Plus(MethylLines(), "    spin-multiplicity: 2"),
                                "    electronic-levels: [[0, 2]]")),
                      "f.yaml"),
      Contains("f.yaml:10:5: species 'CH3': spin-multiplicity: given together with "
               "electronic-levels"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(MethylLines(), "    spin-multiplicity: 1.5")), "f.yaml"),
      Contains("f.yaml:10:24: species 'CH3': spin-multiplicity: '1.5'; expected a whole number "
               "2S+1 of at least 1"));
}

TEST_CASE("rotational constants read in GHz and MHz, moments of inertia in kg m^2", "[species]") {
  // 1 GHz is 1e9 / (100 c) cm^-1, c exact (SI definition): only rounding separates the readings.
  constexpr double kHzToCm1 = 1.0 / (100.0 * constants::kSpeedOfLight);
  const auto b_of = [](const std::string& line) {
    return ReadSpeciesText(Join(With(Co2Lines(), 8, line)), "f.yaml").at(0).rotational_constants_cm1;
  };
  // CO2's B0 = 11.698 GHz (microwave value, from memory); here only the unit arithmetic counts.
  CHECK_THAT(b_of("    rotational-constants: [11.698 GHz]").at(0),
             WithinRel(11.698e9 * kHzToCm1, kReadRelativeTolerance));
  CHECK_THAT(b_of("    rotational-constants: [11698 MHz]").at(0),
             WithinRel(11.698e9 * kHzToCm1, kReadRelativeTolerance));
  CHECK(b_of("    rotational-constants: [0.39021 cm^-1]").at(0) == 0.39021);
  const auto from_moments = [](const std::string& line) {
    return ReadSpeciesText(Join(With(Co2Lines(), 8, line)), "f.yaml").at(0).rotational_constants_cm1;
  };
  const double inertia_kg_m2 = 7.1739e-46;  // about CO2's (43.2 amu A^2), test input
  CHECK_THAT(from_moments("    moments-of-inertia: [7.1739e-46 kg*m^2]").at(0),
             WithinRel(constants::kRotationalConstantTimesInertia /
                           (inertia_kg_m2 / constants::kAmuAngstrom2),
                       kReadRelativeTolerance));
  CHECK(from_moments("    moments-of-inertia: [43.2 amu*A^2]").at(0) ==
        from_moments("    moments-of-inertia: [43.2]").at(0));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(With(Co2Lines(), 8, "    rotational-constants: [11.7 THz]")),
                      "f.yaml"),
      Contains("f.yaml:8:28: species 'CO2': rotational-constants[0]: '11.7 THz'; expected a "
               "positive rotational constant (a number in cm^-1, or with one of the units cm^-1, "
               "GHz, MHz)"));
}

TEST_CASE("the formation enthalpy may be given at 0 K instead of 298.15 K", "[species]") {
  const Species co2 =
      ReadSpeciesText(Join(With(Co2Lines(), 5, "    formation-enthalpy-0k: -393.15 kJ/mol")),
                      "f.yaml")
          .at(0);
  REQUIRE(co2.formation_enthalpy_0k_j_per_mol.has_value());
  CHECK_THAT(*co2.formation_enthalpy_0k_j_per_mol, WithinRel(-393150.0, kReadRelativeTolerance));
  CHECK(co2.electron_convention == ElectronConvention::kThermal);
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(Join(Plus(Co2Lines(), "    formation-enthalpy-0k: -393.15")), "f.yaml"),
      Contains("f.yaml:10:5: species 'CO2': formation-enthalpy-0k: given together with "
               "formation-enthalpy; expected only one of the two"));
}

// scripts/upgrade-species-file.py on files of the first layout: the converted file must give the
// very same tables (every printed digit) as the same species written in the current layout, keep
// the comments of the items it rewrites line by line, and be refused by nothing.
TEST_CASE("the upgrade script turns first-layout files into files with identical tables",
          "[species]") {
  using testing::RunBinary;
  TempDir dir;
  const std::string source_dir = SEVENFOLD_SOURCE_DIR;
  const auto upgrade = [&](const std::string& old_path, const std::string& new_path) {
    const std::string command = "/usr/bin/python3 " + source_dir +
                                "/scripts/upgrade-species-file.py " + old_path + " -o " +
                                new_path + " 2>" + dir.Path("upgrade.err");
    const int raw = std::system(command.c_str());
    return WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  };
  const std::string table = " --from 100 --to 6000 --step 50 --format csv";
  // The demo files before the layout change, against the committed current-layout demo files.
  for (const std::string name : {"h2-o2-core", "nitrogen-chemistry"}) {
    INFO(name);
    const std::string old_path = source_dir + "/tests/data/first-layout/" + name + ".yaml";
    const std::string new_path = dir.Path(name + ".yaml");
    REQUIRE(upgrade(old_path, new_path) == 0);
    const testing::RunResult converted = RunBinary("table " + new_path + table);
    const testing::RunResult current = RunBinary("table species/" + name + ".yaml" + table);
    REQUIRE(converted.exit_status == 0);
    CHECK(converted.out == current.out);
    CHECK(converted.out.size() > 1000);
    // Every comment line of the old file is kept.
    std::istringstream old_lines(testing::ReadWhole(old_path));
    const std::string converted_text = testing::ReadWhole(new_path);
    int num_comments = 0;
    for (std::string line; std::getline(old_lines, line);) {
      const std::size_t hash = line.find('#');
      if (hash == std::string::npos) continue;
      ++num_comments;
      CHECK(converted_text.find(line.substr(hash)) != std::string::npos);
    }
    CHECK(num_comments > 20);
    // Given to sevenfold unconverted, the old file is refused with the way to convert it.
    const testing::RunResult refused = RunBinary("table " + old_path);
    CHECK(refused.exit_status == 2);
    CHECK_THAT(refused.err, Contains("scripts/upgrade-species-file.py"));
  }
  // An ion (charge folded into the formula), a flow-style item and a composition over several
  // lines, against the same species written by hand in the current layout.
  const std::string ions = dir.Path("ions.yaml");
  REQUIRE(upgrade(source_dir + "/tests/data/first-layout/ions.yaml", ions) == 0);
  const std::string by_hand = dir.Write(
      "by-hand.yaml",
      "sevenfold-species: 2\n"
      "defaults:\n  fit-temperatures: {low: 300, mid: 1000, high: 5000}\n"
      "species:\n"
      "  NO+:\n    formula: NO+\n    formation-enthalpy: 990.8 kJ/mol\n    shape: linear\n"
      "    symmetry-number: 1\n    rotational-constants: [1.9972]\n    vibrations: [2376.4]\n"
      "  O2-:\n    formula: O2-\n    formation-enthalpy: -48.7 kJ/mol\n    shape: linear\n"
      "    symmetry-number: 2\n    rotational-constants: [1.17]\n    vibrations: [1090]\n"
      "    electronic-levels: [[0, 4]]\n"
      "  CH4:\n    formula: CH4\n    formation-enthalpy: -74.87\n    shape: nonlinear\n"
      "    symmetry-number: 12\n    rotational-constants: [5.241, 5.241, 5.241]\n"
      "    vibrations: [2917, 1534, 1534, 3019, 3019, 3019, 1306, 1306, 1306]\n");
  const testing::RunResult converted = RunBinary("table " + ions + table);
  REQUIRE(converted.exit_status == 0);
  CHECK(converted.out == RunBinary("table " + by_hand + table).out);
  const std::vector<Species> read = ReadSpeciesFiles({ions});
  REQUIRE(read.size() == 3);
  CHECK(read[0].charge == 1);
  CHECK(read[1].charge == -1);
  CHECK(read[2].composition == std::vector<std::pair<std::string, int>>{{"C", 1}, {"H", 4}});

  // What the script does not understand is refused, and nothing is written.
  const std::string refused_path = dir.Path("refused.yaml");
  CHECK(upgrade(source_dir + "/species/h2-o2-core.yaml", refused_path) == 2);
  CHECK_THAT(testing::ReadWhole(dir.Path("upgrade.err")), Contains("already in the current layout"));
  const std::string unknown =
      dir.Write("unknown.yaml", "species:\n  - name: Ar\n    composition: {Ar: 1}\n    colour: red\n");
  CHECK(upgrade(unknown, refused_path) == 2);
  CHECK_THAT(testing::ReadWhole(dir.Path("upgrade.err")), Contains("unknown key 'colour'"));
  const std::string twice = dir.Write(
      "twice.yaml", "species:\n  - name: Ar\n    composition: {Ar: 1}\n    shape: atom\n"
                    "    shape: linear\n");
  CHECK(upgrade(twice, refused_path) == 2);
  CHECK_THAT(testing::ReadWhole(dir.Path("upgrade.err")),
             Contains("line 5: key 'shape' given twice (first on line 4)"));
  CHECK_FALSE(std::filesystem::exists(refused_path));
}

namespace {

// A markdown table row's cells, trimmed, without the outer bars; empty for other lines.
std::vector<std::string> Cells(const std::string& line) {
  std::vector<std::string> cells;
  if (line.size() < 2 || line.front() != '|') return cells;
  std::size_t start = 1;
  while (start < line.size()) {
    const std::size_t bar = line.find('|', start);
    if (bar == std::string::npos) break;
    std::string cell = line.substr(start, bar - start);
    cell.erase(0, cell.find_first_not_of(' '));
    cell.erase(cell.find_last_not_of(' ') + 1);
    cells.push_back(cell);
    start = bar + 1;
  }
  return cells;
}

std::string KeyRow(const KeySpec& spec) {
  std::string row = "| " + ToString(spec.section) + " | `" + spec.key + "` |";
  for (const std::string* cell : {&spec.kind, &spec.unit, &spec.band, &spec.applies_to,
                                  &spec.required, &spec.default_value}) {
    row += cell->empty() ? " |" : " " + *cell + " |";
  }
  return row;
}

}  // namespace

// docs/species-schema.md's key reference is the key table, row for row: every key, unit, band,
// default and tolerance the docs state is the one the reader applies (the table renders bands
// and defaults from the constants and default values the code uses).
TEST_CASE("the documented keys, bands, defaults and tolerances are the code's", "[species]") {
  const std::string docs =
      testing::ReadWhole(std::string(SEVENFOLD_SOURCE_DIR) + "/docs/species-schema.md");
  const std::size_t start = docs.find("\n## Key reference\n");
  REQUIRE(start != std::string::npos);
  std::istringstream lines(docs.substr(start));
  std::vector<std::string> documented;
  for (std::string line; std::getline(lines, line);) {
    if (line.rfind("## ", 0) == 0 && !documented.empty()) break;
    const std::vector<std::string> cells = Cells(line);
    if (cells.size() != 8 || cells[0] == "section" || cells[0].rfind("---", 0) == 0) continue;
    documented.push_back(line);
  }
  std::string expected;
  for (const KeySpec& spec : KeyTable()) expected += KeyRow(spec) + "\n";
  INFO("docs/species-schema.md, key reference rows expected:\n" << expected);
  REQUIRE(documented.size() == KeyTable().size());
  for (std::size_t i = 0; i < documented.size(); ++i) {
    CHECK(Cells(documented[i]) == Cells(KeyRow(KeyTable()[i])));
  }
  // The default objective of the table is the fitter's.
  CHECK(ToString(FitOptions{}.objective) == ToString(FitObjective::kMinimax));
  // The accepted elements are listed as the element table has them.
  std::string elements = "Elements accepted in formulas:";
  for (const std::string& symbol : KnownElementSymbols()) elements += " " + symbol;
  CHECK_THAT(docs, Contains(elements + ".\n"));
  // docs/theory.md states the torsion tolerance the reader applies.
  const std::string theory =
      testing::ReadWhole(std::string(SEVENFOLD_SOURCE_DIR) + "/docs/theory.md");
  CHECK_THAT(theory, Contains(fmt::format("within {} cm⁻¹ of the torsion's `replaces`",
                                          schema::kTorsionMatchToleranceCm1)));
  CHECK_THAT(docs, Contains(fmt::format("within {} cm^-1", schema::kTorsionMatchToleranceCm1)));
  // The complete example reads, every species of it.
  const std::size_t example = docs.find("```yaml\n", docs.find("## Complete example"));
  REQUIRE(example != std::string::npos);
  const std::size_t begin = example + 8;
  const std::string text = docs.substr(begin, docs.find("```", begin) - begin);
  CHECK(ReadSpeciesText(text, "example.yaml").size() == 8);
}

namespace {
// A tabulated species (Cp rows of CO2 from the JANAF Thermochemical Tables, 4th ed., Chase
// 1998, to 0.001 J/(mol K), from memory); `rows` replaces the points list.
std::string TabulatedText(const std::string& rows, const std::string& extra = "") {
  return "sevenfold-species: 2\n"            // 1
         "species:\n"                        // 2
         "  CO2-table:\n"                    // 3
         "    formula: CO2\n"                // 4
         "    formation-enthalpy: -393.51\n" // 5
         "    shape: linear\n"               // 6
         "    tabulated-cp:\n"               // 7
         "      reference-entropy: [298.15, 213.795]\n"  // 8
         "      points:\n" +                 // 9
         rows + extra;
}
const std::string kCo2Rows =
    "        - [298.15, 37.135]\n"  // 10
    "        - [400, 41.325]\n"     // 11
    "        - [500, 44.627]\n"     // 12
    "        - [600, 47.327]\n";    // 13

TEST_CASE("a tabulated species is read with its rows and entropy anchor", "[species]") {
  const Species co2 = ReadSpeciesText(TabulatedText(kCo2Rows), "t.yaml").at(0);
  REQUIRE(co2.tabulated.has_value());
  CHECK(co2.tabulated->t_k == std::vector<double>{298.15, 400, 500, 600});
  CHECK(co2.tabulated->cp_j_per_mol_k == std::vector<double>{37.135, 41.325, 44.627, 47.327});
  CHECK(co2.tabulated->entropy_t_k == 298.15);
  CHECK(co2.tabulated->entropy_j_per_mol_k == 213.795);
  CHECK(co2.tabulated->h_minus_h298_j_per_mol.empty());
  CHECK(co2.tabulated->row_locations.at(1).line == 11);
  CHECK(co2.formation_enthalpy_j_per_mol == -393510.0);
}

TEST_CASE("bad tabulated-cp input is reported at its place", "[species]") {
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(TabulatedText("        - [298.15, 37.135]\n        - [400, 41.325]\n"),
                      "t.yaml"),
      Contains("t.yaml:10:9: species 'CO2-table': tabulated-cp.points: 2 rows; expected 3 to "
               "10000 rows"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(TabulatedText("        - [298.15, 37.135]\n        - [500, 41.325]\n"
                                    "        - [400, 44.627]\n"),
                      "t.yaml"),
      Contains("t.yaml:12:12: species 'CO2-table': tabulated-cp.points[2][0]: 400 K after 500 K "
               "in the row before; expected temperatures strictly increasing"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(TabulatedText("        - [298.15, 37.135]\n        - [400, -41.325]\n"
                                    "        - [500, 44.627]\n"),
                      "t.yaml"),
      Contains("t.yaml:11:17: species 'CO2-table': tabulated-cp.points[1][1]: -41.325; expected "
               "a heat capacity Cp in J/(mol K) within [0, 100000]"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(TabulatedText("        - [298.15, 37.135, 0]\n" + kCo2Rows), "t.yaml"),
      Contains("t.yaml:10:11: species 'CO2-table': tabulated-cp.points[0]: a list of 3 items; "
               "expected a row [T, Cp] or [T, Cp, H-H298, S]"));
  REQUIRE_THROWS_WITH(
      ReadSpeciesText(TabulatedText(kCo2Rows, "    vibrations: [1333, 667, 667, 2349]\n"),
                      "t.yaml"),
      Contains("t.yaml:14:5: species 'CO2-table': vibrations: given together with tabulated-cp; "
               "expected either molecular data or tabulated-cp, not both"));
}

}  // namespace

}  // namespace sevenfold

namespace sevenfold {
namespace {

TEST_CASE("flow nesting deeper than the limit is found before YAML parsing, quotes and comments aside",
          "[species]") {
  using detail::kMaxFlowNesting;
  using detail::TooDeepFlowNesting;
  const std::string at_limit = std::string(kMaxFlowNesting, '[') + std::string(kMaxFlowNesting, ']');
  CHECK_FALSE(TooDeepFlowNesting("species: " + at_limit + "\n").has_value());
  const std::optional<detail::TextPosition> deep =
      TooDeepFlowNesting("a: 1\nspecies: " + std::string(kMaxFlowNesting + 1, '[') + "\n");
  REQUIRE(deep.has_value());
  CHECK(deep->line == 2);
  CHECK(deep->column == static_cast<int>(std::string("species: ").size()) + kMaxFlowNesting + 1);
  // Brackets in quoted scalars and comments are text, not nesting.
  const std::string many(2 * kMaxFlowNesting, '[');
  CHECK_FALSE(TooDeepFlowNesting("a: '" + many + "'\nb: \"" + many + "\"\n# " + many + "\n"));
  CHECK_FALSE(TooDeepFlowNesting("a: 'it''s " + many + "'\nb: \"\\\" " + many + "\"\n"));
  // The reader refuses such a file with its location, before yaml-cpp sees it.
  REQUIRE_THROWS_WITH(
      ReadSpeciesText("sevenfold-species: 2\nspecies: " + std::string(100000, '[') + "\n", "deep.yaml"),
      Catch::Contains("deep.yaml:2:74: flow collections ('[' or '{') nested deeper than 64 levels"));
}

}  // namespace
}  // namespace sevenfold


// SPDX-License-Identifier: MIT
// The species-file schema in one place: the format key and version, the bands and tolerances the
// reader enforces, and the key table (every key, its kind, unit, band, where it applies, whether
// it is required, its default). The reader takes its allowed keys from the table and its bands
// from the constants below; tests/species_test.cc checks docs/species-schema.md against both.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace sevenfold {
namespace schema {

// The first key of every species file: the format's name, with the layout version as its value.
inline constexpr std::string_view kFormatKey = "sevenfold-species";
inline constexpr int kFormatVersion = 2;
// Tells the reader of a file in an older layout how to convert it.
inline constexpr const char* kUpgradeHint =
    "convert the file with scripts/upgrade-species-file.py (docs/species-schema.md)";

// Temperatures of the fit ranges must lie in this band, kelvin. Below 10 K hardly any gas exists
// as an ideal gas and the polynomial form is useless; above 20000 K ionisation dominates and the
// single-species model no longer holds (common practice).
inline constexpr double kMinTemperatureK = 10.0;
inline constexpr double kMaxTemperatureK = 20000.0;
// Rotational constants given next to a geometry must agree with it within 1 %: equilibrium
// geometries and ground-state constants differ by vibration-rotation terms of this order or less.
inline constexpr double kGeometryConstantsRelativeTolerance = 0.01;
// A torsion's `replaces` must equal a listed vibration; input written to 0.1 cm^-1 rounds by at
// most 0.05 cm^-1.
inline constexpr double kTorsionMatchToleranceCm1 = 0.05;
// Standard pressures accepted: the two conventions, within rounding of the written value.
inline constexpr double kPressureRelativeTolerance = 1.0e-9;

// Plausibility bands. Values outside them are typing mistakes or hostile input, and some of them
// drive the statistical-mechanics engine into overflow (NaN or inf results) or into sums that
// never end (docs/robustness.md lists the cases). Each band is wide around what real molecules
// show; none of them bites on a real species.
// Rotational constants (also torsional ones), cm^-1: H2 has the largest of any molecule,
// B_e = 60.85 cm^-1 (Huber & Herzberg 1979, from memory); C60 is near 0.0028 cm^-1 (from memory).
inline constexpr double kMinRotationalConstantCm1 = 1.0e-6;
inline constexpr double kMaxRotationalConstantCm1 = 1.0e3;
// Harmonic wavenumbers, cm^-1: the highest is H2's 4401 cm^-1 (Huber & Herzberg 1979, from
// memory); a mode below 1 cm^-1 is numerical noise of a frequency calculation (common practice).
inline constexpr double kMinWavenumberCm1 = 1.0;
inline constexpr double kMaxWavenumberCm1 = 1.0e4;
// Frequency scale factors in use lie between about 0.85 and 1.1 (common practice).
inline constexpr double kMinFrequencyScale = 0.5;
inline constexpr double kMaxFrequencyScale = 2.0;
// Dunham-type constants, cm^-1 (magnitude): the strongest bond, CO, has D_0 near 89,500 cm^-1
// (11.1 eV, from memory); every other constant is far smaller.
inline constexpr double kMaxSpectroscopicConstantCm1 = 1.0e5;
// De / Be above which a diatomic's constants are refused (see ReadDiatomicState).
inline constexpr double kMaxCentrifugalToRotational = 1.0e-2;
// Degeneracies (electronic levels, nuclear-spin weights): lumped atomic manifolds reach a few
// hundred (common practice).
inline constexpr double kMaxDegeneracy = 1.0e6;
// |formation enthalpy|, J/mol: gas-phase ions of light elements reach about 1e4 kJ/mol
// (He2+: 7.6e3 kJ/mol from its ionisation energies, from memory).
inline constexpr double kMaxFormationEnthalpyJPerMol = 1.0e8;
// Torsional barriers and Fourier terms, J/mol: real barriers are below about 100 kJ/mol
// (common practice); far above, the mode is a vibration, not a torsion.
inline constexpr double kMaxTorsionBarrierJPerMol = 1.0e6;
// |coordinate| in a geometry, angstrom: molecules are nanometres across.
inline constexpr double kMaxCoordinateAngstrom = 1.0e3;

// Tabulated species (tabulated-cp). Three rows at least: the interpolant's end slopes are
// three-point formulas, and the Wilhoit extrapolation is matched to the value and slope at each
// end. At most 10000 rows, far beyond any evaluated table (hostile-input bound).
inline constexpr std::size_t kMinTabulatedPoints = 3;
inline constexpr std::size_t kMaxTabulatedPoints = 10000;
// Cp, J/(mol K): a species of 1000 atoms reaches about 3 N R = 2.5e4 J/(mol K) classically.
inline constexpr double kMaxTabulatedCpJPerMolK = 1.0e5;
// |S| and |H - H298| bands of the optional columns, J/(mol K) and J/mol.
inline constexpr double kMaxTabulatedEntropyJPerMolK = 1.0e5;
inline constexpr double kMaxTabulatedEnthalpyJPerMol = 1.0e9;
// The H - H298 and S columns must equal the integrals of the interpolated Cp within this
// fraction of the integral's size (|H - H298|, resp. the integral of Cp/T from the first row)
// plus the last printed digit (kTabulatedEnthalpyRoundingJPerMol, kTabulatedEntropyRounding...).
// Piecewise-cubic interpolation between rows 100 K apart, as evaluated tables print them, moves
// the integrals by less than 0.1 % on smooth Cp (tests/statmech_test.cc shows it on CO2), so a
// larger mismatch means the columns do not belong to the Cp column.
inline constexpr double kTabulatedConsistencyRelative = 2.0e-3;
// Tables print H - H298 to 0.001 kJ/mol and S to 0.001 J/(mol K); twice that absorbs rounding.
inline constexpr double kTabulatedEnthalpyRoundingJPerMol = 2.0;
inline constexpr double kTabulatedEntropyRoundingJPerMolK = 2.0e-3;

// A torsion's replaces tolerance and the other rules above, as documented, are also the values
// the engine relies on: statmech never re-derives them.

}  // namespace schema

// The maps of a species file whose keys the table lists.
enum class KeySection {
  kTop,                 // the file's top level
  kDefaults,            // defaults
  kSpecies,             // one species' map
  kFitTemperatures,     // fit-temperatures
  kFitThresholds,       // fit-thresholds
  kFitErrorScales,      // fit-error-scales
  kRovibrationalMap,    // rovibrational-constants, map form (the ground state)
  kRovibrationalState,  // rovibrational-constants, one item of the list form
  kSpinStatistics,      // spin-statistics
  kHinderedRotor,       // one item of hindered-rotors
  kTabulatedCp,         // tabulated-cp
};
// The section's name as the documentation's key reference writes it: "top level", "defaults",
// "species", "fit-temperatures", ...
std::string ToString(KeySection section);

// One key of the schema. Texts are as docs/species-schema.md shows them in its key reference
// (empty: the cell is empty); bands and defaults are rendered from the constants and default
// values the code uses, so a changed value changes the text.
struct KeySpec {
  KeySection section;
  std::string key;
  std::string kind;        // what the value is: "chemical formula", "list", ...
  std::string unit;        // unit of a bare number, then the other units accepted
  std::string band;        // the plausibility band or rule checked on the value
  std::string applies_to;  // which species may give it
  std::string required;    // "yes", "no", or the condition
  std::string default_value;
};

// Every key, sections in the order above and keys in the order messages list them.
const std::vector<KeySpec>& KeyTable();
// The keys of one section, in table order.
const std::vector<std::string>& KeysOf(KeySection section);

}  // namespace sevenfold

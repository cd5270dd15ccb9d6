// SPDX-License-Identifier: MIT
// Physical constants used by the engine, SI units. Sources in docs/theory.md [CODATA2018].
#pragma once

namespace sevenfold::constants {

// CODATA 2018, exact (SI 2019 defining constants).
inline constexpr double kPlanck = 6.62607015e-34;          // J s
inline constexpr double kSpeedOfLight = 299792458.0;       // m/s
inline constexpr double kBoltzmann = 1.380649e-23;         // J/K
inline constexpr double kAvogadro = 6.02214076e23;         // 1/mol
inline constexpr double kElementaryCharge = 1.602176634e-19;  // C

// Derived from the exact constants above, hence exact up to rounding.
inline constexpr double kGasConstant = kAvogadro * kBoltzmann;  // J/(mol K)
// Second radiation constant h c / k in cm K: converts a wavenumber in cm^-1 to kelvin.
inline constexpr double kWavenumberToKelvin = kPlanck * kSpeedOfLight * 100.0 / kBoltzmann;
// Energy per mole of one cm^-1, in J/mol.
inline constexpr double kWavenumberToJoulePerMol = kPlanck * kSpeedOfLight * 100.0 * kAvogadro;

// CODATA 2018, measured (relative standard uncertainty 3.0e-10).
inline constexpr double kAtomicMassUnit = 1.66053906660e-27;  // kg
// CODATA 2018, measured (relative standard uncertainty 3.0e-10).
inline constexpr double kElectronMass = 9.1093837015e-31;     // kg
// CODATA 2018 electron relative atomic mass A_r(e).
inline constexpr double kElectronMassInAmu = 5.48579909065e-4;

// Thermochemical conventions (IUPAC): standard pressure 1 bar; the older 1 atm.
inline constexpr double kStandardPressureBar = 1.0e5;  // Pa
inline constexpr double kStandardPressureAtm = 101325.0;  // Pa, exact by definition
// Reference temperature of formation enthalpies.
inline constexpr double kReferenceTemperature = 298.15;  // K
// The lowest and highest temperatures the exact engine accepts, K: below 10 K an ideal gas is
// no model of anything we fit; above 20,000 K ionisation, which the engine does not model,
// dominates. The species reader, the engine and the checks all use these two.
inline constexpr double kMinTemperatureK = 10.0;
inline constexpr double kMaxTemperatureK = 20000.0;
// Thermochemical calorie, exact by definition.
inline constexpr double kCalorie = 4.184;  // J

// 1 amu * angstrom^2 in kg m^2.
inline constexpr double kAmuAngstrom2 = kAtomicMassUnit * 1.0e-20;
// B [cm^-1] = kRotationalConstantTimesInertia / I [amu angstrom^2]; h / (8 pi^2 c I) with c in cm/s.
inline constexpr double kPi = 3.14159265358979323846;
inline constexpr double kRotationalConstantTimesInertia =
    kPlanck / (8.0 * kPi * kPi * kSpeedOfLight * 100.0 * kAmuAngstrom2);

}  // namespace sevenfold::constants

// SPDX-License-Identifier: MIT
// The exact engine against published tables, a reference library and exact limits.
#include <array>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "core/constants.h"
#include "statmech/harmonic.h"
#include "statmech/rotor.h"
#include "statmech/species_thermo.h"
#include "statmech/translation.h"

namespace sevenfold {
namespace {

using constants::kGasConstant;
using constants::kWavenumberToKelvin;

double RelativeDifference(double value, double reference) {
  return std::abs(value - reference) / std::abs(reference);
}

Species Molecule(const std::string& name, std::vector<std::pair<std::string, int>> composition,
                 Shape shape, double symmetry, std::vector<double> rotational_cm1,
                 std::vector<double> vibrations_cm1) {
  Species species;
  species.name = name;
  species.composition = std::move(composition);
  species.shape = shape;
  species.symmetry_number = symmetry;
  species.rotational_constants_cm1 = std::move(rotational_cm1);
  species.vibrations_cm1 = std::move(vibrations_cm1);
  return species;
}

// Rigid-rotor / harmonic-oscillator inputs. Rotational constants are ground-state B0 and the
// vibrations fundamentals, from memory of the NIST Chemistry WebBook / Herzberg's compilations;
// exact digits matter little since the model itself is ~1 % off real tables at 1000 K.
Species Nitrogen() { return Molecule("N2", {{"N", 2}}, Shape::kLinear, 2, {1.9896}, {2329.9}); }
Species CarbonMonoxide() {
  return Molecule("CO", {{"C", 1}, {"O", 1}}, Shape::kLinear, 1, {1.9225}, {2143.3});
}
Species Oxygen() {
  Species o2 = Molecule("O2", {{"O", 2}}, Shape::kLinear, 2, {1.4377}, {1556.4});
  // X 3Sigma_g-, a 1Delta_g at 7918.1 cm^-1, b 1Sigma_g+ at 13195.1 cm^-1 (from memory,
  // Huber & Herzberg 1979).
  o2.electronic_levels = {{0.0, 3.0}, {7918.1, 2.0}, {13195.1, 1.0}};
  return o2;
}
Species CarbonDioxide() {
  return Molecule("CO2", {{"C", 1}, {"O", 2}}, Shape::kLinear, 2, {0.39021},
                  {1333.0, 667.4, 667.4, 2349.2});
}
Species Water() {
  return Molecule("H2O", {{"H", 2}, {"O", 1}}, Shape::kNonlinear, 2, {27.88, 14.51, 9.28},
                  {3657.1, 1594.7, 3755.9});
}
Species Methane() {
  return Molecule("CH4", {{"C", 1}, {"H", 4}}, Shape::kNonlinear, 12, {5.241, 5.241, 5.241},
                  {2917, 1534, 1534, 3019, 3019, 3019, 1306, 1306, 1306});
}
Species Argon() { return Molecule("Ar", {{"Ar", 1}}, Shape::kAtom, 1, {}, {}); }

struct TableValue {
  double t_k;
  double cp;  // J/(mol K)
  double s;   // J/(mol K), 1 bar
};

// JANAF Thermochemical Tables, 4th ed. (Chase 1998), ideal gas at 1 bar; values quoted to
// 0.001 J/(mol K), from memory.
struct JanafCase {
  const char* name;
  Species (*make)();
  TableValue at_298;
  TableValue at_1000;
};
const JanafCase kJanaf[] = {
    {"N2", Nitrogen, {298.15, 29.124, 191.609}, {1000, 32.697, 228.170}},
    {"O2", Oxygen, {298.15, 29.376, 205.147}, {1000, 34.870, 243.578}},
    {"CO", CarbonMonoxide, {298.15, 29.142, 197.653}, {1000, 33.183, 234.538}},
    {"CO2", CarbonDioxide, {298.15, 37.129, 213.795}, {1000, 54.308, 269.299}},
    {"H2O", Water, {298.15, 33.587, 188.834}, {1000, 41.268, 232.738}},
    {"CH4", Methane, {298.15, 35.695, 186.251}, {1000, 71.795, 247.549}},
    {"Ar", Argon, {298.15, 20.786, 154.845}, {1000, 20.786, 179.999}},
};

// The rigid-rotor / harmonic-oscillator model misses anharmonicity, rotation-vibration coupling
// and Fermi resonance: about 0.5 % at 298.15 K and about 1 % at 1000 K in Cp, less in S
// (common practice). CH4 at 1000 K is the worst of these (many soft, anharmonic bends).
constexpr double kRrhoCpTolerance298 = 0.006;
constexpr double kRrhoCpTolerance1000 = 0.015;
constexpr double kRrhoSTolerance = 0.003;

TEST_CASE("rigid-rotor harmonic model reproduces JANAF Cp and S within the model's accuracy",
          "[statmech]") {
  for (const JanafCase& reference : kJanaf) {
    const SpeciesThermo thermo(reference.make());
    for (const TableValue& row : {reference.at_298, reference.at_1000}) {
      const ThermoPoint point = thermo.At(row.t_k);
      const double cp_deviation = RelativeDifference(point.cp_j_per_mol_k, row.cp);
      const double s_deviation = RelativeDifference(point.s_j_per_mol_k, row.s);
      INFO(reference.name << " at " << row.t_k << " K: Cp " << point.cp_j_per_mol_k << " vs "
                          << row.cp << ", S " << point.s_j_per_mol_k << " vs " << row.s);
      std::printf("JANAF check %-4s %7.2f K  Cp %8.3f (JANAF %8.3f, %+.2f %%)  S %8.3f (JANAF "
                  "%8.3f, %+.3f %%)\n",
                  reference.name, row.t_k, point.cp_j_per_mol_k, row.cp,
                  100 * (point.cp_j_per_mol_k / row.cp - 1), point.s_j_per_mol_k, row.s,
                  100 * (point.s_j_per_mol_k / row.s - 1));
      CHECK(cp_deviation < (row.t_k < 500 ? kRrhoCpTolerance298 : kRrhoCpTolerance1000));
      CHECK(s_deviation < kRrhoSTolerance);
    }
  }
}

TEST_CASE("an atom has Cp = 5/2 R at every temperature", "[statmech]") {
  const SpeciesThermo argon(Argon());
  for (double t : {10.0, 77.0, 298.15, 1000.0, 6000.0, 20000.0}) {
    // 5/2 R exactly (equipartition of three translational degrees plus p V); rounding only.
    CHECK(argon.At(t).cp_j_per_mol_k == Approx(2.5 * kGasConstant).epsilon(1e-14));
  }
}

TEST_CASE("translational entropy equals the Sackur-Tetrode equation", "[statmech]") {
  // Sackur-Tetrode written out independently: S/R = ln[(2 pi m k T/h^2)^(3/2) k T / p] + 5/2,
  // with CODATA 2018 constants typed here again. The mass is the engine's own (the atomic
  // weight table is checked against IUPAC in core_test): this checks the formula.
  const double h = 6.62607015e-34, k = 1.380649e-23, n_a = 6.02214076e23;
  const double m = Argon().MolarMassKgPerMol() / n_a;
  for (double t : {50.0, 298.15, 5000.0}) {
    for (double p : {1.0e5, 101325.0}) {
      const double expected =
          8.314462618 *
          (std::log(std::pow(2 * 3.141592653589793 * m * k * t / (h * h), 1.5) * k * t / p) + 2.5);
      Species argon = Argon();
      argon.standard_pressure_pa = p;
      // Relative 1e-9: the only difference is the rounding of R to 10 digits above.
      CHECK(SpeciesThermo(argon).At(t).s_j_per_mol_k == Approx(expected).epsilon(1e-9));
    }
  }
}

TEST_CASE("explicit rotor sum at T = 5 theta gives 5.35 against 5.0 classically", "[statmech]") {
  // A linear rotor with rotational temperature 15.4 K at 77 K: the explicit sum is about 5.35,
  // the classical T/theta exactly 5.0 (common practice, no source).
  const double theta = 15.4;
  const RotorContribution rotor = RotorContribution::Linear(theta / kWavenumberToKelvin, 1.0);
  const double q = std::exp(rotor.At(77.0).ln_q);
  CHECK(q == Approx(5.35).margin(0.005));
  CHECK(77.0 / theta == Approx(5.0));
  // The classical value is 6 % too low here: the quantum sum matters at this temperature.
  CHECK(q / 5.0 - 1.0 > 0.06);
}

TEST_CASE("explicit linear-rotor sum converges to the classical series", "[statmech]") {
  // q ~ (T/theta)(1 + theta/3T + theta^2/15T^2 + 4 theta^3/315T^3) (Mulholland's expansion;
  // McQuarrie 2000, problem 6-..., from memory). The next term is of order (theta/T)^4,
  // so at T = 20 theta the two agree to about 1e-6 and at T = 25 theta better still.
  const double theta = 2.0;
  const RotorContribution rotor = RotorContribution::Linear(theta / kWavenumberToKelvin, 1.0);
  for (double ratio : {20.0, 25.0}) {
    const double t = ratio * theta;
    REQUIRE(t < rotor.switch_temperature_k());  // this is the explicit sum
    const double x = theta / t;
    const double series = (1 / x) * (1 + x / 3 + x * x / 15 + 4 * x * x * x / 315);
    CHECK(RelativeDifference(std::exp(rotor.At(t).ln_q), series) < std::pow(x, 4));
  }
}

TEST_CASE("rotor hand-over from explicit sum to series is continuous to rounding", "[statmech]") {
  const std::vector<RotorContribution> rotors = {
      RotorContribution::Linear(1.9896, 2.0),
      RotorContribution::Nonlinear({27.88, 14.51, 9.28}, 2.0),     // asymmetric (H2O)
      RotorContribution::Nonlinear({5.241, 5.241, 5.241}, 12.0),   // spherical (CH4)
      RotorContribution::Nonlinear({6.196, 9.444, 9.444}, 3.0),    // oblate (NH3, from memory)
  };
  for (const RotorContribution& rotor : rotors) {
    const double t = rotor.switch_temperature_k();
    const Moments below = rotor.At(t * (1 - 1e-13));
    const Moments above = rotor.At(t * (1 + 1e-13));
    // Matching is exact by construction; what is left is rounding in a sum of O(1) terms and
    // the 1e-13 step in T itself (which moves <E> by ~1e-13 relative).
    CHECK(RelativeDifference(above.ln_q, below.ln_q) < 1e-12);
    CHECK(RelativeDifference(above.mean_energy_k, below.mean_energy_k) < 1e-12);
    CHECK(RelativeDifference(above.energy_variance_k2, below.energy_variance_k2) < 1e-11);
  }
}

TEST_CASE("heteronuclear rigid rotor heat capacity peaks above R near 0.8 theta", "[statmech]") {
  // The rotational heat capacity of a heteronuclear rigid rotor overshoots R to about 1.1 R at
  // T ~ 0.8 theta before falling back to R (common practice; McQuarrie 2000, fig. 6-4, from
  // memory).
  const double theta = 100.0;
  const RotorContribution rotor = RotorContribution::Linear(theta / kWavenumberToKelvin, 1.0);
  double best_cv = 0.0, best_t = 0.0;
  for (double t = 30.0; t <= 300.0; t += 0.5) {
    const Moments m = rotor.At(t);
    const double cv_over_r = m.energy_variance_k2 / (t * t);
    if (cv_over_r > best_cv) best_cv = cv_over_r, best_t = t;
  }
  CHECK(best_cv > 1.05);
  CHECK(best_cv < 1.15);
  CHECK(best_t / theta > 0.7);
  CHECK(best_t / theta < 0.95);
  // And it tends to R (classical) at high temperature: within (theta/T)^2 / 45 (series).
  const Moments hot = rotor.At(3000.0);
  CHECK(hot.energy_variance_k2 / (3000.0 * 3000.0) == Approx(1.0).margin(1e-4));
}

TEST_CASE("asymmetric top with A = B reproduces the symmetric-top closed form", "[statmech]") {
  // Oblate symmetric top: E(J,K) = B J(J+1) + (C - B) K^2, each |K| > 0 twice (closed form).
  const double a = 9.0, b = 9.0, c = 5.0;
  for (int j : {0, 1, 2, 7, 20}) {
    std::vector<double> numeric = AsymmetricTopLevels(j, a, b, c);
    std::vector<double> closed;
    for (int k = -j; k <= j; ++k) closed.push_back(b * j * (j + 1.0) + (c - b) * k * k);
    std::sort(numeric.begin(), numeric.end());
    std::sort(closed.begin(), closed.end());
    REQUIRE(numeric.size() == closed.size());
    for (size_t i = 0; i < closed.size(); ++i) {
      // Eigenvalues of a tridiagonal matrix of norm ~ B J^2: rounding ~ 1e-13 of that norm.
      CHECK(numeric[i] == Approx(closed[i]).margin(1e-11 * b * (j + 1) * (j + 1)));
    }
  }
  // The whole partition function: a nearly symmetric top through the asymmetric path equals the
  // exact symmetric one to the order of the asymmetry.
  const RotorContribution symmetric = RotorContribution::Nonlinear({9.444, 9.444, 6.196}, 3.0);
  const RotorContribution nearly = RotorContribution::Nonlinear({9.444 * (1 + 1e-9), 9.444, 6.196}, 3.0);
  for (double t : {10.0, 30.0, 100.0}) {
    CHECK(nearly.At(t).ln_q == Approx(symmetric.At(t).ln_q).epsilon(1e-8));
  }
}

TEST_CASE("asymmetric-top quantum sum approaches the classical value at high temperature",
          "[statmech]") {
  // H2O constants (from memory, cm^-1). q_cl = sqrt(pi T^3 / (thA thB thC)); the relative
  // difference falls like theta/T (first semiclassical correction ~ 0.5 theta_A / 12 T).
  const double a = 27.88 * kWavenumberToKelvin, b = 14.51 * kWavenumberToKelvin,
               c = 9.28 * kWavenumberToKelvin;
  const RotorContribution rotor = RotorContribution::Nonlinear({27.88, 14.51, 9.28}, 1.0);
  double previous = 1.0;
  for (double t : {50.0, 200.0, 800.0}) {
    REQUIRE(t < rotor.switch_temperature_k());
    const double classical = std::sqrt(3.141592653589793 * t * t * t / (a * b * c));
    const double deviation = RelativeDifference(std::exp(rotor.At(t).ln_q), classical);
    CHECK(deviation < a / t);
    CHECK(deviation < previous);
    previous = deviation;
  }
}

TEST_CASE("harmonic oscillator moments match the Einstein functions", "[statmech]") {
  // Einstein function Cv/R = x^2 e^x / (e^x - 1)^2 at x = 1: 0.920674 (Abramowitz & Stegun
  // style tables; from memory; value also follows from the formula by hand to 6 digits).
  const Moments m = HarmonicMoments({300.0}, 300.0);
  CHECK(m.energy_variance_k2 / (300.0 * 300.0) == Approx(0.920674).epsilon(1e-6));
  // Classical limit: Cv -> R and <E> -> T - theta/2 + theta^2/(12 T) (expansion of
  // theta / (e^x - 1) in x; common practice).
  const Moments hot = HarmonicMoments({10.0}, 1.0e4);
  CHECK(hot.energy_variance_k2 / 1.0e8 == Approx(1.0).epsilon(1e-6));
  CHECK(hot.mean_energy_k == Approx(1.0e4 - 5.0 + 100.0 / 1.2e5).epsilon(1e-12));
}

TEST_CASE("every temperature from 10 K to 20000 K gives finite values and others an error",
          "[statmech]") {
  for (const JanafCase& reference : kJanaf) {
    const SpeciesThermo thermo(reference.make());
    for (double t = 10.0; t <= 20000.0; t *= 1.07) {
      const ThermoPoint p = thermo.At(t);
      REQUIRE(std::isfinite(p.cp_j_per_mol_k));
      REQUIRE(std::isfinite(p.s_j_per_mol_k));
      REQUIRE(std::isfinite(p.h_j_per_mol));
      REQUIRE(p.cp_j_per_mol_k >= 2.5 * kGasConstant * (1 - 1e-12));
    }
    REQUIRE_THROWS_WITH(thermo.At(5.0), Catch::Contains("outside the supported range"));
    REQUIRE_THROWS_WITH(thermo.At(25000.0), Catch::Contains("outside the supported range"));
  }
}

// Runs Debian's python3-ase IdealGasThermo and returns its printed numbers, or an empty vector
// when ASE is unavailable.
std::vector<double> RunAse(const std::string& script) {
  const std::string command = "/usr/bin/python3 -c '" + script + "' 2>/dev/null";
  FILE* pipe = popen(command.c_str(), "r");
  if (pipe == nullptr) return {};
  std::vector<double> values;
  double value = 0.0;
  while (std::fscanf(pipe, "%lf", &value) == 1) values.push_back(value);
  pclose(pipe);
  return values;
}

TEST_CASE("entropy and enthalpy agree with python3-ase ideal-gas thermochemistry", "[statmech]") {
  // ASE's IdealGasThermo (Cramer, Essentials of Computational Chemistry, 2004, ch. 10) uses a
  // classical rotor and harmonic vibrations. It prints: I (amu A^2, principal, ascending),
  // then S at 298.15 and 1000 K (eV/K, at 1e5 Pa) and H(1000) - H(298.15) (eV).
  const std::string header =
      "import numpy as np\n"
      "from ase import Atoms\n"
      "from ase.thermochemistry import IdealGasThermo\n"
      "from ase.units import invcm\n";
  struct Case {
    const char* atoms;
    const char* geometry;
    int symmetry;
    std::vector<double> vibrations_cm1;
    std::vector<std::pair<std::string, int>> composition;
  };
  const std::vector<Case> cases = {
      // CO2, C=O 1.1600 A (from memory); water, O-H 0.9572 A, 104.52 deg (from memory).
      {"[(\"C\",(0,0,0)),(\"O\",(0,0,1.16)),(\"O\",(0,0,-1.16))]", "linear", 2,
       {1333.0, 667.4, 667.4, 2349.2}, {{"C", 1}, {"O", 2}}},
      {"[(\"O\",(0,0,0)),(\"H\",(0,0.7572,0.5865)),(\"H\",(0,-0.7572,0.5865))]", "nonlinear", 2,
       {3657.1, 1594.7, 3755.9}, {{"H", 2}, {"O", 1}}},
  };
  for (const Case& c : cases) {
    std::ostringstream vib;
    for (double w : c.vibrations_cm1) vib << w << ",";
    const std::string script =
        header + "spec=" + c.atoms + "\n" +
        "atoms=Atoms([s for s,_ in spec], positions=[p for _,p in spec])\n"
        "vib=np.array([" + vib.str() + "])*invcm\n"
        "th=IdealGasThermo(vib_energies=vib, geometry=\"" + c.geometry +
        "\", atoms=atoms, symmetrynumber=" + std::to_string(c.symmetry) +
        ", spin=0, potentialenergy=0.0)\n"
        "print(*sorted(atoms.get_moments_of_inertia()))\n"
        "print(th.get_entropy(298.15, 1e5, verbose=False), th.get_entropy(1000, 1e5, "
        "verbose=False))\n"
        "print(th.get_enthalpy(1000, verbose=False)-th.get_enthalpy(298.15, verbose=False))\n"
        "print(sum(atoms.get_masses()))\n";
    const std::vector<double> ase = RunAse(script);
    if (ase.empty()) {
      WARN("python3-ase not available: comparison skipped (.ci/run installs it)");
      return;
    }
    REQUIRE(ase.size() == 7);
    // eV -> J/mol with CODATA 2018: e N_A.
    const double ev_per_k_to_si = 1.602176634e-19 * 6.02214076e23;
    Species species;
    species.name = "ase";
    species.composition = c.composition;
    species.symmetry_number = c.symmetry;
    species.vibrations_cm1 = c.vibrations_cm1;
    if (std::string(c.geometry) == "linear") {
      species.shape = Shape::kLinear;
      species.rotational_constants_cm1 = {constants::kRotationalConstantTimesInertia / ase[2]};
    } else {
      species.shape = Shape::kNonlinear;
      for (int i = 0; i < 3; ++i) {
        species.rotational_constants_cm1.push_back(constants::kRotationalConstantTimesInertia /
                                                   ase[i]);
      }
    }
    const SpeciesThermo thermo(species);
    // ASE takes the mass from its own table and CODATA 2014 units; our molar mass is IUPAC.
    // Those differ by < 1e-5 relative, far below the comparison tolerance of 1e-4 relative.
    INFO("ASE molar mass " << ase[6] << " g/mol, ours " << species.MolarMassKgPerMol() * 1e3);
    CHECK(RelativeDifference(species.MolarMassKgPerMol() * 1e3, ase[6]) < 1e-4);
    // Classical-rotor regime: the first quantum correction cancels in S, and the second is
    // (theta/T)^2 < 1e-4 even for water at 298 K, so 1e-4 relative holds for S and H.
    constexpr double kAseTolerance = 1e-4;
    CHECK(RelativeDifference(thermo.At(298.15).s_j_per_mol_k, ase[3] * ev_per_k_to_si) <
          kAseTolerance);
    CHECK(RelativeDifference(thermo.At(1000.0).s_j_per_mol_k, ase[4] * ev_per_k_to_si) <
          kAseTolerance);
    CHECK(RelativeDifference(thermo.At(1000.0).h_minus_h298_j_per_mol, ase[5] * ev_per_k_to_si) <
          kAseTolerance);
  }
}

}  // namespace
}  // namespace sevenfold

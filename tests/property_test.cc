// SPDX-License-Identifier: MIT
// Properties that must hold for every physically possible input, checked over a generated
// (fixed-seed) range of species and temperatures (docs/robustness.md): finite values, the ideal-gas
// floor Cp >= 5/2 R, S and H increasing in T, the identities dH/dT = Cp and dS/dT = Cp/T by
// independent numerical differentiation, continuity of fitted polynomials at T_mid, and
// byte-identical output of `fit` for identical input.
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "core/constants.h"
#include "fit/fitter.h"
#include "fit/polynomial.h"
#include "mechanism/regenerate.h"
#include "species/species.h"
#include "statmech/species_thermo.h"

namespace {

using sevenfold::Shape;
using sevenfold::Species;
using sevenfold::SpeciesThermo;
using sevenfold::ThermoPoint;
using sevenfold::constants::kGasConstant;

// A small deterministic generator (SplitMix64, Steele, Lea & Flood 2014): the same numbers on
// every platform, unlike the std distributions whose algorithms are implementation-defined.
class Generator {
 public:
  explicit Generator(std::uint64_t seed) : state_(seed) {}
  std::uint64_t Next() {
    std::uint64_t z = (state_ += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
  }
  // Uniform in [0, 1).
  double Uniform() { return static_cast<double>(Next() >> 11) * 0x1.0p-53; }
  // Log-uniform in [low, high].
  double LogUniform(double low, double high) {
    return low * std::exp(Uniform() * std::log(high / low));
  }
  int Integer(int low, int high) {  // inclusive
    return low + static_cast<int>(Next() % static_cast<std::uint64_t>(high - low + 1));
  }

 private:
  std::uint64_t state_;
};

// The ranges of the issue: rotational constants 1e-4..100 cm^-1, wavenumbers 10..4500 cm^-1.
constexpr double kMinRotationalCm1 = 1.0e-4, kMaxRotationalCm1 = 100.0;
constexpr double kMinWavenumberCm1 = 10.0, kMaxWavenumberCm1 = 4500.0;
// Elements to draw compositions from: light to heavy, so molar masses span 2 to a few hundred
// g/mol.
const char* const kElements[] = {"H", "D", "C", "N", "O", "F", "S", "Cl", "Br", "I"};

// A physically possible species: linear or nonlinear, 2 to 8 atoms, 3N-5 or 3N-6 modes.
Species MakeSpecies(Generator& random, int index) {
  Species species;
  species.name = "P" + std::to_string(index);
  const bool linear = random.Uniform() < 0.4;
  const int num_atoms = linear ? random.Integer(2, 5) : random.Integer(3, 8);
  std::vector<std::pair<std::string, int>> composition;
  for (int i = 0; i < num_atoms; ++i) {
    const std::string element = kElements[random.Integer(0, 9)];
    auto it = std::find_if(composition.begin(), composition.end(),
                           [&](const auto& entry) { return entry.first == element; });
    if (it == composition.end()) {
      composition.emplace_back(element, 1);
    } else {
      ++it->second;
    }
  }
  species.composition = composition;
  species.shape = linear ? Shape::kLinear : Shape::kNonlinear;
  species.symmetry_number = random.Uniform() < 0.5 ? 1.0 : 2.0;
  if (linear) {
    species.rotational_constants_cm1 = {random.LogUniform(kMinRotationalCm1, kMaxRotationalCm1)};
  } else {
    // Principal moments obey I_A <= I_B <= I_C <= I_A + I_B (the triangle inequality of a rigid
    // body; equality for a planar one). Draw A >= B, then C between AB/(A+B) and B. A and B start
    // at twice the range's floor so that C >= B/2 stays inside it.
    double a = random.LogUniform(2.0 * kMinRotationalCm1, kMaxRotationalCm1);
    double b = random.LogUniform(2.0 * kMinRotationalCm1, kMaxRotationalCm1);
    if (a < b) std::swap(a, b);
    const double c = random.LogUniform(a * b / (a + b), b);
    species.rotational_constants_cm1 = {a, b, c};
  }
  const int num_modes = linear ? 3 * num_atoms - 5 : 3 * num_atoms - 6;
  for (int k = 0; k < num_modes; ++k) {
    species.vibrations_cm1.push_back(random.LogUniform(kMinWavenumberCm1, kMaxWavenumberCm1));
  }
  species.temperatures.low_k = 200.0;
  species.temperatures.high_k = 6000.0;
  species.location.file = "generated";
  return species;
}

// Builds the generated species. Pure generation: no physics is assumed here.
std::vector<Species> MakeSpeciesSet(std::uint64_t seed, int count) {
  Generator random(seed);
  std::vector<Species> all;
  for (int i = 0; i < count; ++i) all.push_back(MakeSpecies(random, i));
  return all;
}

std::string Describe(const Species& species) {
  std::ostringstream text;
  text << species.name << " " << (species.shape == Shape::kLinear ? "linear" : "nonlinear")
       << " sigma " << species.symmetry_number << " B";
  for (double b : species.rotational_constants_cm1) text << " " << b;
  text << " nu";
  for (double nu : species.vibrations_cm1) text << " " << nu;
  return text.str();
}

// Number of generated species and temperatures per species: enough to cover the ranges, small
// enough for a few seconds in Release and well under a minute with sanitizers.
constexpr int kNumSpecies = 40;
constexpr int kNumTemperatures = 25;
constexpr std::uint64_t kSeed = 20261202;

// Relative step of the numerical derivatives: h = kStep * T. The derivative uses the
// five-point stencil f'(T) = [f(T-2h) - 8 f(T-h) + 8 f(T+h) - f(T+2h)] / (12 h), whose truncation
// error is h^4 f^(5) / 30. For a harmonic mode, T^4 f^(5) / f' is bounded by a few hundred
// (x^6 e^-x, x = theta/T, peaks near 6^6 e^-6 = 117), so the truncation error relative to f' is
// about 1e-12 * 117 / 30 = 4e-12 at kStep = 1e-3. Rounding: each value carries about 1e-16 of
// relative error on magnitudes up to |f| ~ T f' (H) or f ~ 50 f'T (S), giving 1e-16 * 50 / 1e-3 =
// 5e-12 relative. Hand-overs between quantum sums and classical asymptotics are continuous to
// about 1e-12 relative; a stencil straddling one adds up to 1e-12 * 50 / 1e-3 = 5e-8.
constexpr double kStep = 1.0e-3;
// Tolerance on |numerical - analytic| / analytic: the hand-over bound 5e-8 above with a factor of
// two of margin; truncation and rounding alone are four orders smaller.
constexpr double kDerivativeTolerance = 1.0e-7;
// Cp >= 5/2 R: translation alone gives exactly 5/2 R and every other contribution is a variance
// (>= 0). Allow the rounding of a sum of a few terms.
constexpr double kFloorTolerance = 1.0e-12;
// Continuity of the fitted polynomial at T_mid (DESIGN.md: "to ~1e-12 relative").
constexpr double kContinuityTolerance = 1.0e-12;

double FivePoint(double f_m2, double f_m1, double f_p1, double f_p2, double h) {
  return (f_m2 - 8.0 * f_m1 + 8.0 * f_p1 - f_p2) / (12.0 * h);
}

TEST_CASE("generated species give finite Cp, H and S with Cp at least 5/2 R", "[property]") {
  Generator random(kSeed + 1);
  for (const Species& species : MakeSpeciesSet(kSeed, kNumSpecies)) {
    INFO(Describe(species));
    const SpeciesThermo thermo(species);
    std::vector<double> temperatures = {sevenfold::kMinTemperatureK, sevenfold::kMaxTemperatureK};
    for (int i = 0; i < kNumTemperatures; ++i) {
      temperatures.push_back(
          random.LogUniform(sevenfold::kMinTemperatureK, sevenfold::kMaxTemperatureK));
    }
    std::sort(temperatures.begin(), temperatures.end());
    const std::vector<ThermoPoint> points = thermo.Tabulate(temperatures);
    for (std::size_t i = 0; i < points.size(); ++i) {
      const ThermoPoint& p = points[i];
      INFO("T = " << p.t_k << " K");
      REQUIRE(std::isfinite(p.cp_j_per_mol_k));
      REQUIRE(std::isfinite(p.s_j_per_mol_k));
      REQUIRE(std::isfinite(p.h_j_per_mol));
      CHECK(p.cp_j_per_mol_k >= 2.5 * kGasConstant * (1.0 - kFloorTolerance));
      if (i > 0 && p.t_k > points[i - 1].t_k) {
        // Strictly increasing, since Cp > 0.
        CHECK(p.s_j_per_mol_k > points[i - 1].s_j_per_mol_k);
        CHECK(p.h_j_per_mol > points[i - 1].h_j_per_mol);
      }
    }
  }
}

TEST_CASE("dH/dT equals Cp and dS/dT equals Cp/T by numerical differentiation", "[property]") {
  Generator random(kSeed + 2);
  double worst_h = 0.0, worst_s = 0.0;
  for (const Species& species : MakeSpeciesSet(kSeed, kNumSpecies)) {
    INFO(Describe(species));
    const SpeciesThermo thermo(species);
    for (int i = 0; i < kNumTemperatures; ++i) {
      // Keep the stencil inside the accepted range.
      const double t = random.LogUniform(sevenfold::kMinTemperatureK * (1.0 + 3.0 * kStep),
                                         sevenfold::kMaxTemperatureK * (1.0 - 3.0 * kStep));
      const double h = kStep * t;
      const std::vector<ThermoPoint> p =
          thermo.Tabulate({t - 2.0 * h, t - h, t, t + h, t + 2.0 * h});
      const double cp = p[2].cp_j_per_mol_k;
      // H - H(298.15 K) rather than H: the same derivative without the formation enthalpy's
      // magnitude in the rounding.
      const double dh_dt = FivePoint(p[0].h_minus_h298_j_per_mol, p[1].h_minus_h298_j_per_mol,
                                     p[3].h_minus_h298_j_per_mol, p[4].h_minus_h298_j_per_mol, h);
      const double ds_dt = FivePoint(p[0].s_j_per_mol_k, p[1].s_j_per_mol_k, p[3].s_j_per_mol_k,
                                     p[4].s_j_per_mol_k, h);
      const double error_h = std::fabs(dh_dt - cp) / cp;
      const double error_s = std::fabs(ds_dt - cp / t) / (cp / t);
      worst_h = std::max(worst_h, error_h);
      worst_s = std::max(worst_s, error_s);
      INFO("T = " << t << " K, Cp = " << cp << ", dH/dT = " << dh_dt << ", T dS/dT = "
                  << t * ds_dt);
      CHECK(error_h <= kDerivativeTolerance);
      CHECK(error_s <= kDerivativeTolerance);
    }
  }
  // How far below the tolerance the identities hold, in the log of a run with -s.
  WARN("worst relative deviation: dH/dT " << worst_h << ", dS/dT " << worst_s);
}

TEST_CASE("fits of generated species are continuous at T_mid to 1e-12", "[property]") {
  const std::vector<Species> all = MakeSpeciesSet(kSeed + 3, 6);
  for (std::size_t i = 0; i < all.size(); ++i) {
    const Species& species = all[i];
    INFO(Describe(species));
    sevenfold::FitOptions options;
    // A fixed mid temperature for most (fast); the automatic choice for one.
    if (i + 1 < all.size()) options.t_mid_k = 700.0 + 150.0 * static_cast<double>(i);
    const sevenfold::FitResult fit =
        sevenfold::FitTwoRange(sevenfold::ExactCurvesFor(species), options, species.thresholds);
    const sevenfold::TwoRangePolynomial& p = fit.polynomial;
    const double t = p.t_mid_k;
    INFO("T_mid = " << t << " K");
    const auto close = [](double a, double b) {
      return std::fabs(a - b) <= kContinuityTolerance * std::max(std::fabs(a), std::fabs(b));
    };
    CHECK(close(sevenfold::CpOverR(p.low, t), sevenfold::CpOverR(p.high, t)));
    CHECK(close(sevenfold::HOverRT(p.low, t), sevenfold::HOverRT(p.high, t)));
    CHECK(close(sevenfold::SOverR(p.low, t), sevenfold::SOverR(p.high, t)));
    // dCp/dT: relative to Cp/T, the natural scale of a slope (it may itself pass through 0).
    const double slope_scale = sevenfold::CpOverR(p.high, t) / t;
    CHECK(std::fabs(sevenfold::DCpOverRDT(p.low, t) - sevenfold::DCpOverRDT(p.high, t)) <=
          kContinuityTolerance * slope_scale);
  }
}

// ---- determinism of the command line

std::string ReadWhole(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

int RunBinary(const std::string& arguments) {
  const std::string command = std::string("cd ") + SEVENFOLD_SOURCE_DIR + " && timeout 120 " +
                              SEVENFOLD_BINARY + " " + arguments + " >/dev/null 2>&1 </dev/null";
  const int raw = std::system(command.c_str());
  return WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
}

// The blocks of an entries file ("species ..." to "end"), in file order.
std::vector<std::string> Blocks(const std::string& text) {
  std::vector<std::string> blocks;
  std::istringstream lines(text);
  std::string line, block;
  // A record is its header line (at the left margin, starting with the quoted name) and the
  // indented field lines below it (docs/entries-format.md).
  while (std::getline(lines, line)) {
    if (line.rfind("\"", 0) == 0) {
      if (!block.empty()) blocks.push_back(block);
      block = line + "\n";
    } else if (!block.empty() && line.rfind("  ", 0) == 0) {
      block += line + "\n";
    }
  }
  if (!block.empty()) blocks.push_back(block);
  return blocks;
}

TEST_CASE("fit output is byte-identical for identical input and order", "[property]") {
  namespace fs = std::filesystem;
  const fs::path dir = fs::temp_directory_path() /
                       ("sevenfold_property_" + std::to_string(getpid()));
  fs::create_directories(dir);
  // Two species files made from the reference list: its first two species and its last two.
  const std::string reference =
      ReadWhole(std::string(SEVENFOLD_SOURCE_DIR) + "/tests/data/reference-species.yaml");
  const std::size_t list = reference.find("species:\n");
  const std::size_t third = reference.find("  H2O:");
  REQUIRE(list != std::string::npos);
  REQUIRE(third != std::string::npos);
  const std::string head = reference.substr(0, list + 9);
  const std::string a = (dir / "a.yaml").string(), b = (dir / "b.yaml").string();
  std::ofstream(a) << reference.substr(0, third);
  std::ofstream(b) << head << reference.substr(third);

  const auto fit = [&](const std::string& files, const std::string& jobs, const std::string& out) {
    REQUIRE(RunBinary("fit -q --allow-poor-fits -j " + jobs + " " + files + " -o " +
                      (dir / out).string()) == 0);
    return ReadWhole((dir / out).string());
  };
  const std::string ab_1 = fit(a + " " + b, "1", "ab1.entries");
  const std::string ab_2 = fit(a + " " + b, "2", "ab2.entries");
  const std::string ab_again = fit(a + " " + b, "2", "ab3.entries");
  const std::string ba = fit(b + " " + a, "2", "ba.entries");
  REQUIRE_FALSE(ab_1.empty());
  // Same input, same bytes, whatever the thread count.
  CHECK(ab_1 == ab_2);
  CHECK(ab_2 == ab_again);
  // The other file order gives the same blocks, in the order the species were given: entries
  // come out in input order (docs/robustness.md), so the files differ only by block order.
  std::vector<std::string> blocks_ab = Blocks(ab_1), blocks_ba = Blocks(ba);
  CHECK(blocks_ab.size() == 4);
  CHECK(blocks_ab != blocks_ba);
  std::sort(blocks_ab.begin(), blocks_ab.end());
  std::sort(blocks_ba.begin(), blocks_ba.end());
  CHECK(blocks_ab == blocks_ba);
  fs::remove_all(dir);
}

}  // namespace

// SPDX-License-Identifier: MIT
// Tests of the fit module: polynomial evaluation, the constrained fit, the mid-temperature
// choice, the quality figures and the extrapolation check.
#include <algorithm>
#include <array>
#include <filesystem>
#include <cmath>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include <Eigen/Dense>
#include <catch2/catch.hpp>

#include "core/constants.h"
#include "core/error.h"
#include "fit/fitter.h"
#include "fit/polynomial.h"
#include "fit/quality.h"
#include "mechanism/regenerate.h"
#include "species/species_reader.h"
#include "statmech/species_thermo.h"
#include "janaf_values.h"

namespace sevenfold {
namespace {

using constants::kReferenceTemperature;
using constants::kWavenumberToKelvin;

// Relative agreement demanded of continuity and pinning: the constraints are solved exactly, so
// only the rounding of the solve (one refinement step) and of evaluating a quartic whose terms
// partly cancel remains; 1e-12 leaves a margin of ~100 over that rounding (eps ~ 2.2e-16 times a
// cancellation factor of ~10-100 in the T-space evaluation).
constexpr double kConstraintTolerance = 1e-12;
// Recovery of curves that a polynomial pair represents exactly: the fitted curves differ from
// the data only by rounding amplified by the conditioning of the least-squares matrix in
// tau = T/1024 K (~1e4), i.e. ~1e-12; 1e-10 leaves a margin of 100.
constexpr double kRecoveryTolerance = 1e-10;

// An ideal gas of linear molecules with a classical rotor and harmonic vibrations (an Einstein
// oscillator per mode). Per McQuarrie, Statistical Mechanics (1976), ch. 8 (from memory), with
// x = theta_v / T for each mode:
//   Cp/R = 7/2 + sum x^2 e^x / (e^x - 1)^2
//   (H - H_0)/RT = 7/2 + sum x / (e^x - 1)
//   S/R = 7/2 ln T + s_0 + sum [x / (e^x - 1) - ln(1 - e^-x)]
// The additive constants H_0 and s_0 only shift H and S; they are set so that H(298.15 K) and
// S(298.15 K) equal CO2's table values (JANAF Thermochemical Tables, 4th ed., Chase 1998, from
// memory: dfH = -393.52 kJ/mol, S = 213.79 J/(mol K)) to make the curves realistic.
struct EinsteinGas {
  std::vector<double> theta_k;
  double h0_over_r_k = 0.0;
  double s0_over_r = 0.0;

  double CpOverR(double t_k) const {
    double value = 3.5;
    for (double theta : theta_k) {
      const double x = theta / t_k, e = std::exp(x);
      value += x * x * e / ((e - 1.0) * (e - 1.0));
    }
    return value;
  }
  double HThermalOverRT(double t_k) const {
    double value = 3.5;
    for (double theta : theta_k) {
      const double x = theta / t_k;
      value += x / std::expm1(x);
    }
    return value;
  }
  double HOverRT(double t_k) const { return h0_over_r_k / t_k + HThermalOverRT(t_k); }
  double SThermalOverR(double t_k) const {
    double value = 3.5 * std::log(t_k);
    for (double theta : theta_k) {
      const double x = theta / t_k;
      value += x / std::expm1(x) - std::log(-std::expm1(-x));
    }
    return value;
  }
  double SOverR(double t_k) const { return s0_over_r + SThermalOverR(t_k); }

  ExactCurves Sample(const std::vector<double>& grid) const {
    ExactCurves curves;
    for (double t_k : grid) {
      curves.t_k.push_back(t_k);
      curves.cp_over_r.push_back(CpOverR(t_k));
      curves.h_over_rt.push_back(HOverRT(t_k));
      curves.s_over_r.push_back(SOverR(t_k));
    }
    return curves;
  }
};

// CO2 as an Einstein gas. Fundamentals from memory (Herzberg, Molecular Spectra and Molecular
// Structure II, 1945): 667 cm^-1 (bend, doubly degenerate), 1333 cm^-1, 2349 cm^-1.
EinsteinGas CarbonDioxide() {
  EinsteinGas gas;
  for (double wavenumber_cm1 : {667.0, 667.0, 1333.0, 2349.0}) {
    gas.theta_k.push_back(wavenumber_cm1 * kWavenumberToKelvin);
  }
  const double r = constants::kGasConstant;
  gas.h0_over_r_k = -393.52e3 / r - kReferenceTemperature * gas.HThermalOverRT(kReferenceTemperature);
  gas.s0_over_r = 213.79 / r - gas.SThermalOverR(kReferenceTemperature);
  return gas;
}

double RelativeDifference(double a, double b, double scale) { return std::fabs(a - b) / scale; }

// Checks continuity of Cp, dCp/dT, H, S (and d2Cp/dT2 when asked) at the mid temperature.
// Scales: |Cp/R|, |H/RT| and |S/R| themselves; Cp/(R T_mid) for dCp/dT and Cp/(R T_mid^2) for
// d2Cp/dT2, the natural size of those derivatives (a derivative can pass through zero).
void RequireContinuous(const TwoRangePolynomial& p, bool second_derivative) {
  const double t = p.t_mid_k;
  const double cp = CpOverR(p.low, t);
  CHECK(RelativeDifference(CpOverR(p.low, t), CpOverR(p.high, t), std::fabs(cp)) <=
        kConstraintTolerance);
  CHECK(RelativeDifference(DCpOverRDT(p.low, t), DCpOverRDT(p.high, t), cp / t) <=
        kConstraintTolerance);
  CHECK(RelativeDifference(HOverRT(p.low, t), HOverRT(p.high, t), std::fabs(HOverRT(p.low, t))) <=
        kConstraintTolerance);
  CHECK(RelativeDifference(SOverR(p.low, t), SOverR(p.high, t), std::fabs(SOverR(p.low, t))) <=
        kConstraintTolerance);
  if (second_derivative) {
    CHECK(RelativeDifference(D2CpOverRDT2(p.low, t), D2CpOverRDT2(p.high, t), cp / (t * t)) <=
          kConstraintTolerance);
  }
}

// A pair of ranges continuous at t_mid_k in Cp, dCp/dT, H and S by construction: the low range
// is the high one plus kappa (T - t_mid)^2 in Cp/R, with a6 and a7 shifted so that the added
// enthalpy and entropy vanish at t_mid.
TwoRangePolynomial ContinuousPair(const NasaCoefficients& high, double t_low_k, double t_mid_k,
                                  double t_high_k, double kappa) {
  NasaCoefficients delta{};
  delta[0] = kappa * t_mid_k * t_mid_k;
  delta[1] = -2.0 * kappa * t_mid_k;
  delta[2] = kappa;
  double h = 0.0, s = delta[0] * std::log(t_mid_k);
  for (int k = 0; k < 5; ++k) {
    h += delta[k] * std::pow(t_mid_k, k + 1) / (k + 1);
    if (k > 0) s += delta[k] * std::pow(t_mid_k, k) / k;
  }
  delta[5] = -h;
  delta[6] = -s;
  TwoRangePolynomial p;
  p.t_low_k = t_low_k;
  p.t_mid_k = t_mid_k;
  p.t_high_k = t_high_k;
  p.high = high;
  for (int k = 0; k < 7; ++k) p.low[k] = high[k] + delta[k];
  return p;
}

ExactCurves SamplePolynomial(const TwoRangePolynomial& p, const std::vector<double>& grid) {
  ExactCurves curves;
  for (double t_k : grid) {
    curves.t_k.push_back(t_k);
    curves.cp_over_r.push_back(CpOverR(p, t_k));
    curves.h_over_rt.push_back(HOverRT(p, t_k));
    curves.s_over_r.push_back(SOverR(p, t_k));
  }
  return curves;
}

// An arbitrary high range shaped like a diatomic's (Cp/R rising from ~3.3 to ~4.5 over
// 1000-6000 K); its values carry no reference claim: the test is recovery of whatever polynomial
// generated the data.
constexpr NasaCoefficients kDiatomicLikeHigh = {2.9266,     1.4880e-3, -5.6848e-7, 1.0097e-10,
                                                -6.7534e-15, -922.80,   5.9805};

}  // namespace

TEST_CASE("polynomial evaluation follows the NASA 7-coefficient definitions", "[fit]") {
  // Hand-evaluated at T = 2 K with a = (1, 2, 3, 4, 5, 6, 7):
  // Cp/R = 1 + 4 + 12 + 32 + 80 = 129
  // H/RT = 1 + 2 + 4 + 8 + 16 + 3 = 34
  // S/R = ln 2 + 4 + 6 + 32/3 + 20 + 7 = 47.6666... + ln 2
  // dCp/dT = 2 + 12 + 48 + 160 = 222; d2Cp/dT2 = 6 + 48 + 240 = 294
  const NasaCoefficients a = {1, 2, 3, 4, 5, 6, 7};
  CHECK(CpOverR(a, 2.0) == Approx(129.0).epsilon(1e-15));
  CHECK(HOverRT(a, 2.0) == Approx(34.0).epsilon(1e-15));
  CHECK(SOverR(a, 2.0) == Approx(47.0 + 2.0 / 3.0 + std::log(2.0)).epsilon(1e-15));
  CHECK(GOverRT(a, 2.0) == Approx(34.0 - 47.0 - 2.0 / 3.0 - std::log(2.0)).epsilon(1e-15));
  CHECK(DCpOverRDT(a, 2.0) == Approx(222.0).epsilon(1e-15));
  CHECK(D2CpOverRDT2(a, 2.0) == Approx(294.0).epsilon(1e-15));

  TwoRangePolynomial p;
  p.t_mid_k = 1000.0;
  p.low = a;
  p.high = {2, 0, 0, 0, 0, 0, 0};
  CHECK(CpOverR(p, 999.0) == CpOverR(a, 999.0));
  CHECK(CpOverR(p, 1000.0) == 2.0);  // the high range from t_mid on
}

TEST_CASE("fit grid includes both ends and 298.15 K and is fine at low temperature", "[fit]") {
  const std::vector<double> grid = FitGrid(10.0, 6000.0);
  REQUIRE(grid.front() == 10.0);
  REQUIRE(grid.back() == 6000.0);
  CHECK(std::count(grid.begin(), grid.end(), kReferenceTemperature) == 1);
  CHECK(std::is_sorted(grid.begin(), grid.end()));
  CHECK(std::adjacent_find(grid.begin(), grid.end()) == grid.end());
  for (std::size_t i = 1; i < grid.size(); ++i) {
    const double step = grid[i] - grid[i - 1];
    if (grid[i] <= 100.0) CHECK(step <= 2.0);
    if (grid[i] <= 300.0) CHECK(step <= 5.0);
    CHECK(step <= 50.0);
  }
  CHECK(FitGrid(10.0, 6000.0) == grid);  // deterministic

  const std::vector<double> warm = FitGrid(300.0, 5000.0);
  CHECK(warm.front() == 300.0);
  CHECK(std::count(warm.begin(), warm.end(), kReferenceTemperature) == 0);

  CHECK_THROWS_WITH(FitGrid(500.0, 400.0),
                    "fit grid over [500 K, 400 K]; expected 0 < t_low < t_high, finite");
}

TEST_CASE("a known continuous pair of polynomials is recovered", "[fit]") {
  const TwoRangePolynomial truth = ContinuousPair(kDiatomicLikeHigh, 200.0, 1000.0, 6000.0, 1e-6);
  RequireContinuous(truth, false);  // the construction itself
  const ExactCurves curves = SamplePolynomial(truth, FitGrid(200.0, 6000.0));
  FitOptions options;
  options.t_mid_k = 1000.0;
  const FitResult fit = FitTwoRange(curves, options, QualityThresholds{});

  // Coefficients: the error of each polynomial term a_k T^k at the top of its range, relative to
  // Cp/R there (a small a5 of the low range is poorly determined on its own, but its term is
  // what enters Cp); a6 and a7 relative to themselves. Then the curves themselves.
  const std::pair<const NasaCoefficients*, const NasaCoefficients*> ranges[] = {
      {&fit.polynomial.low, &truth.low}, {&fit.polynomial.high, &truth.high}};
  for (const auto& [fitted, exact] : ranges) {
    const double t_end = fitted == &fit.polynomial.low ? 1000.0 : 6000.0;
    const double cp_end = CpOverR(*exact, t_end);
    for (int k = 0; k < 5; ++k) {
      CAPTURE(k, t_end);
      CHECK(std::fabs((*fitted)[k] - (*exact)[k]) * std::pow(t_end, k) / cp_end <=
            kRecoveryTolerance);
    }
    CHECK(RelativeDifference((*fitted)[5], (*exact)[5], std::fabs((*exact)[5])) <=
          kRecoveryTolerance);
    CHECK(RelativeDifference((*fitted)[6], (*exact)[6], std::fabs((*exact)[6])) <=
          kRecoveryTolerance);
  }
  for (const RangeQuality* q : {&fit.quality.low_range, &fit.quality.high_range}) {
    CHECK(q->max_cp_relative <= kRecoveryTolerance);
    CHECK(q->max_h_over_rt <= kRecoveryTolerance);
    CHECK(q->max_s_over_r <= kRecoveryTolerance);
    CHECK(q->max_g_over_rt <= kRecoveryTolerance);
  }
  CHECK(fit.quality.MeetsThresholds());
  CHECK(fit.mid_choice.method == MidTemperatureMethod::kFixed);
}

TEST_CASE("fit of an Einstein gas is continuous at the mid temperature and exact at 298.15 K",
          "[fit]") {
  const EinsteinGas gas = CarbonDioxide();
  ExactCurves curves = gas.Sample(FitGrid(200.0, 6000.0));
  curves.classical_limit_cp_over_r = ClassicalLimitCpOverR(3);
  for (bool second_derivative : {false, true}) {
    for (std::optional<double> t_mid_k : {std::optional<double>(1000.0), std::optional<double>()}) {
      CAPTURE(second_derivative, t_mid_k.has_value());
      FitOptions options;
      options.t_mid_k = t_mid_k;
      options.continuous_second_derivative = second_derivative;
      const FitResult fit = FitTwoRange(curves, options, QualityThresholds{});
      RequireContinuous(fit.polynomial, second_derivative);

      const double t = kReferenceTemperature;
      CHECK(RelativeDifference(HOverRT(fit.polynomial, t), gas.HOverRT(t),
                               std::fabs(gas.HOverRT(t))) <= kConstraintTolerance);
      CHECK(RelativeDifference(SOverR(fit.polynomial, t), gas.SOverR(t), gas.SOverR(t)) <=
            kConstraintTolerance);

      // With the mid temperature chosen automatically (and no d2Cp/dT2 constraint, which costs a
      // degree of freedom) this smooth curve meets the default thresholds and extrapolates sanely;
      // at the customary 1000 K it misses them (max normalised error ~3). Failing fits are
      // covered by the test with a sharp low-temperature feature below.
      if (!t_mid_k && !second_derivative) {
        INFO((fit.quality.threshold_failures.empty() ? "" : fit.quality.threshold_failures.front()) << " | "
             << fit.quality.extrapolation.message << " | t_mid " << fit.polynomial.t_mid_k);
        CHECK(fit.quality.MeetsThresholds());
        CHECK(fit.quality.threshold_failures.empty());
        CHECK(fit.quality.extrapolation.sane);
      }
      CHECK(fit.quality.low_range.num_points + fit.quality.high_range.num_points ==
            static_cast<int>(curves.t_k.size()));
    }
  }
}

TEST_CASE("reference state is pinned also when 298.15 K is not a grid point", "[fit]") {
  const EinsteinGas gas = CarbonDioxide();
  std::vector<double> grid;
  for (double t_k = 200.0; t_k <= 4000.0; t_k += 20.0) grid.push_back(t_k);  // 290, 310: no 298.15
  const ExactCurves curves = gas.Sample(grid);
  FitOptions options;
  options.t_mid_k = 1000.0;
  const FitResult fit = FitTwoRange(curves, options, QualityThresholds{});
  // Cubic Hermite interpolation over 20 K with exact end slopes: error ~ (20 K)^4 / 384 times the
  // fourth derivative of H, far below 1e-7 relative for this smooth curve.
  constexpr double kInterpolationTolerance = 1e-7;
  const double t = kReferenceTemperature;
  CHECK(RelativeDifference(HOverRT(fit.polynomial, t), gas.HOverRT(t), std::fabs(gas.HOverRT(t))) <=
        kInterpolationTolerance);
  CHECK(RelativeDifference(SOverR(fit.polynomial, t), gas.SOverR(t), gas.SOverR(t)) <=
        kInterpolationTolerance);
}

TEST_CASE("automatic mid temperature is refined by Ceres and does at least as well as a scan",
          "[fit]") {
  const EinsteinGas gas = CarbonDioxide();
  ExactCurves curves = gas.Sample(FitGrid(200.0, 6000.0));
  curves.classical_limit_cp_over_r = ClassicalLimitCpOverR(3);
  FitOptions automatic;
  automatic.objective = FitObjective::kLeastSquares;  // the Ceres refinement is least squares
  const FitResult fit = FitTwoRange(curves, automatic, QualityThresholds{});
  INFO("t_mid = " << fit.polynomial.t_mid_k << ", note: " << fit.mid_choice.note);
  CHECK(fit.mid_choice.method == MidTemperatureMethod::kScanAndRefinement);
  CHECK(fit.mid_choice.num_refinement_iterations > 0);
  CHECK(fit.objective < fit.mid_choice.scan_best_objective);

  // An independent scan in steps of 100 K, and the customary 1000 K (common practice).
  FitOptions fixed = automatic;
  fixed.t_mid_k = 1000.0;
  CHECK(fit.objective <= FitTwoRange(curves, fixed, QualityThresholds{}).objective);
  for (double t_mid_k = 400.0; t_mid_k <= 5000.0; t_mid_k += 100.0) {
    fixed.t_mid_k = t_mid_k;
    CAPTURE(t_mid_k);
    CHECK(fit.objective <= FitTwoRange(curves, fixed, QualityThresholds{}).objective);
  }
  // Deterministic: the same bits again.
  const FitResult again = FitTwoRange(curves, automatic, QualityThresholds{});
  CHECK(again.polynomial.t_mid_k == fit.polynomial.t_mid_k);
  CHECK(again.polynomial.low == fit.polynomial.low);
  CHECK(again.polynomial.high == fit.polynomial.high);
}

// The promise for the automatic mid temperature: within 2 % of the best of a 10 K scan.
constexpr double kMidSearchFactor = 1.02;

TEST_CASE("automatic mid temperature of a minimax fit is within 2 % of the best on a 10 K scan",
          "[fit][heavy]") {
  // The guard needs exact Cp beyond the range: the Einstein gas gives it.
  const EinsteinGas gas = CarbonDioxide();
  ExactCurves curves = gas.Sample(FitGrid(200.0, 6000.0));
  for (double t_k : GuardGrid(200.0, 6000.0, ExtrapolationGuard{})) {
    curves.guard_t_k.push_back(t_k);
    curves.guard_cp_over_r.push_back(gas.CpOverR(t_k));
  }
  curves.classical_limit_cp_over_r = ClassicalLimitCpOverR(3);
  FitOptions automatic;
  const FitResult fit = FitTwoRange(curves, automatic, QualityThresholds{});
  double best_scan = HUGE_VAL, best_t_k = 0.0;
  for (double t_mid_k = 300.0; t_mid_k <= 5600.0; t_mid_k += 10.0) {
    FitOptions fixed = automatic;
    fixed.t_mid_k = t_mid_k;
    const double value = FitTwoRange(curves, fixed, QualityThresholds{}).max_normalised_error;
    if (value < best_scan) {
      best_scan = value;
      best_t_k = t_mid_k;
    }
  }
  CAPTURE(fit.polynomial.t_mid_k, fit.max_normalised_error, best_t_k, best_scan);
  CHECK(fit.max_normalised_error <= kMidSearchFactor * best_scan);
  // Deterministic: the same bits again.
  const FitResult again = FitTwoRange(curves, automatic, QualityThresholds{});
  CHECK(again.polynomial.low == fit.polynomial.low);
  CHECK(again.polynomial.high == fit.polynomial.high);
}

TEST_CASE("quality figures match a hand-computed case", "[fit]") {
  // Exact curves = a known polynomial, with three deliberate errors at known points:
  // Cp 1 % high at 400 K, H/RT 0.003 high at 300 K and 0.004 low at 500 K, S/R 0.002 high at
  // 500 K. Polynomial a = (4, 0, ..., 0): Cp/R = 4, H/RT = 4, S/R = 4 ln T.
  const NasaCoefficients a = {4, 0, 0, 0, 0, 0, 0};
  ExactCurves exact;
  for (double t_k : {300.0, 400.0, 500.0, 600.0}) {
    exact.t_k.push_back(t_k);
    exact.cp_over_r.push_back(4.0);
    exact.h_over_rt.push_back(4.0);
    exact.s_over_r.push_back(4.0 * std::log(t_k));
  }
  exact.cp_over_r[1] = 4.04;
  exact.h_over_rt[0] += 0.003;
  exact.h_over_rt[2] -= 0.004;
  exact.s_over_r[2] += 0.002;
  const RangeQuality q = MeasureRangeQuality(a, exact, 0, 4);
  // By hand: Cp error (4 - 4.04)/4.04 = -0.00990099...; rms = that / sqrt(4).
  // H errors -0.003, +0.004: max 0.004 at 500 K, rms sqrt((9 + 16)e-6 / 4) = 0.0025.
  // S error -0.002 at 500 K: rms 0.001. G = H - S errors: -0.003 at 300 K, +0.006 at 500 K:
  // max 0.006, rms sqrt((9 + 36)e-6 / 4).
  constexpr double kRounding = 1e-12;  // double arithmetic on O(1) numbers
  CHECK(q.num_points == 4);
  CHECK(q.max_cp_relative == Approx(0.04 / 4.04).epsilon(kRounding));
  CHECK(q.rms_cp_relative == Approx(0.04 / 4.04 / 2.0).epsilon(kRounding));
  CHECK(q.max_cp_error_t_k == 400.0);
  CHECK(q.max_h_over_rt == Approx(0.004).epsilon(kRounding));
  CHECK(q.rms_h_over_rt == Approx(0.0025).epsilon(kRounding));
  CHECK(q.max_h_error_t_k == 500.0);
  CHECK(q.max_s_over_r == Approx(0.002).epsilon(kRounding));
  CHECK(q.rms_s_over_r == Approx(0.001).epsilon(kRounding));
  CHECK(q.max_s_error_t_k == 500.0);
  CHECK(q.max_g_over_rt == Approx(0.006).epsilon(kRounding));
  CHECK(q.rms_g_over_rt == Approx(std::sqrt(45e-6 / 4.0)).epsilon(kRounding));
  CHECK(q.max_g_error_t_k == 500.0);

  // Only the points [1, 3) count for a sub-range.
  const RangeQuality part = MeasureRangeQuality(a, exact, 1, 3);
  CHECK(part.num_points == 2);
  CHECK(part.max_h_over_rt == Approx(0.004).epsilon(kRounding));
  CHECK(part.rms_h_over_rt == Approx(std::sqrt(16e-6 / 2.0)).epsilon(kRounding));

  // Thresholds: Cp 0.5 %, H 0.002, S 0.002 (the defaults). Cp and H are missed, S is not.
  RangeQuality clean;
  const std::vector<std::string> failures = ThresholdFailures(q, clean, QualityThresholds{});
  REQUIRE(failures.size() == 2);
  CHECK(failures[0] == "low range: max |dCp|/Cp = 0.99 % at 400 K exceeds 0.5 %");
  CHECK(failures[1] == "low range: max |dH|/RT = 0.004 at 500 K exceeds 0.002");
  const std::vector<std::string> high = ThresholdFailures(clean, q, QualityThresholds{});
  REQUIRE(high.size() == 2);
  CHECK(high[0] == "high range: max |dCp|/Cp = 0.99 % at 400 K exceeds 0.5 %");
}

TEST_CASE("a curve with a sharp low-temperature feature is reported as failing", "[fit]") {
  // The Einstein gas plus a low-lying two-level electronic system (Schottky anomaly):
  // q_el = 1 + g e^-x, x = theta/T; U/RT = g x e^-x / q_el, Cp/R = g x^2 e^-x / q_el^2,
  // S/R = ln q_el + U/RT: the moments of the two-level partition function q_el (common practice).
  // A gap of 60 K puts a Cp peak of ~0.44 R near 25 K (at T ~ 0.42 theta for g = 1), which a
  // quartic in T fitted over 20-1000 K cannot follow.
  const EinsteinGas gas = CarbonDioxide();
  constexpr double kGapK = 60.0, kDegeneracy = 1.0;
  ExactCurves curves;
  for (double t_k : FitGrid(20.0, 3000.0)) {
    const double x = kGapK / t_k, w = kDegeneracy * std::exp(-x), q = 1.0 + w;
    curves.t_k.push_back(t_k);
    curves.cp_over_r.push_back(gas.CpOverR(t_k) + x * x * w / (q * q));
    curves.h_over_rt.push_back(gas.HOverRT(t_k) + x * w / q);
    curves.s_over_r.push_back(gas.SOverR(t_k) + std::log(q) + x * w / q);
  }
  for (const FitObjective objective : {FitObjective::kMinimax, FitObjective::kLeastSquares}) {
    CAPTURE(ToString(objective));
    FitOptions options;
    options.t_mid_k = 1000.0;
    options.objective = objective;
    const FitResult fit = FitTwoRange(curves, options, QualityThresholds{});
    CHECK_FALSE(fit.quality.MeetsThresholds());
    REQUIRE_FALSE(fit.quality.threshold_failures.empty());
    CHECK_THAT(fit.quality.threshold_failures.front(),
               Catch::StartsWith("low range: max |dCp|/Cp = "));
    CHECK(fit.quality.low_range.max_cp_relative > QualityThresholds{}.max_cp_relative);
    // Least squares leaves its largest error in the feature; minimax spreads the worst error
    // over several temperatures of equal size (equioscillation), so its place says nothing.
    if (objective == FitObjective::kLeastSquares) {
      CHECK(fit.quality.low_range.max_cp_error_t_k < 100.0);
    }
  }
}

TEST_CASE("extrapolation outside the sane band is reported", "[fit]") {
  // Cp/R = 3.5 - 1e-12 T^4 on [300, 3000]: 3.5 - 81 = -77.5 at 3000 K already, and worse above.
  TwoRangePolynomial p;
  p.t_low_k = 300.0;
  p.t_mid_k = 1000.0;
  p.t_high_k = 3000.0;
  p.low = {3.5, 0, 0, 0, 0, 0, 0};
  p.high = {3.5, 0, 0, 0, -1e-12, 0, 0};
  const ExtrapolationCheck check = CheckExtrapolation(p, ClassicalLimitCpOverR(2) + 4.0);
  CHECK(check.min_cp_over_r_below == 3.5);
  CHECK(check.max_cp_over_r_below == 3.5);
  CHECK(check.max_cp_over_r_above == Approx(3.5 - 81.0).epsilon(1e-12));
  CHECK(check.min_cp_over_r_above == Approx(3.5 - 1e-12 * std::pow(4500.0, 4)).epsilon(1e-12));
  CHECK_FALSE(check.sane);
  CHECK(check.message ==
        "above the range: Cp/R = -406.6 at 4500 K is outside the sane band [2, 8.5]");

  // The classical limits: atom 5/2, linear triatomic 3*3 - 3/2 = 7.5 (translation 5/2, rotation 1,
  // four vibrations 1 each; common practice, equipartition).
  CHECK(ClassicalLimitCpOverR(1) == 2.5);
  CHECK(ClassicalLimitCpOverR(3) == 7.5);
}

TEST_CASE("impossible fit requests are rejected with the reason", "[fit]") {
  const ExactCurves curves = CarbonDioxide().Sample(FitGrid(200.0, 6000.0));
  FitOptions options;
  options.t_mid_k = 7000.0;
  CHECK_THROWS_WITH(FitTwoRange(curves, options, QualityThresholds{}),
                    "mid temperature 7000 K; expected strictly between 200 K and 6000 K");
  // Grid by hand: 200, 205, ..., 295 (20), 298.15, 300, ..., 990 (70), 1000, ..., 1975 (40),
  // 2000, ..., 5950 (80), 6000: 212 points; 205 K leaves only 200 K below.
  options.t_mid_k = 205.0;
  CHECK_THROWS_WITH(FitTwoRange(curves, options, QualityThresholds{}),
                    "mid temperature 205 K leaves 1 grid points below and 211 at or above it; "
                    "expected at least 8 on each side");
  options.t_mid_k = -1.0;
  CHECK_THROWS_WITH(FitTwoRange(curves, options, QualityThresholds{}),
                    "fit options: t_mid_k = -1; expected a positive finite temperature");
  QualityThresholds zero;
  zero.max_s_over_r = 0.0;
  options.t_mid_k.reset();
  CHECK_THROWS_WITH(FitTwoRange(curves, options, zero),
                    "quality threshold max_s_over_r = 0; expected a positive finite number");
  ExactCurves reversed = curves;
  std::swap(reversed.t_k[3], reversed.t_k[4]);
  CHECK_THROWS_WITH(FitTwoRange(reversed, options, QualityThresholds{}),
                    Catch::Contains("expected increasing"));
  // No ideal gas has Cp/R below 5/2, so neither has its classical limit.
  ExactCurves bad_limit = curves;
  bad_limit.classical_limit_cp_over_r = 1.0;
  CHECK_THROWS_WITH(FitTwoRange(bad_limit, options, QualityThresholds{}),
                    "exact curves: classical limit Cp/R = 1; expected 0 (unknown) or a finite "
                    "value of at least 2.5");
}

TEST_CASE("every demo species fits continuously at T_mid and exactly at 298.15 K", "[fit]") {
  // The demo scenario in species/ (read through the real reader and engine): continuity of Cp,
  // dCp/dT, H and S to kConstraintTolerance, H and S equal to the exact values at 298.15 K, and
  // the default quality thresholds met by every fit.
  std::vector<std::string> files;
  for (const auto& item : std::filesystem::directory_iterator(SEVENFOLD_SOURCE_DIR "/species")) {
    if (item.path().extension() == ".yaml") files.push_back(item.path().string());
  }
  std::sort(files.begin(), files.end());
  REQUIRE(!files.empty());
  const std::vector<Species> species = ReadSpeciesFiles(files);
  REQUIRE(species.size() >= 25);
  RegenerateOptions options;
  options.num_jobs = 2;
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, options);
  for (const SpeciesFit& result : fits) {
    INFO(result.species->name << " t_mid " << result.fit.polynomial.t_mid_k << " "
                              << (result.fit.quality.threshold_failures.empty()
                                      ? std::string()
                                      : result.fit.quality.threshold_failures.front()));
    RequireContinuous(result.fit.polynomial, false);
    const auto at_reference = std::lower_bound(result.exact.t_k.begin(), result.exact.t_k.end(),
                                               kReferenceTemperature);
    if (at_reference != result.exact.t_k.end() && *at_reference == kReferenceTemperature) {
      const size_t i = at_reference - result.exact.t_k.begin();
      const double t = kReferenceTemperature;
      CHECK(RelativeDifference(HOverRT(result.fit.polynomial, t), result.exact.h_over_rt[i],
                               std::max(1.0, std::fabs(result.exact.h_over_rt[i]))) <=
            kConstraintTolerance);
      CHECK(RelativeDifference(SOverR(result.fit.polynomial, t), result.exact.s_over_r[i],
                               result.exact.s_over_r[i]) <= kConstraintTolerance);
    }
    // Over 200-6000 K some demo polyatomics cannot meet the thresholds in this form; such a fit
    // must say so (at the form's limit), never fail while a better fit exists.
    CHECK((result.fit.quality.MeetsThresholds() || result.fit.quality.form_limit.AtFormLimit()));
  }
}

}  // namespace sevenfold

namespace sevenfold {
namespace {

// The automatic mid temperature is searched with objectives computed from the triangular QR
// factors of the rows on each side of the split, built once per species (docs/performance.md);
// only the chosen point gets the full QR solve of the 3n x 14 design matrix. Both are backward
// stable QR solves of the same problem, so their objectives differ by rounding amplified by the
// condition of the weighted design matrix in tau = T/1024 K (~1e4..1e6): ~1e-16 * 1e6 = 1e-10
// relative, up to ~1e-9 where residuals are small against right-hand sides of ~1e5 (H/RT over a
// threshold of 0.002). 1e-8 leaves a margin of ~3 over the largest seen on the demo species
// (3.9e-9); the search treats objectives within 1e-6 of each other as ties (fitter.cc).
constexpr double kSearchObjectiveTolerance = 1e-8;
// Below this objective a fit reproduces its curves to rounding (1e-4 of a threshold).
constexpr double kRoundingNoiseObjective = 1e-4;

TEST_CASE("the mid-temperature search objective agrees with the full solve", "[fit]") {
  std::vector<std::string> files;
  for (const auto& item : std::filesystem::directory_iterator(SEVENFOLD_SOURCE_DIR "/species")) {
    if (item.path().extension() == ".yaml") files.push_back(item.path().string());
  }
  std::sort(files.begin(), files.end());
  const std::vector<Species> species = ReadSpeciesFiles(files);
  REQUIRE(species.size() >= 25);
  int num_compared = 0;
  for (const Species& one : species) {
    const ExactCurves curves = ExactCurvesFor(one);
    FitOptions automatic;
    automatic.objective = FitObjective::kLeastSquares;  // the least-squares search's two paths
    const FitResult fit = FitTwoRange(curves, automatic, one.thresholds);
    FitOptions fixed = automatic;
    fixed.t_mid_k = fit.mid_choice.scan_best_t_mid_k;
    const FitResult at_scan_best = FitTwoRange(curves, fixed, one.thresholds);
    CAPTURE(one.name, fit.mid_choice.scan_best_t_mid_k, fit.mid_choice.scan_best_objective,
            at_scan_best.objective);
    // An atom's curves lie in the polynomial space: both objectives are then rounding noise
    // (~1e-6: |b| ~ 1e5 times eps times the conditioning), nothing to compare.
    if (at_scan_best.objective < kRoundingNoiseObjective) continue;
    CHECK(std::fabs(fit.mid_choice.scan_best_objective - at_scan_best.objective) <=
          kSearchObjectiveTolerance * at_scan_best.objective);
    // The chosen point is re-solved in full: the same bits as a fit fixed at that temperature.
    fixed.t_mid_k = fit.polynomial.t_mid_k;
    const FitResult at_chosen = FitTwoRange(curves, fixed, one.thresholds);
    CHECK(at_chosen.polynomial.low == fit.polynomial.low);
    CHECK(at_chosen.polynomial.high == fit.polynomial.high);
    CHECK(at_chosen.objective == fit.objective);
    ++num_compared;
  }
  CHECK(num_compared >= 20);
}

}  // namespace
}  // namespace sevenfold

namespace sevenfold {
namespace {

// ---- Optimality certificate of the minimax fit, recomputed independently ----
// Weak duality (Boyd & Vandenberghe, Convex Optimization, 2004, sec. 5.2, from memory): for
// weights w >= 0 with sum 1 on the normalised errors e_i and multipliers mu >= 0 on the guard
// constraints q_j^2 <= 1, every feasible fit has max e_i^2 >= sum w e^2 + sum mu (q^2 - 1), so
// optimum^2 >= min over the equality-constrained coefficients of that quadratic. The test takes
// only the weights from the fitter and computes the minimum itself: its own design in
// tau = T / 1000 K (the fitter uses 1024 K), in long double, constraints eliminated by a
// full-pivoting QR and the weighted least squares solved by SVD. The worst error is evaluated from
// the printed-form coefficients.
using LongMatrix = Eigen::Matrix<long double, Eigen::Dynamic, Eigen::Dynamic>;
using LongVector = Eigen::Matrix<long double, Eigen::Dynamic, 1>;
constexpr long double kTestScaleK = 1000.0L;

// The rows of Cp/R, dCp/dT (per tau), d2Cp/dT2, H/RT and S/R in tau.
std::array<long double, 7> TestRow(int quantity, long double tau) {
  const long double t2 = tau * tau, t3 = t2 * tau, t4 = t3 * tau;
  switch (quantity) {
    case 0: return {1, tau, t2, t3, t4, 0, 0};
    case 1: return {0, 1, 2 * tau, 3 * t2, 4 * t3, 0, 0};
    case 2: return {0, 0, 2, 6 * tau, 12 * t2, 0, 0};
    case 3: return {1, tau / 2, t2 / 3, t3 / 4, t4 / 5, 1 / tau, 0};
    default: return {std::log(tau), tau, t2 / 2, t3 / 3, t4 / 4, 0, 1};
  }
}

struct CertificateCheck {
  double worst = 0.0;        // achieved worst normalised error (from the kelvin coefficients)
  double lower_bound = 0.0;  // recomputed from the certificate's weights
  bool guard_met = true;
};

CertificateCheck CheckCertificate(const ExactCurves& exact, const FitOptions& options,
                                  const FitResult& fit) {
  const ErrorScales& scales = options.error_scales;
  const TwoRangePolynomial& p = fit.polynomial;
  const std::size_t n = exact.t_k.size();
  std::vector<double> weights(3 * n, 0.0);
  for (const CertificateWeight& item : fit.certificate.weights) {
    REQUIRE(item.error < weights.size());
    REQUIRE(item.weight > 0.0);
    weights[item.error] += item.weight;
  }
  CertificateCheck check;
  for (std::size_t i = 0; i < n; ++i) {
    const double t = exact.t_k[i];
    check.worst = std::max({check.worst,
                            std::fabs(CpOverR(p, t) / exact.cp_over_r[i] - 1.0) / scales.cp_relative,
                            std::fabs(HOverRT(p, t) - exact.h_over_rt[i]) / scales.h_over_rt,
                            std::fabs(SOverR(p, t) - exact.s_over_r[i]) / scales.s_over_r});
  }
  const ExtrapolationGuard& guard = options.extrapolation_guard;
  const std::size_t num_guard = guard.enabled ? exact.guard_t_k.size() : 0;
  for (std::size_t j = 0; j < num_guard; ++j) {
    const double t = exact.guard_t_k[j], cp = exact.guard_cp_over_r[j];
    const NasaCoefficients& a = t < p.t_low_k ? p.low : p.high;
    // 1e-9 of the band: rounding of the evaluation, far below any physical meaning.
    if (std::fabs(CpOverR(a, t) - cp) / (guard.band * cp) > 1.0 + 1e-9) check.guard_met = false;
  }
  // The weighted rows (sqrt of the weights) and the constraints, in tau = T / kTestScaleK.
  LongMatrix a = LongMatrix::Zero(static_cast<Eigen::Index>(3 * n + num_guard), 14);
  LongVector b = LongVector::Zero(a.rows());
  long double sum_mu = 0.0L;
  for (std::size_t i = 0; i < n; ++i) {
    const long double tau = exact.t_k[i] / kTestScaleK;
    const int offset = exact.t_k[i] < p.t_mid_k ? 0 : 7;
    const long double scale[3] = {scales.cp_relative * exact.cp_over_r[i], scales.h_over_rt,
                                  scales.s_over_r};
    const long double value[3] = {exact.cp_over_r[i], exact.h_over_rt[i], exact.s_over_r[i]};
    const int quantity[3] = {0, 3, 4};
    for (int q = 0; q < 3; ++q) {
      const long double w = std::sqrt(static_cast<long double>(weights[3 * i + q]));
      const auto row = TestRow(quantity[q], tau);
      for (int k = 0; k < 7; ++k) a(3 * i + q, offset + k) = w * row[k] / scale[q];
      b[3 * i + q] = w * value[q] / scale[q];
    }
  }
  for (std::size_t j = 0; j < num_guard; ++j) {
    const long double mu = fit.certificate.multipliers.at(j);
    REQUIRE(mu >= 0.0L);
    sum_mu += mu;
    const long double tau = exact.guard_t_k[j] / kTestScaleK;
    const int offset = exact.guard_t_k[j] < p.t_low_k ? 0 : 7;
    const long double scale = guard.band * exact.guard_cp_over_r[j];
    const auto row = TestRow(0, tau);
    for (int k = 0; k < 7; ++k) a(3 * n + j, offset + k) = std::sqrt(mu) * row[k] / scale;
    b[3 * n + j] = std::sqrt(mu) * exact.guard_cp_over_r[j] / scale;
  }
  const int num_continuity = options.continuous_second_derivative ? 5 : 4;
  const bool pinned = options.pin_reference_state && p.t_low_k <= kReferenceTemperature &&
                      kReferenceTemperature <= p.t_high_k;
  LongMatrix c = LongMatrix::Zero(num_continuity + (pinned ? 2 : 0), 14);
  LongVector d = LongVector::Zero(c.rows());
  const int continuity[5] = {0, 1, 3, 4, 2};
  for (int r = 0; r < num_continuity; ++r) {
    const auto row = TestRow(continuity[r], p.t_mid_k / kTestScaleK);
    for (int k = 0; k < 7; ++k) {
      c(r, k) = row[k];
      c(r, 7 + k) = -row[k];
    }
  }
  if (pinned) {
    const auto at = std::lower_bound(exact.t_k.begin(), exact.t_k.end(), kReferenceTemperature);
    REQUIRE(*at == kReferenceTemperature);  // FitGrid includes it
    const std::size_t i = static_cast<std::size_t>(at - exact.t_k.begin());
    const int offset = kReferenceTemperature < p.t_mid_k ? 0 : 7;
    const auto h = TestRow(3, kReferenceTemperature / kTestScaleK);
    const auto s = TestRow(4, kReferenceTemperature / kTestScaleK);
    for (int k = 0; k < 7; ++k) {
      c(num_continuity, offset + k) = h[k];
      c(num_continuity + 1, offset + k) = s[k];
    }
    d[num_continuity] = exact.h_over_rt[i];
    d[num_continuity + 1] = exact.s_over_r[i];
  }
  // x = x_p + N z with C x_p = d, C N = 0; z minimises |A N z - (b - A x_p)|.
  const Eigen::FullPivHouseholderQR<LongMatrix> cqr(c.transpose());
  REQUIRE(cqr.rank() == c.rows());
  const LongMatrix q = cqr.matrixQ();
  const LongMatrix null_space = q.rightCols(14 - c.rows());
  const LongVector x_p = c.completeOrthogonalDecomposition().solve(d);
  const LongMatrix reduced = a * null_space;
  const LongVector z = reduced.jacobiSvd(Eigen::ComputeThinU | Eigen::ComputeThinV)
                           .solve(b - a * x_p);
  const LongVector x = x_p + null_space * z;
  const long double min_value = (a * x - b).squaredNorm();
  const long double bound2 = min_value - sum_mu;
  check.lower_bound = bound2 > 0 ? static_cast<double>(std::sqrt(bound2)) : 0.0;
  return check;
}

// The promise: within 1.05 of the optimum of the same problem.
constexpr double kOptimalityFactor = 1.05;
// Below this worst error a fit is exact to rounding (atoms: the curves lie in the form); the
// ratio to a lower bound of ~0 says nothing there.
constexpr double kExactFitWorst = 1e-6;

void RequireCertified(const std::vector<Species>& species, std::optional<double> t_mid_k,
                      int* num_certified) {
  for (const Species& one : species) {
    FitOptions options;
    options.t_mid_k = t_mid_k ? t_mid_k : one.temperatures.mid_k;
    const ExactCurves curves = ExactCurvesFor(one, options.extrapolation_guard);
    const FitResult fit = FitTwoRange(curves, options, one.thresholds);
    const CertificateCheck check = CheckCertificate(curves, options, fit);
    CAPTURE(one.name, fit.polynomial.t_mid_k, check.worst, check.lower_bound,
            fit.certificate.lower_bound, fit.certificate.num_iterations);
    CHECK(check.guard_met);
    CHECK(check.worst == Approx(fit.max_normalised_error).epsilon(1e-6).margin(1e-9));
    if (check.worst < kExactFitWorst) continue;
    // The bound never exceeds what a fit achieves (else the duality argument or the test is
    // wrong), and the fit is within kOptimalityFactor of it.
    CHECK(check.lower_bound <= check.worst * (1.0 + 1e-9));
    CHECK(check.worst <= kOptimalityFactor * check.lower_bound);
    ++*num_certified;
  }
}

std::vector<Species> ReadTestSpecies(const std::string& name) {
  return ReadSpeciesFiles({std::string(SEVENFOLD_SOURCE_DIR) + "/tests/data/" + name});
}

TEST_CASE("minimax fits of polyatomics over 200-6000 K are certified within 1.05 of the optimum",
          "[fit]") {
  const std::vector<Species> species = ReadTestSpecies("polyatomics-200-6000.yaml");
  int num_certified = 0;
  RequireCertified(species, 1000.0, &num_certified);  // T_mid = 1000 K, as the trade often fixes
  RequireCertified(species, std::nullopt, &num_certified);  // automatic T_mid
  CHECK(num_certified == 2 * static_cast<int>(species.size()));
}

TEST_CASE("minimax fits of the demo and of invented species are certified within 1.05",
          "[fit][heavy]") {
  std::vector<std::string> files;
  for (const auto& item : std::filesystem::directory_iterator(SEVENFOLD_SOURCE_DIR "/species")) {
    if (item.path().extension() == ".yaml") files.push_back(item.path().string());
  }
  std::sort(files.begin(), files.end());
  int num_certified = 0;
  RequireCertified(ReadSpeciesFiles(files), std::nullopt, &num_certified);
  RequireCertified(ReadTestSpecies("invented-30.yaml"), std::nullopt, &num_certified);
  CHECK(num_certified >= 45);
}

// ---- Issue 14's outside check: default fits of five species against the engine and JANAF ----
// N2, O2, H2O, CO2 and CH4 of tests/data/polyatomics-200-6000.yaml (rigid rotor, harmonic
// vibrations from fundamentals; O2 with its a 1Delta_g level), fitted over 200-6000 K with the
// default options (minimax, automatic T_mid, guard 1.25:0.2).
//
// How far that model may lie from JANAF's Cp, which includes anharmonicity, rotation-vibration
// coupling and centrifugal distortion. These terms grow roughly in proportion to T once a mode
// is excited (first-order perturbation of the level energies in x_e = omega_e x_e / omega_e and
// alpha_e / B_e), so they are small up to 1000 K and largest at 3000 K.
// Up to 1000 K: the modes are at most partly excited; below 1 % for all five.
constexpr double kModelAllowanceTo1000K = 0.01;
// At 3000 K, per species (constants from memory of Huber & Herzberg 1979 and Herzberg 1945):
// N2: one mode, x_e ~ 0.006, alpha_e/B_e ~ 0.009: about 1 % of Cp; allow 2 %.
constexpr double kN2ModelAllowanceAt3000K = 0.02;
// O2: x_e ~ 0.0076, alpha_e/B_e ~ 0.011, and the b 1Sigma_g+ state (13195 cm^-1) left out of
// the test file adds ~0.5 % at 3000 K: allow 4 %.
constexpr double kO2ModelAllowanceAt3000K = 0.04;
// H2O: a light asymmetric top, stretches with x_e ~ 0.012-0.02 and large rotation-vibration
// coupling: the harmonic rigid-rotor Cp falls short by a few percent (common practice); allow 5 %.
constexpr double kH2OModelAllowanceAt3000K = 0.05;
// CO2: four modes with x_e ~ 0.003-0.005 and the Fermi resonance of the bend overtone with the
// symmetric stretch: allow 3 %.
constexpr double kCO2ModelAllowanceAt3000K = 0.03;
// CH4: nine modes, C-H stretches with x_e ~ 0.01: allow 4 %.
constexpr double kCH4ModelAllowanceAt3000K = 0.04;
// The test recomputes the exact Cp with its own SpeciesThermo; it agrees with the curves the fit
// used to rounding (the same engine, built to a different top temperature), far below any error
// a fit reports.
constexpr double kEngineRoundingRelative = 1e-9;

struct OutsideCheck {
  const char* name;
  testing::JanafValue at_298;
  testing::JanafValue at_1000;
  testing::JanafCp at_3000;
  double model_allowance_at_3000;
};

TEST_CASE("default fits of N2, O2, H2O, CO2 and CH4 agree with the engine and with JANAF Cp",
          "[fit]") {
  namespace janaf = testing::janaf;
  const OutsideCheck checks[] = {
      {"N2", janaf::kN2At298, janaf::kN2At1000, janaf::kN2CpAt3000, kN2ModelAllowanceAt3000K},
      {"O2", janaf::kO2At298, janaf::kO2At1000, janaf::kO2CpAt3000, kO2ModelAllowanceAt3000K},
      {"H2O", janaf::kH2OAt298, janaf::kH2OAt1000, janaf::kH2OCpAt3000, kH2OModelAllowanceAt3000K},
      {"CO2", janaf::kCO2At298, janaf::kCO2At1000, janaf::kCO2CpAt3000, kCO2ModelAllowanceAt3000K},
      {"CH4", janaf::kCH4At298, janaf::kCH4At1000, janaf::kCH4CpAt3000, kCH4ModelAllowanceAt3000K},
  };
  const std::vector<Species> species = ReadTestSpecies("polyatomics-200-6000.yaml");
  for (const OutsideCheck& check : checks) {
    const auto one = std::find_if(species.begin(), species.end(),
                                  [&](const Species& s) { return s.name == check.name; });
    REQUIRE(one != species.end());
    REQUIRE(one->temperatures.low_k == 200.0);
    REQUIRE(one->temperatures.high_k == 6000.0);
    const FitOptions options = FitOptionsFor(*one, RegenerateOptions{});
    REQUIRE(options.objective == FitObjective::kMinimax);
    REQUIRE(!options.t_mid_k);
    REQUIRE(options.extrapolation_guard.enabled);
    const FitResult fit =
        FitTwoRange(ExactCurvesFor(*one, options.extrapolation_guard), options, one->thresholds);
    const TwoRangePolynomial& p = fit.polynomial;
    const auto reported = [&](double t_k) {
      return (t_k < p.t_mid_k ? fit.quality.low_range : fit.quality.high_range).max_cp_relative;
    };
    CAPTURE(check.name, p.t_mid_k, fit.quality.low_range.max_cp_relative,
            fit.quality.high_range.max_cp_relative);

    // (a) The engine on the fit grid, recomputed here: within the fit's own reported worst error.
    const SpeciesThermo thermo(*one);
    for (const double t_k : FitGrid(200.0, 6000.0)) {
      const double exact = thermo.At(t_k).cp_j_per_mol_k / constants::kGasConstant;
      CAPTURE(t_k);
      CHECK(std::fabs(CpOverR(p, t_k) / exact - 1.0) <=
            reported(t_k) * (1.0 + kEngineRoundingRelative) + kEngineRoundingRelative);
    }

    // (b) JANAF Cp: within the fit's error plus the model's.
    const std::pair<double, double> references[] = {
        {check.at_298.t_k, check.at_298.cp_j_per_mol_k},
        {check.at_1000.t_k, check.at_1000.cp_j_per_mol_k},
        {check.at_3000.t_k, check.at_3000.cp_j_per_mol_k}};
    for (const auto& [t_k, janaf_cp] : references) {
      const double fitted = CpOverR(p, t_k) * constants::kGasConstant;
      const double allowance =
          t_k <= 1000.0 ? kModelAllowanceTo1000K : check.model_allowance_at_3000;
      CAPTURE(t_k, fitted, janaf_cp, thermo.At(t_k).cp_j_per_mol_k);
      CHECK(std::fabs(fitted / janaf_cp - 1.0) <= reported(t_k) + allowance);
    }
  }
}

}  // namespace
}  // namespace sevenfold

namespace sevenfold {
namespace {

TEST_CASE("a threshold miss is printed with the digits that show it", "[fit]") {
  RangeQuality low, high;
  low.max_cp_relative = 0.00504;  // 0.504 %: at two digits it would read "0.5 % exceeds 0.5 %"
  low.max_cp_error_t_k = 200.0;
  high.max_h_over_rt = 0.0020004;
  high.max_h_error_t_k = 6000.0;
  const std::vector<std::string> failures = ThresholdFailures(low, high, QualityThresholds{});
  REQUIRE(failures.size() == 2);
  CHECK(failures[0] == "low range: max |dCp|/Cp = 0.504 % at 200 K exceeds 0.5 %");
  CHECK(failures[1] == "high range: max |dH|/RT = 0.0020004 at 6000 K exceeds 0.002");
}

TEST_CASE("a polyatomic over 200-6000 K is reported at the form's limit with a passing range",
          "[fit]") {
  // C2H4 over 200-6000 K (tests/data/polyatomics-200-6000.yaml): the optimum of the form is
  // several times the default thresholds (seen: ~5), so no fit can pass; a narrower range can.
  const std::vector<Species> species = ReadTestSpecies("polyatomics-200-6000.yaml");
  const auto c2h4 = std::find_if(species.begin(), species.end(),
                                 [](const Species& one) { return one.name == "C2H4"; });
  REQUIRE(c2h4 != species.end());
  FitOptions options;
  options.t_mid_k = 1000.0;
  const ExactCurves curves = ExactCurvesFor(*c2h4, options.extrapolation_guard);
  const FitResult fit = FitTwoRange(curves, options, c2h4->thresholds);
  const FormLimit& limit = fit.quality.form_limit;
  REQUIRE(limit.computed);
  CHECK(limit.AtFormLimit());
  CHECK(limit.best_threshold_ratio > 1.0);
  REQUIRE(limit.passing_range_found);
  CHECK(limit.passing_t_high_k - limit.passing_t_low_k < 5800.0);
  CHECK(limit.passing_t_low_k >= 200.0);
  CHECK(limit.passing_t_high_k <= 6000.0);
  CHECK_THAT(DescribeFormLimit(limit), Catch::StartsWith("at the form's limit"));
}

TEST_CASE("an atom without electronic excitation gets exact coefficients", "[fit]") {
  // He of species/h2-o2-core.yaml: Cp/R = 5/2 exactly (translation 3/2 plus 1; common practice).
  const std::vector<Species> species =
      ReadSpeciesFiles({std::string(SEVENFOLD_SOURCE_DIR) + "/species/h2-o2-core.yaml"});
  const auto he = std::find_if(species.begin(), species.end(),
                               [](const Species& one) { return one.name == "He"; });
  REQUIRE(he != species.end());
  FitOptions options;
  const FitResult fit = FitTwoRange(ExactCurvesFor(*he), options, he->thresholds);
  for (const NasaCoefficients* a : {&fit.polynomial.low, &fit.polynomial.high}) {
    CHECK((*a)[0] == 2.5);
    for (int k = 1; k < 5; ++k) CHECK((*a)[k] == 0.0);
  }
  CHECK(fit.polynomial.low == fit.polynomial.high);
}

}  // namespace
}  // namespace sevenfold

namespace sevenfold {
namespace {

TEST_CASE("a guard no fit of the form can meet still gives a continuous fit, marked as missing it",
          "[fit]") {
  // C2H4 over 200-6000 K with its Cp held within 1e-4 up to 4 x 6000 K: the rigid-rotor
  // harmonic-oscillator Cp keeps rising towards its classical limit there while a quartic in T
  // cannot follow it that closely over a factor of 4 (common practice). The exchange finds no
  // feasible reference; Lawson's iteration returns the least guard-infeasible fit.
  const std::vector<Species> species = ReadSpeciesFiles(
      {std::string(SEVENFOLD_SOURCE_DIR) + "/tests/data/polyatomics-200-6000.yaml"});
  const auto c2h4 = std::find_if(species.begin(), species.end(),
                                 [](const Species& one) { return one.name == "C2H4"; });
  REQUIRE(c2h4 != species.end());
  FitOptions options;
  options.t_mid_k = 1000.0;
  options.extrapolation_guard = ExtrapolationGuard{true, 4.0, 1e-4};
  const ExactCurves curves = ExactCurvesFor(*c2h4, options.extrapolation_guard);
  const FitResult fit = FitTwoRange(curves, options, c2h4->thresholds);
  CHECK_FALSE(fit.certificate.guard_met);
  CHECK(std::isfinite(fit.max_normalised_error));
  // Continuity at T_mid holds whatever the guard (the constraints are equalities).
  const TwoRangePolynomial& p = fit.polynomial;
  CHECK(CpOverR(p.low, p.t_mid_k) == Approx(CpOverR(p.high, p.t_mid_k)).epsilon(1e-12));
  CHECK(HOverRT(p.low, p.t_mid_k) == Approx(HOverRT(p.high, p.t_mid_k)).epsilon(1e-12));
}

}  // namespace
}  // namespace sevenfold

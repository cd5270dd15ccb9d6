// SPDX-License-Identifier: MIT
// The constrained fit of a two-range NASA polynomial to exact curves (minimax or least squares),
// the choice of the mid temperature, and the fit's quality figures. See docs/fitting.md.
// The solvers live in minimax*.cc and least_squares.cc (Ceres there only); this header needs
// neither Eigen nor Ceres.
#pragma once

#include <optional>
#include <string>
#include <cstddef>
#include <vector>

#include "fit/grid.h"
#include "fit/polynomial.h"
#include "fit/quality.h"
#include "core/fit_settings.h"

namespace sevenfold {

struct FitOptions {
  // What is minimised over the grid (docs/fitting.md, "Objective").
  FitObjective objective = FitObjective::kMinimax;
  // The scales that normalise |dCp|/Cp, |dH|/RT and |dS|/R inside the objective (weights, not
  // thresholds).
  ErrorScales error_scales;
  // Constraint on Cp beyond both ends of the range, inside the optimisation.
  ExtrapolationGuard extrapolation_guard;
  // Mid temperature, K; empty means choose it automatically (docs/fitting.md).
  std::optional<double> t_mid_k;
  // Also make d2Cp/dT2 continuous at t_mid_k.
  bool continuous_second_derivative = false;
  // Pin H and S to the exact values at 298.15 K when 298.15 K lies in [t_low_k, t_high_k].
  bool pin_reference_state = true;
  // Returns an empty string when valid, otherwise a message naming the field and the rule.
  std::string Validate() const;
};

// How the mid temperature was chosen.
enum class MidTemperatureMethod {
  kFixed,              // given in FitOptions::t_mid_k
  kScanAndRefinement,  // best scan point refined (minimax: a 10 K scan around it; least squares:
                       // Ceres); the refined point won
  kScanOnly,           // best scan point; the refinement was unusable or no better (see note)
};
// "fixed", "scan+refinement", "scan".
std::string ToString(MidTemperatureMethod method);

struct MidTemperatureChoice {
  MidTemperatureMethod method = MidTemperatureMethod::kFixed;
  int num_scan_points = 0;          // candidates tried by the scan (0 when fixed)
  double scan_best_t_mid_k = 0.0;   // best candidate of the scan, K
  double scan_best_objective = 0.0; // its objective (see FitResult::objective)
  int num_refinement_iterations = 0;
  std::string note;                 // why the refinement was not used, for kScanOnly
};

// The optimality certificate of a minimax fit (docs/fitting.md, "Optimality"): weights w >= 0
// (sum 1) on the normalised in-range errors and multipliers mu >= 0 on the guard errors such that
// the optimum^2 >= min over the equality-constrained coefficients of sum w e^2 + sum mu (q^2 - 1),
// which is lower_bound^2. The achieved worst error over lower_bound bounds the distance from the
// optimum. Empty for least squares.
struct CertificateWeight {
  std::size_t error = 0;  // index of the normalised error: 3 per grid point (Cp, H, S)
  double weight = 0.0;
};

struct MinimaxCertificate {
  double lower_bound = 0.0;
  // The positive weights only (the exchange's reference: m + 1 of some 600 errors), so that a
  // fit kept for output costs a few dozen numbers, not one per error; an error not listed has 0.
  std::vector<CertificateWeight> weights;
  // One per guard point (ExactCurves::guard_t_k), q = (Cp_fit - Cp_exact) / (band Cp_exact).
  std::vector<double> multipliers;
  bool guard_met = true;  // the fit keeps |q| <= 1 at every guard point
  int num_iterations = 0;
};

struct FitResult {
  TwoRangePolynomial polynomial;
  FitQuality quality;
  // The figure that the choice of t_mid minimises. Minimax: the largest normalised error
  // |dCp|/(Cp scale_cp), |dH|/(R T scale_h), |dS|/(R scale_s) over the whole grid (ErrorScales).
  // Least squares: the p-norm (p = 16, mean over all residuals) of the same errors.
  double objective = 0.0;
  // The largest normalised error over the whole grid, in units of the error scales.
  double max_normalised_error = 0.0;
  MidTemperatureChoice mid_choice;
  MinimaxCertificate certificate;
};

// Fits the exact curves (docs/fitting.md). Throws Error when the request is impossible
// (t_mid outside the range, too few grid points on a side, curves not increasing in T,
// non-finite or non-positive values, thresholds not positive). Deterministic: same input,
// same bits.
FitResult FitTwoRange(const ExactCurves& exact, const FitOptions& options,
                      const QualityThresholds& thresholds);

// The threshold failures of a fit: one line per range and quantity whose max error exceeds
// its threshold, e.g. "low range: max |dCp|/Cp = 0.71 % at 215 K exceeds 0.5 %".
std::vector<std::string> ThresholdFailures(const RangeQuality& low_range,
                                           const RangeQuality& high_range,
                                           const QualityThresholds& thresholds);

// One line on what the form can reach, for a fit that misses its thresholds: "a better fit of
// the form exists: ..." or "at the form's limit: ... (best achievable 4.5 times the thresholds);
// [200 K, 2450 K] would pass". Empty when not computed.
std::string DescribeFormLimit(const FormLimit& limit);

// Minimum grid points on each side of t_mid: more than the 7 coefficients of a range.
inline constexpr int kMinPointsPerRange = 8;

}  // namespace sevenfold

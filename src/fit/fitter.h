// SPDX-License-Identifier: MIT
// Constrained weighted least-squares fit of a two-range NASA polynomial to exact curves,
// the choice of the mid temperature, and the fit's quality figures. See docs/fitting.md.
// Eigen and Ceres stay inside fitter.cc; this header needs neither.
#pragma once

#include <optional>
#include <string>
#include <vector>

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
  // Mid temperature, K; empty means choose it automatically (scan + Ceres refinement).
  std::optional<double> t_mid_k;
  // Also make d2Cp/dT2 continuous at t_mid_k.
  bool continuous_second_derivative = false;
  // Pin H and S to the exact values at 298.15 K when 298.15 K lies in [t_low_k, t_high_k].
  bool pin_reference_state = true;
  // Number of atoms of the species, for the upper bound of the extrapolation band (classical
  // limit of all modes + kExtrapolationUpperMargin). 0 means unknown: the bound is then the
  // largest exact Cp/R on the grid + kExtrapolationUpperMargin.
  int num_atoms = 0;
  // Returns an empty string when valid, otherwise a message naming the field and the rule.
  std::string Validate() const;
};

// How the mid temperature was chosen.
enum class MidTemperatureMethod {
  kFixed,              // given in FitOptions::t_mid_k
  kScanAndRefinement,  // best scan point refined by Ceres; the refined point won
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

struct FitResult {
  TwoRangePolynomial polynomial;
  FitQuality quality;
  // The smooth measure of the worst error that the choice of t_mid minimises: the p-norm
  // (p = 16, mean over all residuals) of the normalised residuals |dCp|/(Cp thr_cp),
  // |dH|/(R T thr_h), |dS|/(R thr_s) over the whole grid. Computed for fixed t_mid too.
  double objective = 0.0;
  // The largest normalised residual over the whole grid (1 means "exactly at a threshold").
  double max_normalised_error = 0.0;
  MidTemperatureChoice mid_choice;
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

// The temperature grid on which the exact curves are sampled for a fit over [t_low_k, t_high_k]
// (dense at low temperature, where rotor and vibrational structure lives; docs/fitting.md):
// multiples of 2 K below 100 K, 5 K below 300 K, 10 K below 1000 K, 25 K below 2000 K and
// 50 K above, strictly inside the range, plus both ends and 298.15 K when inside.
// Throws Error unless 0 < t_low_k < t_high_k (both finite).
std::vector<double> FitGrid(double t_low_k, double t_high_k);

// Minimum grid points on each side of t_mid: more than the 7 coefficients of a range.
inline constexpr int kMinPointsPerRange = 8;

}  // namespace sevenfold

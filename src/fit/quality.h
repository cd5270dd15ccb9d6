// SPDX-License-Identifier: MIT
// How close a fitted polynomial is to the exact curves, and whether it stays physically sane
// outside its range. Solver-free: the entries and report modules include this header alone.
// The figures are defined in docs/fitting.md.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "fit/polynomial.h"

namespace sevenfold {

// Exact dimensionless curves sampled on a grid, in increasing temperature, covering
// [t_low_k, t_high_k] (both ends included). h_over_rt is the absolute enthalpy
// (formation enthalpy included) over R T. All four vectors have the same length.
struct ExactCurves {
  std::vector<double> t_k;
  std::vector<double> cp_over_r;
  std::vector<double> h_over_rt;
  std::vector<double> s_over_r;
  // Exact Cp/R beyond the range, for the extrapolation guard (FitOptions::extrapolation_guard):
  // increasing temperatures below t_k.front() and above t_k.back(). Empty when the guard is off
  // or the caller has no model there; quality figures never use these points.
  std::vector<double> guard_t_k;
  std::vector<double> guard_cp_over_r;
  // The classical high-temperature limit of the model's Cp/R (ClassicalLimitCpOverR for its
  // atoms), the top of the sane band outside the range (with kExtrapolationUpperMargin).
  // 0 means unknown: the top is then the largest Cp/R on the grid + kExtrapolationUpperMargin.
  double classical_limit_cp_over_r = 0.0;
};

// Errors of one range against the exact curves over the grid points in that range
// (t < t_mid for the low range, t >= t_mid for the high range, as TwoRangePolynomial::RangeAt).
// All figures are dimensionless; "rms" is the root mean square over the points.
struct RangeQuality {
  int num_points = 0;            // grid points in the range
  double max_cp_relative = 0.0;  // max |Cp_fit - Cp_exact| / Cp_exact
  double rms_cp_relative = 0.0;
  double max_cp_error_t_k = 0.0; // where the max Cp error sits, K
  double max_h_over_rt = 0.0;    // max |H_fit - H_exact| / (R T)
  double rms_h_over_rt = 0.0;
  double max_h_error_t_k = 0.0;
  double max_s_over_r = 0.0;     // max |S_fit - S_exact| / R
  double rms_s_over_r = 0.0;
  double max_s_error_t_k = 0.0;
  double max_g_over_rt = 0.0;    // max |G_fit - G_exact| / (R T), G = H - T S
  double rms_g_over_rt = 0.0;
  double max_g_error_t_k = 0.0;
};

// Cp of the polynomial outside the fitted range, over [0.5 t_low, t_low] (low coefficients) and
// [t_high, 1.5 t_high] (high coefficients), sampled at kNumExtrapolationSamples points each.
struct ExtrapolationCheck {
  double min_cp_over_r_below = 0.0, max_cp_over_r_below = 0.0;
  double min_cp_over_r_above = 0.0, max_cp_over_r_above = 0.0;
  bool sane = true;        // Cp stays inside the physically sane band (docs/fitting.md)
  std::string message;     // why not, when !sane; empty when sane
};

// Samples per side in CheckExtrapolation, both ends included.
inline constexpr int kNumExtrapolationSamples = 101;

// The sane band of Cp/R outside the fitted range (docs/fitting.md, "Extrapolation").
// Lower bound: every ideal gas has Cp/R >= 5/2 (translation plus p V = R T; all other
// contributions are variances of energy, hence >= 0); we allow kExtrapolationLowerMargin below it.
inline constexpr double kIdealGasMinCpOverR = 2.5;
inline constexpr double kExtrapolationLowerMargin = 0.5;
// Upper bound: the classical limit with every mode excited plus kExtrapolationUpperMargin, which
// leaves room for electronic excitation and hindered-rotor maxima above the classical value.
inline constexpr double kExtrapolationUpperMargin = 4.0;

// The classical (high-temperature) limit of Cp/R of an ideal gas of num_atoms atoms, taken over
// the shapes it could have: 5/2 for an atom, 3 N - 3/2 for a linear molecule (which bounds the
// nonlinear 3 N - 2). num_atoms must be >= 1.
double ClassicalLimitCpOverR(int num_atoms);

// What the 7-coefficient form can reach for a species over its requested range, under the same
// constraints and objective: filled when a fit misses its thresholds (docs/fitting.md, "Verdicts").
struct FormLimit {
  bool computed = false;  // false: not evaluated (the fit met its thresholds)
  // The smallest achievable max over the grid of max(|dCp|/Cp / thr_cp, |dH|/RT / thr_h,
  // |dS|/R / thr_s) for this range and mid-temperature choice: <= 1 means some fit of the form
  // meets the thresholds, > 1 means none does ("at the form's limit").
  double best_threshold_ratio = 0.0;
  // The widest [low, high] inside the requested range that meets the thresholds at the optimum;
  // passing_range_found false when none of the tried ranges does.
  bool passing_range_found = false;
  double passing_t_low_k = 0.0;
  double passing_t_high_k = 0.0;
  bool AtFormLimit() const { return computed && best_threshold_ratio > 1.0; }
};

// The quality of one fit: its figures per range, its behaviour outside the range, the thresholds
// it misses and what the form could reach. One type for the fitter's result, the entry and the
// report's assessment.
struct FitQuality {
  RangeQuality low_range;
  RangeQuality high_range;
  ExtrapolationCheck extrapolation;
  std::vector<std::string> threshold_failures;  // one line per missed threshold
  FormLimit form_limit;
  bool MeetsThresholds() const { return threshold_failures.empty(); }
};

// Errors of the coefficients `a` against exact points [begin, end) of `exact`.
// An empty range gives all zeros.
RangeQuality MeasureRangeQuality(const NasaCoefficients& a, const ExactCurves& exact,
                                 std::size_t begin, std::size_t end);

// Checks Cp/R of `polynomial` outside [t_low_k, t_high_k] against [kIdealGasMinCpOverR -
// kExtrapolationLowerMargin, max_cp_over_r]; `message` names the side, the value found and the
// temperature when it leaves the band.
ExtrapolationCheck CheckExtrapolation(const TwoRangePolynomial& polynomial, double max_cp_over_r);

}  // namespace sevenfold

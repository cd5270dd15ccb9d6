// SPDX-License-Identifier: MIT
// Quality figures of a fitted polynomial against exact curves; extrapolation band check.
#include "fit/quality.h"

#include <algorithm>
#include <cmath>
#include <string>

#include <fmt/format.h>

#include "core/error.h"

namespace sevenfold {
namespace {

// Running max (with its temperature) and sum of squares of one error figure.
struct ErrorTally {
  bool any = false;
  double max = 0.0;
  double max_t_k = 0.0;
  double sum_squares = 0.0;

  void Add(double error, double t_k) {
    const double magnitude = std::fabs(error);
    // Strict > keeps the first of equal maxima, so the reported temperature is deterministic.
    if (!any || magnitude > max) {
      max = magnitude;
      max_t_k = t_k;
      any = true;
    }
    sum_squares += error * error;
  }
  double Rms(int count) const { return count > 0 ? std::sqrt(sum_squares / count) : 0.0; }
};

}  // namespace

double ClassicalLimitCpOverR(int num_atoms) {
  SEVENFOLD_ASSERT(num_atoms >= 1);
  if (num_atoms == 1) return 2.5;
  return 3.0 * num_atoms - 1.5;
}

RangeQuality MeasureRangeQuality(const NasaCoefficients& a, const ExactCurves& exact,
                                 std::size_t begin, std::size_t end) {
  SEVENFOLD_ASSERT(begin <= end && end <= exact.t_k.size());
  SEVENFOLD_ASSERT(exact.cp_over_r.size() == exact.t_k.size() &&
                   exact.h_over_rt.size() == exact.t_k.size() &&
                   exact.s_over_r.size() == exact.t_k.size());
  RangeQuality quality;
  if (begin == end) return quality;
  ErrorTally cp, h, s, g;
  for (std::size_t i = begin; i < end; ++i) {
    const double t_k = exact.t_k[i];
    const double cp_error = (CpOverR(a, t_k) - exact.cp_over_r[i]) / exact.cp_over_r[i];
    const double h_error = HOverRT(a, t_k) - exact.h_over_rt[i];
    const double s_error = SOverR(a, t_k) - exact.s_over_r[i];
    cp.Add(cp_error, t_k);
    h.Add(h_error, t_k);
    s.Add(s_error, t_k);
    g.Add(h_error - s_error, t_k);
  }
  const int count = static_cast<int>(end - begin);
  quality.num_points = count;
  quality.max_cp_relative = cp.max;
  quality.rms_cp_relative = cp.Rms(count);
  quality.max_cp_error_t_k = cp.max_t_k;
  quality.max_h_over_rt = h.max;
  quality.rms_h_over_rt = h.Rms(count);
  quality.max_h_error_t_k = h.max_t_k;
  quality.max_s_over_r = s.max;
  quality.rms_s_over_r = s.Rms(count);
  quality.max_s_error_t_k = s.max_t_k;
  quality.max_g_over_rt = g.max;
  quality.rms_g_over_rt = g.Rms(count);
  quality.max_g_error_t_k = g.max_t_k;
  return quality;
}

ExtrapolationCheck CheckExtrapolation(const TwoRangePolynomial& polynomial, double max_cp_over_r) {
  const double min_cp_over_r = kIdealGasMinCpOverR - kExtrapolationLowerMargin;
  ExtrapolationCheck check;
  std::string problems;
  // One side: samples Cp/R of `a` on [from_k, to_k], records its extremes and the first
  // temperature where it leaves the band.
  auto scan = [&](const NasaCoefficients& a, double from_k, double to_k, const char* side,
                  double* low, double* high) {
    *low = HUGE_VAL;
    *high = -HUGE_VAL;
    double worst_t_k = 0.0, worst_value = 0.0, worst_excess = 0.0;
    for (int i = 0; i < kNumExtrapolationSamples; ++i) {
      const double t_k = from_k + (to_k - from_k) * i / (kNumExtrapolationSamples - 1);
      const double value = CpOverR(a, t_k);
      *low = std::min(*low, value);
      *high = std::max(*high, value);
      const double excess = std::max(min_cp_over_r - value, value - max_cp_over_r);
      if (!(excess <= worst_excess)) {  // also catches NaN
        worst_excess = excess;
        worst_value = value;
        worst_t_k = t_k;
      }
    }
    if (worst_excess > 0.0 || std::isnan(worst_excess)) {
      if (!problems.empty()) problems += "; ";
      problems += fmt::format("{} the range: Cp/R = {:.4g} at {:g} K is outside the sane band [{:g}, {:g}]",
                              side, worst_value, worst_t_k, min_cp_over_r, max_cp_over_r);
    }
  };
  scan(polynomial.low, 0.5 * polynomial.t_low_k, polynomial.t_low_k, "below",
       &check.min_cp_over_r_below, &check.max_cp_over_r_below);
  scan(polynomial.high, polynomial.t_high_k, 1.5 * polynomial.t_high_k, "above",
       &check.min_cp_over_r_above, &check.max_cp_over_r_above);
  check.sane = problems.empty();
  check.message = problems;
  return check;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// FitTwoRange: checks the request, dispatches to the minimax or the least-squares fit, and adds
// the quality figures, the threshold failures and the form-limit verdict. docs/fitting.md.
#include "fit/fitter.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "fit/design_rows.h"
#include "fit/least_squares.h"
#include "fit/minimax_fit.h"

namespace sevenfold {
namespace {

using namespace detail;  // NOLINT: the fit module's own internals

// One fit at its chosen mid temperature, from either solver.
struct Solution {
  TwoRangePolynomial polynomial;
  std::size_t split = 0;  // first grid index of the high range
  double objective = 0.0;
  double max_normalised_error = 0.0;
};

// Throws Error unless the curves are usable: equal lengths, finite, T increasing, Cp positive.
void ValidateCurves(const ExactCurves& exact) {
  const std::size_t n = exact.t_k.size();
  if (exact.cp_over_r.size() != n || exact.h_over_rt.size() != n || exact.s_over_r.size() != n) {
    throw Error(fmt::format(
        "exact curves: found {} temperatures, {} Cp, {} H and {} S values; expected equal counts",
        n, exact.cp_over_r.size(), exact.h_over_rt.size(), exact.s_over_r.size()));
  }
  if (n < 2 * static_cast<std::size_t>(kMinPointsPerRange)) {
    throw Error(fmt::format("exact curves: found {} grid points; expected at least {}", n,
                            2 * kMinPointsPerRange));
  }
  for (std::size_t i = 0; i < n; ++i) {
    const double values[] = {exact.t_k[i], exact.cp_over_r[i], exact.h_over_rt[i],
                             exact.s_over_r[i]};
    for (double value : values) {
      if (!std::isfinite(value)) {
        throw Error(fmt::format("exact curves: point {} at {} K holds a non-finite value", i,
                                exact.t_k[i]));
      }
    }
    if (!(exact.t_k[i] > 0.0)) {
      throw Error(fmt::format("exact curves: temperature {} K at point {}; expected positive",
                              exact.t_k[i], i));
    }
    if (!(exact.cp_over_r[i] > 0.0)) {
      throw Error(fmt::format("exact curves: Cp/R = {} at {} K; expected positive",
                              exact.cp_over_r[i], exact.t_k[i]));
    }
    if (i > 0 && !(exact.t_k[i] > exact.t_k[i - 1])) {
      throw Error(fmt::format("exact curves: temperature {} K follows {} K; expected increasing",
                              exact.t_k[i], exact.t_k[i - 1]));
    }
  }
  const double limit = exact.classical_limit_cp_over_r;
  if (!(limit == 0.0 || (std::isfinite(limit) && limit >= kIdealGasMinCpOverR))) {
    throw Error(fmt::format("exact curves: classical limit Cp/R = {}; expected 0 (unknown) or a "
                            "finite value of at least {}",
                            limit, kIdealGasMinCpOverR));
  }
}

void ValidateThresholds(const QualityThresholds& thresholds) {
  const std::pair<const char*, double> fields[] = {
      {"max_cp_relative", thresholds.max_cp_relative},
      {"max_h_over_rt", thresholds.max_h_over_rt},
      {"max_s_over_r", thresholds.max_s_over_r}};
  for (const auto& [name, value] : fields) {
    if (!(value > 0.0) || !std::isfinite(value)) {
      throw Error(fmt::format("quality threshold {} = {}; expected a positive finite number", name,
                              value));
    }
  }
}

// Exact coefficients where the physics is exact: when Cp/R takes one constant value c at every
// grid point (an atom whose electronic levels stay unexcited: 3/2 from translation plus 1 from
// p V = R T, common practice), Cp/R = c, H/RT = c + a6/T and S/R = c ln T + a7 represent the
// curves exactly, with a2..a5 = 0 in both ranges. c is taken as the nearest multiple of 1/2 when
// within kConstantCpTolerance of it (rounding of the engine's sums), a6 and a7 from the reference
// state (or the first grid point). Returns nullopt when the curves are not of this kind.
constexpr double kConstantCpTolerance = 1e-12;
// H/RT and S/R must be reproduced to this (absolute; values of order 10-100) for the exact form
// to be used: rounding of the engine's H and S, not a physical tolerance.
constexpr double kConstantCpCurveTolerance = 1e-10;
std::optional<NasaCoefficients> ConstantCpCoefficients(const ExactCurves& exact, bool pin) {
  const double c0 = exact.cp_over_r.front();
  for (const double cp : exact.cp_over_r) {
    if (std::fabs(cp - c0) > kConstantCpTolerance * c0) return std::nullopt;
  }
  double c = c0;
  const double half_multiple = std::round(2.0 * c0) / 2.0;
  if (std::fabs(c0 - half_multiple) <= kConstantCpTolerance * c0) c = half_multiple;
  const ReferenceState reference = FindReferenceState(exact, pin);
  const double t_ref = reference.pinned ? constants::kReferenceTemperature : exact.t_k.front();
  const double h_ref = reference.pinned ? reference.h_over_rt : exact.h_over_rt.front();
  const double s_ref = reference.pinned ? reference.s_over_r : exact.s_over_r.front();
  NasaCoefficients a{};
  a[0] = c;
  a[5] = (h_ref - c) * t_ref;
  a[6] = s_ref - c * std::log(t_ref);
  for (std::size_t i = 0; i < exact.t_k.size(); ++i) {
    if (std::fabs(HOverRT(a, exact.t_k[i]) - exact.h_over_rt[i]) > kConstantCpCurveTolerance ||
        std::fabs(SOverR(a, exact.t_k[i]) - exact.s_over_r[i]) > kConstantCpCurveTolerance) {
      return std::nullopt;
    }
  }
  return a;
}

}  // namespace

std::string FitOptions::Validate() const {
  if (t_mid_k && !(std::isfinite(*t_mid_k) && *t_mid_k > 0.0)) {
    return fmt::format("t_mid_k = {}; expected a positive finite temperature", *t_mid_k);
  }
  return "";
}

std::string ToString(MidTemperatureMethod method) {
  switch (method) {
    case MidTemperatureMethod::kFixed:
      return "fixed";
    case MidTemperatureMethod::kScanAndRefinement:
      return "scan+refinement";
    case MidTemperatureMethod::kScanOnly:
      return "scan";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

// `value` with the fewest significant digits (at least 2) that print it differently from
// `threshold` at the same precision, so that a miss never reads "0.5 % exceeds 0.5 %".
std::string DigitsAbove(double value, double threshold) {
  for (int digits = 2; digits < 17; ++digits) {
    const std::string shown = fmt::format("{:.{}g}", value, digits);
    if (shown != fmt::format("{:.{}g}", threshold, digits)) return shown;
  }
  return fmt::format("{}", value);
}

std::vector<std::string> ThresholdFailures(const RangeQuality& low_range,
                                           const RangeQuality& high_range,
                                           const QualityThresholds& thresholds) {
  std::vector<std::string> failures;
  const std::pair<const char*, const RangeQuality*> ranges[] = {{"low", &low_range},
                                                                {"high", &high_range}};
  for (const auto& [name, quality] : ranges) {
    if (quality->max_cp_relative > thresholds.max_cp_relative) {
      failures.push_back(fmt::format(
          "{} range: max |dCp|/Cp = {} % at {:g} K exceeds {:g} %", name,
          DigitsAbove(100.0 * quality->max_cp_relative, 100.0 * thresholds.max_cp_relative),
          quality->max_cp_error_t_k, 100.0 * thresholds.max_cp_relative));
    }
    if (quality->max_h_over_rt > thresholds.max_h_over_rt) {
      failures.push_back(fmt::format("{} range: max |dH|/RT = {} at {:g} K exceeds {:g}", name,
                                     DigitsAbove(quality->max_h_over_rt, thresholds.max_h_over_rt),
                                     quality->max_h_error_t_k, thresholds.max_h_over_rt));
    }
    if (quality->max_s_over_r > thresholds.max_s_over_r) {
      failures.push_back(fmt::format("{} range: max |dS|/R = {} at {:g} K exceeds {:g}", name,
                                     DigitsAbove(quality->max_s_over_r, thresholds.max_s_over_r),
                                     quality->max_s_error_t_k, thresholds.max_s_over_r));
    }
  }
  return failures;
}

std::string DescribeFormLimit(const FormLimit& limit) {
  if (!limit.computed) return "";
  if (!limit.AtFormLimit()) {
    return fmt::format("a better fit of the form exists: the optimum reaches {:.3g} of the "
                       "thresholds over this range",
                       limit.best_threshold_ratio);
  }
  std::string text = fmt::format(
      "at the form's limit: no 7-coefficient fit meets the thresholds over this range (best "
      "achievable {:.3g} times the thresholds)",
      limit.best_threshold_ratio);
  if (limit.passing_range_found) {
    text += fmt::format("; [{:g} K, {:g} K] would pass", limit.passing_t_low_k,
                        limit.passing_t_high_k);
  } else {
    text += "; no narrower range tried passes";
  }
  return text;
}

namespace {

// Steps of the bisection for the widest passing range on each side (each halves the interval of
// grid indices: 8 steps resolve a grid of ~250 points to about one point).
constexpr int kPassingRangeSteps = 8;

// The worst error in units of the thresholds of the minimax optimum over grid points [begin, end)
// of `exact`, at the mid temperature nearest `t_mid_k` that leaves enough points on each side;
// guard off (the exact curves beyond a shrunk range are the grid's own points, not a guard
// sample). Infinity when the sub-range is too short.
double OptimumOverSubrange(const ExactCurves& exact, std::size_t begin, std::size_t end,
                           const FitOptions& options, const QualityThresholds& thresholds,
                           double t_mid_k) {
  if (end - begin < 2 * static_cast<std::size_t>(kMinPointsPerRange) + 2) return HUGE_VAL;
  ExactCurves sub;
  sub.t_k.assign(exact.t_k.begin() + begin, exact.t_k.begin() + end);
  sub.cp_over_r.assign(exact.cp_over_r.begin() + begin, exact.cp_over_r.begin() + end);
  sub.h_over_rt.assign(exact.h_over_rt.begin() + begin, exact.h_over_rt.begin() + end);
  sub.s_over_r.assign(exact.s_over_r.begin() + begin, exact.s_over_r.begin() + end);
  FitOptions sub_options = options;
  sub_options.extrapolation_guard.enabled = false;
  sub_options.t_mid_k = std::clamp(t_mid_k, sub.t_k[kMinPointsPerRange],
                                   sub.t_k[sub.t_k.size() - kMinPointsPerRange]);
  const ErrorScales scales{thresholds.max_cp_relative, thresholds.max_h_over_rt,
                           thresholds.max_s_over_r};
  return FitMinimax(sub, sub_options, scales).max_error;
}

FormLimit ComputeFormLimit(const ExactCurves& exact, const FitOptions& options,
                           const QualityThresholds& thresholds, double t_mid_k) {
  FormLimit limit;
  limit.computed = true;
  const ErrorScales scales{thresholds.max_cp_relative, thresholds.max_h_over_rt,
                           thresholds.max_s_over_r};
  // The optimum of the same problem (same range, guard and mid-temperature setting) measured in
  // units of the thresholds.
  limit.best_threshold_ratio = FitMinimax(exact, options, scales).max_error;
  if (!(limit.best_threshold_ratio > 1.0)) return limit;
  // The widest passing range: by bisection on the top end with the bottom fixed, and on the
  // bottom end with the top fixed; the wider of the two (in ln T) wins.
  const std::size_t n = exact.t_k.size();
  auto try_side = [&](bool move_top, std::size_t* best_begin, std::size_t* best_end) {
    std::size_t passing = move_top ? 0 : n;  // an index known to pass, if any
    std::size_t lo = 0, hi = n;               // bisection over the moving end
    bool found = false;
    for (int step = 0; step < kPassingRangeSteps && hi - lo > 1; ++step) {
      const std::size_t mid = (lo + hi) / 2;
      const double value = move_top ? OptimumOverSubrange(exact, 0, mid + 1, options, thresholds, t_mid_k)
                                    : OptimumOverSubrange(exact, mid, n, options, thresholds, t_mid_k);
      const bool passes = value <= 1.0;
      if (passes) {
        found = true;
        passing = mid;
      }
      if (passes == move_top) lo = mid; else hi = mid;
    }
    if (!found) return false;
    *best_begin = move_top ? 0 : passing;
    *best_end = move_top ? passing + 1 : n;
    return true;
  };
  std::size_t begin_a = 0, end_a = 0, begin_b = 0, end_b = 0;
  const bool top = try_side(true, &begin_a, &end_a);
  const bool bottom = try_side(false, &begin_b, &end_b);
  auto width = [&](std::size_t b, std::size_t e) { return std::log(exact.t_k[e - 1] / exact.t_k[b]); };
  if (top || bottom) {
    const bool use_top = top && (!bottom || width(begin_a, end_a) >= width(begin_b, end_b));
    limit.passing_range_found = true;
    limit.passing_t_low_k = exact.t_k[use_top ? begin_a : begin_b];
    limit.passing_t_high_k = exact.t_k[(use_top ? end_a : end_b) - 1];
  }
  return limit;
}

}  // namespace

FitResult FitTwoRange(const ExactCurves& exact, const FitOptions& options,
                      const QualityThresholds& thresholds) {
  if (const std::string problem = options.Validate(); !problem.empty()) {
    throw Error("fit options: " + problem);
  }
  ValidateThresholds(thresholds);
  ValidateCurves(exact);
  const double t_low_k = exact.t_k.front(), t_high_k = exact.t_k.back();
  if (options.t_mid_k && !(*options.t_mid_k > t_low_k && *options.t_mid_k < t_high_k)) {
    throw Error(fmt::format("mid temperature {:g} K; expected strictly between {:g} K and {:g} K",
                            *options.t_mid_k, t_low_k, t_high_k));
  }

  FitResult result;
  Solution solution;
  if (options.objective == FitObjective::kMinimax) {
    MinimaxFit fit = FitMinimax(exact, options, options.error_scales);
    solution.polynomial = fit.polynomial;
    solution.split = fit.split;
    solution.objective = fit.max_error;
    solution.max_normalised_error = fit.max_error;
    result.certificate = std::move(fit.certificate);
    result.mid_choice = fit.mid_choice;
  } else {
    LeastSquaresFit fit = FitLeastSquares(exact, options);
    solution.polynomial = fit.polynomial;
    solution.split = fit.split;
    solution.objective = fit.objective;
    solution.max_normalised_error = fit.max_normalised_error;
    result.mid_choice = fit.mid_choice;
  }
  const std::optional<NasaCoefficients> constant =
      ConstantCpCoefficients(exact, options.pin_reference_state);
  if (constant) {
    solution.polynomial.low = *constant;
    solution.polynomial.high = *constant;
  }
  result.polynomial = solution.polynomial;
  result.objective = solution.objective;
  result.max_normalised_error = solution.max_normalised_error;
  result.quality.low_range = MeasureRangeQuality(solution.polynomial.low, exact, 0, solution.split);
  result.quality.high_range =
      MeasureRangeQuality(solution.polynomial.high, exact, solution.split, exact.t_k.size());
  result.quality.threshold_failures =
      ThresholdFailures(result.quality.low_range, result.quality.high_range, thresholds);
  if (constant) {
    double worst = 0.0;
    for (const RangeQuality* range : {&result.quality.low_range, &result.quality.high_range}) {
      worst = std::max({worst, range->max_cp_relative / options.error_scales.cp_relative,
                        range->max_h_over_rt / options.error_scales.h_over_rt,
                        range->max_s_over_r / options.error_scales.s_over_r});
    }
    result.max_normalised_error = worst;
    if (options.objective == FitObjective::kMinimax) result.objective = worst;
  }
  if (!result.quality.MeetsThresholds()) {
    result.quality.form_limit =
        ComputeFormLimit(exact, options, thresholds, solution.polynomial.t_mid_k);
  }
  const double upper_cp_over_r =
      (exact.classical_limit_cp_over_r > 0.0
           ? exact.classical_limit_cp_over_r
           : *std::max_element(exact.cp_over_r.begin(), exact.cp_over_r.end())) +
      kExtrapolationUpperMargin;
  result.quality.extrapolation = CheckExtrapolation(solution.polynomial, upper_cp_over_r);
  return result;
}

}  // namespace sevenfold

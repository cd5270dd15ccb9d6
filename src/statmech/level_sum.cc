// SPDX-License-Identifier: MIT
#include "statmech/level_sum.h"

#include <cmath>

namespace sevenfold {
namespace {

// exp(-x) underflows to zero (or to a subnormal that no longer affects a sum containing the
// ground level's weight 1) beyond this x; skipping those levels changes nothing.
constexpr double kUnderflowExponent = 745.0;

}  // namespace

Moments LevelSumMoments(const std::vector<Level>& levels, double t_k) {
  // One pass with the weighted update of West (1979): the running mean and the sum of squared
  // deviations stay accurate even when the variance is tiny against <E>^2, and every level costs
  // one exponential only.
  const double inverse_t = 1.0 / t_k;
  double sum_weight = 0.0;
  double mean = 0.0;
  double sum_weight_deviation2 = 0.0;
  for (const Level& level : levels) {
    const double exponent = level.energy_k * inverse_t;
    if (exponent > kUnderflowExponent) continue;
    const double weight = level.degeneracy * std::exp(-exponent);
    if (weight == 0.0) continue;
    sum_weight += weight;
    const double deviation = level.energy_k - mean;
    mean += deviation * (weight / sum_weight);
    sum_weight_deviation2 += weight * deviation * (level.energy_k - mean);
  }
  Moments moments;
  moments.ln_q = std::log(sum_weight);
  moments.mean_energy_k = mean;
  moments.energy_variance_k2 = sum_weight_deviation2 / sum_weight;
  return moments;
}

Moments ShiftedLevelSumMoments(const std::vector<Level>& levels, double lowest_k, double t_k) {
  Moments moments = LevelSumMoments(levels, t_k);
  moments.ln_q -= lowest_k / t_k;
  moments.mean_energy_k += lowest_k;
  return moments;
}

}  // namespace sevenfold

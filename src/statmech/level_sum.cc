// SPDX-License-Identifier: MIT
#include "statmech/level_sum.h"

#include <cmath>
#include <cstddef>

namespace sevenfold {
namespace {

// Levels with E/T beyond this x are skipped. exp(-50) = 1.9e-22 per unit degeneracy; with a
// level density growing as E^(1/2) (a nonlinear top; ladders in one or two dimensions thin out
// faster) all skipped levels together weigh ~x^(1/2) e^-x ~ 1e-21 of q and move the variance by
// ~x^2.5 e^-x ~ 3e-18 of itself: below the last bit of every result. It spares most
// exponentials of a torsion or a large rotor: half the levels summed at 100 lie beyond 50
// (docs/performance.md).
constexpr double kNegligibleExponent = 50.0;

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
    if (exponent > kNegligibleExponent) continue;
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

Cumulants LevelSumCumulants(const std::vector<Level>& levels, double t_k) {
  const double inverse_t = 1.0 / t_k;
  std::vector<double> weights(levels.size());
  double sum_weight = 0.0, sum_energy = 0.0;
  for (std::size_t i = 0; i < levels.size(); ++i) {
    weights[i] = levels[i].degeneracy * std::exp(-levels[i].energy_k * inverse_t);
    sum_weight += weights[i];
    sum_energy += weights[i] * levels[i].energy_k;
  }
  const double mean = sum_energy / sum_weight;
  double m2 = 0.0, m3 = 0.0, m4 = 0.0;  // central moments times sum_weight
  for (std::size_t i = 0; i < levels.size(); ++i) {
    const double d = levels[i].energy_k - mean, d2 = d * d;
    m2 += weights[i] * d2;
    m3 += weights[i] * d2 * d;
    m4 += weights[i] * d2 * d2;
  }
  m2 /= sum_weight;
  m3 /= sum_weight;
  m4 /= sum_weight;
  Cumulants cumulants;
  cumulants.ln_q = std::log(sum_weight);
  cumulants.kappa = {0.0, mean, m2, m3, m4 - 3.0 * m2 * m2};
  return cumulants;
}

Moments ShiftedLevelSumMoments(const std::vector<Level>& levels, double lowest_k, double t_k) {
  Moments moments = LevelSumMoments(levels, t_k);
  moments.ln_q -= lowest_k / t_k;
  moments.mean_energy_k += lowest_k;
  return moments;
}

}  // namespace sevenfold

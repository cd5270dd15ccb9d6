// SPDX-License-Identifier: MIT
#include "statmech/harmonic.h"

#include <cmath>

namespace sevenfold {
namespace {

// Below this x = theta/T, 1 - e^-x comes from expm1 (full precision as x -> 0); above it from
// 1 - exp(-x), whose relative rounding error e^-x/(1 - e^-x) eps stays below 3.6 eps (x >= 0.25).
// exp costs about half of expm1 (docs/performance.md).
constexpr double kSoftModeExponent = 0.25;
// The running product of (1 - e^-x) factors (each in (0, 1]) is folded into a logarithm before it
// can reach the subnormal range: it stays above 1e-200, and a factor below 1e-100 (a mode of
// nearly zero wavenumber) goes straight into the logarithm: the product stays above 1e-300.
constexpr double kProductFoldThreshold = 1e-200;
constexpr double kTinyFactor = 1e-100;

}  // namespace

Moments HarmonicMoments(const std::vector<double>& theta_k, double t_k) {
  Moments moments;
  // ln q = -sum ln(1 - e^-x) is taken as -ln prod(1 - e^-x): one logarithm per temperature
  // instead of one per mode (the product's rounding, ~1 ulp per factor, matches the sum's).
  double product = 1.0;
  double folded_log = 0.0;
  for (const double theta : theta_k) {
    const double x = theta / t_k;
    double e_minus = 0.0, one_minus_e = 0.0;  // e^-x and 1 - e^-x
    if (x < kSoftModeExponent) {
      one_minus_e = -std::expm1(-x);
      e_minus = 1.0 - one_minus_e;
    } else {
      e_minus = std::exp(-x);
      one_minus_e = 1.0 - e_minus;
    }
    const double inverse = 1.0 / one_minus_e;
    // <E> = theta / (e^x - 1) = theta e^-x / (1 - e^-x); Var = theta^2 e^-x / (1 - e^-x)^2.
    const double occupation = e_minus * inverse;
    moments.mean_energy_k += theta * occupation;
    moments.energy_variance_k2 += theta * theta * occupation * inverse;
    if (one_minus_e < kTinyFactor) {
      folded_log += std::log(one_minus_e);
      continue;
    }
    product *= one_minus_e;
    if (product < kProductFoldThreshold) {
      folded_log += std::log(product);
      product = 1.0;
    }
  }
  moments.ln_q = -(folded_log + std::log(product));
  return moments;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "statmech/harmonic.h"

#include <cmath>

namespace sevenfold {

Moments HarmonicMoments(const std::vector<double>& theta_k, double t_k) {
  Moments moments;
  for (const double theta : theta_k) {
    const double x = theta / t_k;
    // expm1 keeps full precision for soft modes (x << 1) where e^x - 1 would cancel.
    const double em1 = std::expm1(x);
    const double e_minus = std::exp(-x);
    moments.ln_q -= std::log1p(-e_minus);
    moments.mean_energy_k += theta / em1;
    // theta^2 e^x / (e^x - 1)^2 written as theta^2 / (em1 * (1 - e^-x)) to avoid overflow.
    moments.energy_variance_k2 += theta * theta / (em1 * -std::expm1(-x));
  }
  return moments;
}

}  // namespace sevenfold

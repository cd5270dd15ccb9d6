// SPDX-License-Identifier: MIT
// Harmonic vibrational modes, energies from each mode's zero-point level.
#pragma once

#include <vector>

#include "statmech/moments.h"

namespace sevenfold {

// Moments of a set of independent harmonic oscillators with vibrational temperatures theta_k
// (h c nu / k, K) at t_k:
//   ln q = -sum ln(1 - e^-x),  <E> = sum theta / (e^x - 1),  Var = sum theta^2 e^x / (e^x - 1)^2,
// x = theta / T [McQuarrie2000, ch. 6].
Moments HarmonicMoments(const std::vector<double>& theta_k, double t_k);

}  // namespace sevenfold

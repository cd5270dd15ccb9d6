// SPDX-License-Identifier: MIT
// Explicit sum over a list of energy levels: q = sum g_i exp(-E_i / T).
#pragma once

#include <array>
#include <vector>

#include "statmech/moments.h"

namespace sevenfold {

struct Level {
  double energy_k = 0.0;  // E / k, K, >= 0 (measured from the lowest level)
  double degeneracy = 1.0;
};

// Moments of an explicit level sum at t_k. Levels with E/T beyond ~745 underflow to zero
// weight, which is exact to double precision (and are skipped without an exponential).
// Requires a level of energy 0 (or close enough that its weight does not underflow).
Moments LevelSumMoments(const std::vector<Level>& levels, double t_k);

// ln q and the first four cumulants of E (<E>, Var, third and fourth) of an explicit level sum
// at t_k, by two passes (the mean first, then central moments, so that the higher cumulants do
// not cancel). For matching asymptotic tails (rotor.cc), once per ladder. Same requirements as
// LevelSumMoments.
struct Cumulants {
  double ln_q = 0.0;
  std::array<double, 5> kappa{};  // kappa[k], k = 1..4: <E>, Var(E), third, fourth; K^k
};
Cumulants LevelSumCumulants(const std::vector<Level>& levels, double t_k);

// Moments of a list whose energies were stored relative to lowest_k (so that its lowest level
// is 0 and the sum cannot underflow), reported relative to the original zero:
//   ln q = ln q_list - lowest/T,  <E> = <E>_list + lowest,  Var unchanged.
Moments ShiftedLevelSumMoments(const std::vector<Level>& levels, double lowest_k, double t_k);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "statmech/nuclear_spin.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <utility>

#include "core/error.h"

namespace sevenfold {

ParityLevels LinearRotorParityLevels(double theta_k, double d_k, double energy_cut_k) {
  SEVENFOLD_ASSERT(theta_k > 0.0 && d_k >= 0.0);
  ParityLevels levels;
  const double turning_jj =
      d_k > 0.0 ? theta_k / (2.0 * d_k) : std::numeric_limits<double>::infinity();
  for (int j = 0;; ++j) {
    const double jj = static_cast<double>(j) * (j + 1);
    if (jj >= turning_jj) break;
    const double energy = theta_k * jj - d_k * jj * jj;
    if (energy > energy_cut_k) break;
    (j % 2 == 0 ? levels.even : levels.odd).push_back({energy, 2.0 * j + 1.0});
  }
  return levels;
}

ParityLevelSum::ShiftedList ParityLevelSum::Shift(std::vector<Level> levels) {
  ShiftedList list;
  if (levels.empty()) return list;
  double lowest = std::numeric_limits<double>::infinity();
  for (const Level& level : levels) lowest = std::min(lowest, level.energy_k);
  for (Level& level : levels) level.energy_k -= lowest;
  list.levels = std::move(levels);
  list.lowest_k = lowest;
  return list;
}

ParityLevelSum::ParityLevelSum(ParityLevels levels, double symmetry_number) {
  SEVENFOLD_ASSERT(symmetry_number >= 1.0);
  std::vector<Level> all = std::move(levels.even);
  all.insert(all.end(), levels.odd.begin(), levels.odd.end());
  SEVENFOLD_ASSERT(!all.empty());
  merged_ = Shift(std::move(all));
  ln_symmetry_ = std::log(symmetry_number);
}

ParityLevelSum::ParityLevelSum(ParityLevels levels, const NuclearSpin& spin) {
  SEVENFOLD_ASSERT(spin.even_weight >= 0.0 && spin.odd_weight >= 0.0);
  const double total = spin.even_weight + spin.odd_weight;
  SEVENFOLD_ASSERT(total > 0.0);
  x_even_ = spin.even_weight / total;
  x_odd_ = spin.odd_weight / total;
  // A parity of weight zero does not exist at all (e.g. odd J of 16O2 in a Sigma_g+ state).
  if (x_even_ == 0.0) levels.even.clear();
  if (x_odd_ == 0.0) levels.odd.clear();
  SEVENFOLD_ASSERT(!levels.even.empty() || !levels.odd.empty());
  if (spin.mixture == SpinMixture::kNormal) {
    normal_ = true;
    even_ = Shift(std::move(levels.even));
    odd_ = Shift(std::move(levels.odd));
    return;
  }
  std::vector<Level> all;
  all.reserve(levels.even.size() + levels.odd.size());
  for (Level level : levels.even) {
    level.degeneracy *= x_even_;
    all.push_back(level);
  }
  for (Level level : levels.odd) {
    level.degeneracy *= x_odd_;
    all.push_back(level);
  }
  merged_ = Shift(std::move(all));
}

Moments ParityLevelSum::At(double t_k) const {
  if (!normal_) {
    Moments moments = ShiftedLevelSumMoments(merged_.levels, merged_.lowest_k, t_k);
    moments.ln_q -= ln_symmetry_;
    return moments;
  }
  // Frozen mixture: each modification is its own ideal gas; the mole-fraction weighting of ln q
  // carries the mixing entropy -R sum x ln x together with the spin degeneracies (theory.md).
  Moments moments;
  const std::pair<double, const ShiftedList*> parts[] = {{x_even_, &even_}, {x_odd_, &odd_}};
  for (const auto& [fraction, list] : parts) {
    if (fraction == 0.0) continue;
    SEVENFOLD_ASSERT(!list->levels.empty());
    const Moments part = ShiftedLevelSumMoments(list->levels, list->lowest_k, t_k);
    moments.ln_q += fraction * part.ln_q;
    moments.mean_energy_k += fraction * part.mean_energy_k;
    moments.energy_variance_k2 += fraction * part.energy_variance_k2;
  }
  return moments;
}

}  // namespace sevenfold

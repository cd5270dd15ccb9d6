// SPDX-License-Identifier: MIT
// The temperature grid of a fit (docs/fitting.md, "The grid").
#include "fit/grid.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"

namespace sevenfold {

std::vector<double> FitGrid(double t_low_k, double t_high_k) {
  if (!(std::isfinite(t_low_k) && std::isfinite(t_high_k) && t_low_k > 0.0 &&
        t_low_k < t_high_k)) {
    throw Error(fmt::format("fit grid over [{:g} K, {:g} K]; expected 0 < t_low < t_high, finite",
                            t_low_k, t_high_k));
  }
  // Step sizes, K, below each bound: fine where rotational and low vibrational structure lives.
  struct Tier {
    double start_k;
    double end_k;
    double step_k;
  };
  constexpr Tier kTiers[] = {{0.0, 100.0, 2.0},
                             {100.0, 300.0, 5.0},
                             {300.0, 1000.0, 10.0},
                             {1000.0, 2000.0, 25.0},
                             {2000.0, std::numeric_limits<double>::infinity(), 50.0}};
  std::vector<double> grid{t_low_k};
  for (const Tier& tier : kTiers) {
    const double from_k = std::max(tier.start_k, t_low_k);
    const double to_k = std::min(tier.end_k, t_high_k);
    if (from_k >= to_k) continue;
    // Integer multiples of the step: exact doubles, no accumulated rounding.
    for (double m = std::ceil(from_k / tier.step_k);; m += 1.0) {
      const double t_k = m * tier.step_k;
      if (t_k >= to_k) break;
      if (t_k > t_low_k) grid.push_back(t_k);
    }
  }
  constexpr double kT = constants::kReferenceTemperature;
  if (kT > t_low_k && kT < t_high_k) grid.push_back(kT);
  grid.push_back(t_high_k);
  std::sort(grid.begin(), grid.end());
  grid.erase(std::unique(grid.begin(), grid.end()), grid.end());
  return grid;
}

std::vector<double> GuardGrid(double t_low_k, double t_high_k, const ExtrapolationGuard& guard) {
  std::vector<double> grid;
  if (!guard.enabled) return grid;
  const double from_k = t_low_k / guard.factor, to_k = t_high_k * guard.factor;
  for (int i = 0; i < kNumGuardPointsPerSide; ++i) {  // from t_low / factor up to below t_low
    grid.push_back(from_k + (t_low_k - from_k) * i / kNumGuardPointsPerSide);
  }
  for (int i = 1; i <= kNumGuardPointsPerSide; ++i) {  // above t_high up to t_high * factor
    grid.push_back(t_high_k + (to_k - t_high_k) * i / kNumGuardPointsPerSide);
  }
  return grid;
}

std::size_t SplitIndex(const std::vector<double>& t_k, double t_mid_k) {
  return static_cast<std::size_t>(std::lower_bound(t_k.begin(), t_k.end(), t_mid_k) - t_k.begin());
}

bool LeavesPointsOnEachSide(const std::vector<double>& t_k, double t_mid_k, int min_points) {
  const std::size_t split = SplitIndex(t_k, t_mid_k), need = static_cast<std::size_t>(min_points);
  return split >= need && t_k.size() - split >= need;
}

void RequirePointsOnEachSide(const std::vector<double>& t_k, double t_mid_k, int min_points) {
  if (LeavesPointsOnEachSide(t_k, t_mid_k, min_points)) return;
  const std::size_t split = SplitIndex(t_k, t_mid_k);
  throw Error(fmt::format(
      "mid temperature {:g} K leaves {} grid points below and {} at or above it; expected at "
      "least {} on each side",
      t_mid_k, split, t_k.size() - split, min_points));
}

}  // namespace sevenfold

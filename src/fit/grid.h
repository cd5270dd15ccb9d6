// SPDX-License-Identifier: MIT
// The temperature grid on which exact curves are sampled for a fit. Solver-free.
#pragma once

#include <cstddef>
#include <vector>

#include "core/fit_settings.h"

namespace sevenfold {

// The temperature grid on which the exact curves are sampled for a fit over [t_low_k, t_high_k]
// (dense at low temperature, where rotor and vibrational structure lives; docs/fitting.md):
// multiples of 2 K below 100 K, 5 K below 300 K, 10 K below 1000 K, 25 K below 2000 K and
// 50 K above, strictly inside the range, plus both ends and 298.15 K when inside.
// Throws Error unless 0 < t_low_k < t_high_k (both finite).
std::vector<double> FitGrid(double t_low_k, double t_high_k);

// Where a mid temperature splits a grid: the index of the first point at or above t_mid_k (the
// high range's first point).
std::size_t SplitIndex(const std::vector<double>& t_k, double t_mid_k);
// Whether t_mid_k leaves at least min_points grid points below it and min_points at or above.
bool LeavesPointsOnEachSide(const std::vector<double>& t_k, double t_mid_k, int min_points);
// Throws Error (what it leaves, what is expected) unless it does.
void RequirePointsOnEachSide(const std::vector<double>& t_k, double t_mid_k, int min_points);

// Points per side where the extrapolation guard holds Cp (docs/fitting.md, "The guard").
inline constexpr int kNumGuardPointsPerSide = 12;

// The temperatures at which the extrapolation guard is imposed: kNumGuardPointsPerSide evenly
// spaced over [t_low_k / factor, t_low_k) and as many over (t_high_k, factor t_high_k], in
// increasing order. Empty when the guard is off. Requires 0 < t_low_k < t_high_k.
std::vector<double> GuardGrid(double t_low_k, double t_high_k, const ExtrapolationGuard& guard);

}  // namespace sevenfold

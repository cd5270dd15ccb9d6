// SPDX-License-Identifier: MIT
// The minimax fit of a species: its rows and guard, the solve at a mid temperature, and the
// search of the mid temperature by the same figure. Internal to fit/; docs/fitting.md.
#pragma once

#include <cstddef>
#include <vector>

#include "fit/design_rows.h"
#include "fit/fitter.h"
#include "fit/minimax.h"

namespace sevenfold::detail {

struct MinimaxFit {
  TwoRangePolynomial polynomial;
  std::size_t split = 0;   // first grid index of the high range
  double max_error = 0.0;  // worst normalised error over the grid (in units of the scales)
  MinimaxCertificate certificate;
  MidTemperatureChoice mid_choice;
};

// Fits by minimax with the error scales of `options` (or `scales` when given), at
// options.t_mid_k or at the mid temperature that minimises the worst error. Throws Error when a
// fixed mid temperature leaves fewer than kMinPointsPerRange points on a side.
MinimaxFit FitMinimax(const ExactCurves& exact, const FitOptions& options,
                      const ErrorScales& scales);

}  // namespace sevenfold::detail

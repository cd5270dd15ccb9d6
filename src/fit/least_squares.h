// SPDX-License-Identifier: MIT
// The least-squares fit of a species (FitObjective::kLeastSquares): the constrained solve at a mid
// temperature and the mid-temperature search. Internal to fit/; its .cc is the only file of fit/
// that includes Ceres. docs/fitting.md, "Least squares".
#pragma once

#include <cstddef>

#include "fit/fitter.h"

namespace sevenfold::detail {

struct LeastSquaresFit {
  TwoRangePolynomial polynomial;
  std::size_t split = 0;  // first grid index of the high range
  // The p-norm (p = 16, mean over all residuals) of the normalised errors: what the choice of
  // the mid temperature minimises (FitResult::objective).
  double objective = 0.0;
  double max_normalised_error = 0.0;  // largest normalised error over the grid
  MidTemperatureChoice mid_choice;
};

// Fits by constrained weighted least squares on the normalised rows of options.error_scales, at
// options.t_mid_k or at the mid temperature that minimises the p-norm (a scan refined with Ceres).
// Throws Error when a fixed mid temperature leaves fewer than kMinPointsPerRange points on a side,
// or the grid leaves no room to choose one. Expects curves checked by FitTwoRange.
LeastSquaresFit FitLeastSquares(const ExactCurves& exact, const FitOptions& options);

}  // namespace sevenfold::detail

// SPDX-License-Identifier: MIT
// The constrained minimax solve at one mid temperature: Lawson's iteratively reweighted least
// squares on the 14 scaled coefficients, with the equality constraints eliminated exactly and the
// extrapolation guard as inequality constraints, stopped by its own duality gap. Internal to fit/
// (includes Eigen); the method and its lower bound are in docs/fitting.md, "Minimax".
#pragma once

#include <cstddef>
#include <vector>

#include <Eigen/Dense>

#include "fit/design_rows.h"

namespace sevenfold::detail {

struct MinimaxProblem {
  // In-range rows (normalised errors), the low range's first: rows [0, split_row) act on the low
  // coefficients, [split_row, size) on the high ones. Not owned.
  const std::vector<Row8>* rows = nullptr;
  std::size_t split_row = 0;
  // Guard rows q_j = (Cp_fit - Cp_exact) / (band Cp_exact) that must satisfy |q_j| <= 1, with the
  // range each acts on (false: low, true: high). Not owned; may be null or empty.
  const std::vector<Row8>* guard_rows = nullptr;
  const std::vector<bool>* guard_high = nullptr;
  ConstraintMatrix c;
  ConstraintVector d;
};

struct MinimaxSolution {
  Vector14 x = Vector14::Zero();  // scaled coefficients, low range first
  double max_error = 0.0;         // max |residual| over the in-range rows at x
  double max_guard = 0.0;         // max |q_j| at x (0 without guard rows)
  bool guard_met = true;          // max_guard <= 1
  // A proven lower bound of the optimum: for weights w >= 0 (sum 1) on the in-range rows and
  // multipliers mu >= 0 on the guard rows, optimum^2 >= min over C x = d of
  // sum w r^2 + sum mu (q^2 - 1) (weak duality). The weights and multipliers that give it:
  double lower_bound = 0.0;
  std::vector<double> weights;      // w, one per in-range row
  std::vector<double> multipliers;  // mu, one per guard row
  int num_iterations = 0;
  bool converged = false;           // max_error <= (1 + gap) lower_bound was reached
};

// Solves min over x with C x = d of max |residual| subject to |q_j| <= 1. Stops when the best
// guard-feasible iterate is within `gap` (relative) of the lower bound, or after max_iterations.
// `start_weights` (one per in-range row; may be empty) warm-starts the iteration, e.g. from the
// solution at a neighbouring mid temperature.
MinimaxSolution SolveMinimax(const MinimaxProblem& problem, double gap, int max_iterations,
                             const std::vector<double>& start_weights);

}  // namespace sevenfold::detail

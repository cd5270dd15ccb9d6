// SPDX-License-Identifier: MIT
// The constrained minimax solve at one mid temperature: minimise the worst normalised error over
// the 14 scaled coefficients subject to the equality constraints (eliminated exactly) and the
// extrapolation guard (inequalities). Solved by an exchange on a reference of m + 1 rows
// (minimax_exchange.cc), with Lawson's reweighted least squares as the fallback
// (minimax_lawson.cc). Internal to fit/ (includes Eigen); docs/fitting.md, "Minimax".
#pragma once

#include <cstddef>
#include <vector>

#include <Eigen/Dense>

#include "fit/design_rows.h"

namespace sevenfold::detail {

using Matrix7 = Eigen::Matrix<double, 7, 7>;
// One row per error, column-major: the errors at u are 7 contiguous multiply-adds of length n.
using Rows7 = Eigen::Matrix<double, Eigen::Dynamic, 7>;

// The rows of one species in a well-conditioned basis, built once and shared by every mid
// temperature (only the split between the ranges and the constraints change).
struct MinimaxRows {
  // The change of basis x_range = precondition[range] * u_range: the inverse triangular factor of
  // the QR of the range's rows, so that their columns are orthonormal. Rows shared by every mid
  // temperature use one factor for both ranges, from all rows.
  Matrix7 precondition[2] = {Matrix7::Identity(), Matrix7::Identity()};
  Rows7 q;            // in-range rows in u, grid order (Cp, H, S per point)
  Eigen::VectorXd b;  // their right-hand sides
  // Guard rows q_j = (Cp_fit - Cp_exact) / (band Cp_exact), |q_j| <= 1: the low range's first.
  Rows7 q_guard;
  Eigen::VectorXd b_guard;
  std::size_t num_guard_low = 0;
};

// `guard_high[j]` says which range guard row j acts on; every low one must precede every high one.
// With split_row = 0 the change of basis is shared by both ranges (and by every split); else each
// range gets its own, which conditions a short range better.
MinimaxRows PrepareMinimaxRows(const std::vector<Row8>& rows, const std::vector<Row8>& guard_rows,
                               const std::vector<bool>& guard_high, std::size_t split_row = 0);

struct MinimaxProblem {
  const MinimaxRows* rows = nullptr;  // not owned
  // The rows as built (not owned; may be null): a solve that fails on `rows` retries with a change
  // of basis for its own split.
  const std::vector<Row8>* raw_rows = nullptr;
  const std::vector<Row8>* raw_guard_rows = nullptr;
  const std::vector<bool>* guard_high = nullptr;
  // Rows [0, split_row) act on the low coefficients, [split_row, size) on the high ones.
  std::size_t split_row = 0;
  ConstraintMatrix c;
  ConstraintVector d;
};

// A row of the exchange's reference: an in-range row or a guard row, with the sign of its error.
struct ReferenceRow {
  std::size_t index = 0;
  bool guard = false;
  bool operator==(const ReferenceRow& other) const {
    return index == other.index && guard == other.guard;
  }
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
  std::vector<ReferenceRow> reference;  // the exchange's final reference (empty after Lawson)
  int num_iterations = 0;
  bool converged = false;           // max_error <= (1 + gap) lower_bound was reached
};

// Solves min over x with C x = d of max |residual| subject to |q_j| <= 1, to within `gap`
// (relative) of the lower bound. `warm_start` (may be null) is the solution at a neighbouring
// mid temperature: its reference (or weights) start the iteration.
MinimaxSolution SolveMinimax(const MinimaxProblem& problem, double gap,
                             const MinimaxSolution* warm_start);

}  // namespace sevenfold::detail

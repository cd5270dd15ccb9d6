// SPDX-License-Identifier: MIT
// The minimax problem with its equality constraints eliminated: u = u_particular + N v, v in R^m,
// shared by the two solvers of fit/minimax.h. Internal to fit/.
#pragma once

#include <cstddef>
#include <vector>

#include <Eigen/Dense>

#include "fit/minimax.h"

namespace sevenfold::detail {

struct ReducedMinimax {
  const MinimaxRows* rows = nullptr;
  std::size_t split = 0;  // first in-range row of the high range
  int m = 0;              // free directions: 14 minus the number of constraints
  Eigen::Matrix<double, 14, Eigen::Dynamic> null_space;  // N, 14 x m, orthonormal columns
  Vector14 u_particular = Vector14::Zero();              // C' u_particular = d, C' N = 0

  std::size_t NumRows() const { return static_cast<std::size_t>(rows->b.size()); }
  std::size_t NumGuard() const { return static_cast<std::size_t>(rows->b_guard.size()); }
  // The residuals of every in-range row and every guard row at u.
  void Residuals(const Vector14& u, Eigen::VectorXd& in_range, Eigen::VectorXd& guard) const;
  // Scaled coefficients from u.
  Vector14 ToCoefficients(const Vector14& u) const;
};

// Eliminates C x = d (C in the preconditioned basis) by the null-space method.
ReducedMinimax ReduceMinimax(const MinimaxProblem& problem);

// The exchange (minimax_exchange.cc). Returns false, leaving `solution` unspecified, when it
// cannot finish: the guard cannot be met, the reference became singular, or it hit its cap.
bool SolveByExchange(const ReducedMinimax& reduced, double gap,
                     const std::vector<ReferenceRow>* start, MinimaxSolution& solution);

// Lawson's iteration (minimax_lawson.cc): always returns a solution, the least guard-infeasible
// one when the guard cannot be met.
MinimaxSolution SolveByLawson(const ReducedMinimax& reduced, double gap, int max_iterations,
                              const std::vector<double>& start_weights);

}  // namespace sevenfold::detail

// SPDX-License-Identifier: MIT
// Constrained minimax by Lawson's iteration (docs/fitting.md, "Minimax").
#include "fit/minimax.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

#include "core/error.h"

namespace sevenfold::detail {
namespace {

using Matrix = Eigen::MatrixXd;
using Vector = Eigen::VectorXd;
using Matrix7 = Eigen::Matrix<double, 7, 7>;
using Matrix14 = Eigen::Matrix<double, 14, 14>;
using Rows7 = Eigen::Matrix<double, 7, Eigen::Dynamic>;

// The guard rows are optimised against a band narrower by this fraction, so that iterates close
// to the optimum already satisfy the true band; the lower bound is taken for the true band, so
// the price (a slightly larger worst error where the guard binds) shows in the duality gap.
constexpr double kGuardMargin = 0.005;
// Share of uniform weights mixed into a warm start (see SolveMinimax).
constexpr double kWarmStartUniformShare = 0.2;
// A worst error below this is an exact fit (constant Cp of an atom): nothing left to minimise.
constexpr double kExactFitError = 1e-13;

// The inverse of the triangular factor of the QR of one range's design rows: the change of
// basis in which that range's rows have orthonormal columns, so that the weighted normal
// equations below are no worse conditioned than the weighted problem itself.
Matrix7 RangePreconditioner(const std::vector<Row8>& rows, std::size_t begin, std::size_t end) {
  Matrix design(static_cast<Eigen::Index>(end - begin), 7);
  for (std::size_t i = begin; i < end; ++i) {
    design.row(static_cast<Eigen::Index>(i - begin)) = rows[i].head<7>();
  }
  const Eigen::HouseholderQR<Matrix> qr(design);
  const Matrix7 r = qr.matrixQR().topRows<7>().triangularView<Eigen::Upper>();
  return r.triangularView<Eigen::Upper>().solve(Matrix7::Identity());
}

}  // namespace

MinimaxSolution SolveMinimax(const MinimaxProblem& problem, double gap, int max_iterations,
                             const std::vector<double>& start_weights) {
  const std::vector<Row8>& rows = *problem.rows;
  const std::size_t n = rows.size(), split = problem.split_row;
  SEVENFOLD_ASSERT(split >= 7 && n - split >= 7);
  const std::size_t num_guard = problem.guard_rows ? problem.guard_rows->size() : 0;

  const Matrix7 precondition[2] = {RangePreconditioner(rows, 0, split),
                                   RangePreconditioner(rows, split, n)};
  // Rows in the preconditioned basis u (x_range = P_range u_range), one column each.
  Rows7 q_low(7, static_cast<Eigen::Index>(split)), q_high(7, static_cast<Eigen::Index>(n - split));
  Vector b(static_cast<Eigen::Index>(n));
  for (std::size_t i = 0; i < n; ++i) {
    const Eigen::Matrix<double, 1, 7> row = rows[i].head<7>() * precondition[i < split ? 0 : 1];
    if (i < split) {
      q_low.col(static_cast<Eigen::Index>(i)) = row.transpose();
    } else {
      q_high.col(static_cast<Eigen::Index>(i - split)) = row.transpose();
    }
    b[static_cast<Eigen::Index>(i)] = rows[i][7];
  }
  Matrix q_guard(14, static_cast<Eigen::Index>(num_guard));
  Vector b_guard(static_cast<Eigen::Index>(num_guard));
  q_guard.setZero();
  for (std::size_t j = 0; j < num_guard; ++j) {
    const Row8& row = (*problem.guard_rows)[j];
    const int range = (*problem.guard_high)[j] ? 1 : 0;
    q_guard.block<7, 1>(7 * range, static_cast<Eigen::Index>(j)) =
        (row.head<7>() * precondition[range]).transpose();
    b_guard[static_cast<Eigen::Index>(j)] = row[7];
  }

  // Constraints in u, eliminated by the null-space method: C' = C diag(P_low, P_high),
  // C'^T Pi = Q [S; 0], u = u_p + N v with u_p = Q1 S^-T Pi^T d and N = Q2.
  Matrix14 block_precondition = Matrix14::Zero();
  block_precondition.topLeftCorner<7, 7>() = precondition[0];
  block_precondition.bottomRightCorner<7, 7>() = precondition[1];
  const Matrix c_u = problem.c * block_precondition;
  const Eigen::Index k = c_u.rows(), m = 14 - k;
  const Eigen::ColPivHouseholderQR<Matrix> cqr(c_u.transpose());
  SEVENFOLD_ASSERT(cqr.rank() == k);
  const Matrix cq = cqr.householderQ();
  const Matrix null_space = cq.rightCols(m);
  const Matrix s_factor = cqr.matrixR().topLeftCorner(k, k);
  const Vector permuted_d = cqr.colsPermutation().transpose() * Vector(problem.d);
  const Vector u_particular =
      cq.leftCols(k) * s_factor.transpose().triangularView<Eigen::Lower>().solve(permuted_d);

  Vector w(static_cast<Eigen::Index>(n));
  w.setConstant(1.0 / static_cast<double>(n));
  if (start_weights.size() == n) {
    // Lawson's weights never revive a row whose weight has decayed to ~0, and a new split needs
    // other rows: mix the start with uniform weights so that every row keeps a share.
    for (std::size_t i = 0; i < n; ++i) {
      w[static_cast<Eigen::Index>(i)] =
          (1.0 - kWarmStartUniformShare) * start_weights[i] + kWarmStartUniformShare * w[static_cast<Eigen::Index>(i)];
    }
  }
  w /= w.sum();
  // Guard weights start level with the mean in-range weight; their scale s is 0 on the first
  // iteration (an unguarded weighted solve), then the current worst error / (1 - margin).
  Vector mu = Vector::Constant(static_cast<Eigen::Index>(num_guard), 1.0 / static_cast<double>(n));
  double guard_scale = 0.0;

  MinimaxSolution best;
  best.max_error = std::numeric_limits<double>::infinity();
  double best_infeasible_guard = std::numeric_limits<double>::infinity();
  Vector14 least_infeasible = Vector14::Zero();
  double least_infeasible_error = 0.0;
  Vector r_low, r_high, r_guard;
  for (int iteration = 0; iteration < max_iterations; ++iteration) {
    best.num_iterations = iteration + 1;
    // The weighted normal equations in u (block diagonal plus the guard rows), reduced to v.
    Matrix14 normal = Matrix14::Zero();
    Vector14 rhs = Vector14::Zero();
    const auto w_low = w.head(static_cast<Eigen::Index>(split));
    const auto w_high = w.tail(static_cast<Eigen::Index>(n - split));
    normal.topLeftCorner<7, 7>() = q_low * w_low.asDiagonal() * q_low.transpose();
    normal.bottomRightCorner<7, 7>() = q_high * w_high.asDiagonal() * q_high.transpose();
    rhs.head<7>() = q_low * w_low.cwiseProduct(b.head(static_cast<Eigen::Index>(split)));
    rhs.tail<7>() = q_high * w_high.cwiseProduct(b.tail(static_cast<Eigen::Index>(n - split)));
    const double s2 = guard_scale * guard_scale;
    if (num_guard > 0 && s2 > 0.0) {
      const Vector mu_s = mu * s2;
      normal += q_guard * mu_s.asDiagonal() * q_guard.transpose();
      rhs += q_guard * mu_s.cwiseProduct(b_guard);
    }
    const Matrix reduced = null_space.transpose() * normal * null_space;
    const Vector reduced_rhs = null_space.transpose() * (rhs - normal * u_particular);
    const Eigen::LDLT<Matrix> ldlt(reduced);
    const Vector14 u = u_particular + null_space * ldlt.solve(reduced_rhs);

    r_low = q_low.transpose() * u.head<7>() - b.head(static_cast<Eigen::Index>(split));
    r_high = q_high.transpose() * u.tail<7>() - b.tail(static_cast<Eigen::Index>(n - split));
    const double worst = std::max(r_low.cwiseAbs().maxCoeff(), r_high.cwiseAbs().maxCoeff());
    double worst_guard = 0.0;
    if (num_guard > 0) {
      r_guard = q_guard.transpose() * u - b_guard;
      worst_guard = r_guard.cwiseAbs().maxCoeff();
    }
    // The weighted sum of squares at the weighted optimum gives the lower bound (minimax.h).
    const double in_range_weight = w.sum();
    double sum = w_low.dot(r_low.cwiseAbs2()) + w_high.dot(r_high.cwiseAbs2());
    double guard_weight = 0.0;
    if (num_guard > 0 && s2 > 0.0) {
      sum += s2 * mu.dot(r_guard.cwiseAbs2());
      guard_weight = mu.sum();
    }
    const double bound2 = (sum - s2 * guard_weight) / in_range_weight;
    if (bound2 > 0.0 && std::sqrt(bound2) > best.lower_bound) {
      best.lower_bound = std::sqrt(bound2);
      best.weights.assign(w.data(), w.data() + n);
      for (double& value : best.weights) value /= in_range_weight;
      best.multipliers.assign(num_guard, 0.0);
      for (std::size_t j = 0; j < num_guard && s2 > 0.0; ++j) {
        best.multipliers[j] = mu[static_cast<Eigen::Index>(j)] * s2 / in_range_weight;
      }
    }
    const Vector14 x = block_precondition * u;
    // Stop at the first feasible iterate within the gap of the bound, and return that iterate
    // (not the best one seen): it is a smooth function of the curves for a given number of
    // steps, so rounding-level changes of the input move it by rounding only, whereas the
    // choice of the best among nearly equal iterates could flip.
    // For the same reason the last iteration returns its own iterate when it is feasible.
    const bool within_gap = worst <= (1.0 + gap) * best.lower_bound || worst < kExactFitError;
    if (worst_guard <= 1.0 && (within_gap || iteration + 1 == max_iterations)) {
      best.max_error = worst;
      best.max_guard = worst_guard;
      best.x = x;
      best.converged = within_gap;
      break;
    }
    if (worst_guard <= 1.0) {
      if (worst < best.max_error) {
        best.max_error = worst;
        best.max_guard = worst_guard;
        best.x = x;
      }
    } else if (worst_guard < best_infeasible_guard) {
      best_infeasible_guard = worst_guard;
      least_infeasible = x;
      least_infeasible_error = worst;
    }
    if (best.max_error <= (1.0 + gap) * best.lower_bound || best.max_error < kExactFitError) {
      best.converged = true;
      break;
    }
    // Lawson's update: each weight grows in proportion to its residual.
    w.head(static_cast<Eigen::Index>(split)) = w_low.cwiseProduct(r_low.cwiseAbs());
    w.tail(static_cast<Eigen::Index>(n - split)) = w_high.cwiseProduct(r_high.cwiseAbs());
    // The guard's scale follows the best lower bound: it only grows, towards the optimum, which
    // keeps the iteration from oscillating between guard and range (the current worst error does).
    guard_scale = (best.lower_bound > 0.0 ? best.lower_bound : worst) / (1.0 - kGuardMargin);
    if (num_guard > 0) {
      mu = mu.cwiseProduct(r_guard.cwiseAbs()) * guard_scale;
    }
    const double total = w.sum() + (num_guard > 0 ? mu.sum() : 0.0);
    if (!(total > 0.0)) break;
    w /= total;
    if (num_guard > 0) mu /= total;
  }
  if (!std::isfinite(best.max_error)) {  // no iterate met the guard
    best.x = least_infeasible;
    best.max_error = least_infeasible_error;
    best.max_guard = best_infeasible_guard;
    best.guard_met = false;
  }
  // Iterative refinement on the constraints: the change of basis leaves a residual of order
  // eps |x| in C x = d; the minimum-norm correction removes it, so continuity at T_mid holds to the
  // rounding of the evaluation (docs/fitting.md).
  const Matrix c_x = problem.c;
  const Eigen::CompleteOrthogonalDecomposition<Matrix> c_decomposition(c_x);
  for (int step = 0; step < 2; ++step) {
    const Vector residual = Vector(problem.d) - c_x * Vector(best.x);
    best.x += Vector14(c_decomposition.solve(residual));
  }
  return best;
}

}  // namespace sevenfold::detail

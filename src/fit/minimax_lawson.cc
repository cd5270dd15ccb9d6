// SPDX-License-Identifier: MIT
// Lawson's iteratively reweighted least squares for the constrained minimax problem: the fallback
// of the exchange, for problems whose guard cannot be met (docs/fitting.md, "Minimax").
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

#include "fit/minimax_reduced.h"

namespace sevenfold::detail {
namespace {

using Matrix = Eigen::MatrixXd;
using Vector = Eigen::VectorXd;
using Matrix14 = Eigen::Matrix<double, 14, 14>;

// The guard rows are optimised against a band narrower by this fraction, so that iterates close
// to the optimum already satisfy the true band; the lower bound is taken for the true band, so
// the price (a slightly larger worst error where the guard binds) shows in the duality gap.
constexpr double kGuardMargin = 0.005;
// Share of uniform weights mixed into a warm start (see SolveByLawson).
constexpr double kWarmStartUniformShare = 0.2;
// A worst error below this is an exact fit (constant Cp of an atom): nothing left to minimise.
constexpr double kExactFitError = 1e-13;

}  // namespace

MinimaxSolution SolveByLawson(const ReducedMinimax& reduced, double gap, int max_iterations,
                              const std::vector<double>& start_weights) {
  const MinimaxRows& rows = *reduced.rows;
  const std::size_t n = reduced.NumRows(), split = reduced.split;
  const std::size_t num_guard = reduced.NumGuard(), guard_low = rows.num_guard_low;
  const auto s = static_cast<Eigen::Index>(split), ni = static_cast<Eigen::Index>(n);
  const auto g = static_cast<Eigen::Index>(num_guard), gl = static_cast<Eigen::Index>(guard_low);
  const Matrix& null_space = reduced.null_space;
  const Vector14& u_particular = reduced.u_particular;

  Vector w(ni);
  w.setConstant(1.0 / static_cast<double>(n));
  if (start_weights.size() == n) {
    // Lawson's weights never revive a row whose weight has decayed to ~0, and a new split needs
    // other rows: mix the start with uniform weights so that every row keeps a share.
    for (Eigen::Index i = 0; i < ni; ++i) {
      w[i] = (1.0 - kWarmStartUniformShare) * start_weights[static_cast<std::size_t>(i)] +
             kWarmStartUniformShare * w[i];
    }
  }
  w /= w.sum();
  // Guard weights start level with the mean in-range weight; their scale is 0 on the first
  // iteration (an unguarded weighted solve), then the best lower bound / (1 - margin).
  Vector mu = Vector::Constant(g, 1.0 / static_cast<double>(n));
  double guard_scale = 0.0;

  MinimaxSolution best;
  best.max_error = std::numeric_limits<double>::infinity();
  double best_infeasible_guard = std::numeric_limits<double>::infinity();
  Vector14 least_infeasible = Vector14::Zero();
  double least_infeasible_error = 0.0;
  Vector r, r_guard;
  for (int iteration = 0; iteration < max_iterations; ++iteration) {
    best.num_iterations = iteration + 1;
    // The weighted normal equations in u (block diagonal plus the guard rows), reduced to v.
    Matrix14 normal = Matrix14::Zero();
    Vector14 rhs = Vector14::Zero();
    normal.topLeftCorner<7, 7>() = rows.q.topRows(s).transpose() * w.head(s).asDiagonal() * rows.q.topRows(s);
    normal.bottomRightCorner<7, 7>() =
        rows.q.bottomRows(ni - s).transpose() * w.tail(ni - s).asDiagonal() * rows.q.bottomRows(ni - s);
    rhs.head<7>() = rows.q.topRows(s).transpose() * w.head(s).cwiseProduct(rows.b.head(s));
    rhs.tail<7>() = rows.q.bottomRows(ni - s).transpose() * w.tail(ni - s).cwiseProduct(rows.b.tail(ni - s));
    const double s2 = guard_scale * guard_scale;
    if (g > 0 && s2 > 0.0) {
      const Vector mu_s = mu * s2;
      normal.topLeftCorner<7, 7>() += rows.q_guard.topRows(gl).transpose() * mu_s.head(gl).asDiagonal() *
                                      rows.q_guard.topRows(gl);
      normal.bottomRightCorner<7, 7>() += rows.q_guard.bottomRows(g - gl).transpose() *
                                          mu_s.tail(g - gl).asDiagonal() *
                                          rows.q_guard.bottomRows(g - gl);
      rhs.head<7>() += rows.q_guard.topRows(gl).transpose() * mu_s.head(gl).cwiseProduct(rows.b_guard.head(gl));
      rhs.tail<7>() +=
          rows.q_guard.bottomRows(g - gl).transpose() * mu_s.tail(g - gl).cwiseProduct(rows.b_guard.tail(g - gl));
    }
    const Matrix reduced_normal = null_space.transpose() * normal * null_space;
    const Vector reduced_rhs = null_space.transpose() * (rhs - normal * u_particular);
    const Eigen::LDLT<Matrix> ldlt(reduced_normal);
    const Vector14 u = u_particular + null_space * ldlt.solve(reduced_rhs);

    reduced.Residuals(u, r, r_guard);
    const double worst = r.cwiseAbs().maxCoeff();
    const double worst_guard = g > 0 ? r_guard.cwiseAbs().maxCoeff() : 0.0;
    // The weighted sum of squares at the weighted optimum gives the lower bound (minimax.h).
    const double in_range_weight = w.sum();
    double sum = w.dot(r.cwiseAbs2());
    double guard_weight = 0.0;
    if (g > 0 && s2 > 0.0) {
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
    const Vector14 x = reduced.ToCoefficients(u);
    // Stop at the first feasible iterate within the gap of the bound, and return that iterate
    // (not the best one seen): it is a smooth function of the curves for a given number of steps.
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
    w = w.cwiseProduct(r.cwiseAbs());
    // The guard's scale follows the best lower bound: it only grows, towards the optimum, which
    // keeps the iteration from oscillating between guard and range (the current worst error does).
    guard_scale = (best.lower_bound > 0.0 ? best.lower_bound : worst) / (1.0 - kGuardMargin);
    if (g > 0) mu = mu.cwiseProduct(r_guard.cwiseAbs()) * guard_scale;
    const double total = w.sum() + (g > 0 ? mu.sum() : 0.0);
    if (!(total > 0.0)) break;
    w /= total;
    if (g > 0) mu /= total;
  }
  if (!std::isfinite(best.max_error)) {  // no iterate met the guard
    best.x = least_infeasible;
    best.max_error = least_infeasible_error;
    best.max_guard = best_infeasible_guard;
    best.guard_met = false;
  }
  return best;
}

}  // namespace sevenfold::detail

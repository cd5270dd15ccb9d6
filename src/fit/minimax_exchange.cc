// SPDX-License-Identifier: MIT
// The exchange for the constrained minimax problem (docs/fitting.md, "Minimax"). In the reduced
// variables v (minimax_reduced.h) the problem is: minimise t subject to s (p_i . v - e_i) <= t for
// every in-range row i and both signs s, and s (p_j . v - e_j) <= 1 for every guard row j. A
// reference is m + 1 signed rows held with equality; its levelled error t is the optimum of the
// problem restricted to it, so a lower bound of the whole one. Each step brings in the row that
// violates the current level most and lets go the row that keeps the multipliers of the reference
// non-negative (Stiefel's exchange, with the guard rows as references of level 1). The level
// never decreases; at the end no row exceeds it and the multipliers are the certificate.
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <vector>

#include "fit/minimax_reduced.h"

namespace sevenfold::detail {
namespace {

// m + 1 <= 15: the reference systems live on the stack.
constexpr int kMaxReference = 15;
using Small = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, 0, kMaxReference, kMaxReference>;
using SmallVector = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, kMaxReference, 1>;
using Vector = Eigen::VectorXd;

// The guard is held at this level instead of 1, so that the rounding of any later evaluation of
// the polynomial still finds |q| <= 1; far below any physical meaning.
constexpr double kGuardLevel = 1.0 - 1e-9;
// A row exceeds the level when its error is above level (1 + this): below it is rounding, so the
// reference is the optimum of the whole problem to that relative accuracy.
constexpr double kVertexTolerance = 1e-11;
// A worst error below this is an exact fit (constant Cp of an atom): nothing left to minimise.
// In units of the error scales: 1e-8 of the default 0.5 % scale of Cp is 5e-11 relative, the
// rounding of evaluating the curves and the polynomial.
constexpr double kExactFitError = 1e-8;
// A row of the reference that reads as above the level by less than this (relative) is rounding
// of an ill-conditioned reference: the reference is accepted as the optimum.
constexpr double kRoundingExcess = 1e-6;
// In the ratio test, a component of the entering row's coordinates below this fraction of the
// largest is zero (rounding), not a direction that could free a reference row.
constexpr double kPivotTolerance = 1e-12;
// A reference system whose LU has pivots further apart than this ratio is singular: the exchange
// gives up (the pivot ratio is a cheap stand-in for the reciprocal condition number).
constexpr double kMinPivotRatio = 1e-13;

bool Singular(const Eigen::PartialPivLU<Small>& lu) {
  const auto pivots = lu.matrixLU().diagonal().cwiseAbs();
  return !(pivots.minCoeff() > kMinPivotRatio * pivots.maxCoeff());
}
// Steps per unknown before the exchange gives up (cycling on a degenerate problem); the demo and
// the invented sets need a few per unknown from a cold start (docs/fitting.md).
constexpr int kMaxStepsPerUnknown = 40;

// The row in v: its error is p . v - e.
void RowInV(const ReducedMinimax& reduced, const ReferenceRow& row, SmallVector& p, double& e) {
  const MinimaxRows& rows = *reduced.rows;
  const auto index = static_cast<Eigen::Index>(row.index);
  const Eigen::Matrix<double, 7, 1> q = row.guard ? rows.q_guard.row(index).transpose() : rows.q.row(index).transpose();
  const double b = row.guard ? rows.b_guard[index] : rows.b[index];
  const bool high = row.guard ? row.index >= rows.num_guard_low : row.index >= reduced.split;
  const int offset = high ? 7 : 0;
  p = reduced.null_space.middleRows<7>(offset).transpose() * q;
  e = b - q.dot(reduced.u_particular.segment<7>(offset));
}

// The reference system: s (p . v - e) - t = 0 for an in-range row, s (p . v - e) = level for a
// guard row, in the unknowns (v, t).
void BuildReferenceSystem(const ReducedMinimax& reduced, const std::vector<ReferenceRow>& reference,
                          const std::vector<double>& signs, Small& system, SmallVector& levels) {
  const int m = reduced.m, size = m + 1;
  system.resize(size, size);
  levels.resize(size);
  SmallVector p;
  for (int k = 0; k < size; ++k) {
    const ReferenceRow& member = reference[static_cast<std::size_t>(k)];
    const double sign = signs[static_cast<std::size_t>(k)];
    double e = 0.0;
    RowInV(reduced, member, p, e);
    system.row(k).head(m) = sign * p.transpose();
    system(k, m) = member.guard ? 0.0 : -1.0;
    levels[k] = sign * e + (member.guard ? kGuardLevel : 0.0);
  }
}

// The level t of a reference with the given signs; -infinity when its system is singular.
double ReferenceLevel(const ReducedMinimax& reduced, const std::vector<ReferenceRow>& reference,
                      const std::vector<double>& signs) {
  Small system;
  SmallVector levels;
  BuildReferenceSystem(reduced, reference, signs, system, levels);
  const Eigen::PartialPivLU<Small> lu(system);
  if (Singular(lu)) return -std::numeric_limits<double>::infinity();
  return lu.solve(levels)[reduced.m];
}

// The signs that make the reference's multipliers non-negative: the rows' p vectors have a
// one-dimensional dependence sum c_k p_k = 0; s_k = sign(c_k), lambda_k = |c_k| / sum over the
// in-range rows of |c_k|. False when there is no such dependence with in-range weight.
bool ChooseSigns(const ReducedMinimax& reduced, const std::vector<ReferenceRow>& reference,
                 std::vector<double>& signs) {
  const int m = reduced.m;
  if (static_cast<int>(reference.size()) != m + 1) return false;
  Small rows(m, m + 1);
  SmallVector p;
  double e = 0.0;
  for (int k = 0; k <= m; ++k) {
    RowInV(reduced, reference[static_cast<std::size_t>(k)], p, e);
    rows.col(k) = p;
  }
  const Eigen::FullPivLU<Small> lu(rows);
  if (lu.rank() != m) return false;
  const Small kernel = lu.kernel();
  if (kernel.cols() != 1) return false;
  double in_range = 0.0;
  signs.assign(static_cast<std::size_t>(m + 1), 1.0);
  for (int k = 0; k <= m; ++k) {
    if (kernel(k, 0) < 0.0) signs[static_cast<std::size_t>(k)] = -1.0;
    if (!reference[static_cast<std::size_t>(k)].guard) in_range += std::fabs(kernel(k, 0));
  }
  if (!(in_range > kPivotTolerance * kernel.col(0).cwiseAbs().maxCoeff())) return false;
  // The dependence is known up to its sign, and both orientations are dual feasible: take the
  // one with the higher level, closer to the optimum (the other can start far below zero).
  std::vector<double> flipped = signs;
  for (double& sign : flipped) sign = -sign;
  if (ReferenceLevel(reduced, reference, flipped) > ReferenceLevel(reduced, reference, signs)) {
    signs.swap(flipped);
  }
  return true;
}

// A cold reference: m in-range rows chosen by a column-pivoted QR of their p vectors (the most
// independent ones), and the row that the interpolant through them misses most.
std::vector<ReferenceRow> ColdReference(const ReducedMinimax& reduced) {
  const MinimaxRows& rows = *reduced.rows;
  const int m = reduced.m;
  const auto n = static_cast<Eigen::Index>(reduced.NumRows());
  const auto s = static_cast<Eigen::Index>(reduced.split);
  Eigen::MatrixXd p(m, n);
  p.leftCols(s).noalias() = reduced.null_space.topRows<7>().transpose() * rows.q.topRows(s).transpose();
  p.rightCols(n - s).noalias() =
      reduced.null_space.bottomRows<7>().transpose() * rows.q.bottomRows(n - s).transpose();
  const Eigen::ColPivHouseholderQR<Eigen::MatrixXd> qr(p);
  std::vector<ReferenceRow> reference;
  Small chosen(m, m);
  SmallVector rhs(m), row;
  for (int k = 0; k < m; ++k) {
    const auto index = qr.colsPermutation().indices()[k];
    reference.push_back({static_cast<std::size_t>(index), false});
    double e = 0.0;
    RowInV(reduced, reference.back(), row, e);
    chosen.row(k) = row.transpose();
    rhs[k] = e;
  }
  const SmallVector v = chosen.fullPivLu().solve(rhs);
  Vector r, r_guard;
  reduced.Residuals(reduced.u_particular + reduced.null_space * Vector(v), r, r_guard);
  for (const ReferenceRow& member : reference) r[static_cast<Eigen::Index>(member.index)] = 0.0;
  Eigen::Index worst = 0;
  r.cwiseAbs().maxCoeff(&worst);
  reference.push_back({static_cast<std::size_t>(worst), false});
  return reference;
}

void SortReference(std::vector<ReferenceRow>& reference, std::vector<double>& signs) {
  std::vector<std::size_t> order(reference.size());
  for (std::size_t k = 0; k < order.size(); ++k) order[k] = k;
  const auto before = [&](std::size_t a, std::size_t b) {
    const ReferenceRow &x = reference[a], &y = reference[b];
    return x.guard != y.guard ? y.guard : x.index != y.index ? x.index < y.index : signs[a] < signs[b];
  };
  if (std::is_sorted(order.begin(), order.end(), before)) return;
  std::sort(order.begin(), order.end(), before);
  std::vector<ReferenceRow> sorted_reference;
  std::vector<double> sorted_signs;
  for (const std::size_t k : order) {
    sorted_reference.push_back(reference[k]);
    sorted_signs.push_back(signs[k]);
  }
  reference.swap(sorted_reference);
  signs.swap(sorted_signs);
}

// Whether the signed row is a member of the reference.
bool InReference(const std::vector<ReferenceRow>& reference, const std::vector<double>& signs,
                 Eigen::Index index, double residual_or_sign, bool guard = false) {
  const ReferenceRow row{static_cast<std::size_t>(index), guard};
  const double sign = residual_or_sign >= 0.0 ? 1.0 : -1.0;
  for (std::size_t k = 0; k < reference.size(); ++k) {
    if (reference[k] == row && signs[k] == sign) return true;
  }
  return false;
}

}  // namespace

bool SolveByExchange(const ReducedMinimax& reduced, double gap,
                     const std::vector<ReferenceRow>* start, MinimaxSolution& solution) {
  const int m = reduced.m, size = m + 1;
  if (size > kMaxReference || m < 1) return false;
  std::vector<ReferenceRow> reference;
  std::vector<double> signs;
  if (start) reference = *start;
  if (!ChooseSigns(reduced, reference, signs)) {
    reference = ColdReference(reduced);
    if (!ChooseSigns(reduced, reference, signs)) return false;
  }
  const double tolerance = std::max(gap, kVertexTolerance);
  const int max_steps = kMaxStepsPerUnknown * size;
  Small system(size, size);
  SmallVector levels(size), p, entering(size);
  SmallVector unit_t = SmallVector::Zero(size);
  unit_t[m] = -1.0;
  Vector r, r_guard;
  for (int step = 0; step < max_steps; ++step) {
    // Rows in a canonical order, so that the same reference gives the same bits however it was
    // reached (a warm start and a cold one; the check of committed entries relies on it).
    SortReference(reference, signs);
    // The reference system: s (p . v - e) - t = 0 for an in-range row, s (p . v - e) = level for
    // a guard row, in the unknowns (v, t).
    BuildReferenceSystem(reduced, reference, signs, system, levels);
    const Eigen::PartialPivLU<Small> lu(system);
    if (Singular(lu)) return false;
    const SmallVector y = lu.solve(levels);
    // The multipliers: system^T lambda = -e_t (stationarity in v and t of the restricted problem).
    const SmallVector lambda = lu.transpose().solve(unit_t);
    const double level = y[m];
    const Vector14 u = reduced.u_particular + reduced.null_space * Vector(y.head(m));
    reduced.Residuals(u, r, r_guard);
    Eigen::Index worst_row = 0, worst_guard_row = 0;
    const double worst = r.cwiseAbs().maxCoeff(&worst_row);
    const double worst_guard = r_guard.size() > 0 ? r_guard.cwiseAbs().maxCoeff(&worst_guard_row) : 0.0;
    // The guard is held at kGuardLevel; between it and the band is rounding.
    const bool guard_met = worst_guard <= 1.0;
    // A row of the reference that reads as violated means rounding: accept when it is small.
    const bool converged =
        guard_met && (worst <= (1.0 + tolerance) * std::max(level, 0.0) || worst < kExactFitError ||
                      (InReference(reference, signs, worst_row, r[worst_row]) &&
                       worst <= (1.0 + kRoundingExcess) * std::max(level, 0.0)));
    if (converged) {
      solution = MinimaxSolution();
      solution.x = reduced.ToCoefficients(u);
      solution.max_error = worst;
      solution.max_guard = worst_guard;
      solution.guard_met = true;
      solution.lower_bound = std::max(level, 0.0);
      solution.weights.assign(reduced.NumRows(), 0.0);
      solution.multipliers.assign(reduced.NumGuard(), 0.0);
      // In the certificate's form (minimax.h): w = lambda on the in-range rows, mu = t lambda on
      // the guard rows, which makes the weighted problem's minimum t^2 at the same v.
      for (int k = 0; k < size; ++k) {
        const ReferenceRow& member = reference[static_cast<std::size_t>(k)];
        const double multiplier = std::max(lambda[k], 0.0);
        if (member.guard) {
          solution.multipliers[member.index] += multiplier * solution.lower_bound;
        } else {
          solution.weights[member.index] += multiplier;
        }
      }
      solution.reference = reference;
      solution.num_iterations = step + 1;
      solution.converged = true;
      return true;
    }
    // The entering row: the in-range row furthest above the level, or the guard row furthest
    // outside the band, whichever is further in relative terms.
    const double in_range_excess = (worst - level) / std::max(std::fabs(level), kExactFitError);
    const double guard_excess = worst_guard - kGuardLevel;
    ReferenceRow incoming;
    double incoming_sign = 1.0;
    if (guard_met || in_range_excess >= guard_excess) {
      incoming = {static_cast<std::size_t>(worst_row), false};
      incoming_sign = r[worst_row] >= 0.0 ? 1.0 : -1.0;
    } else {
      incoming = {static_cast<std::size_t>(worst_guard_row), true};
      incoming_sign = r_guard[worst_guard_row] >= 0.0 ? 1.0 : -1.0;
    }
    // Bringing in a row of the reference again would cycle: its excess is rounding of an
    // ill-conditioned reference, too large to accept above. Give up (the caller retries).
    if (InReference(reference, signs, static_cast<Eigen::Index>(incoming.index), incoming_sign,
                    incoming.guard)) {
      return false;
    }
    double e = 0.0;
    RowInV(reduced, incoming, p, e);
    entering.head(m) = incoming_sign * p;
    entering[m] = incoming.guard ? 0.0 : -1.0;
    // Ratio test: the entering row's coordinates z in the reference rows (system^T z = a); the
    // multipliers move as lambda - theta z, and the first to reach zero leaves.
    const SmallVector z = lu.transpose().solve(entering);
    const double z_scale = z.cwiseAbs().maxCoeff();
    int leaving = -1;
    double best_ratio = std::numeric_limits<double>::infinity();
    for (int k = 0; k < size; ++k) {
      if (z[k] <= kPivotTolerance * z_scale) continue;
      const double ratio = std::max(lambda[k], 0.0) / z[k];
      if (ratio < best_ratio) {
        best_ratio = ratio;
        leaving = k;
      }
    }
    if (leaving < 0) return false;  // unbounded dual: no fit of the form meets the guard
    reference[static_cast<std::size_t>(leaving)] = incoming;
    signs[static_cast<std::size_t>(leaving)] = incoming_sign;
  }
  return false;
}

}  // namespace sevenfold::detail

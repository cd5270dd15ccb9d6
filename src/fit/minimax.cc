// SPDX-License-Identifier: MIT
// The constrained minimax solve: the change of basis, the elimination of the constraints, and the
// choice between the exchange and Lawson's iteration (docs/fitting.md, "Minimax").
#include "fit/minimax.h"

#include <algorithm>
#include <cstddef>
#include <vector>

#include "core/error.h"
#include "fit/minimax_reduced.h"

namespace sevenfold::detail {
namespace {

using Matrix = Eigen::MatrixXd;
using Vector = Eigen::VectorXd;

// Lawson's iteration gains a roughly constant fraction of the gap per step: it is asked for no
// less than this gap, and stopped after this many steps (far above what the demo needs).
constexpr double kLawsonGap = 0.005;
constexpr int kLawsonMaxIterations = 2000;

}  // namespace

namespace {

Matrix7 Preconditioner(const Matrix& design) {
  const Eigen::HouseholderQR<Matrix> qr(design);
  const Matrix7 r = qr.matrixQR().topRows<7>().triangularView<Eigen::Upper>();
  return r.triangularView<Eigen::Upper>().solve(Matrix7::Identity());
}

}  // namespace

MinimaxRows PrepareMinimaxRows(const std::vector<Row8>& rows, const std::vector<Row8>& guard_rows,
                               const std::vector<bool>& guard_high, std::size_t split_row) {
  SEVENFOLD_ASSERT(rows.size() >= 7 && guard_rows.size() == guard_high.size());
  MinimaxRows prepared;
  const auto n = static_cast<Eigen::Index>(rows.size());
  const auto split = static_cast<Eigen::Index>(split_row);
  Matrix design(n, 7);
  for (Eigen::Index i = 0; i < n; ++i) design.row(i) = rows[static_cast<std::size_t>(i)].head<7>();
  if (split == 0) {
    prepared.precondition[0] = prepared.precondition[1] = Preconditioner(design);
  } else {
    SEVENFOLD_ASSERT(split >= 7 && n - split >= 7);
    prepared.precondition[0] = Preconditioner(design.topRows(split));
    prepared.precondition[1] = Preconditioner(design.bottomRows(n - split));
  }
  prepared.q.resize(n, 7);
  prepared.b.resize(n);
  for (Eigen::Index i = 0; i < n; ++i) {
    const int range = split > 0 && i >= split ? 1 : 0;
    prepared.q.row(i) = design.row(i) * prepared.precondition[range];
    prepared.b[i] = rows[static_cast<std::size_t>(i)][7];
  }
  const auto g = static_cast<Eigen::Index>(guard_rows.size());
  prepared.q_guard.resize(g, 7);
  prepared.b_guard.resize(g);
  for (Eigen::Index j = 0; j < g; ++j) {
    const Row8& row = guard_rows[static_cast<std::size_t>(j)];
    const int range = guard_high[static_cast<std::size_t>(j)] ? 1 : 0;
    prepared.q_guard.row(j) = row.head<7>() * prepared.precondition[range];
    prepared.b_guard[j] = row[7];
  }
  prepared.num_guard_low = static_cast<std::size_t>(
      std::find(guard_high.begin(), guard_high.end(), true) - guard_high.begin());
  SEVENFOLD_ASSERT(std::find(guard_high.begin() + static_cast<std::ptrdiff_t>(prepared.num_guard_low),
                             guard_high.end(), false) == guard_high.end());
  return prepared;
}

void ReducedMinimax::Residuals(const Vector14& u, Vector& in_range, Vector& guard) const {
  const auto n = static_cast<Eigen::Index>(NumRows()), s = static_cast<Eigen::Index>(split);
  in_range.resize(n);
  in_range.head(s).noalias() = rows->q.topRows(s) * u.head<7>();
  in_range.tail(n - s).noalias() = rows->q.bottomRows(n - s) * u.tail<7>();
  in_range -= rows->b;
  const auto g = static_cast<Eigen::Index>(NumGuard());
  const auto g_low = static_cast<Eigen::Index>(rows->num_guard_low);
  guard.resize(g);
  if (g == 0) return;
  guard.head(g_low).noalias() = rows->q_guard.topRows(g_low) * u.head<7>();
  guard.tail(g - g_low).noalias() = rows->q_guard.bottomRows(g - g_low) * u.tail<7>();
  guard -= rows->b_guard;
}

Vector14 ReducedMinimax::ToCoefficients(const Vector14& u) const {
  Vector14 x;
  x.head<7>() = rows->precondition[0] * u.head<7>();
  x.tail<7>() = rows->precondition[1] * u.tail<7>();
  return x;
}

ReducedMinimax ReduceMinimax(const MinimaxProblem& problem) {
  ReducedMinimax reduced;
  reduced.rows = problem.rows;
  reduced.split = problem.split_row;
  SEVENFOLD_ASSERT(reduced.split >= 7 && reduced.NumRows() - reduced.split >= 7);
  // C' = C diag(P, P), C'^T Pi = Q [S; 0], u = u_p + N v with u_p = Q1 S^-T Pi^T d and N = Q2.
  Matrix c_u(problem.c.rows(), 14);
  c_u.leftCols<7>() = problem.c.leftCols<7>() * problem.rows->precondition[0];
  c_u.rightCols<7>() = problem.c.rightCols<7>() * problem.rows->precondition[1];
  const Eigen::Index k = c_u.rows();
  reduced.m = static_cast<int>(14 - k);
  const Eigen::ColPivHouseholderQR<Matrix> cqr(c_u.transpose());
  SEVENFOLD_ASSERT(cqr.rank() == k);
  const Matrix cq = cqr.householderQ();
  reduced.null_space = cq.rightCols(reduced.m);
  const Matrix s_factor = cqr.matrixR().topLeftCorner(k, k);
  const Vector permuted_d = cqr.colsPermutation().transpose() * Vector(problem.d);
  reduced.u_particular =
      cq.leftCols(k) * s_factor.transpose().triangularView<Eigen::Lower>().solve(permuted_d);
  return reduced;
}

MinimaxSolution SolveMinimax(const MinimaxProblem& problem, double gap,
                             const MinimaxSolution* warm_start) {
  MinimaxSolution solution;
  const std::vector<ReferenceRow>* start =
      warm_start && !warm_start->reference.empty() ? &warm_start->reference : nullptr;
  bool solved = SolveByExchange(ReduceMinimax(problem), gap, start, solution);
  // A short range is ill conditioned in the basis shared by every split: retry in its own basis,
  // then fall back to Lawson's iteration, which always ends.
  MinimaxRows own_basis;
  MinimaxProblem retry = problem;
  if (!solved && problem.raw_rows) {
    own_basis = PrepareMinimaxRows(*problem.raw_rows, *problem.raw_guard_rows,
                                   *problem.guard_high, problem.split_row);
    retry.rows = &own_basis;
    solved = SolveByExchange(ReduceMinimax(retry), gap, nullptr, solution);
    }
  if (!solved) {
    static const std::vector<double> kNoWeights;
    solution = SolveByLawson(ReduceMinimax(retry), std::max(gap, kLawsonGap), kLawsonMaxIterations,
                             warm_start ? warm_start->weights : kNoWeights);
  }
  // Iterative refinement on the constraints: the change of basis leaves a residual of order
  // eps |x| in C x = d; the minimum-norm correction removes it, so continuity at T_mid holds to the
  // rounding of the evaluation (docs/fitting.md).
  const Matrix c_x = problem.c;
  const Eigen::CompleteOrthogonalDecomposition<Matrix> c_decomposition(c_x);
  for (int step = 0; step < 2; ++step) {
    const Vector residual = Vector(problem.d) - c_x * Vector(solution.x);
    solution.x += Vector14(c_decomposition.solve(residual));
  }
  return solution;
}

}  // namespace sevenfold::detail

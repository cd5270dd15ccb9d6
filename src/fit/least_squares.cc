// SPDX-License-Identifier: MIT
// The least-squares fit (FitObjective::kLeastSquares): the constrained weighted least-squares
// solve at a mid temperature (Eigen), and the choice of the mid temperature by a scan refined with
// Ceres. The only file of fit/ that includes Ceres. The method is documented in docs/fitting.md.
#include "fit/least_squares.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include <Eigen/Dense>
#include <ceres/gradient_problem.h>
#include <ceres/gradient_problem_solver.h>
#include <ceres/numeric_diff_first_order_function.h>
#include <fmt/format.h>

#include "core/error.h"
#include "fit/design_rows.h"
#include "fit/grid.h"

namespace sevenfold::detail {
namespace {

// Exponent p of the p-norm used as the smooth measure of the worst error. 16 is close enough to
// the max (within a factor n^(1/16) ~ 1.5 for n ~ 600 residuals) while staying smooth.
constexpr double kObjectiveExponent = 16.0;
// Candidates of the mid-temperature scan, spaced geometrically over the allowed interval.
constexpr int kNumScanPoints = 41;
// The refined mid temperature is rounded to 1/kMidRoundingPerK K, so entries show a readable
// value (dividing by 10 gives the double nearest to the decimal, printed short).
constexpr double kMidRoundingPerK = 10.0;
// Start of the refinement parameter when the best candidate sits on the edge of its bracket.
constexpr double kEdgeStartParameter = 3.0;
// Ceres settings of the 1-parameter refinement (docs/fitting.md). The central-difference step is
// relative to the parameter x ~ O(1); 1e-4 maps to ~0.01 K, far below the curvature scale of the
// objective (tens of K) yet large enough to ride over rounding noise in the objective.
constexpr double kNumericDiffRelativeStep = 1e-4;
constexpr int kMaxRefinementIterations = 50;
constexpr double kRefinementFunctionTolerance = 1e-10;
constexpr double kRefinementParameterTolerance = 1e-10;
// The mid-temperature search compares objectives from the triangular factors of each split
// (SearchObjective), which agree with the full QR solve's to ~1e-9 relative (tests/fit_test.cc).
// Two objectives closer than this are compared again with full solves.
constexpr double kSearchTieRelative = 1e-6;

using Matrix = Eigen::MatrixXd;
using Vector = Eigen::VectorXd;
// A weighted row of the least-squares problem: the 7 coefficients of its range, then the
// right-hand side; and the triangular factor R (with Q^T b in its last column) of a set of rows.
using Triangle8 = Eigen::Matrix<double, 8, 8, Eigen::RowMajor>;

// Adds one row to the QR factorisation [R | Q^T b] of a set of rows by Givens rotations: the
// factor of the rows so far plus this row, without revisiting the earlier rows (Golub & Van Loan,
// Matrix Computations, 4th ed., 2013, sec. 6.5, from memory). Backward stable, like the full QR.
void AddRow(Triangle8& r, Row8 row) {
  for (int j = 0; j < 7; ++j) {
    const double v = row[j];
    if (v == 0.0) continue;
    const double diagonal = r(j, j);
    const double radius = std::sqrt(diagonal * diagonal + v * v);
    const double c = diagonal / radius, s = v / radius;
    for (int k = j; k < 8; ++k) {
      const double upper = r(j, k), lower = row[k];
      r(j, k) = c * upper + s * lower;
      row[k] = c * lower - s * upper;
    }
  }
}
// min |R x - g| subject to C x = d, R block-diagonal upper triangular (two nonsingular 7 x 7
// blocks): the search's solve on the triangular factor of a split. With y = R x the problem
// becomes min |y - g| subject to M y = d, M = C R^-1: the point of an affine set nearest to g.
// M^T = Q1 S (Householder QR, S upper triangular), so the set is Q1^T y = w with S^T w = d, and
// y = g - Q1 (Q1^T g - w). Written out on fixed arrays: at this size (14 x at most 7) Eigen's
// general routines cost several times the arithmetic (docs/performance.md).
using Matrix14 = Eigen::Matrix<double, 14, 14>;
Vector14 SolveOnFactor(const Matrix14& r, const Vector14& g, const ConstraintMatrix& c,
                       const ConstraintVector& d) {
  const int k = static_cast<int>(c.rows());
  const auto block_start = [](int i) { return i < 7 ? 0 : 7; };
  // a = M^T = R^-T C^T, column by column (forward substitution with the lower triangle R^T).
  double a[14][kMaxConstraints];
  for (int j = 0; j < k; ++j) {
    for (int i = 0; i < 14; ++i) {
      double value = c(j, i);
      for (int l = block_start(i); l < i; ++l) value -= r(l, i) * a[l][j];
      a[i][j] = value / r(i, i);
    }
  }
  // Householder QR of a: reflector j is I - beta_j v_j v_j^T with v_j zero above row j.
  double v[kMaxConstraints][14];
  double beta[kMaxConstraints];
  double diagonal[kMaxConstraints];
  for (int j = 0; j < k; ++j) {
    double norm2 = 0.0;
    for (int i = j; i < 14; ++i) norm2 += a[i][j] * a[i][j];
    const double alpha = a[j][j] >= 0.0 ? -std::sqrt(norm2) : std::sqrt(norm2);
    double v_norm2 = 0.0;
    for (int i = j; i < 14; ++i) {
      v[j][i] = i == j ? a[i][j] - alpha : a[i][j];
      v_norm2 += v[j][i] * v[j][i];
    }
    beta[j] = v_norm2 > 0.0 ? 2.0 / v_norm2 : 0.0;
    for (int l = j + 1; l < k; ++l) {
      double dot = 0.0;
      for (int i = j; i < 14; ++i) dot += v[j][i] * a[i][l];
      const double scale = beta[j] * dot;
      for (int i = j; i < 14; ++i) a[i][l] -= scale * v[j][i];
    }
    diagonal[j] = alpha;  // S(j, j); S(j, l > j) = a[j][l]
  }
  // w from S^T w = d (forward substitution), then y = Q [w; Q2^T g].
  double y[14];
  for (int i = 0; i < 14; ++i) y[i] = g[i];
  for (int j = 0; j < k; ++j) {  // y = Q^T g
    double dot = 0.0;
    for (int i = j; i < 14; ++i) dot += v[j][i] * y[i];
    for (int i = j; i < 14; ++i) y[i] -= beta[j] * dot * v[j][i];
  }
  for (int j = 0; j < k; ++j) {
    double value = d[j];
    for (int l = 0; l < j; ++l) value -= a[l][j] * y[l];
    y[j] = value / diagonal[j];
  }
  for (int j = k - 1; j >= 0; --j) {  // y = Q y
    double dot = 0.0;
    for (int i = j; i < 14; ++i) dot += v[j][i] * y[i];
    for (int i = j; i < 14; ++i) y[i] -= beta[j] * dot * v[j][i];
  }
  // x = R^-1 y (back substitution within each block).
  Vector14 x;
  for (int i = 13; i >= 0; --i) {
    double value = y[i];
    const int end = i < 7 ? 7 : 14;
    for (int l = i + 1; l < end; ++l) value -= r(i, l) * x[l];
    x[i] = value / r(i, i);
  }
  return x;
}

// x^16 by repeated squaring: the p-norm of the search path (a few ulp from std::pow).
inline double PowerSixteen(double x) {
  const double x2 = x * x, x4 = x2 * x2, x8 = x4 * x4;
  return x8 * x8;
}

// One constrained fit at a given mid temperature, with its residuals.
struct Solution {
  TwoRangePolynomial polynomial;
  std::size_t split = 0;  // first grid index of the high range
  double objective = 0.0;
  double max_normalised_error = 0.0;
};

// Holds the prepared problem; Solve() is const and cheap enough to call inside the refinement.
class LeastSquaresFitter {
 public:
  LeastSquaresFitter(const ExactCurves& exact, const FitOptions& options)
      : exact_(exact),
        options_(options),
        reference_(FindReferenceState(exact, options.pin_reference_state)) {
    // Weighted rows: each residual is a normalised error (error / its scale), docs/fitting.md.
    // Built once per species; the exact solve and the search both read them.
    rows_ = NormalisedRows(exact_, options_.error_scales);
  }

  // Lowest and highest mid temperatures leaving kMinPointsPerRange points on each side.
  double LowestMidK() const { return exact_.t_k[kMinPointsPerRange]; }
  double HighestMidK() const { return exact_.t_k[exact_.t_k.size() - kMinPointsPerRange]; }

  // Throws Error when t_mid_k leaves fewer than kMinPointsPerRange grid points on a side.
  Solution Solve(double t_mid_k) const {
    const std::vector<double>& t = exact_.t_k;
    RequirePointsOnEachSide(t, t_mid_k, kMinPointsPerRange);
    const std::size_t split = SplitIndex(t, t_mid_k);

    // |A x - b|^2 = |R x - Q^T b|^2 + (a constant) with A = Q R the block-diagonal QR of the
    // weighted rows: the problem is solved on the 14 x 14 factor, and the residuals are taken
    // from the rows themselves.
    Matrix14 factor;
    Vector14 target;
    SplitFactor(split, factor, target);
    const Matrix a = factor;
    const Vector b = target;
    ConstraintMatrix fixed_c;
    ConstraintVector fixed_d;
    BuildConstraints(t_mid_k, options_.continuous_second_derivative, reference_, fixed_c, fixed_d);
    const Matrix c = fixed_c;
    const Vector d = fixed_d;
    const Eigen::Index num_constraints = c.rows();

    // Null-space method. C^T P = Q [R; 0] (column-pivoted Householder QR); with Q = [Q1 Q2],
    // every x = Q1 R^-T P^T d + Q2 z satisfies C x = d, and z solves the unconstrained
    // least-squares problem min |A Q2 z - (b - A x_p)| by complete orthogonal decomposition
    // (A and b here: the factor and Q^T b above).
    const Eigen::ColPivHouseholderQR<Matrix> qr(c.transpose());
    SEVENFOLD_ASSERT(qr.rank() == num_constraints);  // the constraints are independent
    const Matrix q = qr.householderQ();
    const Matrix q1 = q.leftCols(num_constraints);
    const Matrix q2 = q.rightCols(14 - num_constraints);
    const Matrix r = qr.matrixR().topLeftCorner(num_constraints, num_constraints);
    auto particular = [&](const Vector& rhs) -> Vector {
      const Vector permuted = qr.colsPermutation().transpose() * rhs;
      const Vector y =
          r.transpose().triangularView<Eigen::Lower>().solve(permuted);
      return q1 * y;
    };
    Vector x = particular(d);
    const Matrix reduced = a * q2;
    const Eigen::CompleteOrthogonalDecomposition<Matrix> cod(reduced);
    const Vector z = cod.solve(b - a * x);
    x += q2 * z;
    // One step of iterative refinement on the constraints: adding Q2 z leaves a residual of
    // order eps |Q2 z| in C x = d; remove it so continuity holds to rounding of the evaluation.
    x += particular(d - c * x);

    Solution solution;
    solution.split = split;
    solution.polynomial.t_low_k = t.front();
    solution.polynomial.t_mid_k = t_mid_k;
    solution.polynomial.t_high_k = t.back();
    solution.polynomial.low = ToKelvinCoefficients(x, 0);
    solution.polynomial.high = ToKelvinCoefficients(x, 7);

    // The p-norm of the normalised residuals, scaled by the largest to avoid overflow.
    std::vector<double> residual;
    const double largest = AbsoluteResiduals(Vector14(x), split, residual);
    double sum = 0.0;
    if (largest > 0.0) {
      for (const double value : residual) sum += std::pow(value / largest, kObjectiveExponent);
    }
    solution.max_normalised_error = largest;
    solution.objective =
        largest > 0.0
            ? largest * std::pow(sum / static_cast<double>(residual.size()), 1.0 / kObjectiveExponent)
            : 0.0;
    return solution;
  }

  // Prepares SearchObjective(): the triangular factors of the rows below and at or above every
  // possible split, built once by adding rows one at a time from the left and from the right
  // (O(n) Givens rotations, once per species).
  void PrepareSearch() {
    const std::size_t n = exact_.t_k.size();
    below_.assign(n + 1, Triangle8::Zero());
    above_.assign(n + 1, Triangle8::Zero());
    for (std::size_t i = 0; i < n; ++i) {
      Triangle8 factor = below_[i];
      for (std::size_t k = 3 * i; k < 3 * i + 3; ++k) AddRow(factor, rows_[k]);
      below_[i + 1] = factor;
    }
    for (std::size_t i = n; i-- > 0;) {
      Triangle8 factor = above_[i + 1];
      for (std::size_t k = 3 * i; k < 3 * i + 3; ++k) AddRow(factor, rows_[k]);
      above_[i] = factor;
    }
  }

  // The objective of Solve(t_mid_k).objective, computed for the search (docs/performance.md):
  // the same constrained least-squares problem, but on the 14 x 14 block-diagonal triangular
  // factor of the split (from PrepareSearch) instead of the 3n x 14 design matrix, so that each
  // candidate costs a few 14-variable triangular and QR solves plus one pass over the rows for the
  // residuals. Both are orthogonal-factor methods; they agree to ~1e-9 relative
  // (tests/fit_test.cc). Returns NaN when t_mid_k leaves too few points on a side.
  double SearchObjective(double t_mid_k) const {
    SEVENFOLD_ASSERT(!below_.empty());
    const std::vector<double>& t = exact_.t_k;
    if (!LeavesPointsOnEachSide(t, t_mid_k, kMinPointsPerRange)) {
      return std::numeric_limits<double>::quiet_NaN();
    }
    const std::size_t split = SplitIndex(t, t_mid_k);
    Matrix14 factor;
    Vector14 target;
    SplitFactor(split, factor, target);

    ConstraintMatrix c;
    ConstraintVector d;
    BuildConstraints(t_mid_k, options_.continuous_second_derivative, reference_, c, d);
    const Vector14 x = SolveOnFactor(factor, target, c, d);

    // Residuals and their p-norm as in Solve(), with x^16 by squaring and one division.
    std::vector<double>& residual = residual_scratch_;
    const double largest = AbsoluteResiduals(x, split, residual);
    if (!(largest > 0.0)) return largest == 0.0 ? 0.0 : std::numeric_limits<double>::quiet_NaN();
    const double inverse_largest = 1.0 / largest;
    double sum = 0.0;
    for (const double value : residual) sum += PowerSixteen(value * inverse_largest);
    return largest *
           std::pow(sum / static_cast<double>(residual.size()), 1.0 / kObjectiveExponent);
  }

 private:
  // The block-diagonal triangular factor R and Q^T b of the rows below and at or above `split`:
  // from PrepareSearch() when it ran, else by the same Givens updates in the same order (the high
  // range from the top down), so that a fit at a fixed mid temperature and the automatic fit that
  // chose it give the same bits.
  void SplitFactor(std::size_t split, Matrix14& r, Vector14& g) const {
    Triangle8 low = Triangle8::Zero(), high = Triangle8::Zero();
    if (!below_.empty()) {
      low = below_[split];
      high = above_[split];
    } else {
      for (std::size_t k = 0; k < 3 * split; ++k) AddRow(low, rows_[k]);
      for (std::size_t i = exact_.t_k.size(); i-- > split;) {
        for (std::size_t k = 3 * i; k < 3 * i + 3; ++k) AddRow(high, rows_[k]);
      }
    }
    r.setZero();
    r.topLeftCorner<7, 7>() = low.topLeftCorner<7, 7>();
    r.bottomRightCorner<7, 7>() = high.topLeftCorner<7, 7>();
    g.head<7>() = low.col(7).head<7>();
    g.tail<7>() = high.col(7).head<7>();
  }

  // |row . [x_range; -1]| of every weighted row into `out` (one 8-wide dot product per row), and
  // the largest of them.
  double AbsoluteResiduals(const Vector14& x, std::size_t split, std::vector<double>& out) const {
    out.resize(rows_.size());
    double largest = 0.0;
    const auto pass = [&](std::size_t begin, std::size_t end, int offset) {
      Row8 coefficients;
      coefficients << x.segment<7>(offset).transpose(), -1.0;
      for (std::size_t k = begin; k < end; ++k) {
        const double value = std::fabs(rows_[k].dot(coefficients));
        out[k] = value;
        largest = std::max(largest, value);
      }
    };
    pass(0, 3 * split, 0);
    pass(3 * split, rows_.size(), 7);
    return largest;
  }

  const ExactCurves& exact_;
  const FitOptions& options_;
  ReferenceState reference_;
  std::vector<Row8> rows_;   // 3 per grid point: Cp, H, S
  std::vector<Triangle8> below_;  // below_[s]: [R | Q^T b] of the rows of grid points i < s
  std::vector<Triangle8> above_;  // above_[s]: the same for grid points i >= s
  // Scratch of SearchObjective(); a LeastSquaresFitter is used by one thread.
  mutable std::vector<double> residual_scratch_;
};

// The refinement parameter x maps onto the bracket (lower_k, upper_k) by a logistic function,
// which keeps the unconstrained line search of Ceres inside the bracket.
double MidFromParameter(double x, double lower_k, double upper_k) {
  return lower_k + (upper_k - lower_k) / (1.0 + std::exp(-x));
}

// The objective as a Ceres first-order functor of x. Never throws into Ceres: a failed solve is
// reported as an evaluation failure.
struct MidObjective {
  const LeastSquaresFitter* fitter;
  double lower_k;
  double upper_k;

  bool operator()(const double* x, double* cost) const {
    try {
      *cost = fitter->SearchObjective(MidFromParameter(x[0], lower_k, upper_k));
    } catch (const Error&) {
      return false;
    }
    return std::isfinite(*cost);
  }
};

struct Refinement {
  bool usable = false;
  double t_mid_k = 0.0;
  int num_iterations = 0;
  std::string message;
};

// Minimises the objective over (lower_k, upper_k) from start_k with Ceres' line-search
// minimiser (BFGS on the one parameter x, gradient by central differences).
Refinement RefineMid(const LeastSquaresFitter& fitter, double lower_k, double upper_k,
                     double start_k) {
  Refinement refinement;
  double x = 0.0;
  if (start_k <= lower_k) {
    x = -kEdgeStartParameter;
  } else if (start_k >= upper_k) {
    x = kEdgeStartParameter;
  } else {
    x = std::log((start_k - lower_k) / (upper_k - start_k));
  }
  ceres::NumericDiffOptions diff_options;
  diff_options.relative_step_size = kNumericDiffRelativeStep;
  // GradientProblem takes ownership of the function, which owns the functor.
  ceres::GradientProblem problem(
      new ceres::NumericDiffFirstOrderFunction<MidObjective, ceres::CENTRAL, 1>(
          new MidObjective{&fitter, lower_k, upper_k}, ceres::TAKE_OWNERSHIP, diff_options));
  ceres::GradientProblemSolver::Options options;
  options.line_search_direction_type = ceres::BFGS;
  options.max_num_iterations = kMaxRefinementIterations;
  options.function_tolerance = kRefinementFunctionTolerance;
  options.parameter_tolerance = kRefinementParameterTolerance;
  options.logging_type = ceres::SILENT;
  options.minimizer_progress_to_stdout = false;
  ceres::GradientProblemSolver::Summary summary;
  ceres::Solve(options, problem, &x, &summary);
  refinement.num_iterations = static_cast<int>(summary.iterations.size());
  refinement.message = summary.message;
  refinement.usable = summary.IsSolutionUsable() && std::isfinite(x);
  if (refinement.usable) refinement.t_mid_k = MidFromParameter(x, lower_k, upper_k);
  return refinement;
}

}  // namespace

LeastSquaresFit FitLeastSquares(const ExactCurves& exact, const FitOptions& options) {
  LeastSquaresFit result;
  Solution solution;
  if (options.t_mid_k) {
    solution = LeastSquaresFitter(exact, options).Solve(*options.t_mid_k);
    result.mid_choice.method = MidTemperatureMethod::kFixed;
  } else {
    LeastSquaresFitter fitter(exact, options);
    const double lowest_k = fitter.LowestMidK(), highest_k = fitter.HighestMidK();
    if (!(lowest_k < highest_k)) {
      throw Error(fmt::format("exact curves: {} grid points leave no room to choose a mid "
                              "temperature with {} points on each side",
                              exact.t_k.size(), kMinPointsPerRange));
    }
    // Scan: whole-kelvin candidates spaced geometrically over [lowest_k, highest_k].
    std::vector<double> candidates;
    for (int i = 0; i < kNumScanPoints; ++i) {
      const double t_k = lowest_k * std::pow(highest_k / lowest_k,
                                              static_cast<double>(i) / (kNumScanPoints - 1));
      const double rounded = std::clamp(std::round(t_k), lowest_k, highest_k);
      if (candidates.empty() || rounded > candidates.back()) candidates.push_back(rounded);
    }
    // The search compares objectives from the normal-equation path (SearchObjective); only the
    // chosen mid temperature gets the full QR solve below.
    fitter.PrepareSearch();
    std::vector<double> scan_objectives(candidates.size());
    std::size_t best = 0;
    for (std::size_t i = 0; i < candidates.size(); ++i) {
      scan_objectives[i] = fitter.SearchObjective(candidates[i]);
      if (scan_objectives[i] < scan_objectives[best]) best = i;
    }
    double best_objective = scan_objectives[best];
    // Candidates within the search path's error of the best are decided by the full solve, as the
    // unoptimised scan did: the choice then matches it unless two candidates tie to ~1e-7.
    std::optional<Solution> best_solution;
    const double tie_bound = best_objective * (1.0 + kSearchTieRelative);
    if (std::count_if(scan_objectives.begin(), scan_objectives.end(),
                      [&](double value) { return value <= tie_bound; }) > 1) {
      for (std::size_t i = 0; i < candidates.size(); ++i) {
        if (!(scan_objectives[i] <= tie_bound)) continue;
        Solution trial = fitter.Solve(candidates[i]);
        if (!best_solution || trial.objective < best_solution->objective) {
          best = i;
          best_solution = std::move(trial);
        }
      }
      best_objective = best_solution->objective;
    }
    MidTemperatureChoice& choice = result.mid_choice;
    choice.num_scan_points = static_cast<int>(candidates.size());
    choice.scan_best_t_mid_k = candidates[best];
    choice.scan_best_objective = best_objective;
    choice.method = MidTemperatureMethod::kScanOnly;
    double chosen_k = candidates[best];

    // Refinement between the neighbours of the best candidate.
    const double lower_k = candidates[best > 0 ? best - 1 : 0];
    const double upper_k = candidates[std::min(best + 1, candidates.size() - 1)];
    std::optional<Solution> refined_solution;
    if (!(lower_k < upper_k)) {
      choice.note = "refinement skipped: the scan has a single candidate";
    } else {
      const Refinement refinement = RefineMid(fitter, lower_k, upper_k, candidates[best]);
      choice.num_refinement_iterations = refinement.num_iterations;
      if (!refinement.usable) {
        choice.note = "refinement unusable (" + refinement.message + "); best scan point kept";
      } else {
        const double rounded_k = std::clamp(
            std::round(refinement.t_mid_k * kMidRoundingPerK) / kMidRoundingPerK, lower_k, upper_k);
        const double refined_objective = fitter.SearchObjective(rounded_k);
        bool improves = refined_objective < best_objective;
        if (std::fabs(refined_objective - best_objective) <=
            kSearchTieRelative * best_objective) {
          // Too close for the search path: compare full solves.
          if (!best_solution) best_solution = fitter.Solve(candidates[best]);
          refined_solution = fitter.Solve(rounded_k);
          improves = refined_solution->objective < best_solution->objective;
        }
        if (improves) {
          choice.method = MidTemperatureMethod::kScanAndRefinement;
          chosen_k = rounded_k;
        } else {
          choice.note = "refinement did not improve on the best scan point";
        }
      }
    }
    if (chosen_k == candidates[best] && best_solution) {
      solution = std::move(*best_solution);
    } else if (chosen_k != candidates[best] && refined_solution) {
      solution = std::move(*refined_solution);
    } else {
      solution = fitter.Solve(chosen_k);
    }
  }
  result.polynomial = solution.polynomial;
  result.split = solution.split;
  result.objective = solution.objective;
  result.max_normalised_error = solution.max_normalised_error;
  return result;
}

}  // namespace sevenfold::detail

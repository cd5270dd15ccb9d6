// SPDX-License-Identifier: MIT
// Constrained weighted least squares for two-range NASA polynomials (Eigen), and the choice of
// the mid temperature by a scan refined with Ceres. The method is documented in docs/fitting.md.
#include "fit/fitter.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <string>
#include <vector>

#include <Eigen/Dense>
#include <ceres/gradient_problem.h>
#include <ceres/gradient_problem_solver.h>
#include <ceres/numeric_diff_first_order_function.h>
#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"

namespace sevenfold {
namespace {

// The fit runs in tau = T / kScaleTemperatureK. A power of two makes the back-transform of
// a1..a6 (multiplication by powers of 2) exact in binary floating point; only a7 = b7 - b1 ln T_s
// takes one rounding. 1024 K keeps tau^4 below ~1e3 up to 6000 K instead of T^4 ~ 1e15.
constexpr double kScaleTemperatureK = 1024.0;
// Exponent p of the p-norm used as the smooth measure of the worst error. 16 is close enough to
// the max (within a factor n^(1/16) ~ 1.5 for n ~ 600 residuals) while staying smooth.
constexpr double kObjectiveExponent = 16.0;
// Candidates of the mid-temperature scan, spaced geometrically over the allowed interval.
constexpr int kNumScanPoints = 41;
// The refined mid temperature is rounded to 1/kMidRoundingPerK K, so entries show a readable
// value (dividing by 10 gives the double nearest to the decimal, printed short).
constexpr double kMidRoundingPerK = 10.0;
// A grid temperature within this distance of 298.15 K is taken as 298.15 K itself.
constexpr double kReferenceMatchK = 1e-9;
// Start of the refinement parameter when the best candidate sits on the edge of its bracket.
constexpr double kEdgeStartParameter = 3.0;
// Ceres settings of the 1-parameter refinement (docs/fitting.md). The central-difference step is
// relative to the parameter x ~ O(1); 1e-4 maps to ~0.01 K, far below the curvature scale of the
// objective (tens of K) yet large enough to ride over rounding noise in the objective.
constexpr double kNumericDiffRelativeStep = 1e-4;
constexpr int kMaxRefinementIterations = 50;
constexpr double kRefinementFunctionTolerance = 1e-10;
constexpr double kRefinementParameterTolerance = 1e-10;

using Matrix = Eigen::MatrixXd;
using Vector = Eigen::VectorXd;
using Row7 = Eigen::Matrix<double, 1, 7>;

// Rows of the linear maps from the scaled coefficients b to the functions at tau.
Row7 CpRow(double tau) {
  Row7 row;
  row << 1.0, tau, tau * tau, tau * tau * tau, tau * tau * tau * tau, 0.0, 0.0;
  return row;
}
Row7 DCpRow(double tau) {
  Row7 row;
  row << 0.0, 1.0, 2.0 * tau, 3.0 * tau * tau, 4.0 * tau * tau * tau, 0.0, 0.0;
  return row;
}
Row7 D2CpRow(double tau) {
  Row7 row;
  row << 0.0, 0.0, 2.0, 6.0 * tau, 12.0 * tau * tau, 0.0, 0.0;
  return row;
}
Row7 HRow(double tau) {
  Row7 row;
  row << 1.0, tau / 2.0, tau * tau / 3.0, tau * tau * tau / 4.0, tau * tau * tau * tau / 5.0,
      1.0 / tau, 0.0;
  return row;
}
Row7 SRow(double tau) {
  Row7 row;
  row << std::log(tau), tau, tau * tau / 2.0, tau * tau * tau / 3.0, tau * tau * tau * tau / 4.0,
      0.0, 1.0;
  return row;
}

// Coefficients in T from coefficients in tau = T / T_s (exact for a1..a6, see above).
NasaCoefficients ToKelvinCoefficients(const Vector& b, int offset) {
  NasaCoefficients a;
  double scale = 1.0;
  for (int k = 0; k < 5; ++k) {
    a[k] = b[offset + k] / scale;
    scale *= kScaleTemperatureK;
  }
  a[5] = b[offset + 5] * kScaleTemperatureK;
  a[6] = b[offset + 6] - b[offset] * std::log(kScaleTemperatureK);
  return a;
}

// The exact H/RT and S/R at 298.15 K that the fit is pinned to.
struct ReferenceState {
  bool pinned = false;
  double h_over_rt = 0.0;
  double s_over_r = 0.0;
};

ReferenceState FindReferenceState(const ExactCurves& exact, bool pin) {
  constexpr double kT = constants::kReferenceTemperature;
  const std::vector<double>& t = exact.t_k;
  ReferenceState state;
  if (!pin || kT < t.front() - kReferenceMatchK || kT > t.back() + kReferenceMatchK) return state;
  state.pinned = true;
  const std::size_t i = static_cast<std::size_t>(
      std::lower_bound(t.begin(), t.end(), kT - kReferenceMatchK) - t.begin());
  if (i < t.size() && std::fabs(t[i] - kT) <= kReferenceMatchK) {
    state.h_over_rt = exact.h_over_rt[i];
    state.s_over_r = exact.s_over_r[i];
    return state;
  }
  // 298.15 K is not a grid point (FitGrid always includes it; other grids may not): cubic Hermite
  // interpolation of H/R and S/R, whose temperature derivatives Cp/R and Cp/(R T) are known
  // exactly at the neighbouring points.
  SEVENFOLD_ASSERT(i > 0 && i < t.size());
  const double t0 = t[i - 1], t1 = t[i], width = t1 - t0;
  const double u = (kT - t0) / width;
  const double h00 = (1.0 + 2.0 * u) * (1.0 - u) * (1.0 - u), h10 = u * (1.0 - u) * (1.0 - u);
  const double h01 = u * u * (3.0 - 2.0 * u), h11 = u * u * (u - 1.0);
  auto hermite = [&](double y0, double y1, double dy0, double dy1) {
    return h00 * y0 + h10 * width * dy0 + h01 * y1 + h11 * width * dy1;
  };
  const double cp0 = exact.cp_over_r[i - 1], cp1 = exact.cp_over_r[i];
  state.h_over_rt =
      hermite(exact.h_over_rt[i - 1] * t0, exact.h_over_rt[i] * t1, cp0, cp1) / kT;
  state.s_over_r = hermite(exact.s_over_r[i - 1], exact.s_over_r[i], cp0 / t0, cp1 / t1);
  return state;
}

// One constrained fit at a given mid temperature, with its residuals.
struct Solution {
  TwoRangePolynomial polynomial;
  std::size_t split = 0;  // first grid index of the high range
  double objective = 0.0;
  double max_normalised_error = 0.0;
};

// Holds the prepared problem; Solve() is const and cheap enough to call inside the refinement.
class ConstrainedFitter {
 public:
  ConstrainedFitter(const ExactCurves& exact, const FitOptions& options,
                    const QualityThresholds& thresholds)
      : exact_(exact),
        options_(options),
        thresholds_(thresholds),
        reference_(FindReferenceState(exact, options.pin_reference_state)) {}

  // Lowest and highest mid temperatures leaving kMinPointsPerRange points on each side.
  double LowestMidK() const { return exact_.t_k[kMinPointsPerRange]; }
  double HighestMidK() const { return exact_.t_k[exact_.t_k.size() - kMinPointsPerRange]; }

  // Throws Error when t_mid_k leaves fewer than kMinPointsPerRange grid points on a side.
  Solution Solve(double t_mid_k) const {
    const std::vector<double>& t = exact_.t_k;
    const std::size_t n = t.size();
    const std::size_t split =
        static_cast<std::size_t>(std::lower_bound(t.begin(), t.end(), t_mid_k) - t.begin());
    if (split < static_cast<std::size_t>(kMinPointsPerRange) ||
        n - split < static_cast<std::size_t>(kMinPointsPerRange)) {
      throw Error(fmt::format(
          "mid temperature {:g} K leaves {} grid points below and {} at or above it; expected at "
          "least {} on each side",
          t_mid_k, split, n - split, kMinPointsPerRange));
    }

    // Weighted rows: each residual is a normalised error (error / threshold), docs/fitting.md.
    Matrix a = Matrix::Zero(3 * static_cast<Eigen::Index>(n), 14);
    Vector b(3 * static_cast<Eigen::Index>(n));
    for (std::size_t i = 0; i < n; ++i) {
      const Eigen::Index row = 3 * static_cast<Eigen::Index>(i);
      const Eigen::Index offset = i < split ? 0 : 7;
      const double tau = t[i] / kScaleTemperatureK;
      const double cp_weight = 1.0 / (thresholds_.max_cp_relative * exact_.cp_over_r[i]);
      a.block<1, 7>(row, offset) = CpRow(tau) * cp_weight;
      b[row] = exact_.cp_over_r[i] * cp_weight;
      a.block<1, 7>(row + 1, offset) = HRow(tau) / thresholds_.max_h_over_rt;
      b[row + 1] = exact_.h_over_rt[i] / thresholds_.max_h_over_rt;
      a.block<1, 7>(row + 2, offset) = SRow(tau) / thresholds_.max_s_over_r;
      b[row + 2] = exact_.s_over_r[i] / thresholds_.max_s_over_r;
    }

    // Equality constraints C x = d: continuity at t_mid, then the pinned reference state.
    const double tau_mid = t_mid_k / kScaleTemperatureK;
    std::vector<Row7> continuity = {CpRow(tau_mid), DCpRow(tau_mid), HRow(tau_mid), SRow(tau_mid)};
    if (options_.continuous_second_derivative) continuity.push_back(D2CpRow(tau_mid));
    const Eigen::Index num_constraints =
        static_cast<Eigen::Index>(continuity.size()) + (reference_.pinned ? 2 : 0);
    Matrix c = Matrix::Zero(num_constraints, 14);
    Vector d = Vector::Zero(num_constraints);
    Eigen::Index k = 0;
    for (const Row7& row : continuity) {
      c.block<1, 7>(k, 0) = row;
      c.block<1, 7>(k, 7) = -row;
      ++k;
    }
    if (reference_.pinned) {
      const double tau_ref = constants::kReferenceTemperature / kScaleTemperatureK;
      const Eigen::Index offset = constants::kReferenceTemperature < t_mid_k ? 0 : 7;
      c.block<1, 7>(k, offset) = HRow(tau_ref);
      d[k++] = reference_.h_over_rt;
      c.block<1, 7>(k, offset) = SRow(tau_ref);
      d[k++] = reference_.s_over_r;
    }
    // Rows of unit length: the same constraints, better balanced for the factorisation.
    for (Eigen::Index r = 0; r < num_constraints; ++r) {
      const double norm = c.row(r).norm();
      c.row(r) /= norm;
      d[r] /= norm;
    }

    // Null-space method. C^T P = Q [R; 0] (column-pivoted Householder QR); with Q = [Q1 Q2],
    // every x = Q1 R^-T P^T d + Q2 z satisfies C x = d, and z solves the unconstrained
    // least-squares problem min |A Q2 z - (b - A x_p)| by complete orthogonal decomposition.
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
    const Vector residual = a * x - b;
    const double largest = residual.cwiseAbs().maxCoeff();
    double sum = 0.0;
    if (largest > 0.0) {
      for (Eigen::Index i = 0; i < residual.size(); ++i) {
        sum += std::pow(std::fabs(residual[i]) / largest, kObjectiveExponent);
      }
    }
    solution.max_normalised_error = largest;
    solution.objective =
        largest > 0.0
            ? largest * std::pow(sum / static_cast<double>(residual.size()), 1.0 / kObjectiveExponent)
            : 0.0;
    return solution;
  }

 private:
  const ExactCurves& exact_;
  const FitOptions& options_;
  const QualityThresholds& thresholds_;
  ReferenceState reference_;
};

// The refinement parameter x maps onto the bracket (lower_k, upper_k) by a logistic function,
// which keeps the unconstrained line search of Ceres inside the bracket.
double MidFromParameter(double x, double lower_k, double upper_k) {
  return lower_k + (upper_k - lower_k) / (1.0 + std::exp(-x));
}

// The objective as a Ceres first-order functor of x. Never throws into Ceres: a failed solve is
// reported as an evaluation failure.
struct MidObjective {
  const ConstrainedFitter* fitter;
  double lower_k;
  double upper_k;

  bool operator()(const double* x, double* cost) const {
    try {
      *cost = fitter->Solve(MidFromParameter(x[0], lower_k, upper_k)).objective;
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
Refinement RefineMid(const ConstrainedFitter& fitter, double lower_k, double upper_k,
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

// Throws Error unless the curves are usable: equal lengths, finite, T increasing, Cp positive.
void ValidateCurves(const ExactCurves& exact) {
  const std::size_t n = exact.t_k.size();
  if (exact.cp_over_r.size() != n || exact.h_over_rt.size() != n || exact.s_over_r.size() != n) {
    throw Error(fmt::format(
        "exact curves: found {} temperatures, {} Cp, {} H and {} S values; expected equal counts",
        n, exact.cp_over_r.size(), exact.h_over_rt.size(), exact.s_over_r.size()));
  }
  if (n < 2 * static_cast<std::size_t>(kMinPointsPerRange)) {
    throw Error(fmt::format("exact curves: found {} grid points; expected at least {}", n,
                            2 * kMinPointsPerRange));
  }
  for (std::size_t i = 0; i < n; ++i) {
    const double values[] = {exact.t_k[i], exact.cp_over_r[i], exact.h_over_rt[i],
                             exact.s_over_r[i]};
    for (double value : values) {
      if (!std::isfinite(value)) {
        throw Error(fmt::format("exact curves: point {} at {} K holds a non-finite value", i,
                                exact.t_k[i]));
      }
    }
    if (!(exact.t_k[i] > 0.0)) {
      throw Error(fmt::format("exact curves: temperature {} K at point {}; expected positive",
                              exact.t_k[i], i));
    }
    if (!(exact.cp_over_r[i] > 0.0)) {
      throw Error(fmt::format("exact curves: Cp/R = {} at {} K; expected positive",
                              exact.cp_over_r[i], exact.t_k[i]));
    }
    if (i > 0 && !(exact.t_k[i] > exact.t_k[i - 1])) {
      throw Error(fmt::format("exact curves: temperature {} K follows {} K; expected increasing",
                              exact.t_k[i], exact.t_k[i - 1]));
    }
  }
}

void ValidateThresholds(const QualityThresholds& thresholds) {
  const std::pair<const char*, double> fields[] = {
      {"max_cp_relative", thresholds.max_cp_relative},
      {"max_h_over_rt", thresholds.max_h_over_rt},
      {"max_s_over_r", thresholds.max_s_over_r}};
  for (const auto& [name, value] : fields) {
    if (!(value > 0.0) || !std::isfinite(value)) {
      throw Error(fmt::format("quality threshold {} = {}; expected a positive finite number", name,
                              value));
    }
  }
}

}  // namespace

std::string FitOptions::Validate() const {
  if (t_mid_k && !(std::isfinite(*t_mid_k) && *t_mid_k > 0.0)) {
    return fmt::format("t_mid_k = {}; expected a positive finite temperature", *t_mid_k);
  }
  if (num_atoms < 0) return fmt::format("num_atoms = {}; expected 0 (unknown) or more", num_atoms);
  return "";
}

std::string ToString(MidTemperatureMethod method) {
  switch (method) {
    case MidTemperatureMethod::kFixed:
      return "fixed";
    case MidTemperatureMethod::kScanAndRefinement:
      return "scan+refinement";
    case MidTemperatureMethod::kScanOnly:
      return "scan";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

std::vector<std::string> ThresholdFailures(const RangeQuality& low_range,
                                           const RangeQuality& high_range,
                                           const QualityThresholds& thresholds) {
  std::vector<std::string> failures;
  const std::pair<const char*, const RangeQuality*> ranges[] = {{"low", &low_range},
                                                                {"high", &high_range}};
  for (const auto& [name, quality] : ranges) {
    if (quality->max_cp_relative > thresholds.max_cp_relative) {
      failures.push_back(fmt::format("{} range: max |dCp|/Cp = {:.2g} % at {:g} K exceeds {:g} %",
                                     name, 100.0 * quality->max_cp_relative,
                                     quality->max_cp_error_t_k,
                                     100.0 * thresholds.max_cp_relative));
    }
    if (quality->max_h_over_rt > thresholds.max_h_over_rt) {
      failures.push_back(fmt::format("{} range: max |dH|/RT = {:.2g} at {:g} K exceeds {:g}", name,
                                     quality->max_h_over_rt, quality->max_h_error_t_k,
                                     thresholds.max_h_over_rt));
    }
    if (quality->max_s_over_r > thresholds.max_s_over_r) {
      failures.push_back(fmt::format("{} range: max |dS|/R = {:.2g} at {:g} K exceeds {:g}", name,
                                     quality->max_s_over_r, quality->max_s_error_t_k,
                                     thresholds.max_s_over_r));
    }
  }
  return failures;
}

FitResult FitTwoRange(const ExactCurves& exact, const FitOptions& options,
                      const QualityThresholds& thresholds) {
  if (const std::string problem = options.Validate(); !problem.empty()) {
    throw Error("fit options: " + problem);
  }
  ValidateThresholds(thresholds);
  ValidateCurves(exact);
  const ConstrainedFitter fitter(exact, options, thresholds);
  const double t_low_k = exact.t_k.front(), t_high_k = exact.t_k.back();

  FitResult result;
  Solution solution;
  if (options.t_mid_k) {
    if (!(*options.t_mid_k > t_low_k && *options.t_mid_k < t_high_k)) {
      throw Error(fmt::format("mid temperature {:g} K; expected strictly between {:g} K and {:g} K",
                              *options.t_mid_k, t_low_k, t_high_k));
    }
    solution = fitter.Solve(*options.t_mid_k);
    result.mid_choice.method = MidTemperatureMethod::kFixed;
  } else {
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
    std::size_t best = 0;
    Solution best_solution = fitter.Solve(candidates[0]);
    for (std::size_t i = 1; i < candidates.size(); ++i) {
      Solution trial = fitter.Solve(candidates[i]);
      if (trial.objective < best_solution.objective) {
        best = i;
        best_solution = std::move(trial);
      }
    }
    MidTemperatureChoice& choice = result.mid_choice;
    choice.num_scan_points = static_cast<int>(candidates.size());
    choice.scan_best_t_mid_k = candidates[best];
    choice.scan_best_objective = best_solution.objective;
    choice.method = MidTemperatureMethod::kScanOnly;
    solution = best_solution;

    // Refinement between the neighbours of the best candidate.
    const double lower_k = candidates[best > 0 ? best - 1 : 0];
    const double upper_k = candidates[std::min(best + 1, candidates.size() - 1)];
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
        Solution refined = fitter.Solve(rounded_k);
        if (refined.objective < best_solution.objective) {
          choice.method = MidTemperatureMethod::kScanAndRefinement;
          solution = std::move(refined);
        } else {
          choice.note = "refinement did not improve on the best scan point";
        }
      }
    }
  }

  result.polynomial = solution.polynomial;
  result.objective = solution.objective;
  result.max_normalised_error = solution.max_normalised_error;
  result.low_range = MeasureRangeQuality(solution.polynomial.low, exact, 0, solution.split);
  result.high_range =
      MeasureRangeQuality(solution.polynomial.high, exact, solution.split, exact.t_k.size());
  result.threshold_failures = ThresholdFailures(result.low_range, result.high_range, thresholds);
  result.meets_thresholds = result.threshold_failures.empty();
  const double upper_cp_over_r =
      (options.num_atoms > 0
           ? ClassicalLimitCpOverR(options.num_atoms)
           : *std::max_element(exact.cp_over_r.begin(), exact.cp_over_r.end())) +
      kExtrapolationUpperMargin;
  result.extrapolation = CheckExtrapolation(solution.polynomial, upper_cp_over_r);
  return result;
}

std::vector<double> FitGrid(double t_low_k, double t_high_k) {
  if (!(std::isfinite(t_low_k) && std::isfinite(t_high_k) && t_low_k > 0.0 &&
        t_low_k < t_high_k)) {
    throw Error(fmt::format("fit grid over [{:g} K, {:g} K]; expected 0 < t_low < t_high, finite",
                            t_low_k, t_high_k));
  }
  // Step sizes, K, below each bound: fine where rotational and low vibrational structure lives.
  struct Tier {
    double start_k;
    double end_k;
    double step_k;
  };
  constexpr Tier kTiers[] = {{0.0, 100.0, 2.0},
                             {100.0, 300.0, 5.0},
                             {300.0, 1000.0, 10.0},
                             {1000.0, 2000.0, 25.0},
                             {2000.0, std::numeric_limits<double>::infinity(), 50.0}};
  std::vector<double> grid{t_low_k};
  for (const Tier& tier : kTiers) {
    const double from_k = std::max(tier.start_k, t_low_k);
    const double to_k = std::min(tier.end_k, t_high_k);
    if (from_k >= to_k) continue;
    // Integer multiples of the step: exact doubles, no accumulated rounding.
    for (double m = std::ceil(from_k / tier.step_k);; m += 1.0) {
      const double t_k = m * tier.step_k;
      if (t_k >= to_k) break;
      if (t_k > t_low_k) grid.push_back(t_k);
    }
  }
  constexpr double kT = constants::kReferenceTemperature;
  if (kT > t_low_k && kT < t_high_k) grid.push_back(kT);
  grid.push_back(t_high_k);
  std::sort(grid.begin(), grid.end());
  grid.erase(std::unique(grid.begin(), grid.end()), grid.end());
  return grid;
}

}  // namespace sevenfold

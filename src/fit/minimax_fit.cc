// SPDX-License-Identifier: MIT
// Minimax fit of a species and its mid-temperature search (docs/fitting.md, "Minimax" and
// "The mid temperature").
#include "fit/minimax_fit.h"

#include <algorithm>
#include <cmath>
#include <cstddef>
#include <limits>
#include <utility>
#include <vector>

#include <fmt/format.h>

#include "core/error.h"
#include "fit/grid.h"

namespace sevenfold::detail {
namespace {

// Relative duality gap at which the solve stops: the final fit is the optimum of its problem
// (the exchange stops at its vertex; a gap of 0 asks for nothing less); the candidates of the
// search within 1 %, enough to rank them (the search is required to land within 2 % of the best
// mid temperature of a 10 K scan).
constexpr double kFinalGap = 0.0;
constexpr double kSearchGap = 0.01;
// Candidates of the coarse scan, spaced geometrically over the admissible mid temperatures; then
// a pattern search on the multiples of kRefineStepK between the best candidate's neighbours.
constexpr int kNumCoarseCandidates = 21;
constexpr double kRefineStepK = 10.0;

class MinimaxProblemBuilder {
 public:
  MinimaxProblemBuilder(const ExactCurves& exact, const FitOptions& options,
                        const ErrorScales& scales)
      : exact_(exact),
        options_(options),
        reference_(FindReferenceState(exact, options.pin_reference_state)),
        rows_(NormalisedRows(exact, scales)) {
    const ExtrapolationGuard& guard = options.extrapolation_guard;
    if (guard.enabled) {
      SEVENFOLD_ASSERT(exact.guard_t_k.size() == exact.guard_cp_over_r.size());
      const double t_low_k = exact.t_k.front(), t_high_k = exact.t_k.back();
      for (std::size_t j = 0; j < exact.guard_t_k.size(); ++j) {
        const double t_k = exact.guard_t_k[j];
        // Only the margin the guard asks for; the caller's sample may reach further.
        const bool below = t_k < t_low_k && t_k >= t_low_k / guard.factor * (1.0 - 1e-12);
        const bool above = t_k > t_high_k && t_k <= t_high_k * guard.factor * (1.0 + 1e-12);
        if (!below && !above) continue;
        const double weight = 1.0 / (guard.band * exact.guard_cp_over_r[j]);
        Row8 row;
        row << CpRow(t_k / kScaleTemperatureK) * weight, exact.guard_cp_over_r[j] * weight;
        guard_rows_.push_back(row);
        guard_high_.push_back(above);
        guard_index_.push_back(j);
      }
    }
    prepared_ = PrepareMinimaxRows(rows_, guard_rows_, guard_high_);
  }

  std::size_t Split(double t_mid_k) const { return SplitIndex(exact_.t_k, t_mid_k); }
  bool Admissible(double t_mid_k) const {
    return LeavesPointsOnEachSide(exact_.t_k, t_mid_k, kMinPointsPerRange);
  }

  MinimaxSolution Solve(double t_mid_k, double gap, const MinimaxSolution* warm_start) const {
    MinimaxProblem problem;
    problem.rows = &prepared_;
    problem.raw_rows = &rows_;
    problem.raw_guard_rows = &guard_rows_;
    problem.guard_high = &guard_high_;
    problem.split_row = 3 * Split(t_mid_k);
    BuildConstraints(t_mid_k, options_.continuous_second_derivative, reference_, problem.c,
                     problem.d);
    return SolveMinimax(problem, gap, warm_start);
  }

  MinimaxFit Finish(double t_mid_k, const MinimaxSolution& solution) const {
    MinimaxFit fit;
    fit.split = Split(t_mid_k);
    fit.polynomial.t_low_k = exact_.t_k.front();
    fit.polynomial.t_mid_k = t_mid_k;
    fit.polynomial.t_high_k = exact_.t_k.back();
    fit.polynomial.low = ToKelvinCoefficients(solution.x, 0);
    fit.polynomial.high = ToKelvinCoefficients(solution.x, 7);
    fit.max_error = solution.max_error;
    MinimaxCertificate& certificate = fit.certificate;
    certificate.lower_bound = solution.lower_bound;
    for (std::size_t i = 0; i < solution.weights.size(); ++i) {
      if (solution.weights[i] > 0.0) certificate.weights.push_back({i, solution.weights[i]});
    }
    certificate.multipliers.assign(exact_.guard_t_k.size(), 0.0);
    for (std::size_t j = 0; j < guard_index_.size() && j < solution.multipliers.size(); ++j) {
      certificate.multipliers[guard_index_[j]] = solution.multipliers[j];
    }
    certificate.guard_met = solution.guard_met;
    certificate.num_iterations = solution.num_iterations;
    return fit;
  }

 private:
  const ExactCurves& exact_;
  const FitOptions& options_;
  ReferenceState reference_;
  std::vector<Row8> rows_;
  std::vector<Row8> guard_rows_;
  std::vector<bool> guard_high_;
  std::vector<std::size_t> guard_index_;  // index into exact.guard_t_k of each guard row
  MinimaxRows prepared_;
};

// The figure candidates are ranked by: the worst error, and a guard miss ranks last.
double Rank(const MinimaxSolution& solution) {
  return solution.guard_met ? solution.max_error
                            : std::numeric_limits<double>::max() / 4 + solution.max_guard;
}

}  // namespace

MinimaxFit FitMinimax(const ExactCurves& exact, const FitOptions& options,
                      const ErrorScales& scales) {
  const MinimaxProblemBuilder builder(exact, options, scales);
  const std::vector<double>& t = exact.t_k;
  if (options.t_mid_k) {
    RequirePointsOnEachSide(t, *options.t_mid_k, kMinPointsPerRange);
    MinimaxFit fit = builder.Finish(*options.t_mid_k, builder.Solve(*options.t_mid_k, kFinalGap, nullptr));
    fit.mid_choice.method = MidTemperatureMethod::kFixed;
    return fit;
  }
  const double lowest_k = t[kMinPointsPerRange], highest_k = t[t.size() - kMinPointsPerRange];
  if (!(lowest_k < highest_k)) {
    throw Error(fmt::format("exact curves: {} grid points leave no room to choose a mid "
                            "temperature with {} points on each side",
                            t.size(), kMinPointsPerRange));
  }
  // Coarse scan: whole-kelvin candidates spaced geometrically, each solve warm-started from the
  // weights of the previous candidate (the grid is the same; only the split moves).
  std::vector<double> candidates;
  for (int i = 0; i < kNumCoarseCandidates; ++i) {
    const double t_k =
        lowest_k * std::pow(highest_k / lowest_k, static_cast<double>(i) / (kNumCoarseCandidates - 1));
    const double rounded = std::clamp(std::round(t_k), lowest_k, highest_k);
    if (candidates.empty() || rounded > candidates.back()) candidates.push_back(rounded);
  }
  MinimaxSolution previous;
  std::size_t best = 0;
  double best_rank = std::numeric_limits<double>::infinity();
  MinimaxSolution best_solution;
  for (std::size_t i = 0; i < candidates.size(); ++i) {
    MinimaxSolution solution = builder.Solve(candidates[i], kSearchGap, i > 0 ? &previous : nullptr);
    if (Rank(solution) < best_rank) {
      best_rank = Rank(solution);
      best = i;
      best_solution = solution;
    }
    previous = std::move(solution);
  }
  MidTemperatureChoice choice;
  choice.num_scan_points = static_cast<int>(candidates.size());
  choice.scan_best_t_mid_k = candidates[best];
  choice.scan_best_objective = best_rank;
  choice.method = MidTemperatureMethod::kScanOnly;
  // Refinement: a pattern search on the multiples of kRefineStepK strictly between the
  // neighbours of the best: try the centre +- the step, move to the better, halve the step down to
  // kRefineStepK (about 2 log2(width / 10 K) solves instead of one per multiple).
  const double lower_k = candidates[best > 0 ? best - 1 : 0];
  const double upper_k = candidates[std::min(best + 1, candidates.size() - 1)];
  const auto on_lattice = [](double t_k) { return std::round(t_k / kRefineStepK) * kRefineStepK; };
  double chosen_k = candidates[best];
  std::vector<double> tried = {chosen_k};
  double step_k = std::max(kRefineStepK, on_lattice((upper_k - lower_k) / 4.0));
  for (;;) {
    const double centre_k = chosen_k;
    for (const double direction : {-1.0, 1.0}) {
      const double t_k = on_lattice(centre_k + direction * step_k);
      if (t_k <= lower_k || t_k >= upper_k || !builder.Admissible(t_k) ||
          std::find(tried.begin(), tried.end(), t_k) != tried.end()) {
        continue;
      }
      tried.push_back(t_k);
      MinimaxSolution solution = builder.Solve(t_k, kSearchGap, &best_solution);
      ++choice.num_refinement_iterations;
      if (Rank(solution) < best_rank) {
        best_rank = Rank(solution);
        chosen_k = t_k;
        best_solution = std::move(solution);
      }
    }
    if (chosen_k != centre_k) continue;  // moved: try the same step around the new centre
    if (step_k <= kRefineStepK) break;
    step_k = std::max(kRefineStepK, on_lattice(step_k / 2.0));
  }
  if (chosen_k != candidates[best]) {
    choice.method = MidTemperatureMethod::kScanAndRefinement;
  } else {
    choice.note = "no multiple of 10 K near the best scan point did better";
  }
  // The final solve starts cold, as a fit fixed at chosen_k does: the same mid temperature then
  // gives the same bits whichever way it was reached (the check of committed entries relies on it).
  MinimaxFit fit = builder.Finish(chosen_k, builder.Solve(chosen_k, kFinalGap, nullptr));
  fit.mid_choice = choice;
  return fit;
}

}  // namespace sevenfold::detail

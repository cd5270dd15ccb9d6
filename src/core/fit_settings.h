// SPDX-License-Identifier: MIT
// The vocabulary of fit settings shared by the species file (species/), the fitter (fit/), the
// entries file (entries/) and the command line: objective, error scales, quality thresholds and
// the extrapolation guard. Defined here, in core, so that fit depends on core only and species
// can carry per-species settings without depending on fit. Meanings: docs/fitting.md.
#pragma once

#include <optional>
#include <string>

namespace sevenfold {

// What the fitter minimises over the fit grid.
enum class FitObjective {
  kMinimax,       // the worst normalised error (default)
  kLeastSquares,  // the sum of squared normalised errors
};
// "minimax", "least-squares"; ParseFitObjective returns nullopt for anything else.
std::string ToString(FitObjective objective);
std::optional<FitObjective> ParseFitObjective(const std::string& text);

// The scales that normalise the three errors inside the objective: the fit minimises (the worst
// or the squares of) |dCp|/Cp / cp_relative, |dH|/(R T) / h_over_rt and |dS|/R / s_over_r.
// Weights only: they are not the pass/fail thresholds (QualityThresholds), and changing a
// threshold never changes the coefficients.
struct ErrorScales {
  double cp_relative = 0.005;
  double h_over_rt = 0.002;
  double s_over_r = 0.002;
};

// Quality thresholds a fit must meet over each range to pass (docs/fitting.md).
struct QualityThresholds {
  double max_cp_relative = 0.005;  // max |dCp| / Cp_exact
  double max_h_over_rt = 0.002;    // max |dH| / (R T)
  double max_s_over_r = 0.002;     // max |dS| / R
};

// A constraint inside the optimisation: for t_high < T <= factor * t_high the fitted Cp stays
// within `band` (relative) of the exact model, and likewise for t_low / factor <= T < t_low.
struct ExtrapolationGuard {
  bool enabled = true;
  double factor = 1.25;  // > 1
  double band = 0.2;     // > 0, relative to the exact Cp
};
// "off" or "FACTOR:BAND" in the shortest round-trip form, e.g. "1.25:0.2".
std::string ToString(const ExtrapolationGuard& guard);
// Parses "off" or "FACTOR:BAND" (FACTOR > 1 and <= 4, 0 < BAND <= 1); nullopt for anything else.
std::optional<ExtrapolationGuard> ParseExtrapolationGuard(const std::string& text);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "core/fit_settings.h"

#include <fmt/format.h>

#include "core/units.h"

namespace sevenfold {

std::string ToString(FitObjective objective) {
  switch (objective) {
    case FitObjective::kMinimax: return "minimax";
    case FitObjective::kLeastSquares: return "least-squares";
  }
  return "minimax";
}

std::optional<FitObjective> ParseFitObjective(const std::string& text) {
  if (text == "minimax") return FitObjective::kMinimax;
  if (text == "least-squares") return FitObjective::kLeastSquares;
  return std::nullopt;
}

std::string ToString(const ExtrapolationGuard& guard) {
  if (!guard.enabled) return "off";
  return fmt::format("{}:{}", guard.factor, guard.band);
}

std::optional<ExtrapolationGuard> ParseExtrapolationGuard(const std::string& text) {
  if (text == "off") return ExtrapolationGuard{false, 1.25, 0.2};
  const std::size_t colon = text.find(':');
  if (colon == std::string::npos) return std::nullopt;
  const std::optional<double> factor = ParsePlainNumber(text.substr(0, colon));
  const std::optional<double> band = ParsePlainNumber(text.substr(colon + 1));
  if (!factor || !band || !(*factor > 1.0 && *factor <= 4.0) || !(*band > 0.0 && *band <= 1.0)) {
    return std::nullopt;
  }
  return ExtrapolationGuard{true, *factor, *band};
}

}  // namespace sevenfold

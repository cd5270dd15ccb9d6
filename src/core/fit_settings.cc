// SPDX-License-Identifier: MIT
#include "core/fit_settings.h"

#include <cerrno>
#include <cmath>
#include <cstdlib>

#include <fmt/format.h>

namespace sevenfold {
namespace {

// A plain decimal number filling the whole of `text` (no sign, no hex, no spaces).
std::optional<double> ParsePlainNumber(const std::string& text) {
  if (text.empty() || text.find_first_not_of("0123456789.eE+-") != std::string::npos) {
    return std::nullopt;
  }
  if (!(text[0] >= '0' && text[0] <= '9') && text[0] != '.') return std::nullopt;
  errno = 0;
  char* end = nullptr;
  const double value = std::strtod(text.c_str(), &end);
  if (errno != 0 || end != text.c_str() + text.size() || !std::isfinite(value)) return std::nullopt;
  return value;
}

}  // namespace

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

// SPDX-License-Identifier: MIT
#include "statmech/diatomic.h"

#include <string>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"

namespace sevenfold {
namespace {

using constants::kWavenumberToKelvin;

// A diatomic with D0 / Be ~ 1e5 (the heaviest, most strongly bound cases) has ~1e6 bound
// levels; beyond that the input is almost certainly wrong and the sum would be slow.
constexpr std::size_t kMaxLevels = 4000000;

}  // namespace

ParityLevels DiatomicLevels(const std::vector<DiatomicState>& states,
                            std::vector<DiatomicStateSummary>* summaries) {
  ParityLevels levels;
  if (summaries) summaries->clear();
  std::size_t total = 0;
  for (std::size_t s = 0; s < states.size(); ++s) {
    const DiatomicState& state = states[s];
    const DiatomicConstants& c = state.constants;
    const std::string where = fmt::format("diatomic state {} (energy {} cm^-1)", s, state.energy_cm1);
    if (!(c.we_cm1 > 0.0) || !(c.be_cm1 > 0.0) || !(c.dissociation_cm1 > 0.0) ||
        !(state.degeneracy > 0.0) || !(c.de_cm1 >= 0.0)) {
      throw Error(fmt::format("{}: we, Be, dissociation and degeneracy must be positive and De "
                              "at least 0 (got we {}, Be {}, dissociation {}, degeneracy {}, De {})",
                              where, c.we_cm1, c.be_cm1, c.dissociation_cm1, state.degeneracy,
                              c.de_cm1));
    }
    const auto g_of = [&](double x) {
      return x * (c.we_cm1 + x * (-c.wexe_cm1 + x * c.weye_cm1));
    };
    const double g0 = g_of(0.5);
    DiatomicStateSummary summary;
    for (int v = 0;; ++v) {
      const double x = v + 0.5;
      const double vibration = g_of(x) - g0;  // G(v) - G(0), cm^-1
      const double slope = c.we_cm1 - 2.0 * c.wexe_cm1 * x + 3.0 * c.weye_cm1 * x * x;
      const double b_v = c.be_cm1 - c.alphae_cm1 * x + c.gammae_cm1 * x * x;
      if (v == 0 && (!(slope > 0.0) || !(b_v > 0.0))) {
        throw Error(fmt::format("{}: no bound ladder: at v = 0 dG/dv = {} cm^-1 and B_v = {} "
                                "cm^-1; expected both positive",
                                where, slope, b_v));
      }
      if (vibration >= c.dissociation_cm1 || !(slope > 0.0) || !(b_v > 0.0)) break;
      summary.max_v = v;
      const double turning_jj = c.de_cm1 > 0.0 ? b_v / (2.0 * c.de_cm1) : 1e300;
      for (int j = 0;; ++j) {
        const double jj = static_cast<double>(j) * (j + 1);
        if (jj >= turning_jj) break;
        const double rotation = b_v * jj - c.de_cm1 * jj * jj;
        if (vibration + rotation >= c.dissociation_cm1) break;
        const double energy_k = (state.energy_cm1 + vibration + rotation) * kWavenumberToKelvin;
        (j % 2 == 0 ? levels.even : levels.odd)
            .push_back({energy_k, state.degeneracy * (2.0 * j + 1.0)});
        if (v == 0) summary.max_j_at_v0 = j;
        ++summary.num_levels;
      }
      if (summary.num_levels + total > kMaxLevels) {
        throw Error(fmt::format("{}: more than {} bound levels (Be {} cm^-1, dissociation {} "
                                "cm^-1); expected constants of a real diatomic",
                                where, kMaxLevels, c.be_cm1, c.dissociation_cm1));
      }
    }
    total += summary.num_levels;
    if (summaries) summaries->push_back(summary);
  }
  return levels;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "statmech/torsion.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include <Eigen/Dense>
#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "statmech/tridiagonal.h"

namespace sevenfold {
namespace {

static_assert(TorsionOptions{}.top_temperature_k == constants::kMaxTemperatureK,
              "torsion.h restates the engine's top temperature");

// Points for the range of V(phi): the cosine series has at most a few dozen terms, so 4096
// samples find its extremes to far better than the margin they feed.
constexpr int kPotentialSamples = 4096;
// Rounds of basis growth before giving up.
constexpr int kMaxRounds = 8;

struct Terms {
  std::vector<std::pair<int, double>> nonzero;  // (k, V_k in K) with V_k != 0
  int gcd = 1;
  int max_k = 0;
  double mean_k = 0.0;   // average of V over phi: sum V_k / 2
  double range_k = 0.0;  // max V - min V
};

Terms Analyse(const std::vector<std::pair<int, double>>& fourier_k) {
  Terms terms;
  for (const auto& [k, v] : fourier_k) {
    SEVENFOLD_ASSERT(k >= 1);
    if (v == 0.0) continue;
    terms.nonzero.emplace_back(k, v);
    terms.gcd = terms.nonzero.size() == 1 ? k : std::gcd(terms.gcd, k);
    terms.max_k = std::max(terms.max_k, k);
    terms.mean_k += 0.5 * v;
  }
  double low = std::numeric_limits<double>::infinity(), high = -low;
  for (int i = 0; i < kPotentialSamples; ++i) {
    const double phi = 2.0 * constants::kPi * i / kPotentialSamples;
    double v = 0.0;
    for (const auto& [k, v_k] : terms.nonzero) v += 0.5 * v_k * (1.0 - std::cos(k * phi));
    low = std::min(low, v);
    high = std::max(high, v);
  }
  terms.range_k = high - low;
  return terms;
}

// <m|H|m2> in the free-rotor basis: theta m^2 + <V> on the diagonal, -V_k / 4 where |m - m2| = k.
double Element(double theta_k, const Terms& terms, int m, int m2) {
  double value = m == m2 ? theta_k * m * m + terms.mean_k : 0.0;
  for (const auto& [k, v_k] : terms.nonzero) {
    if (m - m2 == k || m2 - m == k) value -= 0.25 * v_k;
  }
  return value;
}

// Appends the eigenvalues of the n x n symmetric matrix with elements entry(i, j). With
// `tridiagonal` only entry(i, i) and entry(i, i + 1) are read: eigenvalues by implicit QL
// (statmech/tridiagonal.h; it scales its input, which Eigen's tridiagonal QL does not, and costs
// a few times less, docs/performance.md); otherwise by Eigen's dense symmetric solver.
template <typename Entry>
void AppendEigenvalues(int n, const Entry& entry, bool tridiagonal, std::vector<double>& out) {
  if (n == 0) return;
  if (tridiagonal) {
    std::vector<double> diagonal(n), coupling(n - 1);
    for (int i = 0; i < n; ++i) diagonal[i] = entry(i, i);
    for (int i = 0; i + 1 < n; ++i) coupling[i] = entry(i, i + 1);
    for (const double value :
         SymmetricTridiagonalEigenvalues(std::move(diagonal), std::move(coupling))) {
      out.push_back(value);
    }
    return;
  }
  Eigen::MatrixXd matrix(n, n);
  for (int i = 0; i < n; ++i) {
    for (int j = i; j < n; ++j) matrix(i, j) = matrix(j, i) = entry(i, j);
  }
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> solver(matrix, Eigen::EigenvaluesOnly);
  SEVENFOLD_ASSERT(solver.info() == Eigen::Success);
  for (int i = 0; i < n; ++i) out.push_back(solver.eigenvalues()(i));
}

// Eigenvalues of the block m = r (mod g), |m| <= max_m, with r = -r (mod g): the block is closed
// under m -> -m, which commutes with H (the potential is a cosine series), so it splits into the
// even states (|m> + |-m>) / sqrt 2 (and |0>) and the odd states (|m> - |-m>) / sqrt 2, m > 0:
// two blocks of half the size, as the Wang blocks of rotor.cc [GordyCook1984, ch. 7]. In the
// split basis <m, +-|H|m2, +-> = <m|H|m2> +- <m|H|-m2>, and <0|H|m, +> = sqrt 2 <0|H|m>.
void AppendMirrorSymmetricBlock(double theta_k, const Terms& terms, int residue, int max_m,
                                std::vector<double>& out) {
  const int g = terms.gcd;
  std::vector<int> positive;  // m > 0 of the block, ascending
  for (int m = residue == 0 ? g : residue; m <= max_m; m += g) positive.push_back(m);
  // One term (k = g) couples neighbours only, in either half.
  const bool tridiagonal = terms.nonzero.size() <= 1;
  for (const int sign : {+1, -1}) {
    std::vector<int> states;  // 0 stands for |0>, m > 0 for the pair (|m> +- |-m>) / sqrt 2
    if (residue == 0 && sign > 0) states.push_back(0);
    states.insert(states.end(), positive.begin(), positive.end());
    const auto entry = [&](int i, int j) {
      const int m = states[i], m2 = states[j];
      if (m == 0 && m2 == 0) return Element(theta_k, terms, 0, 0);
      if (m == 0 || m2 == 0) return std::sqrt(2.0) * Element(theta_k, terms, m, m2);
      return Element(theta_k, terms, m, m2) + sign * Element(theta_k, terms, m, -m2);
    };
    AppendEigenvalues(static_cast<int>(states.size()), entry, tridiagonal, out);
  }
}

// All eigenvalues over |m| <= max_m. H conserves m modulo g, the gcd of the potential's k, so it
// is block diagonal in the residue r. m -> -m maps block r onto block g - r with the same
// spectrum, which is therefore computed once; a block that maps onto itself is split in two.
std::vector<double> Eigenvalues(double theta_k, const Terms& terms, int max_m) {
  std::vector<double> values;
  values.reserve(2 * max_m + 1);
  const int g = terms.gcd;
  for (int r = 0; r < g; ++r) {
    const int mirror = (g - r) % g;
    if (mirror == r) {
      AppendMirrorSymmetricBlock(theta_k, terms, r, max_m, values);
    } else if (mirror > r) {
      const std::size_t first = values.size();
      // Block r alone: its mirror has the same eigenvalues, appended as copies.
      std::vector<int> ms;
      for (int m = -max_m + ((r + max_m) % g + g) % g; m <= max_m; m += g) ms.push_back(m);
      const auto entry = [&](int i, int j) { return Element(theta_k, terms, ms[i], ms[j]); };
      AppendEigenvalues(static_cast<int>(ms.size()), entry, terms.nonzero.size() <= 1, values);
      const std::size_t last = values.size();
      for (std::size_t i = first; i < last; ++i) {
        const double value = values[i];  // a copy: push_back may not take a reference into values
        values.push_back(value);
      }
    }
  }
  std::sort(values.begin(), values.end());
  return values;
}

// Smallest |m| cap that can represent the levels up to energy_cut_k above the lowest one, with a
// margin of a few coupling steps for the states just below the cut.
int StartingMaxM(double theta_k, const Terms& terms, double energy_cut_k) {
  return static_cast<int>(std::ceil(std::sqrt((energy_cut_k + terms.range_k) / theta_k))) +
         2 * terms.max_k + 10;
}

}  // namespace

std::vector<double> TorsionEigenvalues(double theta_k,
                                       const std::vector<std::pair<int, double>>& fourier_k,
                                       int max_m) {
  return Eigenvalues(theta_k, Analyse(fourier_k), max_m);
}

TorsionContribution::TorsionContribution(double theta_k, int symmetry,
                                         const std::vector<std::pair<int, double>>& fourier_k,
                                         const TorsionOptions& options) {
  SEVENFOLD_ASSERT(theta_k > 0.0 && symmetry >= 1);
  const Terms terms = Analyse(fourier_k);
  const bool tridiagonal =
      terms.nonzero.empty() || (terms.nonzero.size() == 1 && terms.nonzero[0].first == terms.gcd);
  const int cap_m = tridiagonal ? options.max_m_tridiagonal : options.max_m_dense;

  // Sum explicitly up to the top of the engine's range if the basis this needs is affordable;
  // otherwise lower the top to what the capped basis converges, and hand over to the tail there.
  double top_t = std::min(options.top_temperature_k, constants::kMaxTemperatureK);
  double switch_t = std::numeric_limits<double>::infinity();
  // Leave room for the convergence rounds, which grow the basis by a quarter each.
  const int affordable_m = static_cast<int>(cap_m / 1.6);
  if (StartingMaxM(theta_k, terms, options.level_cut_factor * top_t) > affordable_m) {
    const double root = affordable_m - 2.0 * terms.max_k - 10.0;
    top_t = (theta_k * root * root - terms.range_k) / options.level_cut_factor;
    switch_t = top_t;
    if (!(top_t > 0.0)) {
      throw Error(fmt::format("torsion with B/k = {} K and a barrier of {} K needs a free-rotor "
                              "basis beyond |m| = {}; expected a larger rotational constant",
                              theta_k, terms.range_k, cap_m));
    }
  }
  const double energy_cut = options.level_cut_factor * top_t;

  int max_m = StartingMaxM(theta_k, terms, energy_cut);
  std::vector<double> previous = Eigenvalues(theta_k, terms, max_m);
  bool converged = false;
  for (int round = 0; round < kMaxRounds && !converged; ++round) {
    const int next_m = max_m + std::max(10, max_m / 4);
    if (next_m > cap_m) break;
    std::vector<double> next = Eigenvalues(theta_k, terms, next_m);
    converged = true;
    const double lowest = next.front();
    for (std::size_t i = 0; i < previous.size() && next[i] - lowest <= energy_cut; ++i) {
      const double change = std::abs(next[i] - previous[i]);
      if (change > options.convergence_tolerance * (std::abs(next[i]) + theta_k)) {
        converged = false;
        break;
      }
    }
    max_m = next_m;
    previous = std::move(next);
  }
  if (!converged) {
    throw Error(fmt::format("torsion levels did not converge to {} relative up to {} K with "
                            "|m| <= {} (B/k = {} K, barrier {} K)",
                            options.convergence_tolerance, energy_cut, max_m, theta_k,
                            terms.range_k));
  }
  basis_max_m_ = max_m;

  const double lowest = previous.front();
  std::vector<Level> levels;
  for (const double e : previous) {
    if (e - lowest > energy_cut) break;
    levels.push_back({e - lowest, 1.0});
  }
  // High-temperature limit, energies from the lowest level E0: q -> sqrt(pi T / theta) / n times
  // exp((E0 - <V>) / T); the quantum corrections start at 1/T^3 (Wigner-Kirkwood; the free
  // rotor's own corrections are exponentially small), so c1 = E0 - <V> is exact.
  LadderTail tail;
  tail.classical_exponent = 0.5;
  tail.ln_classical_prefactor = 0.5 * std::log(constants::kPi / theta_k);
  tail.c1_k = lowest - terms.mean_k;
  tail.switch_t_k = switch_t;
  tail.symmetry_number = symmetry;
  ladder_ = RotorContribution::FromLevels(std::move(levels), tail);
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "statmech/rotor.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <utility>

#include <Eigen/Dense>

#include "core/constants.h"
#include "core/error.h"
#include "statmech/tridiagonal.h"

namespace sevenfold {
namespace {

using constants::kWavenumberToKelvin;

// Two rotational constants count as equal (symmetric top) within this relative difference; the
// closed form and the diagonalisation agree there to rounding anyway.
constexpr double kSymmetricTopTolerance = 1e-12;

bool NearlyEqual(double x, double y) {
  return std::abs(x - y) <= kSymmetricTopTolerance * std::max(std::abs(x), std::abs(y));
}

}  // namespace

// The Hamiltonian couples K with K +- 2 only and is symmetric under K -> -K; in the Wang
// combinations |K, +-> = (|K> +- |-K>) / sqrt 2 it splits into four tridiagonal blocks (E+, E-,
// O+, O-) of about J/2 each [GordyCook1984, ch. 7]. Eigenvalues by implicit QL
// (statmech/tridiagonal.h), whose cost grows as the square of the block size: four half-size
// blocks cost half of the two K-parity blocks. This loop over J dominates the cost of a large
// molecule (docs/performance.md).
std::vector<double> AsymmetricTopLevels(int j, double a_k, double b_k, double c_k) {
  const double jj = static_cast<double>(j) * (j + 1);
  const auto diagonal = [&](int k) { return a_k * k * k + 0.5 * (b_k + c_k) * (jj - k * k); };
  // <J,K+2| (B-C)/4 (J+^2 + J-^2) |J,K>, equal to <J,-K| ... |J,-K-2>.
  const auto coupling = [&](int k) {
    return 0.25 * (b_k - c_k) * std::sqrt((j - k) * (j + k + 1.0) * (j - k - 1.0) * (j + k + 2.0));
  };
  std::vector<double> energies(2 * j + 1);
  std::size_t filled = 0;
  // Scratch for one block's off-diagonal (the diagonal is built in place in `energies`).
  std::vector<double> block_coupling(j / 2 + 2);
  // One Wang block over K = first_k, first_k + 2, ..., <= J. first_scale multiplies the first
  // coupling (sqrt 2 between |0> and |2,+>); first_shift adds to the first diagonal element
  // (+-<J,1|H|J,-1> = +-(B-C)/4 J(J+1) for O+ and O-).
  const auto append_block = [&](int first_k, double first_scale, double first_shift) {
    if (first_k > j) return;
    double* block_diagonal = energies.data() + filled;
    int n = 0;
    for (int k = first_k; k <= j; k += 2, ++n) {
      block_diagonal[n] = diagonal(k);
      block_coupling[n] = k + 2 <= j ? coupling(k) : 0.0;
    }
    block_diagonal[0] += first_shift;
    block_coupling[0] *= first_scale;
    SymmetricTridiagonalEigenvaluesInPlace(block_diagonal, block_coupling.data(), n);
    filled += static_cast<std::size_t>(n);
  };
  const double k1_coupling = 0.25 * (b_k - c_k) * jj;
  append_block(0, std::sqrt(2.0), 0.0);  // E+: K = 0, 2, 4, ...
  append_block(2, 1.0, 0.0);             // E-: K = 2, 4, ...
  append_block(1, 1.0, k1_coupling);     // O+: K = 1, 3, ...
  append_block(1, 1.0, -k1_coupling);    // O-
  SEVENFOLD_ASSERT(filled == energies.size());
  return energies;
}

RotorContribution RotorContribution::Linear(double b_cm1, double symmetry_number, double d_cm1,
                                            const RotorOptions& options) {
  RotorContribution rotor;
  const double theta = b_cm1 * kWavenumberToKelvin;
  const double d_k = d_cm1 * kWavenumberToKelvin;
  rotor.ln_symmetry_ = std::log(symmetry_number);
  rotor.classical_exponent_ = 1.0;
  rotor.ln_classical_prefactor_ = -std::log(theta);
  rotor.tail_[1] = theta / 3.0;
  if (d_k > 0.0) {
    // The distortion term grows with T, so no decaying tail exists: sum explicitly everywhere.
    rotor.switch_t_k_ = std::numeric_limits<double>::infinity();
    const double energy_cut = options.level_cut_factor * constants::kMaxTemperatureK;
    const double turning_jj = theta / (2.0 * d_k);
    for (int j = 0;; ++j) {
      const double jj = static_cast<double>(j) * (j + 1);
      if (jj >= turning_jj) break;
      const double energy = theta * jj - d_k * jj * jj;
      if (energy > energy_cut) break;
      rotor.levels_.push_back({energy, 2.0 * j + 1.0});
    }
    return rotor;
  }
  rotor.switch_t_k_ = options.switch_factor * theta;
  const double energy_cut = options.level_cut_factor * rotor.switch_t_k_;
  for (int j = 0;; ++j) {
    const double energy = theta * j * (j + 1.0);
    if (energy > energy_cut) break;
    rotor.levels_.push_back({energy, 2.0 * j + 1.0});
  }
  rotor.MatchTail();
  return rotor;
}

RotorContribution RotorContribution::Nonlinear(const std::array<double, 3>& abc_cm1,
                                               double symmetry_number,
                                               const RotorOptions& options) {
  std::array<double, 3> theta = abc_cm1;
  for (double& value : theta) value *= kWavenumberToKelvin;
  std::sort(theta.begin(), theta.end(), std::greater<double>());
  const double a = theta[0], b = theta[1], c = theta[2];

  RotorContribution rotor;
  rotor.ln_symmetry_ = std::log(symmetry_number);
  rotor.classical_exponent_ = 1.5;
  rotor.ln_classical_prefactor_ = 0.5 * std::log(constants::kPi / (a * b * c));
  rotor.tail_[1] = (2.0 * (a + b + c) - (a * b / c + b * c / a + c * a / b)) / 12.0;

  // The level ladder in J is set by the smallest constant. When a complete ladder up to
  // switch_factor * A would need J beyond max_j, the top is necessarily near-prolate (the
  // moments obey I_C <= I_A + I_B, so C >= AB/(A+B) >= B/2 and A/C large means A >> B ~ C):
  // then K is summed exactly over symmetric-top stacks with b = sqrt(BC) (which keeps the
  // classical limit exact), and J within each stack by Euler-Maclaurin, valid since T >> C there.
  // The neglected asymmetry splitting enters at order ((B - C)/A)^2 (common practice).
  const double max_jj = static_cast<double>(options.max_j) * (options.max_j + 1);
  const double switch_t = options.switch_factor * a;
  if (c * max_jj / options.level_cut_factor < switch_t) {
    rotor.switch_t_k_ = -1.0;  // no explicit sum at any temperature
    rotor.hybrid_b_k_ = std::sqrt(b * c);
    const double hb = rotor.hybrid_b_k_;
    const double energy_cut = options.level_cut_factor * constants::kMaxTemperatureK;
    for (int k = 0; a * k * k <= energy_cut; ++k) {
      KTerm term;
      term.degeneracy = k == 0 ? 1.0 : 2.0;
      term.energy_k = (a - hb) * k * k + hb * k * (k + 1.0);
      // sum_{J>=K} (2J+1) e^{-b (J(J+1) - K(K+1))/T} = T/b + (2K+1)/2 - 1/6 + (2K+1)^2 b/(12 T)
      // + O((b/T)^2): the integral plus the first Euler-Maclaurin end corrections.
      term.c = (2.0 * k + 1.0) / 2.0 - 1.0 / 6.0;
      term.d = (2.0 * k + 1.0) * (2.0 * k + 1.0) * hb / 12.0;
      rotor.k_terms_.push_back(term);
    }
    return rotor;
  }
  rotor.switch_t_k_ = switch_t;
  const double energy_cut = options.level_cut_factor * switch_t;

  const bool prolate = NearlyEqual(b, c);
  const bool oblate = NearlyEqual(a, b);
  for (int j = 0; c * j * (j + 1.0) <= energy_cut; ++j) {
    const double jj = static_cast<double>(j) * (j + 1);
    const double m_degeneracy = 2.0 * j + 1.0;
    if (prolate || oblate) {
      // E = d J(J+1) + (u - d) K^2 with u the unique and d the twice-repeated constant;
      // K and -K are degenerate. A spherical top falls in here with u = d.
      const double d = prolate ? b : a;
      const double u = prolate ? a : c;
      for (int k = 0; k <= j; ++k) {
        const double energy = d * jj + (u - d) * k * k;
        if (energy > energy_cut) continue;
        rotor.levels_.push_back({energy, m_degeneracy * (k == 0 ? 1.0 : 2.0)});
      }
    } else {
      for (const double energy : AsymmetricTopLevels(j, a, b, c)) {
        if (energy <= energy_cut) rotor.levels_.push_back({energy, m_degeneracy});
      }
    }
  }
  rotor.MatchTail();
  return rotor;
}

RotorContribution RotorContribution::FromLevels(std::vector<Level> levels,
                                                const LadderTail& tail) {
  RotorContribution rotor;
  rotor.levels_ = std::move(levels);
  rotor.ln_symmetry_ = std::log(tail.symmetry_number);
  rotor.classical_exponent_ = tail.classical_exponent;
  rotor.ln_classical_prefactor_ = tail.ln_classical_prefactor;
  rotor.tail_[1] = tail.c1_k;
  rotor.switch_t_k_ = tail.switch_t_k;
  if (std::isfinite(tail.switch_t_k)) rotor.MatchTail();
  return rotor;
}

void RotorContribution::MatchTail() {
  // With y_n = c_n / T^n and the falling factorial n^(k) = n (n-1) ... (n-k+1), the series gives
  //   ln q = ln q_cl + c1/T + sum y_n,
  //   kappa_k = (k-1)! p T^k - [k = 1] c1 + (-1)^k T^k sum n^(k) y_n
  // for the cumulants kappa_1 = <E>, kappa_2 = Var, ... (derivatives of ln q in 1/T). Matching
  // ln q and kappa_1..4 of the level sum fixes y_2..y_6: a 5 x 5 linear system.
  constexpr int kMatched = kTailTerms - 1;
  const double t = switch_t_k_;
  const Cumulants sum = LevelSumCumulants(levels_, t);
  const double p = classical_exponent_;
  const double c1 = tail_[1];
  Eigen::Matrix<double, kMatched, 1> rhs;
  Eigen::Matrix<double, kMatched, kMatched> matrix;
  rhs(0) = sum.ln_q - (ln_classical_prefactor_ + p * std::log(t) + c1 / t);
  double factorial = 1.0, t_power = 1.0, sign = 1.0;  // (k-1)!, T^k, (-1)^k
  for (int k = 1; k < kMatched; ++k) {
    t_power *= t;
    sign = -sign;
    if (k > 1) factorial *= k - 1;
    const double classical = factorial * p * t_power - (k == 1 ? c1 : 0.0);
    rhs(k) = sign * (sum.kappa[static_cast<std::size_t>(k)] - classical) / t_power;
  }
  for (int k = 0; k < kMatched; ++k) {
    for (int j = 0; j < kMatched; ++j) {
      const int n = j + 2;
      double falling = 1.0;
      for (int i = 0; i < k; ++i) falling *= n - i;
      matrix(k, j) = falling;
    }
  }
  const Eigen::Matrix<double, kMatched, 1> y = matrix.fullPivLu().solve(rhs);
  double t_n = t;
  for (int j = 0; j < kMatched; ++j) {
    t_n *= t;  // T^(j+2)
    tail_[static_cast<std::size_t>(j + 2)] = y(j) * t_n;
  }
}

Moments RotorContribution::SeriesAt(double t_k) const {
  const double p = classical_exponent_;
  Moments moments;
  moments.ln_q = ln_classical_prefactor_ + p * std::log(t_k);
  moments.mean_energy_k = p * t_k;
  moments.energy_variance_k2 = p * t_k * t_k;
  double t_power = 1.0;  // T^n, built up as n grows
  for (int n = 1; n <= kTailTerms; ++n) {
    t_power *= t_k;
    const double term = tail_[static_cast<std::size_t>(n)] / t_power;  // c_n / T^n
    moments.ln_q += term;
    moments.mean_energy_k -= n * term * t_k;
    moments.energy_variance_k2 += n * (n - 1.0) * term * t_k * t_k;
  }
  return moments;
}

Moments RotorContribution::ProlateHybridAt(double t_k) const {
  // q = sum_K w_K with w_K = g_K e^{-E_K/T} S_K(T), S_K = T/b + c_K + d_K/T. With
  // u_K = T^2 d ln w_K/dT: <E> = sum p_K u_K and Var = sum p_K (u_K - <E>)^2 + sum p_K T^2 du_K/dT.
  const double t = t_k, b = hybrid_b_k_;
  double max_log_weight = -std::numeric_limits<double>::infinity();
  std::vector<double> log_weight(k_terms_.size()), u(k_terms_.size()), du(k_terms_.size());
  for (size_t i = 0; i < k_terms_.size(); ++i) {
    const KTerm& term = k_terms_[i];
    const double s = t / b + term.c + term.d / t;
    const double s1 = 1.0 / b - term.d / (t * t);  // dS/dT
    const double s2 = 2.0 * term.d / (t * t * t);  // d2S/dT2
    log_weight[i] = std::log(term.degeneracy) - term.energy_k / t + std::log(s);
    max_log_weight = std::max(max_log_weight, log_weight[i]);
    u[i] = term.energy_k + t * t * s1 / s;
    du[i] = 2.0 * t * s1 / s + t * t * (s2 / s - (s1 / s) * (s1 / s));
  }
  double sum = 0.0, sum_u = 0.0;
  std::vector<double> weight(k_terms_.size());
  for (size_t i = 0; i < k_terms_.size(); ++i) {
    weight[i] = std::exp(log_weight[i] - max_log_weight);
    sum += weight[i];
    sum_u += weight[i] * u[i];
  }
  Moments moments;
  moments.ln_q = max_log_weight + std::log(sum);
  moments.mean_energy_k = sum_u / sum;
  double variance = 0.0;
  for (size_t i = 0; i < k_terms_.size(); ++i) {
    const double deviation = u[i] - moments.mean_energy_k;
    variance += weight[i] * (deviation * deviation + t * t * du[i]);
  }
  moments.energy_variance_k2 = variance / sum;
  return moments;
}

Moments RotorContribution::At(double t_k) const {
  Moments moments = !k_terms_.empty()       ? ProlateHybridAt(t_k)
                    : t_k <= switch_t_k_ ? LevelSumMoments(levels_, t_k)
                                         : SeriesAt(t_k);
  moments.ln_q -= ln_symmetry_;
  return moments;
}

}  // namespace sevenfold

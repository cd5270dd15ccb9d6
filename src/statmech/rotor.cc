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
#include "statmech/species_thermo.h"
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
  std::vector<double> energies;
  energies.reserve(2 * j + 1);
  // One Wang block over K = first_k, first_k + 2, ..., <= J. first_scale multiplies the first
  // coupling (sqrt 2 between |0> and |2,+>); first_shift adds to the first diagonal element
  // (+-<J,1|H|J,-1> = +-(B-C)/4 J(J+1) for O+ and O-).
  const auto append_block = [&](int first_k, double first_scale, double first_shift) {
    if (first_k > j) return;
    std::vector<double> block_diagonal, block_coupling;
    for (int k = first_k; k <= j; k += 2) {
      block_diagonal.push_back(diagonal(k));
      if (k + 2 <= j) block_coupling.push_back(coupling(k));
    }
    block_diagonal.front() += first_shift;
    if (!block_coupling.empty()) block_coupling.front() *= first_scale;
    for (const double value : SymmetricTridiagonalEigenvalues(std::move(block_diagonal),
                                                              std::move(block_coupling))) {
      energies.push_back(value);
    }
  };
  const double k1_coupling = 0.25 * (b_k - c_k) * jj;
  append_block(0, std::sqrt(2.0), 0.0);  // E+: K = 0, 2, 4, ...
  append_block(2, 1.0, 0.0);             // E-: K = 2, 4, ...
  append_block(1, 1.0, k1_coupling);     // O+: K = 1, 3, ...
  append_block(1, 1.0, -k1_coupling);    // O-
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
    const double energy_cut = options.level_cut_factor * kMaxTemperatureK;
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

  // The level ladder in J is set by the smallest constant; cap it by lowering T_switch.
  double switch_t = options.switch_factor * a;
  const double max_jj = static_cast<double>(options.max_j) * (options.max_j + 1);
  switch_t = std::min(switch_t, c * max_jj / options.level_cut_factor);
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
                                                double classical_exponent,
                                                double ln_classical_prefactor, double c1_k,
                                                double switch_t_k, double symmetry_number) {
  RotorContribution rotor;
  rotor.levels_ = std::move(levels);
  rotor.ln_symmetry_ = std::log(symmetry_number);
  rotor.classical_exponent_ = classical_exponent;
  rotor.ln_classical_prefactor_ = ln_classical_prefactor;
  rotor.tail_[1] = c1_k;
  rotor.switch_t_k_ = switch_t_k;
  if (std::isfinite(switch_t_k)) rotor.MatchTail();
  return rotor;
}

void RotorContribution::MatchTail() {
  const double t = switch_t_k_;
  const Moments sum = LevelSumMoments(levels_, t);
  const double p = classical_exponent_;
  const double c1 = tail_[1];
  // Residuals of the level sum against ln q_cl + c1/T, in the dimensionless y_n = c_n / T^n.
  Eigen::Vector3d rhs;
  rhs(0) = sum.ln_q - (ln_classical_prefactor_ + p * std::log(t) + c1 / t);
  rhs(1) = -(sum.mean_energy_k - p * t + c1) / t;
  rhs(2) = (sum.energy_variance_k2 - p * t * t) / (t * t);
  Eigen::Matrix3d matrix;
  matrix << 1, 1, 1,  //
      2, 3, 4,        //
      2, 6, 12;
  const Eigen::Vector3d y = matrix.fullPivLu().solve(rhs);
  tail_[2] = y(0) * t * t;
  tail_[3] = y(1) * t * t * t;
  tail_[4] = y(2) * t * t * t * t;
}

Moments RotorContribution::SeriesAt(double t_k) const {
  const double p = classical_exponent_;
  Moments moments;
  moments.ln_q = ln_classical_prefactor_ + p * std::log(t_k);
  moments.mean_energy_k = p * t_k;
  moments.energy_variance_k2 = p * t_k * t_k;
  double t_power = 1.0;  // T^n, built up as n grows
  for (int n = 1; n <= 4; ++n) {
    t_power *= t_k;
    const double term = tail_[n] / t_power;  // c_n / T^n
    moments.ln_q += term;
    moments.mean_energy_k -= n * term * t_k;
    moments.energy_variance_k2 += n * (n - 1.0) * term * t_k * t_k;
  }
  return moments;
}

Moments RotorContribution::At(double t_k) const {
  Moments moments = t_k <= switch_t_k_ ? LevelSumMoments(levels_, t_k) : SeriesAt(t_k);
  moments.ln_q -= ln_symmetry_;
  return moments;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// One-dimensional hindered internal rotor (torsion) with a cosine-series potential: levels from
// diagonalising its Hamiltonian in a free-rotor basis.
#pragma once

#include <optional>
#include <utility>
#include <vector>

#include "statmech/level_sum.h"
#include "statmech/moments.h"
#include "statmech/rotor.h"

namespace sevenfold {

// Tunables of the torsion model (docs/theory.md, "Hindered internal rotation").
struct TorsionOptions {
  // Levels are kept up to level_cut_factor * T_top above the lowest one, T_top being the highest
  // temperature summed explicitly: a level there weighs exp(-40) ~ 4e-18 of the lowest, and
  // all levels beyond it together less than 1e-15 of q.
  double level_cut_factor = 40.0;
  // The basis is grown until every kept level changes by less than this (relative to |E| + theta).
  double convergence_tolerance = 1e-9;
  // Largest |m| of the basis. A single cosine term gives tridiagonal blocks (cheap, O(n^2));
  // several terms give dense blocks (O(n^3)). Beyond these the explicit sum stops below the top
  // temperature and the matched asymptotic tail of rotor.h takes over.
  int max_m_tridiagonal = 4000;
  int max_m_dense = 500;
  // Highest temperature summed explicitly, K: the levels kept, and the basis, grow with it (the
  // cost as its first power). Above it the matched tail of rotor.h is used. The engine's top
  // (kMaxTemperatureK) by default; a fit needs only its own highest temperature.
  double top_temperature_k = 20000.0;
};

// The contribution of one torsion: q = sum_i exp(-(E_i - E_0)/T) / n, with E_i the eigenvalues of
//   H = theta p^2 + V(phi),   p = -i d/dphi,   V(phi) = sum_k V_k / 2 (1 - cos k phi)
// (theta = B hc / k, V_k in K) in the basis e^{i m phi}, |m| <= M [PitzerGwinn1942 for the model;
// the diagonalisation is common practice]. Matrix elements: <m|H|m> = theta m^2 + sum_k V_k / 2,
// <m +- k|H|m> = -V_k / 4: real symmetric, and block diagonal in m modulo the greatest common
// divisor of the k. Levels are computed once at construction; each temperature costs only
// exponentials.
class TorsionContribution {
 public:
  // theta_k > 0; symmetry n >= 1; fourier_k: terms (k >= 1, V_k in K). Throws Error (no
  // location) when the basis does not converge within the caps of options.
  TorsionContribution(double theta_k, int symmetry,
                      const std::vector<std::pair<int, double>>& fourier_k,
                      const TorsionOptions& options = {});

  Moments At(double t_k) const { return ladder_->At(t_k); }

  // Levels in K from the lowest, each non-degenerate (a +-m pair appears twice).
  const std::vector<Level>& levels() const { return ladder_->levels(); }
  // Largest |m| of the final (converged) basis.
  int basis_max_m() const { return basis_max_m_; }
  // Above this temperature the asymptotic tail is used (infinity: explicit sum everywhere).
  double switch_temperature_k() const { return ladder_->switch_temperature_k(); }

 private:
  std::optional<RotorContribution> ladder_;
  int basis_max_m_ = 0;
};

// All eigenvalues (K, ascending, with the constant sum_k V_k / 2 included) of the torsional
// Hamiltonian above in the basis |m| <= max_m. Exposed for tests.
std::vector<double> TorsionEigenvalues(double theta_k,
                                       const std::vector<std::pair<int, double>>& fourier_k,
                                       int max_m);

}  // namespace sevenfold

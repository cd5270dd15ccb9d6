// SPDX-License-Identifier: MIT
// Rotational level sums of linear molecules split by the parity of J: plain symmetry number, or
// nuclear-spin statistics with equilibrium or frozen ("normal") ortho/para populations.
#pragma once

#include <vector>

#include "species/species.h"
#include "statmech/level_sum.h"
#include "statmech/moments.h"

namespace sevenfold {

// Levels of a linear molecule (energies in K from a common zero, degeneracy including 2J+1 and
// any electronic degeneracy) sorted by the parity of the rotational quantum number J.
struct ParityLevels {
  std::vector<Level> even;  // J = 0, 2, 4, ...
  std::vector<Level> odd;   // J = 1, 3, 5, ...
};

// Levels of a linear rotor E_J = theta J(J+1) - d J^2 (J+1)^2 (theta = B hc/k, d = D hc/k in K)
// up to energy_cut_k, and with d > 0 only below the turning point J(J+1) < theta / (2 d).
ParityLevels LinearRotorParityLevels(double theta_k, double d_k, double energy_cut_k);

// The partition function built from ParityLevels (docs/theory.md, "Nuclear-spin statistics").
//
// Without nuclear spin: q = (q_even + q_odd) / sigma, with q_p = sum_{J of parity p} g e^{-E/T}.
// With weights g_e (even J), g_o (odd J) and x_e = g_e / (g_e + g_o), x_o = g_o / (g_e + g_o):
//   equilibrium: q = x_e q_even + x_o q_odd (one species, ortho and para exchange freely)
//   normal:      a frozen mixture of an even-J and an odd-J species with mole fractions x_e, x_o:
//                ln q = x_e ln q_even + x_o ln q_odd, <E> = sum x <E>_p, Var = sum x Var_p.
// Dividing by g_e + g_o removes the nuclear-spin entropy R ln(g_e + g_o) (the "practical"
// convention), and both forms tend to q / 2 at high temperature: the sigma = 2 result.
class ParityLevelSum {
 public:
  ParityLevelSum(ParityLevels levels, double symmetry_number);
  ParityLevelSum(ParityLevels levels, const NuclearSpin& spin);

  Moments At(double t_k) const;

  // Number of levels summed per temperature.
  std::size_t num_levels() const {
    return merged_.levels.size() + even_.levels.size() + odd_.levels.size();
  }

 private:
  // Each list is stored relative to its own lowest level (so its sum cannot underflow at 10 K)
  // and the offset is restored in At().
  struct ShiftedList {
    std::vector<Level> levels;
    double lowest_k = 0.0;
  };
  static ShiftedList Shift(std::vector<Level> levels);

  ShiftedList merged_;      // symmetry-number and equilibrium forms
  ShiftedList even_, odd_;  // normal form
  bool normal_ = false;
  double x_even_ = 0.0, x_odd_ = 0.0;
  double ln_symmetry_ = 0.0;
};

}  // namespace sevenfold

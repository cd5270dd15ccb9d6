// SPDX-License-Identifier: MIT
// One row of an exact table: the value type the engine returns and the tables print.
#pragma once

namespace sevenfold {

// SI per mole; entropy at the species' standard pressure.
struct ThermoPoint {
  double t_k = 0.0;
  double cp_j_per_mol_k = 0.0;
  double s_j_per_mol_k = 0.0;
  double h_minus_h298_j_per_mol = 0.0;  // H(T) - H(298.15 K)
  double h_j_per_mol = 0.0;             // dfH(298.15 K) + H(T) - H(298.15 K)
};

}  // namespace sevenfold

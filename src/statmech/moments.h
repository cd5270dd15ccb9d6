// SPDX-License-Identifier: MIT
// The common currency of every contribution: ln q and the first two moments of the energy.
#pragma once

namespace sevenfold {

// Contribution of one independent degree of freedom (or a set of them) at one temperature.
// Energies are in kelvin (E / k) and measured from the contribution's own ground level, so
// that H - H(0) = R <E>, Cv = R Var(E) / T^2 and S = R (ln q + <E>/T) per mole.
// Independent factors of the partition function add: see operator+=.
struct Moments {
  double ln_q = 0.0;
  double mean_energy_k = 0.0;     // <E>, K
  double energy_variance_k2 = 0.0;  // <E^2> - <E>^2, K^2

  Moments& operator+=(const Moments& other) {
    ln_q += other.ln_q;
    mean_energy_k += other.mean_energy_k;
    energy_variance_k2 += other.energy_variance_k2;
    return *this;
  }
};

}  // namespace sevenfold

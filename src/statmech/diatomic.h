// SPDX-License-Identifier: MIT
// Rovibrational direct sum of a diatomic molecule over its bound levels, from Dunham-type
// constants of one or more electronic states.
#pragma once

#include <vector>

#include "species/species.h"
#include "statmech/nuclear_spin.h"

namespace sevenfold {

// What the level construction found for one electronic state (for reports and tests).
struct DiatomicStateSummary {
  int max_v = 0;            // highest bound vibrational level kept
  int max_j_at_v0 = 0;      // highest J kept in v = 0
  std::size_t num_levels = 0;
};

// Bound rovibrational levels of all states, energies in K from the ground state's v=0, J=0:
//   E(v,J) = T_s + G(v) - G(0) + B_v J(J+1) - D_e J^2 (J+1)^2
//   G(v)   = we (v+1/2) - wexe (v+1/2)^2 + weye (v+1/2)^3
//   B_v    = Be - alphae (v+1/2) + gammae (v+1/2)^2
// [HuberHerzberg1979, introduction; Herzberg1950, ch. III]. A state keeps v while
// G(v) - G(0) < D0 (its dissociation energy from its own v=0, J=0), dG/dv > 0 and B_v > 0; and J
// while G(v) - G(0) + F_v(J) < D0 and dF/dJ > 0 (J(J+1) < B_v / (2 D_e): the centrifugal turning
// point). Degeneracy g_state (2J+1). Throws Error (no location; the caller adds it) when a
// state has no bound ladder (we, Be or D0 not positive, dG/dv or B_v not positive at v = 0) or
// when the level count exceeds a sanity cap.
ParityLevels DiatomicLevels(const std::vector<DiatomicState>& states,
                            std::vector<DiatomicStateSummary>* summaries = nullptr);

}  // namespace sevenfold

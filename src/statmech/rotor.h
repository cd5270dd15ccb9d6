// SPDX-License-Identifier: MIT
// Rotational partition functions: explicit quantum sums where the temperature is not far above
// the rotational temperatures, and the classical limit with asymptotic corrections above.
#pragma once

#include <array>
#include <limits>
#include <vector>

#include "statmech/level_sum.h"
#include "statmech/moments.h"

namespace sevenfold {

// Tunables of the rotor model (docs/theory.md, "Rotation").
struct RotorOptions {
  // The explicit sum is used up to switch_factor * (largest rotational temperature); the
  // asymptotic series beyond it, with c2..c6 matched, has a relative error of order (theta/T)^7
  // there (measured: below 1e-12 in ln q, <E>/T and Var/T^2; tests/statmech_test.cc).
  double switch_factor = 12.0;
  // Levels with E / k > level_cut_factor * T_switch are dropped: their weight is below
  // exp(-40) ~ 4e-18 of the ground level at T_switch, and all of them together (a level density
  // growing as E^(1/2) for a nonlinear top) below ~1e-16 of q and ~1e-13 of Var(E) there. The
  // number of levels of an asymmetric top, and the diagonalisation cost, grow as this factor to
  // the power 1 and 1.5 (docs/performance.md).
  double level_cut_factor = 40.0;
  // Cap on J for asymmetric and symmetric tops: keeps very prolate or oblate tops affordable
  // by lowering T_switch (then the series is used from a lower temperature).
  int max_j = 400;
};

// The high-temperature side of a general level ladder (RotorContribution::FromLevels): five
// numbers that are easy to swap in a call, hence named.
struct LadderTail {
  // Classical limit q_cl = exp(ln_classical_prefactor) T^classical_exponent.
  double classical_exponent = 0.0;
  double ln_classical_prefactor = 0.0;
  // Exact first correction c1_k / T of ln q, K.
  double c1_k = 0.0;
  // Hand-over temperature, K; infinity keeps the explicit sum everywhere.
  double switch_t_k = std::numeric_limits<double>::infinity();
  double symmetry_number = 1.0;
};

// The rotational contribution of one rigid rotor (ln q includes -ln sigma).
//
// Below T_switch: q = sum over levels g exp(-E/T) / sigma.
// Above T_switch: ln q = ln q_cl(T) + c1/T + c2/T^2 + ... + c6/T^6 - ln sigma, where
//   linear:    q_cl = T / theta
//   nonlinear: q_cl = sqrt(pi T^3 / (theta_A theta_B theta_C))
// c1 is the first semiclassical correction (theta/3 for a linear rotor; for a nonlinear one
// [2(a+b+c) - (ab/c + bc/a + ca/b)] / 12 with a, b, c the rotational temperatures), and
// c2..c6 are fixed so that ln q and the first four cumulants of E (<E>, Var(E), third, fourth)
// of the two branches agree exactly at T_switch. The hand-over is therefore continuous in q, H,
// S, Cp and dCp/dT to rounding.
class RotorContribution {
 public:
  // Linear rotor with rotational constant b_cm1 and centrifugal distortion d_cm1 (>= 0):
  // E_J = hc (B J(J+1) - D J^2 (J+1)^2). With D > 0 the explicit sum is used at every
  // temperature, over J up to the turning point of E_J.
  static RotorContribution Linear(double b_cm1, double symmetry_number, double d_cm1 = 0.0,
                                  const RotorOptions& options = {});
  // Nonlinear rigid rotor with rotational constants in cm^-1 (any order). Symmetric and
  // spherical tops use their closed-form levels; asymmetric tops are diagonalised per J in the
  // symmetric-top basis.
  static RotorContribution Nonlinear(const std::array<double, 3>& abc_cm1, double symmetry_number,
                                     const RotorOptions& options = {});

  // A general level ladder with the same hand-over: levels (K, from the lowest, complete up to
  // at least level_cut_factor * tail.switch_t_k) and the classical limit, first correction,
  // hand-over and symmetry number of `tail`. Used by the hindered internal rotor (torsion.h).
  static RotorContribution FromLevels(std::vector<Level> levels, const LadderTail& tail);

  Moments At(double t_k) const;

  // Temperature at which the explicit sum hands over to the series (infinity: never).
  double switch_temperature_k() const { return switch_t_k_; }
  const std::vector<Level>& levels() const { return levels_; }

 private:
  RotorContribution() = default;
  // Fixes c2..c6 by matching the level sum's ln q and cumulants at switch_t_k_.
  void MatchTail();
  Moments SeriesAt(double t_k) const;
  Moments ProlateHybridAt(double t_k) const;

  // Near-prolate tops too elongated for the explicit sum (A/C beyond what max_j allows): K is
  // summed exactly, J semiclassically (see Nonlinear). One term per K.
  struct KTerm {
    double degeneracy = 1.0;  // 1 for K = 0, 2 otherwise
    double energy_k = 0.0;    // A K^2 + b K, K (lowest level of the K stack)
    double c = 0.0;           // Euler-Maclaurin constants of the J sum: T/b + c + d/T
    double d = 0.0;
  };
  std::vector<KTerm> k_terms_;
  double hybrid_b_k_ = 0.0;  // sqrt(B C), K

  std::vector<Level> levels_;
  double ln_symmetry_ = 0.0;
  double classical_exponent_ = 1.0;  // q_cl proportional to T^exponent
  double ln_classical_prefactor_ = 0.0;
  static constexpr int kTailTerms = 6;     // c1..c6
  std::array<double, kTailTerms + 1> tail_{};  // tail_[n] = c_n, n = 1..6, kelvin^n
  double switch_t_k_ = 0.0;
};

// Energy levels (K, from the ground) of an asymmetric rigid rotor for one J, by diagonalising
// H = A Ja^2 + B Jb^2 + C Jc^2 in the symmetric-top basis |J,K> (K along a); the even-K and
// odd-K blocks are tridiagonal [GordyCook1984, ch. 7]. Constants in kelvin. Each level has
// degeneracy 2J+1 (M), not included here.
std::vector<double> AsymmetricTopLevels(int j, double a_k, double b_k, double c_k);

}  // namespace sevenfold

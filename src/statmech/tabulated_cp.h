// SPDX-License-Identifier: MIT
// Exact curves of a species given as a table of Cp (Species::tabulated): a shape-preserving
// piecewise-cubic interpolant inside the table, integrated in closed form so that H and S stay
// the integrals of Cp, and the Wilhoit form outside it (docs/theory.md, "Tabulated species").
#pragma once

#include <vector>

#include "core/error.h"
#include "species/species.h"
#include "statmech/thermo_point.h"

namespace sevenfold {

// Wilhoit's Cp form (Wilhoit 1975, [Wilhoit1975] in docs/theory.md):
//   Cp(T) = Cp0 + (Cpinf - Cp0) y^2 (1 + (y - 1)(a0 + a1 y)),  y = T / (T + B).
// Cp -> Cp0 as T -> 0 and Cp -> Cpinf as T -> infinity.
struct WilhoitCp {
  double cp_zero = 0.0;      // J/(mol K)
  double cp_infinity = 0.0;  // J/(mol K)
  double b_k = 0.0;          // K
  double a0 = 0.0, a1 = 0.0;
  double At(double t_k) const;
};

// The Wilhoit curve with the given limits whose value and slope equal cp and dcp_dt at
// edge_t_k: B and a0 with a1 = 0 when such a curve exists (a 1-D root search), else
// B = edge_t_k and a0, a1 (a 2 x 2 linear solve, never singular for 0 < y < 1).
WilhoitCp MatchWilhoit(double cp_zero, double cp_infinity, double edge_t_k, double cp,
                       double dcp_dt);

// Wilhoit's limits from the atom count and the shape (classical equipartition, common
// practice): Cp0 = 2.5 R atom, 3.5 R linear, 4 R nonlinear; Cpinf = 2.5 R atom,
// (3N - 1.5) R linear, (3N - 2) R nonlinear. J/(mol K).
double WilhoitCpZero(Shape shape);
double WilhoitCpInfinity(Shape shape, int num_atoms);

class TabulatedCurves {
 public:
  // Builds the interpolant and the two Wilhoit extrapolations of species.tabulated (which must
  // be set). Throws Error at the row's file location when the optional H - H298 or S columns
  // disagree with the integrals of Cp (schema::kTabulatedConsistencyRelative), and at the
  // species' location when an extrapolation reaches Cp <= 0 within [kMinTemperatureK,
  // kMaxTemperatureK].
  explicit TabulatedCurves(const Species& species);

  // Cp, S, H - H298 and H (with the species' dfH) at t_k. Thread-safe.
  ThermoPoint At(double t_k) const;
  // H(298.15 K) - H(0) of the curves (the Wilhoit form reaches 0 K), J/mol.
  double H298MinusH0JPerMol() const;

  // The interpolated or extrapolated Cp at t_k, J/(mol K).
  double Cp(double t_k) const;
  // Integrals from the first row's temperature to t_k (negative below it): of Cp (J/mol) and of
  // Cp/T (J/(mol K)). Inside the table in closed form; outside by Gauss-Legendre quadrature.
  double IntegralCp(double t_k) const;
  double IntegralCpOverT(double t_k) const;

 private:
  std::vector<double> t_k_, cp_, slope_;
  std::vector<double> integral_cp_, integral_cp_over_t_;  // at each row
  WilhoitCp below_, above_;
  double formation_enthalpy_j_per_mol_ = 0.0;
  double entropy_offset_ = 0.0;       // S(t) = entropy_offset_ + IntegralCpOverT(t)
  double enthalpy_offset_ = 0.0;      // H - H298 = IntegralCp(t) - enthalpy_offset_
  double h298_minus_h0_ = 0.0;
};

}  // namespace sevenfold

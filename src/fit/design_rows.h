// SPDX-License-Identifier: MIT
// The linear maps from the seven scaled coefficients of one range to Cp/R, its derivatives, H/RT
// and S/R at a scaled temperature, and the exact back-transform to kelvin coefficients. Internal
// to fit/ (includes Eigen); docs/fitting.md, "Scaling".
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "fit/polynomial.h"
#include "fit/quality.h"
#include "core/fit_settings.h"

namespace sevenfold::detail {

// The fit runs in tau = T / kScaleTemperatureK. A power of two makes the back-transform of
// a1..a6 (multiplication by powers of 2) exact in binary floating point; only a7 = b7 - b1 ln T_s
// takes one rounding. 1024 K keeps tau^4 below ~1e3 up to 6000 K instead of T^4 ~ 1e15.
inline constexpr double kScaleTemperatureK = 1024.0;

using Row7 = Eigen::Matrix<double, 1, 7>;
using Vector14 = Eigen::Matrix<double, 14, 1>;
// A normalised row: the 7 coefficients of its range, then the right-hand side; its error is
// row.head<7>() . x_range - row[7].
using Row8 = Eigen::Matrix<double, 1, 8>;

Row7 CpRow(double tau);
Row7 DCpRow(double tau);
Row7 D2CpRow(double tau);
Row7 HRow(double tau);
Row7 SRow(double tau);

// Coefficients in T from the coefficients in tau of the range starting at `offset` (0 or 7) of
// x: a_k = b_k / T_s^(k-1) (k = 1..5), a6 = b6 T_s, a7 = b7 - b1 ln T_s.
NasaCoefficients ToKelvinCoefficients(const Vector14& x, int offset);

// Three normalised rows per grid point (Cp, H, S): (Cp_fit - Cp)/(Cp scale_cp),
// (H_fit - H)/(R T scale_h), (S_fit - S)/(R scale_s), each linear in the coefficients.
std::vector<Row8> NormalisedRows(const ExactCurves& exact, const ErrorScales& scales);

// The exact H/RT and S/R at 298.15 K that the fit is pinned to.
struct ReferenceState {
  bool pinned = false;
  double h_over_rt = 0.0;
  double s_over_r = 0.0;
};
// From the grid point at 298.15 K, or by cubic Hermite interpolation of H/R and S/R when the grid
// lacks it. Not pinned when `pin` is false or 298.15 K lies outside the grid.
ReferenceState FindReferenceState(const ExactCurves& exact, bool pin);

// The constraint matrix has 14 columns and at most 7 rows (4 or 5 continuity, 2 pinning).
inline constexpr int kMaxConstraints = 7;
// C (one row per constraint) and d, with fixed capacity: built for every mid-temperature candidate.
using ConstraintMatrix = Eigen::Matrix<double, Eigen::Dynamic, 14, 0, kMaxConstraints, 14>;
using ConstraintVector = Eigen::Matrix<double, Eigen::Dynamic, 1, 0, kMaxConstraints, 1>;

// Equality constraints C x = d at t_mid_k on the 14 scaled coefficients (low range first): Cp,
// dCp/dT, H and S continuous (and d2Cp/dT2 when `second_derivative`), then H and S of the range
// holding 298.15 K equal to `reference` when pinned. Rows scaled to unit length.
void BuildConstraints(double t_mid_k, bool second_derivative, const ReferenceState& reference,
                      ConstraintMatrix& c, ConstraintVector& d);

}  // namespace sevenfold::detail

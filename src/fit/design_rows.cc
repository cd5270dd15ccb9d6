// SPDX-License-Identifier: MIT
// Design rows of the NASA 7-coefficient form in the scaled temperature; docs/fitting.md.
#include "fit/design_rows.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <vector>

#include "core/constants.h"
#include "core/error.h"

namespace sevenfold::detail {
namespace {
// A grid temperature within this distance of 298.15 K is taken as 298.15 K itself.
constexpr double kReferenceMatchK = 1e-9;
}  // namespace

Row7 CpRow(double tau) {
  Row7 row;
  row << 1.0, tau, tau * tau, tau * tau * tau, tau * tau * tau * tau, 0.0, 0.0;
  return row;
}
Row7 DCpRow(double tau) {
  Row7 row;
  row << 0.0, 1.0, 2.0 * tau, 3.0 * tau * tau, 4.0 * tau * tau * tau, 0.0, 0.0;
  return row;
}
Row7 D2CpRow(double tau) {
  Row7 row;
  row << 0.0, 0.0, 2.0, 6.0 * tau, 12.0 * tau * tau, 0.0, 0.0;
  return row;
}
Row7 HRow(double tau) {
  Row7 row;
  row << 1.0, tau / 2.0, tau * tau / 3.0, tau * tau * tau / 4.0, tau * tau * tau * tau / 5.0,
      1.0 / tau, 0.0;
  return row;
}
Row7 SRow(double tau) {
  Row7 row;
  row << std::log(tau), tau, tau * tau / 2.0, tau * tau * tau / 3.0, tau * tau * tau * tau / 4.0,
      0.0, 1.0;
  return row;
}

NasaCoefficients ToKelvinCoefficients(const Vector14& x, int offset) {
  NasaCoefficients a;
  double scale = 1.0;
  for (int k = 0; k < 5; ++k) {
    a[k] = x[offset + k] / scale;
    scale *= kScaleTemperatureK;
  }
  a[5] = x[offset + 5] * kScaleTemperatureK;
  a[6] = x[offset + 6] - x[offset] * std::log(kScaleTemperatureK);
  return a;
}

std::vector<Row8> NormalisedRows(const ExactCurves& exact, const ErrorScales& scales) {
  const std::size_t n = exact.t_k.size();
  std::vector<Row8> rows(3 * n);
  for (std::size_t i = 0; i < n; ++i) {
    const double tau = exact.t_k[i] / kScaleTemperatureK;
    const double cp_weight = 1.0 / (scales.cp_relative * exact.cp_over_r[i]);
    rows[3 * i] << CpRow(tau) * cp_weight, exact.cp_over_r[i] * cp_weight;
    rows[3 * i + 1] << HRow(tau) / scales.h_over_rt, exact.h_over_rt[i] / scales.h_over_rt;
    rows[3 * i + 2] << SRow(tau) / scales.s_over_r, exact.s_over_r[i] / scales.s_over_r;
  }
  return rows;
}

ReferenceState FindReferenceState(const ExactCurves& exact, bool pin) {
  constexpr double kT = constants::kReferenceTemperature;
  const std::vector<double>& t = exact.t_k;
  ReferenceState state;
  if (!pin || kT < t.front() - kReferenceMatchK || kT > t.back() + kReferenceMatchK) return state;
  state.pinned = true;
  const std::size_t i = static_cast<std::size_t>(
      std::lower_bound(t.begin(), t.end(), kT - kReferenceMatchK) - t.begin());
  if (i < t.size() && std::fabs(t[i] - kT) <= kReferenceMatchK) {
    state.h_over_rt = exact.h_over_rt[i];
    state.s_over_r = exact.s_over_r[i];
    return state;
  }
  // 298.15 K is not a grid point (FitGrid always includes it; other grids may not): cubic Hermite
  // interpolation of H/R and S/R, whose temperature derivatives Cp/R and Cp/(R T) are known
  // exactly at the neighbouring points.
  SEVENFOLD_ASSERT(i > 0 && i < t.size());
  const double t0 = t[i - 1], t1 = t[i], width = t1 - t0;
  const double u = (kT - t0) / width;
  const double h00 = (1.0 + 2.0 * u) * (1.0 - u) * (1.0 - u), h10 = u * (1.0 - u) * (1.0 - u);
  const double h01 = u * u * (3.0 - 2.0 * u), h11 = u * u * (u - 1.0);
  auto hermite = [&](double y0, double y1, double dy0, double dy1) {
    return h00 * y0 + h10 * width * dy0 + h01 * y1 + h11 * width * dy1;
  };
  const double cp0 = exact.cp_over_r[i - 1], cp1 = exact.cp_over_r[i];
  state.h_over_rt =
      hermite(exact.h_over_rt[i - 1] * t0, exact.h_over_rt[i] * t1, cp0, cp1) / kT;
  state.s_over_r = hermite(exact.s_over_r[i - 1], exact.s_over_r[i], cp0 / t0, cp1 / t1);
  return state;
}


void BuildConstraints(double t_mid_k, bool second_derivative, const ReferenceState& reference,
                      ConstraintMatrix& c, ConstraintVector& d) {
  const double tau_mid = t_mid_k / kScaleTemperatureK;
  const std::array<Row7, 5> continuity = {CpRow(tau_mid), DCpRow(tau_mid), HRow(tau_mid),
                                          SRow(tau_mid), D2CpRow(tau_mid)};
  const Eigen::Index num_continuity = second_derivative ? 5 : 4;
  const Eigen::Index num_constraints = num_continuity + (reference.pinned ? 2 : 0);
  c.setZero(num_constraints, 14);
  d.setZero(num_constraints);
  Eigen::Index k = 0;
  for (; k < num_continuity; ++k) {
    c.block<1, 7>(k, 0) = continuity[static_cast<std::size_t>(k)];
    c.block<1, 7>(k, 7) = -continuity[static_cast<std::size_t>(k)];
  }
  if (reference.pinned) {
    const double tau_ref = constants::kReferenceTemperature / kScaleTemperatureK;
    const Eigen::Index offset = constants::kReferenceTemperature < t_mid_k ? 0 : 7;
    c.block<1, 7>(k, offset) = HRow(tau_ref);
    d[k++] = reference.h_over_rt;
    c.block<1, 7>(k, offset) = SRow(tau_ref);
    d[k++] = reference.s_over_r;
  }
  // Rows of unit length: the same constraints, better balanced for the factorisation.
  for (Eigen::Index r = 0; r < num_constraints; ++r) {
    const double norm = c.row(r).norm();
    c.row(r) /= norm;
    d[r] /= norm;
  }
}

}  // namespace sevenfold::detail

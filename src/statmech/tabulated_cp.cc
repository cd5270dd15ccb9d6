// SPDX-License-Identifier: MIT
#include "statmech/tabulated_cp.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstddef>
#include <functional>
#include <optional>

#include <fmt/format.h>

#include "core/constants.h"
#include "species/species_schema.h"

namespace sevenfold {
namespace {

using constants::kGasConstant;
using constants::kReferenceTemperature;

// 8-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz & Stegun 1964, Table 25.4,
// from memory; they integrate polynomials of degree 15 exactly, and tests/statmech_test.cc
// checks that).
constexpr std::array<double, 4> kGaussNodes = {0.1834346424956498, 0.5255324099163290,
                                               0.7966664774136267, 0.9602898564975363};
constexpr std::array<double, 4> kGaussWeights = {0.3626837833783620, 0.3137066458778873,
                                                 0.2223810344533745, 0.1012285362903763};
// Pieces per unit of ln(T): the Wilhoit form varies on the scale of T itself, so pieces whose
// ends differ by a factor e^(1/8) leave a quadrature error near rounding.
constexpr double kPiecesPerLogUnit = 8.0;
// Temperatures at which an extrapolation is checked for Cp > 0, per side.
constexpr int kExtrapolationChecks = 400;

double GaussOn(const std::function<double(double)>& f, double a, double b) {
  const double mid = 0.5 * (a + b), half = 0.5 * (b - a);
  double sum = 0.0;
  for (std::size_t i = 0; i < kGaussNodes.size(); ++i) {
    sum += kGaussWeights[i] * (f(mid - half * kGaussNodes[i]) + f(mid + half * kGaussNodes[i]));
  }
  return half * sum;
}

// Integral of f from a to b (both > 0) on geometric pieces.
double Integrate(const std::function<double(double)>& f, double a, double b) {
  if (a == b) return 0.0;
  if (a > b) return -Integrate(f, b, a);
  const int pieces = 1 + static_cast<int>(std::ceil(kPiecesPerLogUnit * std::log(b / a)));
  const double ratio = std::pow(b / a, 1.0 / pieces);
  double sum = 0.0, lo = a;
  for (int i = 0; i < pieces; ++i) {
    const double hi = i + 1 == pieces ? b : lo * ratio;
    sum += GaussOn(f, lo, hi);
    lo = hi;
  }
  return sum;
}

int Sign(double x) { return (x > 0.0) - (x < 0.0); }

// Fritsch-Carlson slopes of a monotone-preserving cubic Hermite interpolant, with the
// three-point end formula (Fritsch & Carlson 1980 [FritschCarlson1980]; the end rule as in
// Moler, Numerical Computing with MATLAB, 2004, section 3.4, from memory).
std::vector<double> ShapePreservingSlopes(const std::vector<double>& x, const std::vector<double>& y) {
  const std::size_t n = x.size();
  std::vector<double> h(n - 1), delta(n - 1), d(n, 0.0);
  for (std::size_t k = 0; k + 1 < n; ++k) {
    h[k] = x[k + 1] - x[k];
    delta[k] = (y[k + 1] - y[k]) / h[k];
  }
  for (std::size_t k = 1; k + 1 < n; ++k) {
    if (Sign(delta[k - 1]) * Sign(delta[k]) > 0) {
      const double w1 = 2.0 * h[k] + h[k - 1], w2 = h[k] + 2.0 * h[k - 1];
      d[k] = (w1 + w2) / (w1 / delta[k - 1] + w2 / delta[k]);
    }
  }
  const auto end = [](double h0, double h1, double del0, double del1) {
    double slope = ((2.0 * h0 + h1) * del0 - h0 * del1) / (h0 + h1);
    if (Sign(slope) != Sign(del0)) {
      slope = 0.0;
    } else if (Sign(del0) != Sign(del1) && std::fabs(slope) > std::fabs(3.0 * del0)) {
      slope = 3.0 * del0;
    }
    return slope;
  };
  d[0] = end(h[0], h[1], delta[0], delta[1]);
  d[n - 1] = end(h[n - 2], h[n - 3], delta[n - 2], delta[n - 3]);
  return d;
}

// Coefficients of the cubic on row k's segment in s = T - t_k: c0 + c1 s + c2 s^2 + c3 s^3.
std::array<double, 4> Segment(const std::vector<double>& t, const std::vector<double>& cp,
                              const std::vector<double>& d, std::size_t k) {
  const double h = t[k + 1] - t[k];
  const double delta = (cp[k + 1] - cp[k]) / h;
  return {cp[k], d[k], (3.0 * delta - 2.0 * d[k] - d[k + 1]) / h,
          (d[k] + d[k + 1] - 2.0 * delta) / (h * h)};
}

// Closed-form integrals over [t_k, t_k + s] of the segment's cubic p and of p / T.
double SegmentIntegralCp(const std::array<double, 4>& c, double s) {
  return s * (c[0] + s * (c[1] / 2.0 + s * (c[2] / 3.0 + s * c[3] / 4.0)));
}
double SegmentIntegralCpOverT(const std::array<double, 4>& c, double t_start, double s) {
  // p(s) = (s + a) q(s) + r with a = t_start: then p / T integrates to q's integral plus
  // r ln(1 + s / a).
  const double a = t_start;
  const double q2 = c[3], q1 = c[2] - a * q2, q0 = c[1] - a * q1, r = c[0] - a * q0;
  return s * (q0 + s * (q1 / 2.0 + s * q2 / 3.0)) + r * std::log1p(s / a);
}

}  // namespace

double WilhoitCp::At(double t_k) const {
  const double y = t_k / (t_k + b_k);
  return cp_zero + (cp_infinity - cp_zero) * y * y * (1.0 + (y - 1.0) * (a0 + a1 * y));
}

WilhoitCp MatchWilhoit(double cp_zero, double cp_infinity, double edge_t_k, double cp,
                       double dcp_dt) {
  WilhoitCp w;
  w.cp_zero = cp_zero;
  w.cp_infinity = cp_infinity;
  const double span = cp_infinity - cp_zero;
  const double g = (cp - cp_zero) / span;
  const double gp = dcp_dt / span;
  // With a1 = 0, the value fixes a0 for each y = T/(T + B) at the edge, and the slope
  // dg/dT = y (2 + a0 (3 y - 2)) y (1 - y) / T then fixes y: a root of `residual` in (0, 1).
  // Of several roots the largest y (smallest B) is taken, whose curve reaches its limit soonest
  // and so wanders least; without a root, B = edge_t_k and a1 takes the slope (a 2 x 2 solve).
  const auto a0_of = [&](double y) { return (g / (y * y) - 1.0) / (y - 1.0); };
  const auto residual = [&](double y) {
    return y * (2.0 + a0_of(y) * (3.0 * y - 2.0)) * y * (1.0 - y) / edge_t_k - gp;
  };
  constexpr int kScan = 2000;       // grid of y on which sign changes are looked for
  constexpr int kBisections = 80;   // halvings of the bracket: to rounding
  std::optional<double> root;
  double y_hi = 1.0 - 0.5 / kScan, r_hi = residual(y_hi);
  for (int i = kScan - 1; i >= 1 && !root; --i) {
    const double y_lo = (i - 0.5) / kScan, r_lo = residual(y_lo);
    if (std::isfinite(r_lo) && std::isfinite(r_hi) && (r_lo <= 0.0) != (r_hi <= 0.0)) {
      double lo = y_lo, hi = y_hi;
      for (int k = 0; k < kBisections; ++k) {
        const double mid = 0.5 * (lo + hi);
        ((residual(mid) <= 0.0) == (r_lo <= 0.0) ? lo : hi) = mid;
      }
      root = 0.5 * (lo + hi);
    }
    y_hi = y_lo;
    r_hi = r_lo;
  }
  if (root) {
    w.b_k = edge_t_k * (1.0 - *root) / *root;
    w.a0 = a0_of(*root);
    w.a1 = 0.0;
    return w;
  }
  w.b_k = edge_t_k;
  const double y = 0.5;
  const double dy_dt = w.b_k / ((edge_t_k + w.b_k) * (edge_t_k + w.b_k));
  // g(y) = y^2 + a0 y^2 (y - 1) + a1 y^3 (y - 1) must equal g, and dg/dy equal gp / (dy/dT).
  const double m00 = y * y * (y - 1.0), m01 = y * y * y * (y - 1.0);
  const double m10 = 3.0 * y * y - 2.0 * y, m11 = 4.0 * y * y * y - 3.0 * y * y;
  const double r0 = g - y * y, r1 = gp / dy_dt - 2.0 * y;
  const double det = m00 * m11 - m01 * m10;  // y^4 (y - 1)^2 > 0
  w.a0 = (r0 * m11 - m01 * r1) / det;
  w.a1 = (m00 * r1 - m10 * r0) / det;
  return w;
}

double WilhoitCpZero(Shape shape) {
  switch (shape) {
    case Shape::kAtom:
      return 2.5 * kGasConstant;
    case Shape::kLinear:
      return 3.5 * kGasConstant;
    case Shape::kNonlinear:
      return 4.0 * kGasConstant;
  }
  return 0.0;
}

double WilhoitCpInfinity(Shape shape, int num_atoms) {
  switch (shape) {
    case Shape::kAtom:
      return 2.5 * kGasConstant;
    case Shape::kLinear:
      return (3.0 * num_atoms - 1.5) * kGasConstant;
    case Shape::kNonlinear:
      return (3.0 * num_atoms - 2.0) * kGasConstant;
  }
  return 0.0;
}

TabulatedCurves::TabulatedCurves(const Species& species) {
  SEVENFOLD_ASSERT(species.tabulated.has_value());
  const TabulatedCp& table = *species.tabulated;
  const auto fail = [&](const SourceLocation& where, const std::string& message) {
    throw Error(where, fmt::format("species '{}': {}", species.name, message));
  };
  t_k_ = table.t_k;
  cp_ = table.cp_j_per_mol_k;
  const std::size_t n = t_k_.size();
  SEVENFOLD_ASSERT(n >= schema::kMinTabulatedPoints && cp_.size() == n);
  formation_enthalpy_j_per_mol_ = species.formation_enthalpy_j_per_mol;
  slope_ = ShapePreservingSlopes(t_k_, cp_);
  integral_cp_.assign(n, 0.0);
  integral_cp_over_t_.assign(n, 0.0);
  for (std::size_t k = 0; k + 1 < n; ++k) {
    const auto c = Segment(t_k_, cp_, slope_, k);
    const double s = t_k_[k + 1] - t_k_[k];
    integral_cp_[k + 1] = integral_cp_[k] + SegmentIntegralCp(c, s);
    integral_cp_over_t_[k + 1] = integral_cp_over_t_[k] + SegmentIntegralCpOverT(c, t_k_[k], s);
  }

  const double cp_zero = table.cp_zero_j_per_mol_k.value_or(WilhoitCpZero(species.shape));
  const double cp_infinity =
      table.cp_infinity_j_per_mol_k.value_or(WilhoitCpInfinity(species.shape, species.NumAtoms()));
  if (!(cp_zero < cp_infinity)) {
    fail(species.location,
         fmt::format("tabulated-cp: Wilhoit limits cp-zero {} and cp-infinity {} J/(mol K); "
                     "expected cp-zero below cp-infinity (give both for an atom)",
                     cp_zero, cp_infinity));
  }
  below_ = MatchWilhoit(cp_zero, cp_infinity, t_k_.front(), cp_.front(), slope_.front());
  above_ = MatchWilhoit(cp_zero, cp_infinity, t_k_.back(), cp_.back(), slope_.back());
  // A Wilhoit curve matched to a steep or falling edge can dip below zero: refuse it rather
  // than fit a negative Cp.
  const auto check_side = [&](const WilhoitCp& w, double from_k, double to_k, const char* side) {
    if (!(from_k < to_k)) return;
    for (int i = 0; i <= kExtrapolationChecks; ++i) {
      const double t = from_k * std::pow(to_k / from_k, static_cast<double>(i) / kExtrapolationChecks);
      if (!(w.At(t) > 0.0)) {
        fail(species.location,
             fmt::format("tabulated-cp: the Wilhoit extrapolation {} the table reaches Cp = {} "
                         "J/(mol K) at {} K; expected Cp > 0 (add rows toward that end, or give "
                         "cp-zero and cp-infinity)",
                         side, w.At(t), t));
      }
    }
  };
  check_side(below_, constants::kMinTemperatureK, t_k_.front(), "below");
  check_side(above_, t_k_.back(), constants::kMaxTemperatureK, "above");

  entropy_offset_ = table.entropy_j_per_mol_k - IntegralCpOverT(table.entropy_t_k);
  enthalpy_offset_ = IntegralCp(kReferenceTemperature);
  // From 0 K: the Wilhoit form is finite there (Cp -> cp_zero); the piece [0, 1 K] by one
  // Gauss rule, the rest on geometric pieces.
  const auto cp_below = [this](double t) { return below_.At(t); };
  const double first = t_k_.front();
  h298_minus_h0_ = (first > 1.0 ? GaussOn(cp_below, 0.0, 1.0) + Integrate(cp_below, 1.0, first)
                                : GaussOn(cp_below, 0.0, first)) +
                   IntegralCp(kReferenceTemperature);

  // The optional columns must be the integrals of this Cp.
  for (std::size_t i = 0; i < table.h_minus_h298_j_per_mol.size(); ++i) {
    const SourceLocation& where =
        i < table.row_locations.size() ? table.row_locations[i] : species.location;
    const double h = IntegralCp(t_k_[i]) - enthalpy_offset_;
    const double h_given = table.h_minus_h298_j_per_mol[i];
    const double h_tolerance = schema::kTabulatedConsistencyRelative * std::fabs(h) +
                               schema::kTabulatedEnthalpyRoundingJPerMol;
    if (std::fabs(h_given - h) > h_tolerance) {
      fail(where, fmt::format("tabulated-cp.points[{}]: H-H298 {:.3f} kJ/mol at {} K, but the "
                              "integral of the table's Cp gives {:.3f} kJ/mol; expected them to "
                              "agree within {:.3f} kJ/mol",
                              i, h_given * 1e-3, t_k_[i], h * 1e-3, h_tolerance * 1e-3));
    }
    const double s = entropy_offset_ + integral_cp_over_t_[i];
    const double s_given = table.s_j_per_mol_k[i];
    const double s_tolerance = schema::kTabulatedConsistencyRelative * std::fabs(integral_cp_over_t_[i]) +
                               schema::kTabulatedEntropyRoundingJPerMolK;
    if (std::fabs(s_given - s) > s_tolerance) {
      fail(where, fmt::format("tabulated-cp.points[{}]: S {:.3f} J/(mol K) at {} K, but the "
                              "first row's S plus the integral of Cp/T gives {:.3f} J/(mol K); "
                              "expected them to agree within {:.3f} J/(mol K)",
                              i, s_given, t_k_[i], s, s_tolerance));
    }
  }
}

double TabulatedCurves::Cp(double t_k) const {
  if (t_k < t_k_.front()) return below_.At(t_k);
  if (t_k > t_k_.back()) return above_.At(t_k);
  const std::size_t k = std::min<std::size_t>(
      static_cast<std::size_t>(std::upper_bound(t_k_.begin(), t_k_.end(), t_k) - t_k_.begin()) - 1,
      t_k_.size() - 2);
  const auto c = Segment(t_k_, cp_, slope_, k);
  const double s = t_k - t_k_[k];
  return c[0] + s * (c[1] + s * (c[2] + s * c[3]));
}

double TabulatedCurves::IntegralCp(double t_k) const {
  if (t_k < t_k_.front()) {
    return -Integrate([this](double t) { return below_.At(t); }, t_k, t_k_.front());
  }
  if (t_k > t_k_.back()) {
    return integral_cp_.back() +
           Integrate([this](double t) { return above_.At(t); }, t_k_.back(), t_k);
  }
  const std::size_t k = std::min<std::size_t>(
      static_cast<std::size_t>(std::upper_bound(t_k_.begin(), t_k_.end(), t_k) - t_k_.begin()) - 1,
      t_k_.size() - 2);
  return integral_cp_[k] + SegmentIntegralCp(Segment(t_k_, cp_, slope_, k), t_k - t_k_[k]);
}

double TabulatedCurves::IntegralCpOverT(double t_k) const {
  if (t_k < t_k_.front()) {
    return -Integrate([this](double t) { return below_.At(t) / t; }, t_k, t_k_.front());
  }
  if (t_k > t_k_.back()) {
    return integral_cp_over_t_.back() +
           Integrate([this](double t) { return above_.At(t) / t; }, t_k_.back(), t_k);
  }
  const std::size_t k = std::min<std::size_t>(
      static_cast<std::size_t>(std::upper_bound(t_k_.begin(), t_k_.end(), t_k) - t_k_.begin()) - 1,
      t_k_.size() - 2);
  return integral_cp_over_t_[k] +
         SegmentIntegralCpOverT(Segment(t_k_, cp_, slope_, k), t_k_[k], t_k - t_k_[k]);
}

ThermoPoint TabulatedCurves::At(double t_k) const {
  ThermoPoint point;
  point.t_k = t_k;
  point.cp_j_per_mol_k = Cp(t_k);
  point.s_j_per_mol_k = entropy_offset_ + IntegralCpOverT(t_k);
  point.h_minus_h298_j_per_mol = IntegralCp(t_k) - enthalpy_offset_;
  point.h_j_per_mol = formation_enthalpy_j_per_mol_ + point.h_minus_h298_j_per_mol;
  return point;
}

double TabulatedCurves::H298MinusH0JPerMol() const { return h298_minus_h0_; }

}  // namespace sevenfold

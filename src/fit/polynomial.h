// SPDX-License-Identifier: MIT
// The two-range NASA 7-coefficient polynomial (McBride, Gordon & Reno, NASA TM-4513, 1993)
// as a value type, with evaluation of Cp, H, S and G. No solver here: entries and report
// include this header alone.
#pragma once

#include <array>

namespace sevenfold {

// One range: Cp/R = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4
//            H/RT = a1 + a2 T/2 + a3 T^2/3 + a4 T^3/4 + a5 T^4/5 + a6/T
//            S/R  = a1 ln T + a2 T + a3 T^2/2 + a4 T^3/3 + a5 T^4/4 + a7
using NasaCoefficients = std::array<double, 7>;

struct TwoRangePolynomial {
  double t_low_k = 0.0;
  double t_mid_k = 0.0;
  double t_high_k = 0.0;
  NasaCoefficients low{};   // valid on [t_low_k, t_mid_k]
  NasaCoefficients high{};  // valid on [t_mid_k, t_high_k]

  // The range used at t_k: low below t_mid_k, high at and above it (also when extrapolating).
  const NasaCoefficients& RangeAt(double t_k) const { return t_k < t_mid_k ? low : high; }
};

// Dimensionless functions of one range at t_k (kelvin).
double CpOverR(const NasaCoefficients& a, double t_k);
double HOverRT(const NasaCoefficients& a, double t_k);
double SOverR(const NasaCoefficients& a, double t_k);
// G/RT = H/RT - S/R.
double GOverRT(const NasaCoefficients& a, double t_k);
// d(Cp/R)/dT and d2(Cp/R)/dT2, 1/K and 1/K^2.
double DCpOverRDT(const NasaCoefficients& a, double t_k);
double D2CpOverRDT2(const NasaCoefficients& a, double t_k);

// The same on the two-range polynomial, choosing the range with RangeAt.
inline double CpOverR(const TwoRangePolynomial& p, double t_k) { return CpOverR(p.RangeAt(t_k), t_k); }
inline double HOverRT(const TwoRangePolynomial& p, double t_k) { return HOverRT(p.RangeAt(t_k), t_k); }
inline double SOverR(const TwoRangePolynomial& p, double t_k) { return SOverR(p.RangeAt(t_k), t_k); }
inline double GOverRT(const TwoRangePolynomial& p, double t_k) { return GOverRT(p.RangeAt(t_k), t_k); }

}  // namespace sevenfold

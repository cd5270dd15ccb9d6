// SPDX-License-Identifier: MIT
// Evaluation of the NASA 7-coefficient polynomial (McBride, Gordon & Reno, NASA TM-4513, 1993).
#include "fit/polynomial.h"

#include <cmath>

namespace sevenfold {

// Horner's scheme throughout: fewer roundings than summing powers, and the same bits every time.

double CpOverR(const NasaCoefficients& a, double t_k) {
  return a[0] + t_k * (a[1] + t_k * (a[2] + t_k * (a[3] + t_k * a[4])));
}

double HOverRT(const NasaCoefficients& a, double t_k) {
  return a[0] + t_k * (a[1] / 2.0 + t_k * (a[2] / 3.0 + t_k * (a[3] / 4.0 + t_k * (a[4] / 5.0)))) +
         a[5] / t_k;
}

double SOverR(const NasaCoefficients& a, double t_k) {
  return a[0] * std::log(t_k) + t_k * (a[1] + t_k * (a[2] / 2.0 + t_k * (a[3] / 3.0 + t_k * (a[4] / 4.0)))) +
         a[6];
}

double GOverRT(const NasaCoefficients& a, double t_k) { return HOverRT(a, t_k) - SOverR(a, t_k); }

double DCpOverRDT(const NasaCoefficients& a, double t_k) {
  return a[1] + t_k * (2.0 * a[2] + t_k * (3.0 * a[3] + t_k * (4.0 * a[4])));
}

double D2CpOverRDT2(const NasaCoefficients& a, double t_k) {
  return 2.0 * a[2] + t_k * (6.0 * a[3] + t_k * (12.0 * a[4]));
}

}  // namespace sevenfold

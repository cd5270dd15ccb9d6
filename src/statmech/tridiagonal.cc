// SPDX-License-Identifier: MIT
#include "statmech/tridiagonal.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/error.h"

namespace sevenfold {
namespace {

// Iterations allowed per eigenvalue; QL with these shifts converges cubically, typically in 1-3.
constexpr int kMaxIterationsPerEigenvalue = 60;

}  // namespace

std::vector<double> SymmetricTridiagonalEigenvalues(std::vector<double> diagonal,
                                                    std::vector<double> off_diagonal) {
  const int n = static_cast<int>(diagonal.size());
  if (n <= 1) return diagonal;
  off_diagonal.resize(n);
  SymmetricTridiagonalEigenvaluesInPlace(diagonal.data(), off_diagonal.data(), n);
  return diagonal;
}

void SymmetricTridiagonalEigenvaluesInPlace(double* d, double* e, int n) {
  if (n <= 1) return;
  e[n - 1] = 0.0;
  double scale = 0.0;
  for (int i = 0; i < n; ++i) scale = std::max({scale, std::fabs(d[i]), std::fabs(e[i])});
  if (scale == 0.0) return;
  for (int i = 0; i < n; ++i) {
    d[i] /= scale;
    e[i] /= scale;
  }
  constexpr double kEps = std::numeric_limits<double>::epsilon();
  for (int l = 0; l < n; ++l) {
    int iterations = 0;
    for (;;) {
      // Find a negligible off-diagonal element: the block l..m is then unreduced.
      int m = l;
      for (; m < n - 1; ++m) {
        if (std::fabs(e[m]) <= kEps * (std::fabs(d[m]) + std::fabs(d[m + 1]))) break;
      }
      if (m == l) break;
      SEVENFOLD_ASSERT(++iterations <= kMaxIterationsPerEigenvalue);
      // Shift from the leading 2x2 block's eigenvalue closer to d[l].
      double g = (d[l + 1] - d[l]) / (2.0 * e[l]);
      double r = std::sqrt(g * g + 1.0);
      g = d[m] - d[l] + e[l] / (g + std::copysign(r, g));
      double s = 1.0, c = 1.0, p = 0.0;
      int i = m - 1;
      bool underflow = false;
      for (; i >= l; --i) {
        const double f = s * e[i], b = c * e[i];
        r = std::sqrt(f * f + g * g);
        e[i + 1] = r;
        if (r == 0.0) {  // the rotation is undefined: deflate and restart the sweep
          d[i + 1] -= p;
          e[m] = 0.0;
          underflow = true;
          break;
        }
        s = f / r;
        c = g / r;
        g = d[i + 1] - p;
        r = (d[i] - g) * s + 2.0 * c * b;
        p = s * r;
        d[i + 1] = g + p;
        g = c * r - b;
      }
      if (underflow) continue;
      d[l] -= p;
      e[l] = g;
      e[m] = 0.0;
    }
  }
  for (int i = 0; i < n; ++i) d[i] *= scale;
  std::sort(d, d + n);
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Eigenvalues of a real symmetric tridiagonal matrix, for the rotor and torsion level ladders.
#pragma once

#include <vector>

namespace sevenfold {

// All eigenvalues, ascending, of the symmetric tridiagonal matrix with diagonal `diagonal`
// (n entries) and off-diagonal `off_diagonal` (n - 1 entries; more are ignored). Implicit QL with
// Wilkinson-type shifts and no eigenvectors (Bowdler, Martin, Reinsch & Wilkinson, Numer. Math.
// 11 (1968) 293, procedure tql1, from memory); the matrix is
// scaled to [-1, 1] first (exact in binary). Costs ~10 n^2 flops, a few times less than a general
// symmetric eigensolver's tridiagonal stage with its bookkeeping. The eigenvalues agree with any
// backward-stable solver's to a few eps times the largest |entry| (tested in statmech_test.cc).
// Aborts (SEVENFOLD_ASSERT) if an eigenvalue needs more than 60 iterations, which does not happen
// for finite input.
std::vector<double> SymmetricTridiagonalEigenvalues(std::vector<double> diagonal,
                                                    std::vector<double> off_diagonal);

// The same in place, without allocation: d[0..n) holds the diagonal on entry and the eigenvalues,
// ascending, on return; e[0..n) holds the off-diagonal in e[0..n-1) on entry (e[n-1] is
// scratch) and is overwritten. For the many small blocks of an asymmetric top (rotor.cc).
void SymmetricTridiagonalEigenvaluesInPlace(double* d, double* e, int n);

}  // namespace sevenfold

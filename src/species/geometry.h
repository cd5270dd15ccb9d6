// SPDX-License-Identifier: MIT
// Rigid-body analysis of a Cartesian geometry: principal moments of inertia, shape and rotational
// constants.
#pragma once

#include <array>
#include <vector>

#include "species/species.h"

namespace sevenfold {

// A principal moment below this fraction of the largest one counts as zero, which makes the
// geometry linear. Coordinates written to ~1e-4 angstrom on bonds of ~1 angstrom keep truly bent
// molecules many orders above it, while exactly collinear input gives ~1e-16.
inline constexpr double kLinearMomentRelativeTolerance = 1.0e-6;

struct RigidRotor {
  Shape shape = Shape::kAtom;
  // Principal moments about the centre of mass, ascending, amu angstrom^2.
  std::array<double, 3> moments_amu_angstrom2{};
  // Atom: empty. Linear: {B} from the largest moment. Nonlinear: {A, B, C}, A >= B >= C. cm^-1.
  std::vector<double> rotational_constants_cm1;
};

// Principal moments (Eigen SelfAdjointEigenSolver on the inertia tensor about the centre of mass,
// masses from AtomicWeightGPerMol: standard atomic weights, isotopic masses for D and T), the shape
// (1 atom: atom; smallest moment <= kLinearMomentRelativeTolerance * largest: linear; else
// nonlinear), and B = constants::kRotationalConstantTimesInertia / I.
// Throws Error for an empty list, an unknown element or a non-finite coordinate.
RigidRotor AnalyzeGeometry(const std::vector<GeometryAtom>& atoms);

}  // namespace sevenfold

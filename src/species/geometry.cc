// SPDX-License-Identifier: MIT
#include "species/geometry.h"

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <optional>
#include <string>

#include "core/constants.h"
#include "core/elements.h"

namespace sevenfold {

RigidRotor AnalyzeGeometry(const std::vector<GeometryAtom>& atoms) {
  if (atoms.empty()) throw Error("structure: no atoms; expected at least one atom");
  std::vector<double> masses;
  std::vector<Eigen::Vector3d> positions;
  double total_mass = 0.0;
  Eigen::Vector3d centre = Eigen::Vector3d::Zero();
  for (std::size_t i = 0; i < atoms.size(); ++i) {
    const GeometryAtom& atom = atoms[i];
    const std::optional<double> mass = AtomicWeightGPerMol(atom.element);
    if (!mass) {
      throw Error("geometry[" + std::to_string(i) + "]: unknown element '" + atom.element +
                  "'; expected an element symbol such as C, O or D");
    }
    const Eigen::Vector3d position(atom.x_angstrom, atom.y_angstrom, atom.z_angstrom);
    if (!position.allFinite()) {
      throw Error("geometry[" + std::to_string(i) + "]: non-finite coordinate; expected numbers");
    }
    masses.push_back(*mass);
    positions.push_back(position);
    total_mass += *mass;
    centre += *mass * position;
  }
  centre /= total_mass;

  // I = sum m (|r|^2 1 - r r^T) about the centre of mass.
  Eigen::Matrix3d inertia = Eigen::Matrix3d::Zero();
  for (std::size_t i = 0; i < positions.size(); ++i) {
    const Eigen::Vector3d r = positions[i] - centre;
    inertia += masses[i] * (r.squaredNorm() * Eigen::Matrix3d::Identity() - r * r.transpose());
  }
  const Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> solver(inertia, Eigen::EigenvaluesOnly);
  SEVENFOLD_ASSERT(solver.info() == Eigen::Success);
  const Eigen::Vector3d eigenvalues = solver.eigenvalues();  // ascending

  RigidRotor rotor;
  for (int k = 0; k < 3; ++k) {
    // Rounding can leave a tiny negative value where the exact moment is zero.
    rotor.moments_amu_angstrom2[k] = std::max(0.0, eigenvalues[k]);
  }
  const double largest = rotor.moments_amu_angstrom2[2];
  if (atoms.size() == 1 || largest <= 0.0) {
    // Several atoms all at one point also have no rotation; the reader rejects that case.
    rotor.shape = Shape::kAtom;
    return rotor;
  }
  if (rotor.moments_amu_angstrom2[0] <= kLinearMomentRelativeTolerance * largest) {
    rotor.shape = Shape::kLinear;
    rotor.rotational_constants_cm1 = {constants::kRotationalConstantTimesInertia / largest};
    return rotor;
  }
  rotor.shape = Shape::kNonlinear;
  for (int k = 0; k < 3; ++k) {
    rotor.rotational_constants_cm1.push_back(constants::kRotationalConstantTimesInertia /
                                             rotor.moments_amu_angstrom2[k]);
  }
  return rotor;
}

}  // namespace sevenfold

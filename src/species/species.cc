// SPDX-License-Identifier: MIT
#include "species/species.h"

#include "core/constants.h"
#include "core/elements.h"

namespace sevenfold {

std::string ToString(Shape shape) {
  switch (shape) {
    case Shape::kAtom:
      return "atom";
    case Shape::kLinear:
      return "linear";
    case Shape::kNonlinear:
      return "nonlinear";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

std::optional<Shape> ParseShape(const std::string& text) {
  if (text == "atom") return Shape::kAtom;
  if (text == "linear") return Shape::kLinear;
  if (text == "nonlinear") return Shape::kNonlinear;
  return std::nullopt;
}

std::string ToString(SpinMixture mixture) {
  switch (mixture) {
    case SpinMixture::kEquilibrium:
      return "equilibrium";
    case SpinMixture::kNormal:
      return "normal";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

std::optional<SpinMixture> ParseSpinMixture(const std::string& text) {
  if (text == "equilibrium") return SpinMixture::kEquilibrium;
  if (text == "normal") return SpinMixture::kNormal;
  return std::nullopt;
}

double Species::MolarMassKgPerMol() const {
  double mass_g_per_mol = 0.0;
  for (const auto& [symbol, count] : composition) {
    const std::optional<double> weight = AtomicWeightGPerMol(symbol);
    if (!weight) {
      throw Error(location,
                  "species '" + name + "': formula: unknown element '" + symbol +
                      "'; expected an element symbol such as C, O or D");
    }
    mass_g_per_mol += *weight * count;
  }
  // A cation has lost `charge` electrons; an anion (negative charge) has gained them.
  mass_g_per_mol -= charge * constants::kElectronMassInAmu;
  return mass_g_per_mol * 1.0e-3;
}

std::string ToString(ElectronConvention convention) {
  switch (convention) {
    case ElectronConvention::kThermal:
      return "thermal";
    case ElectronConvention::kStationary:
      return "stationary";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

int Species::NumElectrons() const {
  int electrons = -charge;
  for (const auto& [symbol, count] : composition) {
    const std::optional<int> z = AtomicNumber(symbol);
    SEVENFOLD_ASSERT(z.has_value());
    electrons += *z * count;
  }
  return electrons;
}

int Species::NumAtoms() const {
  int num_atoms = 0;
  for (const auto& entry : composition) num_atoms += entry.second;
  return num_atoms;
}

}  // namespace sevenfold

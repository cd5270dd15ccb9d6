// SPDX-License-Identifier: MIT
#include "formation/formation.h"

#include <cmath>
#include <utility>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "species/species_reader.h"

namespace sevenfold {

// Labels as species files write them; the element each stands for is its formula's only one.
const char* const kReferenceStatesText = R"(# Element reference states built into sevenfold (docs/theory.md, section 13).
sevenfold-species: 2
species:
  H2:
    formula: H2
    formation-enthalpy: 0 kJ/mol   # element in its reference state (definition)
    shape: linear
    symmetry-number: 2
    # X 1Sigma_g+ Dunham-type constants, cm^-1: Huber & Herzberg 1979, from memory (as the demo's
    # species/h2-o2-core.yaml); D0 = 36118.1 cm^-1 (from memory).
    rovibrational-constants: {we: 4401.21, wexe: 121.34, weye: 0.812, Be: 60.853, alphae: 3.062,
                         De: 0.0471, dissociation-energy: 36118.1}
  O2:
    formula: O2
    formation-enthalpy: 0 kJ/mol
    shape: linear
    symmetry-number: 2
    # X, a and b states: Huber & Herzberg 1979, from memory; ground D0 from the ATcT atomisation
    # enthalpy at 0 K (from memory); as the demo's species/h2-o2-core.yaml.
    rovibrational-constants:
      - {energy: 0, degeneracy: 3,
         we: 1580.193, wexe: 11.981, weye: 0.04747, Be: 1.44563, alphae: 0.01593,
         De: 4.839e-6, dissociation-energy: 41268.6}
      - {energy: 7882.4, degeneracy: 2,
         we: 1483.50, wexe: 12.90, Be: 1.4264, alphae: 0.0171, De: 4.86e-6,
         dissociation-energy: 33386.2}
      - {energy: 13120.9, degeneracy: 1,
         we: 1432.77, wexe: 14.00, Be: 1.40037, alphae: 0.01820, De: 5.351e-6,
         dissociation-energy: 28147.7}
  N2:
    formula: N2
    formation-enthalpy: 0 kJ/mol
    shape: linear
    symmetry-number: 2
    # X 1Sigma_g+: Huber & Herzberg 1979, from memory; D0 = 78714 cm^-1 (same).
    rovibrational-constants: {we: 2358.57, wexe: 14.324, weye: -0.00226, Be: 1.99824,
                         alphae: 0.017318, De: 5.76e-6, dissociation-energy: 78714}
  F2:
    formula: F2
    formation-enthalpy: 0 kJ/mol
    shape: linear
    symmetry-number: 2
    # X 1Sigma_g+: Huber & Herzberg 1979, from memory; D0 = 1.602 eV = 12920 cm^-1 (from memory).
    rovibrational-constants: {we: 916.64, wexe: 11.236, Be: 0.89019, alphae: 0.013847,
                         De: 3.3e-6, dissociation-energy: 12920}
  Cl2:
    formula: Cl2
    formation-enthalpy: 0 kJ/mol
    shape: linear
    symmetry-number: 2
    # X 1Sigma_g+ of 35Cl2: Huber & Herzberg 1979, from memory; D0 = 2.479 eV = 19997 cm^-1
    # (from memory). The natural isotope mix enters only through the mass.
    rovibrational-constants: {we: 559.72, wexe: 2.675, Be: 0.2440, alphae: 0.00149,
                         De: 1.86e-7, dissociation-energy: 19997}
  C(gr):
    formula: C
    formation-enthalpy: 0 kJ/mol
    shape: atom
    # Graphite: Cp and S(298.15 K) from the JANAF Thermochemical Tables, 4th ed. (Chase 1998),
    # C (reference state), to 0.001 J/(mol K), from memory. A solid: Cp -> 0 at 0 K and the
    # Dulong-Petit 3 R far above (common practice); the reference is used only within the rows.
    tabulated-cp:
      cp-zero: 0
      cp-infinity: 30.0
      reference-entropy: [298.15, 5.740]
      points:
        - [100, 1.674]
        - [200, 5.006]
        - [250, 6.816]
        - [298.15, 8.517]
        - [300, 8.581]
        - [400, 11.817]
        - [500, 14.623]
        - [600, 16.844]
        - [700, 18.537]
        - [800, 19.827]
        - [900, 20.824]
        - [1000, 21.610]
        - [1100, 22.244]
        - [1200, 22.766]
        - [1300, 23.204]
        - [1400, 23.578]
        - [1500, 23.904]
        - [1600, 24.191]
        - [1700, 24.448]
        - [1800, 24.681]
        - [1900, 24.895]
        - [2000, 25.094]
)";

namespace {

using constants::kGasConstant;

// The element a reference species stands for: its formula's only element.
ReferenceState MakeReference(Species species) {
  ReferenceState state;
  SEVENFOLD_ASSERT(species.composition.size() == 1);
  state.element = species.composition.front().first;
  state.atoms = species.composition.front().second;
  if (species.tabulated) {
    state.min_t_k = species.tabulated->t_k.front();
    state.max_t_k = species.tabulated->t_k.back();
  } else {
    state.min_t_k = constants::kMinTemperatureK;
    state.max_t_k = constants::kMaxTemperatureK;
  }
  state.species = std::move(species);
  return state;
}

}  // namespace

const std::vector<ReferenceState>& BuiltInReferenceStates() {
  static const std::vector<ReferenceState> states = [] {
    std::vector<ReferenceState> list;
    for (Species& species : ReadSpeciesText(kReferenceStatesText, "built-in reference states")) {
      list.push_back(MakeReference(std::move(species)));
    }
    return list;
  }();
  return states;
}

struct FormationModel::Built {
  ReferenceState state;
  SpeciesThermo thermo;
};

FormationModel::FormationModel(const std::vector<Species>& user_species) {
  for (const ReferenceState& state : BuiltInReferenceStates()) {
    ReferenceState chosen = state;
    for (const Species& user : user_species) {
      if (user.name != state.species.name) continue;
      // A user's species of the same label replaces the built-in state; it must be the same
      // element's (the label is the contract).
      if (user.composition.size() != 1 || user.composition.front().first != state.element ||
          user.charge != 0) {
        throw Error(user.location,
                    fmt::format("species '{}': replaces the reference state of {} (same label) "
                                "but its formula is not made of {} alone",
                                user.name, state.element, state.element));
      }
      chosen = MakeReference(user);
    }
    SpeciesThermo thermo(chosen.species);
    const std::string element = chosen.element;  // before chosen is moved from
    by_element_.emplace(element,
                        std::make_unique<Built>(Built{std::move(chosen), std::move(thermo)}));
  }
}

FormationModel::~FormationModel() = default;

const ReferenceState* FormationModel::Reference(const std::string& element) const {
  const auto it = by_element_.find(element);
  return it == by_element_.end() ? nullptr : &it->second->state;
}

FormationPoint FormationModel::At(const Species& species, const SpeciesThermo& thermo,
                                  double t_k) const {
  const auto fail = [&](const std::string& message) {
    throw Error(species.location, fmt::format("species '{}': {}", species.name, message));
  };
  if (species.charge != 0) fail("formation properties of ions are not supported");
  const ThermoPoint own = thermo.At(t_k);
  double h = own.h_j_per_mol, s = own.s_j_per_mol_k;
  for (const auto& [element, count] : species.composition) {
    const auto it = by_element_.find(element);
    if (it == by_element_.end()) {
      fail(fmt::format("no reference state for element {} (built-in: H2, O2, N2, F2, Cl2, "
                       "C(gr); docs/theory.md, section 13)",
                       element));
    }
    const ReferenceState& ref = it->second->state;
    if (t_k < ref.min_t_k || t_k > ref.max_t_k) {
      fail(fmt::format("the reference state {} of {} is defined only over {}-{} K (its phase "
                       "changes beyond are not modelled); got {} K",
                       ref.species.name, element, ref.min_t_k, ref.max_t_k, t_k));
    }
    const ThermoPoint point = it->second->thermo.At(t_k);
    const double share = static_cast<double>(count) / ref.atoms;
    h -= share * point.h_j_per_mol;
    s -= share * point.s_j_per_mol_k;
  }
  return MakeFormationPoint(t_k, h, s);
}

FormationPoint MakeFormationPoint(double t_k, double dfh_j_per_mol, double dfs_j_per_mol_k) {
  FormationPoint result;
  result.t_k = t_k;
  result.dfh_j_per_mol = dfh_j_per_mol;
  result.dfg_j_per_mol = dfh_j_per_mol - t_k * dfs_j_per_mol_k;
  // For an element in its reference state dfG is 0 and -0 / x is -0; tables print 0.
  result.log10_kf =
      result.dfg_j_per_mol == 0.0 ? 0.0
                                  : -result.dfg_j_per_mol / (kGasConstant * t_k * std::log(10.0));
  return result;
}

FormationModel::Series FormationModel::Tabulate(const Species& species,
                                                const SpeciesThermo& thermo,
                                                const std::vector<double>& temperatures_k) const {
  Series series;
  for (const double t_k : temperatures_k) {
    try {
      series.points.push_back(At(species, thermo, t_k));
    } catch (const Error& error) {
      // At names the species and the reason; one message per species is enough for callers.
      series.points.push_back(std::nullopt);
      if (series.reason.empty()) series.reason = error.what();
    }
  }
  return series;
}

}  // namespace sevenfold

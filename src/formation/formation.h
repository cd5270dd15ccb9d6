// SPDX-License-Identifier: MIT
// Formation properties of a species from its elements in their reference states: dfH(T),
// dfG(T) and log10 Kf(T) (docs/theory.md, section 13).
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "species/species.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

// One element's reference state: the species (label as in the built-in table or a user's
// species file) and the number of the element's atoms in it (2 for H2, 1 for C(gr)).
struct ReferenceState {
  std::string element;
  Species species;
  int atoms = 1;
  // Temperatures where the reference is defined, K: a tabulated (condensed) reference only over
  // its rows, since its phase changes beyond them are not modelled.
  double min_t_k = 0.0;
  double max_t_k = 0.0;
};

// The built-in reference states (H2, O2, N2, F2, Cl2 gases from molecular constants; C as
// graphite from tabulated Cp), read from the species text kReferenceStatesText with the species
// reader. Never throws on the built-in text (tests/formation_test.cc reads it).
const std::vector<ReferenceState>& BuiltInReferenceStates();
// The species-file text of the built-in reference states, with the source of every value.
extern const char* const kReferenceStatesText;

struct FormationPoint {
  double t_k = 0.0;
  double dfh_j_per_mol = 0.0;  // dfH(T) = H(T) - sum_e n_e / atoms_e H_ref,e(T)
  double dfg_j_per_mol = 0.0;  // dfG(T) = dfH(T) - T dfS(T)
  double log10_kf = 0.0;       // -dfG / (R T ln 10)
};

// The point at t_k from the formation enthalpy and entropy: dfG = dfH - T dfS, log10 Kf =
// -dfG / (R T ln 10). The one home of those relations (used for species and fitted entries).
FormationPoint MakeFormationPoint(double t_k, double dfh_j_per_mol, double dfs_j_per_mol_k);

// Formation properties against the reference states: the built-in ones, each replaced by a
// species of `user_species` with the same label (the rule in docs/theory.md, section 13).
class FormationModel {
 public:
  // Builds the reference states' exact curves. Throws Error when a user reference cannot be
  // built.
  explicit FormationModel(const std::vector<Species>& user_species = {});
  ~FormationModel();

  // Formation properties of `species` (whose exact curves are `thermo`) at t_k. Throws Error
  // naming the species when an element has no reference state, for an ion, or when t_k lies
  // outside a reference state's range (for graphite: its table; no phase change is modelled).
  FormationPoint At(const Species& species, const SpeciesThermo& thermo, double t_k) const;

  // Formation properties at each of `temperatures_k`: a point where they can be computed, none
  // where they cannot (no reference state, an ion, outside a reference's range); `reason` holds
  // the first failure's message (empty when every point was computed). Never throws for those.
  struct Series {
    std::vector<std::optional<FormationPoint>> points;
    std::string reason;
  };
  Series Tabulate(const Species& species, const SpeciesThermo& thermo,
                  const std::vector<double>& temperatures_k) const;

  // The reference state in use for `element`, or nullptr.
  const ReferenceState* Reference(const std::string& element) const;

 private:
  struct Built;
  std::map<std::string, std::unique_ptr<Built>> by_element_;
};

}  // namespace sevenfold

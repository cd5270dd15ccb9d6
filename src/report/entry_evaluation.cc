// SPDX-License-Identifier: MIT
#include "report/entry_evaluation.h"

#include <fmt/format.h>

#include "core/constants.h"

namespace sevenfold {

ThermoPoint EvaluateEntry(const Entry& entry, double t_k) {
  using constants::kGasConstant;
  using constants::kReferenceTemperature;
  const TwoRangePolynomial& p = entry.polynomial;
  const double h298 = kGasConstant * kReferenceTemperature * HOverRT(p, kReferenceTemperature);
  ThermoPoint point;
  point.t_k = t_k;
  point.cp_j_per_mol_k = kGasConstant * CpOverR(p, t_k);
  point.s_j_per_mol_k = kGasConstant * SOverR(p, t_k);
  point.h_j_per_mol = kGasConstant * t_k * HOverRT(p, t_k);
  point.h_minus_h298_j_per_mol = point.h_j_per_mol - h298;
  return point;
}

FormationModel::Series EntryFormation(const Entry& entry, const std::vector<Entry>& available,
                                      const std::vector<double>& temperatures_k) {
  FormationModel::Series series;
  const auto fail_all = [&](const std::string& why) {
    series.points.assign(temperatures_k.size(), std::nullopt);
    series.reason = fmt::format("{}: species '{}': {}", entry.location.ToString(), entry.name, why);
    return series;
  };
  if (entry.charge != 0) return fail_all("formation properties of ions are not supported");
  // Per element: the reference entry and the share n_e / atoms_e of its enthalpy and entropy.
  struct Share {
    const Entry* reference;
    double share;
  };
  std::vector<Share> shares;
  for (const auto& [element, count] : entry.composition) {
    const ReferenceState* state = nullptr;
    for (const ReferenceState& built_in : BuiltInReferenceStates()) {
      if (built_in.element == element) state = &built_in;
    }
    const Entry* found = nullptr;
    if (state != nullptr) {
      for (const Entry& candidate : available) {
        if (candidate.name == state->species.name && candidate.charge == 0 &&
            candidate.composition.size() == 1 && candidate.composition.front().first == element) {
          found = &candidate;
        }
      }
    }
    if (found == nullptr) {
      if (state == nullptr) {
        return fail_all(fmt::format("no reference-state entry for element {}: none is built in "
                                    "for it (docs/cli.md)",
                                    element));
      }
      return fail_all(fmt::format(
          "no reference-state entry for element {} (expected an entry labelled {} of {} alone "
          "in the same entries file; docs/cli.md)",
          element, state->species.name, element));
    }
    shares.push_back({found, static_cast<double>(count) / found->composition.front().second});
  }
  for (const double t_k : temperatures_k) {
    const ThermoPoint own = EvaluateEntry(entry, t_k);
    double h = own.h_j_per_mol, s = own.s_j_per_mol_k;
    std::optional<FormationPoint> point;
    bool inside = true;
    for (const Share& share : shares) {
      const TwoRangePolynomial& p = share.reference->polynomial;
      if (t_k < p.t_low_k || t_k > p.t_high_k) {
        inside = false;
        if (series.reason.empty()) {
          series.reason = fmt::format(
              "{}: species '{}': the reference-state entry {} is fitted only over {}-{} K (not "
              "extrapolated: its phase may change beyond); got {} K",
              entry.location.ToString(), entry.name, share.reference->name, p.t_low_k,
              p.t_high_k, t_k);
        }
        break;
      }
      const ThermoPoint ref = EvaluateEntry(*share.reference, t_k);
      h -= share.share * ref.h_j_per_mol;
      s -= share.share * ref.s_j_per_mol_k;
    }
    if (inside) point = MakeFormationPoint(t_k, h, s);
    series.points.push_back(point);
  }
  return series;
}

}  // namespace sevenfold

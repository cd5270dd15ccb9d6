// SPDX-License-Identifier: MIT
#include "report/entry_evaluation.h"

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

}  // namespace sevenfold

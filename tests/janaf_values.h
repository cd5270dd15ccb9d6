// SPDX-License-Identifier: MIT
// Reference values shared by several test files: ideal-gas Cp and S at 1 bar from the JANAF
// Thermochemical Tables, 4th ed. (M. W. Chase, J. Phys. Chem. Ref. Data Monograph 9, 1998),
// typed from memory; three decimals quoted (0.001 J/(mol K)). One home, so that a corrected
// digit is corrected everywhere.
#pragma once

namespace sevenfold::testing {

struct JanafValue {
  double t_k;
  double cp_j_per_mol_k;
  double s_j_per_mol_k;
};

// A Cp value alone, where only Cp is used.
struct JanafCp {
  double t_k;
  double cp_j_per_mol_k;
};

namespace janaf {
inline constexpr JanafValue kN2At298{298.15, 29.124, 191.609};
inline constexpr JanafValue kN2At1000{1000.0, 32.697, 228.170};
inline constexpr JanafValue kO2At298{298.15, 29.376, 205.147};
inline constexpr JanafValue kO2At1000{1000.0, 34.870, 243.578};
inline constexpr JanafValue kCOAt298{298.15, 29.142, 197.653};
inline constexpr JanafValue kCOAt1000{1000.0, 33.183, 234.538};
inline constexpr JanafValue kCO2At298{298.15, 37.129, 213.795};
inline constexpr JanafValue kCO2At1000{1000.0, 54.308, 269.299};
inline constexpr JanafValue kH2OAt298{298.15, 33.587, 188.834};
inline constexpr JanafValue kH2OAt1000{1000.0, 41.268, 232.738};
inline constexpr JanafValue kCH4At298{298.15, 35.695, 186.251};
inline constexpr JanafValue kCH4At1000{1000.0, 71.795, 247.549};
inline constexpr JanafValue kArAt298{298.15, 20.786, 154.845};
inline constexpr JanafValue kArAt1000{1000.0, 20.786, 179.999};

// Cp at 3000 K from the same tables, typed from memory; cross-checked against memory of the
// NIST Chemistry WebBook's Shomate fits to these tables (Chase 1998), which agree within 0.02 %
// (O2: 39.870 from the fit; its table value is quoted to two decimals, the third not recalled).
inline constexpr JanafCp kN2CpAt3000{3000.0, 37.028};
inline constexpr JanafCp kO2CpAt3000{3000.0, 39.87};
inline constexpr JanafCp kH2OCpAt3000{3000.0, 55.748};
inline constexpr JanafCp kCO2CpAt3000{3000.0, 62.229};
inline constexpr JanafCp kCH4CpAt3000{3000.0, 101.389};
}  // namespace janaf

}  // namespace sevenfold::testing

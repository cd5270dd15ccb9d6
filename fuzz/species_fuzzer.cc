// SPDX-License-Identifier: MIT
// libFuzzer target: the species loader (ReadSpeciesText). Any input must either load or throw
// sevenfold::Error. A loaded species must hold finite values inside the bands the reader
// promises; anything else (another exception, a crash, a sanitizer report, a hang) is a finding.
// The statistical-mechanics engine is not run here: one asymmetric top costs about a second in
// this instrumented build, which would cut the executions a hundredfold; the engine's response
// to extreme accepted values is covered by tests/property_test.cc and docs/robustness.md.
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

#include "core/error.h"
#include "species/species_reader.h"

namespace {

[[noreturn]] void Finding(const std::string& what) {
  std::fprintf(stderr, "species_fuzzer finding: %s\n", what.c_str());
  std::abort();
}

void RequireFinite(double value, const std::string& species, const char* field) {
  if (!std::isfinite(value)) Finding("species '" + species + "': non-finite " + field);
}

// What the reader guarantees for every species it returns (docs/species-schema.md).
void CheckLoaded(const sevenfold::Species& s) {
  if (s.name.empty()) Finding("a species without a name");
  if (s.composition.empty()) Finding("species '" + s.name + "' without composition");
  RequireFinite(s.formation_enthalpy_j_per_mol, s.name, "formation enthalpy");
  RequireFinite(s.symmetry_number, s.name, "symmetry number");
  RequireFinite(s.frequency_scale, s.name, "frequency scale");
  if (!(s.temperatures.low_k < s.temperatures.high_k)) Finding(s.name + ": low >= high");
  if (s.temperatures.mid_k && !(*s.temperatures.mid_k > s.temperatures.low_k &&
                                *s.temperatures.mid_k < s.temperatures.high_k)) {
    Finding(s.name + ": mid outside (low, high)");
  }
  for (const double b : s.rotational_constants_cm1) {
    if (!(b > 0.0) || !std::isfinite(b)) Finding(s.name + ": bad rotational constant");
  }
  for (const double nu : s.vibrations_cm1) {
    if (!(nu > 0.0) || !std::isfinite(nu)) Finding(s.name + ": bad wavenumber");
  }
  for (const auto& level : s.electronic_levels) {
    RequireFinite(level.energy_cm1, s.name, "level energy");
    if (!(level.degeneracy > 0.0) || !std::isfinite(level.degeneracy)) {
      Finding(s.name + ": bad degeneracy");
    }
  }
  if (s.MolarMassKgPerMol() <= 0.0 && s.charge <= 0) Finding(s.name + ": molar mass <= 0");
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  std::vector<sevenfold::Species> species;
  try {
    species = sevenfold::ReadSpeciesText(text, "fuzz.yaml");
  } catch (const sevenfold::Error&) {
    return 0;  // rejected with a message: the expected outcome for bad input
  }
  for (const sevenfold::Species& one : species) CheckLoaded(one);
  return 0;
}

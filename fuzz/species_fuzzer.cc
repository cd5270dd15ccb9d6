// SPDX-License-Identifier: MIT
// libFuzzer target: the species loader (ReadSpeciesText). Any input must either load or throw
// sevenfold::Error. A loaded species must hold finite values inside the bands the reader
// promises, and the item-by-item reading must agree with the whole-document one (same species,
// digests and locations, or the same message); anything else (another exception, a crash, a
// sanitizer report, a hang) is a finding.
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
  if (s.formation_enthalpy_0k_j_per_mol) {
    RequireFinite(*s.formation_enthalpy_0k_j_per_mol, s.name, "formation enthalpy at 0 K");
  }
  // Kramers: the reader refuses an odd-electron species with a single ground level.
  if (s.NumElectrons() % 2 != 0 && s.electronic_levels.front().degeneracy == 1.0) {
    Finding("species '" + s.name + "': odd electron count with a single ground level");
  }
  for (const sevenfold::Torsion& torsion : s.torsions) {
    if (torsion.mode_index < 0 ||
        torsion.mode_index >= static_cast<int>(s.vibrations_cm1.size())) {
      Finding("species '" + s.name + "': a hindered rotor without a valid mode index");
    }
  }
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

// One reading of `text`: the species, or the error message.
struct Reading {
  bool ok = false;
  std::vector<sevenfold::Species> species;
  std::string error;
};

Reading Read(const std::string& text, bool allow_split) {
  Reading reading;
  try {
    reading.species = sevenfold::detail::ReadSpeciesTextForTesting(text, "fuzz.yaml", allow_split,
                                                                   1, nullptr);
    reading.ok = true;
  } catch (const sevenfold::Error& error) {
    reading.error = error.what();  // rejected with a message: the expected outcome for bad input
  }
  return reading;
}

// The item-by-item reading (when the text scan takes it) and the whole-document reading must
// agree: the same message, or the same species (the digest covers their content).
void CheckSameReading(const Reading& split, const Reading& whole) {
  if (split.ok != whole.ok) {
    Finding("one reading failed, the other did not: " + split.error + whole.error);
  }
  if (!split.ok) {
    if (split.error != whole.error) {
      Finding("different messages:\n" + split.error + "\n" + whole.error);
    }
    return;
  }
  if (split.species.size() != whole.species.size()) Finding("different species counts");
  for (std::size_t i = 0; i < split.species.size(); ++i) {
    const sevenfold::Species& a = split.species[i];
    const sevenfold::Species& b = whole.species[i];
    if (a.name != b.name || a.input_digest != b.input_digest ||
        a.location.line != b.location.line || a.location.column != b.location.column) {
      Finding("species " + std::to_string(i) + " differs between the two readings");
    }
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  const Reading split = Read(text, true);
  CheckSameReading(split, Read(text, false));
  for (const sevenfold::Species& one : split.species) CheckLoaded(one);
  return 0;
}

// SPDX-License-Identifier: MIT
// sevenfold's public C++ API: the one header an outside program includes (installed as
// <sevenfold/sevenfold.h>; docs/library.md). It exposes the value types (Species, Entry,
// ThermoPoint, the fit settings and quality figures) and a few functions; the readers, the
// engine, the fitter and the report stay internal. Errors in input are thrown as sevenfold::Error
// (core/error.h), whose what() starts with file:line:column; the functions never print.
//
// Example:
//   std::vector<sevenfold::Species> species = sevenfold::LoadSpecies("species/h2-o2-core.yaml");
//   sevenfold::EntriesFile entries = sevenfold::Fit(species, sevenfold::FitSettings{});
//   sevenfold::WriteEntries(entries, "out.entries");
//   for (const sevenfold::EntryValue& v : sevenfold::Evaluate(entries.entries[0], {300, 3000}))
//     std::printf("%g K: Cp = %g J/(mol K)%s\n", v.point.t_k, v.point.cp_j_per_mol_k,
//                 v.outside_range ? " (outside the fitted range)" : "");
#pragma once

#include <string>
#include <vector>

#include "core/error.h"
#include "core/fit_settings.h"
#include "entries/entries.h"
#include "species/species.h"
#include "statmech/thermo_point.h"
#include "version.h"

namespace sevenfold {

// Reads and validates a species file (docs/species-schema.md); species in file order, whatever
// `jobs` (threads reading its species; 0: the hardware threads).
// Throws Error listing every problem of the file, each with file:line:column.
std::vector<Species> LoadSpecies(const std::string& path, int jobs = 1);
// The same for a document in memory; `file_name` appears in error locations only.
std::vector<Species> LoadSpeciesFromText(const std::string& text, const std::string& file_name);

// Exact ideal-gas Cp, S, H - H298 and H of `species` at each temperature (K, within the
// engine's 10-20000 K), SI per mole, entropy at the species' standard pressure.
// Throws Error for a temperature outside the engine's range.
std::vector<ThermoPoint> ExactTable(const Species& species, const std::vector<double>& t_k);

// The options of `sevenfold fit`, with the same meanings and defaults (docs/cli.md). Empty
// strings mean each species' own setting from its file, else the built-in default.
struct FitSettings {
  std::string mid;                  // "", "auto" or a temperature in K
  std::string objective;            // "", "minimax" or "least-squares"
  std::string extrapolation_guard;  // "", "off" or "FACTOR:BAND"
  bool smooth_curvature = false;    // also make d2Cp/dT2 continuous at T_mid
  int jobs = 0;                     // species fitted in parallel; 0: the hardware threads
};

// Fits every species and returns their entries in input order (a fit that misses its
// thresholds is returned too: see Entry::quality.MeetsThresholds()). Throws Error for a
// malformed setting or a species that cannot be computed, naming it and its file location.
EntriesFile Fit(const std::vector<Species>& species, const FitSettings& settings);

// Reads an entries file (docs/entries-format.md). Throws Error with file:line:column.
EntriesFile ReadEntries(const std::string& path);
// Writes `entries` to `path` atomically (the old file stays whole if anything fails).
// Throws Error naming the path when it cannot be written.
void WriteEntries(const EntriesFile& entries, const std::string& path);

// One evaluation of an entry's polynomial. g_j_per_mol is G = H - T S (absolute).
struct EntryValue {
  ThermoPoint point;
  double g_j_per_mol = 0.0;
  // True outside [T_low, T_high]: the polynomial extrapolates there.
  bool outside_range = false;
};
// Evaluates `entry` at each temperature (K, > 0 and finite). Throws Error otherwise.
std::vector<EntryValue> Evaluate(const Entry& entry, const std::vector<double>& t_k);

}  // namespace sevenfold

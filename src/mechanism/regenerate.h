// SPDX-License-Identifier: MIT
// The whole job for a list of species: exact curves, constrained fit, entry. Species are
// independent and run in parallel; results come back in input order whatever the thread count.
#pragma once

#include <functional>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "entries/entries.h"
#include "fit/fitter.h"
#include "species/species.h"

namespace sevenfold {

// What a committed entry records about how it was made: `check` regenerates with these settings
// wherever neither the command line nor the species file decides.
struct RecordedFit {
  EntryFitSettings settings;
  double t_mid_k = 0.0;  // the entry's T_mid; used when settings.t_mid_fixed
};

struct RegenerateOptions {
  // Overrides every species' mid temperature (K); empty: each species' own setting.
  std::optional<double> t_mid_override_k;
  // When true the species' own mid temperature is ignored and chosen automatically.
  bool force_auto_mid = false;
  bool continuous_second_derivative = false;
  // Override every species' own setting when set (from the command line).
  std::optional<FitObjective> objective_override;
  std::optional<ExtrapolationGuard> extrapolation_guard_override;
  std::optional<ErrorScales> error_scales_override;
  // By species name: what the committed entries record (filled by `check`, empty otherwise).
  // Precedence of every setting: command line > species file (Species::fit_request) > recorded
  // here > default. d2Cp/dT2 continuity: on when continuous_second_derivative or recorded.
  std::map<std::string, RecordedFit> recorded;
  // Worker threads; 0 means the machine's hardware threads.
  int num_jobs = 0;
  // Called after each species finishes, from a worker thread (must be thread-safe).
  std::function<void(int num_done, int num_total)> progress;
};

// Regeneration options from the text of the command line's --mid, --objective,
// --extrapolation-guard (each "" for "each species' own setting") and --jobs; the library's Fit
// takes the same strings. Throws Error naming the option, the value and what was expected.
RegenerateOptions ParseRegenerateOptions(const std::string& mid, const std::string& objective,
                                         const std::string& guard, int num_jobs);

// One species' result: the exact curves on the fit grid and the fit.
struct SpeciesFit {
  const Species* species = nullptr;  // points into the caller's vector
  ExactCurves exact;
  FitResult fit;
  double formation_enthalpy_j_per_mol = 0.0;  // dfH(298.15 K) of the exact model
};

// Fits every species. Throws Error listing every species that could not be computed (bad data
// the reader could not catch, an impossible fit request), each with its file location.
std::vector<SpeciesFit> FitAllSpecies(const std::vector<Species>& species,
                                      const RegenerateOptions& options);
// The same, but a species that cannot be computed is left out of the result and its message
// (with file location) appended to *failures instead of throwing: for runs that must write
// the good entries and list the bad ones.
std::vector<SpeciesFit> FitAllSpecies(const std::vector<Species>& species,
                                      const RegenerateOptions& options,
                                      std::vector<std::string>* failures);

// The entry of one fitted species, with provenance.
Entry MakeEntry(const SpeciesFit& result, const RegenerateOptions& options);
EntriesFile MakeEntriesFile(const std::vector<SpeciesFit>& results, const RegenerateOptions& options);

// Records in options->recorded the fit settings of every entry of `committed`, so that a
// regeneration makes each entry the way it was made.
void RecordCommittedSettings(const EntriesFile& committed, RegenerateOptions* options);

// The fit options a species gets under `options` (precedence: see RegenerateOptions::recorded).
FitOptions FitOptionsFor(const Species& species, const RegenerateOptions& options);

// Exact dimensionless curves of a species on the fit grid of its temperature range, plus exact
// Cp/R at the guard points beyond it (GuardGrid; empty when the guard is off). The model is built
// exact up to the guard's top only (see SpeciesThermo); guard points outside the engine's range
// are left out. When formation_enthalpy_j_per_mol is not null it receives the model's
// dfH(298.15 K) (converted from the species' 0 K value when that is what the file gives).
ExactCurves ExactCurvesFor(const Species& species,
                           const ExtrapolationGuard& guard = ExtrapolationGuard{},
                           double* formation_enthalpy_j_per_mol = nullptr);

// A one-line description of the physical model of a species (the fit settings are recorded in
// fields of their own, EntryFitSettings); written into each entry's provenance so that a change
// of model shows as a change of entry.
std::string ModelDescription(const Species& species);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Checking a committed entries file against entries regenerated in memory from the species files:
// the verdict behind `sevenfold check` and its JUnit-style report. No printing here; the CLI
// decides what to show. Definitions and tolerances: docs/cli.md, "check".
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "core/error.h"
#include "entries/entries.h"
#include "fit/polynomial.h"
#include "mechanism/regenerate.h"
#include "species/species.h"

namespace sevenfold {

// What a finding is about. Each species gets at most one finding of each kind.
enum class FindingKind {
  kMissing,        // a species of the species files has no entry
  kExtra,          // an entry names no species of the species files
  kStale,          // the species' input changed since its entry was written (input-sha256)
  kModelChanged,   // same input, but the entry's model or fit settings differ from this run's
  kDataChanged,    // composition, charge, phase, formation enthalpy or reference pressure differ
  kRangeChanged,   // temperatures-k (low, mid, high) differ
  kCurveChanged,   // Cp, H or S of the polynomials differ beyond CurveTolerances
  kQualityChanged, // same curves, but the recorded quality figures, extrapolation check, form
                   // limit, grid counts, verdict or failure lines differ from the regenerated
  kFitFails,       // the committed verdict is "fail", or the regenerated fit misses a threshold
};
// "missing", "extra", "stale", "model-changed", "data-changed", "range-changed",
// "curve-changed", "quality-changed", "fit-fails".
std::string ToString(FindingKind kind);

struct Finding {
  FindingKind kind = FindingKind::kMissing;
  std::string species;
  // One line, no trailing period, e.g. "input changed since the entry was written".
  std::string message;
  // The species' block in its species file; for kExtra, the entry's block in the entries file.
  SourceLocation location;
};

// How far apart committed and regenerated curves may be before they count as different.
//
// 1e-6 lies far below any fit error that matters (quality thresholds are of order 1e-3: 0.5 % in
// Cp, 0.002 RT in H, 0.002 R in S), so a difference this small never changes a result anyone
// uses; and far above the rounding that differs between compilers, libm versions and thread
// counts: perturbing every exact value of the reference species (tests/data) by up to 4e-16
// relative, i.e. a couple of units in the last place, and refitting moved the fitted curves by at
// most 1.1e-12 (measured with this build, fixed and automatic mid temperature).
struct CurveTolerances {
  double max_cp_relative = 1e-6;  // max |Cp_committed - Cp_regenerated| / Cp_regenerated
  double max_h_over_rt = 1e-6;    // max |H_committed - H_regenerated| / (R T)
  double max_s_over_r = 1e-6;     // max |S_committed - S_regenerated| / R
};

// How far recorded quality figures may lie from the regenerated ones (absolute, in the figures'
// own dimensionless units: |dCp|/Cp, |dH|/RT, |dS|/R, |dG|/RT). Two polynomials whose curves agree
// within CurveTolerances (1e-6) have error figures that agree within 1e-6 for Cp, H and S and
// 2e-6 for G = H - T S; a regeneration of the same fit agrees to rounding (about 1e-12).
inline constexpr double kQualityFigureTolerance = 2e-6;
// The same, relative, for the extrapolation's Cp/R extremes, the form limit's best threshold
// ratio and its passing range: numbers computed from the same polynomial or search agree to
// rounding; 1e-6 is the curve tolerance.
inline constexpr double kQualityRelativeTolerance = 1e-6;

// Temperatures (low, mid, high) that differ by more than this relative amount are a range
// change. The entries format reads numbers back bit for bit, so equal ranges compare equal;
// the slack only absorbs a last-bit difference.
inline constexpr double kRangeRelativeTolerance = 1e-12;

// Points of the comparison grid (geometric in T over the common range, both ends included;
// 298.15 K and both mid temperatures are added when inside). Spacing is about 0.2 % of T for
// 200 K to 6000 K, far finer than any structure a 4th-degree polynomial can have.
inline constexpr int kNumCurveSamples = 2001;

// The largest differences between two polynomials over a grid, and where they sit.
struct CurveDifference {
  double max_cp_relative = 0.0;
  double max_cp_t_k = 0.0;
  double max_h_over_rt = 0.0;
  double max_h_t_k = 0.0;
  double max_s_over_r = 0.0;
  double max_s_t_k = 0.0;
};

// Differences of `committed` from `reference` over [t_low_k, t_high_k] (kelvin, 0 < low < high),
// sampled as described at kNumCurveSamples; each polynomial uses its own ranges. Cp is relative
// to |Cp| of `reference`.
CurveDifference CompareCurves(const TwoRangePolynomial& committed,
                              const TwoRangePolynomial& reference, double t_low_k,
                              double t_high_k);

// Settings of CheckEntries.
struct CheckOptions {
  CurveTolerances tolerances;
};

struct CheckResult {
  // The names checked: the species in input order, then the extra entries in file order. One
  // JUnit test case each.
  std::vector<std::string> names;
  // Grouped by name in the order above; within a name, in the order of FindingKind.
  std::vector<Finding> findings;

  bool Passed() const { return findings.empty(); }
};

// Compares the committed entries with fresh fits of the same species. `regenerated` is what
// FitAllSpecies(species, regenerate) returned (same order as `species`); `regenerate` must be the
// options of that run (they define the expected model description).
//
// Every field of the committed entry is compared with the regenerated entry (docs/cli.md,
// "check", lists each field and its tolerance), except tool-version (it changes with every
// release; a release that changes results shows in the other fields), source (the path as the
// tool was given it, which depends on the working directory; input-sha256 identifies the
// content) and the at-k temperatures of the error maxima (when two grid points carry nearly the
// same error, rounding moves the maximum from one to the other; the maxima themselves are
// compared).
//
// A stale entry or one with changed model or settings is reported as such alone: range, curve
// and quality differences are then its consequences, and the message states the largest curve
// difference. A stale entry whose regeneration matches it in every compared field is reported
// as "input text changed, physics unchanged". kFitFails is reported independently of the other
// kinds. For `regenerate` to make each entry the way it was made, fill regenerate.recorded with
// RecordCommittedSettings(committed, ...) before FitAllSpecies.
CheckResult CheckEntries(const std::vector<SpeciesFit>& regenerated, const EntriesFile& committed,
                         const RegenerateOptions& regenerate, const CheckOptions& options = {});

// A JUnit-style XML report of `result`: one <testsuite name=suite_name> with one <testcase> per
// name and one <failure type=KIND message=...> per finding (text: location, kind and message).
// Deterministic (no times, no host names); every attribute and text is XML-escaped, and control
// characters XML 1.0 cannot carry are written as "\xNN".
std::string FormatJUnitReport(const CheckResult& result, const std::string& suite_name);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Tests of the mechanism module: regenerating every species (deterministic whatever the thread
// count, in input order, all errors reported) and checking committed entries against it.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

#include <catch2/catch.hpp>

#include "core/error.h"
#include "entries/entries.h"
#include "fit/fitter.h"
#include "fit/polynomial.h"
#include "mechanism/check.h"
#include "mechanism/regenerate.h"
#include "species/species.h"
#include "species/species_reader.h"
#include "statmech/species_thermo.h"

namespace sevenfold {
namespace {

using Catch::Matchers::Contains;

// The name used for the reference species in locations; Run-from-source-dir style.
const char* const kReferenceName = "tests/data/reference-species.yaml";

// The text of tests/data/reference-species.yaml: N2, CO2, H2O and Ar with sourced constants (see
// the file's header). Species blocks start at lines 8, 15, 22 and 29, column 5.
std::string ReferenceText() {
  std::ifstream in(std::string(SEVENFOLD_SOURCE_DIR) + "/" + kReferenceName);
  REQUIRE(in.good());
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

// `text` with its one occurrence of `from` replaced by `to` (a REQUIRE fails if it is not once).
std::string ReplaceOnce(const std::string& text, const std::string& from, const std::string& to) {
  const std::size_t at = text.find(from);
  REQUIRE(at != std::string::npos);
  REQUIRE(text.find(from, at + 1) == std::string::npos);
  return text.substr(0, at) + to + text.substr(at + from.size());
}

RegenerateOptions Jobs(int num_jobs) {
  RegenerateOptions options;
  options.num_jobs = num_jobs;
  return options;
}

// The options the checks run with: the mid temperature chosen automatically, with which every
// reference species meets the default quality thresholds (with the file's fixed 1000 K, N2 and
// CO2 miss them), so that a finding of kind fit-fails appears only where a test provokes it.
RegenerateOptions Base(int num_jobs) {
  RegenerateOptions options = Jobs(num_jobs);
  options.force_auto_mid = true;
  return options;
}

// The entries file as fit writes it and check reads it: through the text format, so that the
// check sees exactly what a committed file holds.
EntriesFile Committed(const std::vector<SpeciesFit>& fits, const RegenerateOptions& options) {
  return ParseEntries(FormatEntries(MakeEntriesFile(fits, options)), "committed.entries");
}

Entry* FindEntry(EntriesFile& file, const std::string& name) {
  for (Entry& entry : file.entries) {
    if (entry.name == name) return &entry;
  }
  FAIL("no entry " << name);
  return nullptr;
}

// The kinds of the findings, as text, in order: "N2 stale", ...
std::vector<std::string> Summary(const CheckResult& result) {
  std::vector<std::string> lines;
  for (const Finding& finding : result.findings) {
    lines.push_back(finding.species + " " + ToString(finding.kind));
  }
  return lines;
}

TEST_CASE("regenerated entries are byte-identical for 1, 2 and 4 threads", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  // Both the fixed mid temperature of the file and the automatic choice (scan + Ceres), which
  // has the most floating-point work that could depend on the thread.
  for (const bool automatic_mid : {false, true}) {
    std::vector<std::string> texts;
    for (const int num_jobs : {1, 2, 4}) {
      RegenerateOptions options = Jobs(num_jobs);
      options.force_auto_mid = automatic_mid;
      texts.push_back(FormatEntries(MakeEntriesFile(FitAllSpecies(species, options), options)));
    }
    CHECK(texts[0] == texts[1]);
    CHECK(texts[0] == texts[2]);
    CHECK_THAT(texts[0], Contains("\"N2\" record-version 2 field-lines"));
  }
}

TEST_CASE("regenerated results come back in input order", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  REQUIRE(species.size() == 4);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Jobs(4));
  REQUIRE(fits.size() == species.size());
  for (std::size_t i = 0; i < species.size(); ++i) {
    CHECK(fits[i].species == &species[i]);
    CHECK(fits[i].fit.polynomial.t_high_k == species[i].temperatures.high_k);
  }
  const EntriesFile file = MakeEntriesFile(fits, Jobs(4));
  REQUIRE(file.entries.size() == 4);
  CHECK(file.entries[0].name == "N2");
  CHECK(file.entries[1].name == "CO2");
  CHECK(file.entries[2].name == "H2O");
  CHECK(file.entries[3].name == "Ar");
}

TEST_CASE("errors of several species are all reported with their locations", "[mechanism]") {
  // A fixed mid temperature just inside the range passes the reader but leaves fewer than
  // kMinPointsPerRange grid points on one side, which only the fitter can refuse.
  std::string text = ReferenceText();
  text = ReplaceOnce(text, "    vibrations: [2329.9]\n",
                     "    vibrations: [2329.9]\n    fit-temperatures: {mid: 201}\n");
  text = ReplaceOnce(text, "    vibrations: [3657.1, 1594.7, 3755.9]\n",
                     "    vibrations: [3657.1, 1594.7, 3755.9]\n    fit-temperatures: {mid: 5999}\n");
  const std::vector<Species> species = ReadSpeciesText(text, "two-bad.yaml");
  REQUIRE(species.size() == 4);
  for (const int num_jobs : {1, 3}) {
    try {
      FitAllSpecies(species, Jobs(num_jobs));
      FAIL("FitAllSpecies accepted two impossible fits");
    } catch (const Error& e) {
      const std::string message = e.what();
      // N2's label is on line 9, H2O's (after the line added to N2) on line 24.
      CHECK_THAT(message, Contains("two-bad.yaml:9:3: species 'N2'"));
      CHECK_THAT(message, Contains("two-bad.yaml:24:3: species 'H2O'"));
      CHECK(message.find("CO2") == std::string::npos);
      CHECK(message.find("'Ar'") == std::string::npos);
      // In input order, one line each.
      CHECK(message.find("'N2'") < message.find("'H2O'"));
      CHECK(std::count(message.begin(), message.end(), '\n') == 1);
    }
  }
}

TEST_CASE("check finds nothing in freshly regenerated entries", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
  const CheckResult result = CheckEntries(fits, Committed(fits, Base(2)), Base(1));
  CHECK(result.Passed());
  CHECK(result.findings.empty());
  CHECK(result.names == std::vector<std::string>{"N2", "CO2", "H2O", "Ar"});
  // A second regeneration with another thread count is checked clean against the first.
  const std::vector<SpeciesFit> again = FitAllSpecies(species, Base(4));
  CHECK(CheckEntries(again, Committed(fits, Base(2)), Base(4)).Passed());
}

TEST_CASE("check reports a species without entry and an entry without species", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
  const EntriesFile complete = Committed(fits, Base(2));

  SECTION("missing") {
    EntriesFile without_co2 = complete;
    without_co2.entries.erase(without_co2.entries.begin() + 1);
    const CheckResult result = CheckEntries(fits, without_co2, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"CO2 missing"});
    CHECK(result.findings[0].location.ToString() == std::string(kReferenceName) + ":16:3");
    CHECK(result.names.size() == 4);
  }
  SECTION("extra") {
    // Ar removed from the species list, still in the entries file (its block starts at line 28).
    std::vector<Species> fewer(species.begin(), species.begin() + 3);
    const std::vector<SpeciesFit> fewer_fits = FitAllSpecies(fewer, Base(2));
    const CheckResult result = CheckEntries(fewer_fits, complete, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"Ar extra"});
    CHECK(result.findings[0].location.file == "committed.entries");
    CHECK(result.findings[0].location.line == complete.entries[3].location.line);
    CHECK(result.findings[0].location.line > 0);
    CHECK(result.names == std::vector<std::string>{"N2", "CO2", "H2O", "Ar"});
  }
}

TEST_CASE("check reports an entry that was not regenerated after a vibration was edited",
          "[mechanism]") {
  const std::string original = ReferenceText();
  const std::vector<Species> before = ReadSpeciesText(original, kReferenceName);
  const EntriesFile committed = Committed(FitAllSpecies(before, Base(2)), Base(2));

  // The edit a user might make: N2's fundamental 2329.9 cm^-1 replaced by its harmonic
  // wavenumber we = 2358.57 cm^-1 (Huber & Herzberg 1979, from memory).
  const std::vector<Species> after = ReadSpeciesText(
      ReplaceOnce(original, "vibrations: [2329.9]", "vibrations: [2358.57]"), kReferenceName);
  CHECK(after[0].input_digest != before[0].input_digest);
  CHECK(after[1].input_digest == before[1].input_digest);
  const CheckResult result = CheckEntries(FitAllSpecies(after, Base(2)), committed, Base(2));
  REQUIRE(Summary(result) == std::vector<std::string>{"N2 stale"});
  CHECK(result.findings[0].location.ToString() == std::string(kReferenceName) + ":9:3");
  CHECK_THAT(result.findings[0].message, Contains("input changed"));
  CHECK_THAT(result.findings[0].message, Contains(before[0].input_digest.substr(0, 12)));
  CHECK_THAT(result.findings[0].message, Contains(after[0].input_digest.substr(0, 12)));
}

TEST_CASE("check compares curves within a tolerance far above rounding", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
  EntriesFile committed = Committed(fits, Base(2));
  Entry& co2 = *FindEntry(committed, "CO2");

  SECTION("a change of one unit in the last place of every coefficient is not a finding") {
    for (NasaCoefficients* a : {&co2.polynomial.low, &co2.polynomial.high}) {
      for (double& value : *a) value = std::nextafter(value, std::numeric_limits<double>::max());
    }
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    CHECK(result.Passed());
  }
  SECTION("a Cp coefficient changed by 1e-4 relative is a curve change in Cp") {
    // a1 of the low range carries most of Cp/R near t_low, so the relative change of Cp there
    // is of the order of the perturbation, 100 times the 1e-6 tolerance.
    co2.polynomial.low[0] *= 1.0 + 1e-4;
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"CO2 curve-changed"});
    CHECK_THAT(result.findings[0].message, Contains("Cp by"));
    CHECK_THAT(result.findings[0].location.ToString(), Contains(":16:3"));
  }
  SECTION("the enthalpy constant changed by 1e-4 relative is a curve change in H only") {
    // a6/T alone changes H/RT: |a6| ~ 5e4 K gives 5 / T, far beyond 1e-6 at any T <= 6000 K.
    co2.polynomial.high[5] *= 1.0 + 1e-4;
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"CO2 curve-changed"});
    CHECK_THAT(result.findings[0].message, Contains("H by"));
    CHECK(result.findings[0].message.find("Cp by") == std::string::npos);
    CHECK(result.findings[0].message.find("S by") == std::string::npos);
  }
  SECTION("the entropy constant shifted by 1e-5 is a curve change in S only") {
    co2.polynomial.high[6] += 1e-5;
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"CO2 curve-changed"});
    CHECK_THAT(result.findings[0].message, Contains("S by 1e-05 R"));
  }
  SECTION("a moved mid temperature is a range change") {
    co2.polynomial.t_mid_k = 1100.0;
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    REQUIRE(!result.findings.empty());
    CHECK(result.findings[0].kind == FindingKind::kRangeChanged);
    CHECK_THAT(result.findings[0].message, Contains("200 1100 6000 K in the entry"));
  }
  SECTION("a hand-edited formation enthalpy is a data change") {
    co2.formation_enthalpy_j_per_mol = -393520.0;  // JANAF's -393.52 kJ/mol (from memory)
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"CO2 data-changed"});
    CHECK_THAT(result.findings[0].message, Contains("-393520 J/mol in the entry, -393510 J/mol now"));
  }
}

// Run for both objectives. KNOWN DEFECT (minimax, tagged [!mayfail] so that it stays visible in
// the test output without failing ctest): the minimax optimum is not always unique. When one
// range sets the worst error, the other keeps some freedom at the same worst error, and which of
// the equally good solutions the exchange ends on can turn on a rounding-level change of the
// curves; H2O of the reference file moves by ~7e-4 in Cp at 200 K. The cure is a second stage
// that makes the solution unique (docs/fitting.md, "Open problems").
void RequireRoundingInsensitive(FitObjective objective) {
  // What another compiler or libm could do: every exact value a couple of units in the last
  // place off (4e-16 relative, alternating in sign), refitted at the same mid temperature.
  constexpr double kRoundingRelative = 4e-16;
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  RegenerateOptions base = Base(2);
  base.objective_override = objective;
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, base);
  const EntriesFile committed = Committed(fits, base);
  std::vector<SpeciesFit> perturbed = fits;
  for (SpeciesFit& fit : perturbed) {
    int sign = 1;
    for (std::vector<double>* values :
         {&fit.exact.cp_over_r, &fit.exact.h_over_rt, &fit.exact.s_over_r}) {
      for (double& value : *values) {
        value *= 1.0 + sign * kRoundingRelative;
        sign = -sign;
      }
    }
    FitOptions options = FitOptionsFor(*fit.species, base);
    options.t_mid_k = fit.fit.polynomial.t_mid_k;
    const FitResult refit = FitTwoRange(fit.exact, options, fit.species->thresholds);
    // The perturbation did reach the coefficients, so the check below is not trivially clean.
    CHECK(refit.polynomial.low != fit.fit.polynomial.low);
    fit.fit = refit;
  }
  const CheckResult result = CheckEntries(perturbed, committed, base);
  CHECK(result.Passed());
  for (const Finding& finding : result.findings) FAIL_CHECK(finding.species + ": " + finding.message);
}

TEST_CASE("rounding-level changes of the exact curves are not a curve change (least squares)",
          "[mechanism]") {
  RequireRoundingInsensitive(FitObjective::kLeastSquares);
}

TEST_CASE("rounding-level changes of the exact curves are not a curve change (minimax)",
          "[mechanism][!mayfail]") {
  RequireRoundingInsensitive(FitObjective::kMinimax);
}

TEST_CASE("curve differences are measured where they are largest", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
  const TwoRangePolynomial& p = fits[0].fit.polynomial;
  const CurveDifference none = CompareCurves(p, p, p.t_low_k, p.t_high_k);
  CHECK(none.max_cp_relative == 0.0);
  CHECK(none.max_h_over_rt == 0.0);
  CHECK(none.max_s_over_r == 0.0);
  // A shift of a6 by d changes H/RT by d / T: largest at the lowest temperature compared.
  TwoRangePolynomial shifted = p;
  shifted.low[5] += 1.0;
  const CurveDifference d = CompareCurves(shifted, p, p.t_low_k, p.t_high_k);
  CHECK(d.max_h_t_k == p.t_low_k);
  CHECK(d.max_h_over_rt == Approx(1.0 / p.t_low_k).epsilon(1e-9));
  CHECK(d.max_cp_relative == 0.0);
  CHECK(d.max_s_over_r == 0.0);
}

TEST_CASE("check reports fits that miss their quality thresholds", "[mechanism]") {
  const std::string original = ReferenceText();
  SECTION("committed and regenerated fits both fail") {
    // A Cp threshold of 1e-5 is far below what 2 x 7 coefficients can follow over 200 to 6000 K
    // for N2 (its fit errors are of order 1e-3, docs/fitting.md), so the fit must miss it.
    const std::vector<Species> strict = ReadSpeciesText(
        ReplaceOnce(original, "    vibrations: [2329.9]\n",
                    "    vibrations: [2329.9]\n    fit-thresholds: {cp: 0.00001}\n"),
        kReferenceName);
    const std::vector<SpeciesFit> fits = FitAllSpecies(strict, Base(2));
    REQUIRE_FALSE(fits[0].fit.quality.MeetsThresholds());
    const CheckResult result = CheckEntries(fits, Committed(fits, Base(2)), Base(2));
    REQUIRE(Summary(result) == std::vector<std::string>{"N2 fit-fails"});
    CHECK_THAT(result.findings[0].message, Contains("committed entry and regeneration"));
    CHECK_THAT(result.findings[0].message, Contains("exceeds 0.001 %"));
  }
  SECTION("a committed entry marked failing is reported though the regeneration passes") {
    const std::vector<Species> species = ReadSpeciesText(original, kReferenceName);
    const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
    EntriesFile committed = Committed(fits, Base(2));
    Entry& h2o = *FindEntry(committed, "H2O");
    h2o.quality.threshold_failures = {"low range: max |dCp|/Cp = 0.71 % at 215 K exceeds 0.5 %"};
    const CheckResult result = CheckEntries(fits, committed, Base(2));
    // The failure line is also a recorded quality figure the regeneration does not reproduce.
    REQUIRE(Summary(result) == std::vector<std::string>{"H2O quality-changed", "H2O fit-fails"});
    CHECK_THAT(result.findings[0].message, Contains("verdict fail in the entry, pass regenerated"));
    CHECK_THAT(result.findings[1].message, Contains("committed entry has verdict fail: low range"));
  }
}

TEST_CASE("check reports entries written with other model options", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const RegenerateOptions plain = Base(2);
  const EntriesFile committed = Committed(FitAllSpecies(species, plain), plain);

  RegenerateOptions smooth = Base(2);
  smooth.continuous_second_derivative = true;
  const CheckResult result = CheckEntries(FitAllSpecies(species, smooth), committed, smooth);
  // The extra constraint costs accuracy: CO2 and H2O then miss their thresholds (fit-fails,
  // reported independently). Every species has its model change, and nothing else is found.
  std::vector<std::string> changed;
  for (const Finding& finding : result.findings) {
    if (finding.kind == FindingKind::kFitFails) continue;
    CHECK(finding.kind == FindingKind::kModelChanged);
    changed.push_back(finding.species);
  }
  CHECK(changed == std::vector<std::string>{"N2", "CO2", "H2O", "Ar"});
  CHECK_THAT(result.findings[0].message,
             Contains("cp-curvature-at-mid: free in the entry, continuous requested by "
                      "--smooth-curvature; drop --smooth-curvature to check the entry as it was "
                      "made"));

  // The species file's own fixed mid temperature instead of the automatic choice.
  const RegenerateOptions file_mid = Jobs(2);
  const CheckResult fixed = CheckEntries(FitAllSpecies(species, file_mid), committed, file_mid);
  REQUIRE(!fixed.findings.empty());
  CHECK(fixed.findings[0].species == "N2");
  CHECK(fixed.findings[0].kind == FindingKind::kModelChanged);
  CHECK_THAT(fixed.findings[0].message, Contains("t-mid-choice: auto in the entry, fixed at 1000 K"));
  CHECK_THAT(fixed.findings[0].message, Contains("regenerated curves differ by Cp"));

  // An objective requested on the command line that the entry does not record.
  RegenerateOptions squares = Base(2);
  squares.objective_override = FitObjective::kLeastSquares;
  const CheckResult objective =
      CheckEntries(FitAllSpecies(species, squares), committed, squares);
  REQUIRE(!objective.findings.empty());
  CHECK(objective.findings[0].kind == FindingKind::kModelChanged);
  CHECK_THAT(objective.findings[0].message,
             Contains("fit-objective: minimax in the entry, least-squares requested by "
                      "--objective; drop --objective"));
}

TEST_CASE("check regenerates each entry with the settings it records", "[mechanism]") {
  // Issue 12 item 6: after `fit --mid 1000 --objective least-squares --extrapolation-guard off
  // --smooth-curvature`, a plain `check` (no options retyped) must find nothing but what the
  // fits themselves fail.
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  RegenerateOptions made = Jobs(2);
  made.t_mid_override_k = 1000.0;
  made.objective_override = FitObjective::kLeastSquares;
  made.extrapolation_guard_override = ExtrapolationGuard{false, 1.25, 0.2};
  made.continuous_second_derivative = true;
  const EntriesFile committed = Committed(FitAllSpecies(species, made), made);
  for (const Entry& entry : committed.entries) {
    CHECK(entry.fit_settings.t_mid_fixed);
    CHECK(entry.fit_settings.objective == FitObjective::kLeastSquares);
    CHECK_FALSE(entry.fit_settings.extrapolation_guard.enabled);
    CHECK(entry.fit_settings.continuous_second_derivative);
  }

  RegenerateOptions plain = Jobs(2);
  RecordCommittedSettings(committed, &plain);
  const CheckResult result = CheckEntries(FitAllSpecies(species, plain), committed, plain);
  for (const Finding& finding : result.findings) {
    CHECK(finding.kind == FindingKind::kFitFails);
  }
  // Without the recorded settings the same check reports every entry as made differently.
  const RegenerateOptions forgetful = Jobs(2);
  const CheckResult blind = CheckEntries(FitAllSpecies(species, forgetful), committed, forgetful);
  int num_changed = 0;
  for (const Finding& finding : blind.findings) {
    num_changed += finding.kind == FindingKind::kModelChanged ? 1 : 0;
  }
  CHECK(num_changed == static_cast<int>(species.size()));
}

TEST_CASE("check finds falsified quality figures", "[mechanism]") {
  const std::vector<Species> species = ReadSpeciesText(ReferenceText(), kReferenceName);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Base(2));
  const EntriesFile honest = Committed(fits, Base(2));
  const auto quality_findings = [&](const EntriesFile& committed) {
    std::vector<std::string> messages;
    for (const Finding& finding : CheckEntries(fits, committed, Base(2)).findings) {
      if (finding.kind == FindingKind::kQualityChanged) messages.push_back(finding.message);
    }
    return messages;
  };
  CHECK(quality_findings(honest).empty());

  SECTION("every Cp error set to 0") {
    EntriesFile forged = honest;
    Entry& co2 = *FindEntry(forged, "CO2");
    for (RangeQuality* range : {&co2.quality.low_range, &co2.quality.high_range}) {
      range->max_cp_relative = 0.0;
      range->rms_cp_relative = 0.0;
    }
    const std::vector<std::string> messages = quality_findings(forged);
    REQUIRE(messages.size() == 1);
    CHECK_THAT(messages[0], Contains("cp-error low max 0 in the entry"));
  }
  SECTION("an extrapolation relabelled") {
    EntriesFile forged = honest;
    Entry& n2 = *FindEntry(forged, "N2");
    n2.quality.extrapolation.sane = !n2.quality.extrapolation.sane;
    const std::vector<std::string> messages = quality_findings(forged);
    REQUIRE(messages.size() == 1);
    CHECK_THAT(messages[0], Contains("extrapolation"));
    CHECK_THAT(messages[0], Contains("in the entry"));
  }
  SECTION("grid counts and the form limit") {
    EntriesFile forged = honest;
    Entry& ar = *FindEntry(forged, "Ar");
    ar.quality.low_range.num_points += 1;
    ar.quality.form_limit = {true, 0.5, true, 200.0, 6000.0};
    const std::vector<std::string> messages = quality_findings(forged);
    REQUIRE(messages.size() == 1);
    CHECK_THAT(messages[0], Contains("grid-points low"));
    CHECK_THAT(messages[0], Contains("form-limit best-threshold-ratio 0.5"));
  }
}

TEST_CASE("a cosmetic edit of the species file is reported as such", "[mechanism]") {
  // 2329.9 and 2329.90 are the same number: the physics cannot change. Either the input digest
  // ignores the edit (no finding) or check says "input text changed, physics unchanged", never
  // a curve difference "at 0 K".
  const std::string original = ReferenceText();
  const std::vector<Species> before = ReadSpeciesText(original, kReferenceName);
  const EntriesFile committed = Committed(FitAllSpecies(before, Base(2)), Base(2));
  const std::vector<Species> after = ReadSpeciesText(
      ReplaceOnce(original, "vibrations: [2329.9]", "vibrations: [2329.90]"), kReferenceName);
  const CheckResult result = CheckEntries(FitAllSpecies(after, Base(2)), committed, Base(2));
  for (const Finding& finding : result.findings) {
    if (finding.kind == FindingKind::kFitFails) continue;
    CHECK(finding.species == "N2");
    CHECK(finding.kind == FindingKind::kStale);
    CHECK_THAT(finding.message, Catch::StartsWith("input text changed, physics unchanged"));
    CHECK_THAT(finding.message, !Contains("at 0 K"));
  }
}

TEST_CASE("finding kinds have one spelling each", "[mechanism]") {
  CHECK(ToString(FindingKind::kMissing) == "missing");
  CHECK(ToString(FindingKind::kExtra) == "extra");
  CHECK(ToString(FindingKind::kStale) == "stale");
  CHECK(ToString(FindingKind::kModelChanged) == "model-changed");
  CHECK(ToString(FindingKind::kDataChanged) == "data-changed");
  CHECK(ToString(FindingKind::kRangeChanged) == "range-changed");
  CHECK(ToString(FindingKind::kCurveChanged) == "curve-changed");
  CHECK(ToString(FindingKind::kQualityChanged) == "quality-changed");
  CHECK(ToString(FindingKind::kFitFails) == "fit-fails");
}

TEST_CASE("the JUnit report has one test case per species and escapes text", "[mechanism]") {
  CheckResult result;
  result.names = {"N2", "A&B<\"x\">", "Ar"};
  result.findings.push_back({FindingKind::kStale, "A&B<\"x\">", "input 'changed'\x01",
                             SourceLocation{"s.yaml", 3, 5}});
  result.findings.push_back({FindingKind::kExtra, "A&B<\"x\">", "line\nbreak", SourceLocation{}});
  const std::string xml = FormatJUnitReport(result, "suite & co");
  CHECK(xml ==
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
        "<testsuite name=\"suite &amp; co\" tests=\"3\" failures=\"1\" errors=\"0\" "
        "skipped=\"0\">\n"
        "  <testcase classname=\"suite &amp; co\" name=\"N2\"/>\n"
        "  <testcase classname=\"suite &amp; co\" name=\"A&amp;B&lt;&quot;x&quot;&gt;\">\n"
        "    <failure type=\"stale\" message=\"stale: input &apos;changed&apos;\\x01\">s.yaml:3:5: "
        "stale: input &apos;changed&apos;\\x01</failure>\n"
        "    <failure type=\"extra\" message=\"extra: line&#10;break\">extra: "
        "line&#10;break</failure>\n"
        "  </testcase>\n"
        "  <testcase classname=\"suite &amp; co\" name=\"Ar\"/>\n"
        "</testsuite>\n");
  CHECK(FormatJUnitReport(result, "suite & co") == xml);
}

// The worst error of a fit in units of its thresholds, over both ranges: Cp, H and S.
double WorstNormalisedError(const FitQuality& quality, const QualityThresholds& thresholds) {
  double worst = 0.0;
  for (const RangeQuality* range : {&quality.low_range, &quality.high_range}) {
    worst = std::max({worst, range->max_cp_relative / thresholds.max_cp_relative,
                      range->max_h_over_rt / thresholds.max_h_over_rt,
                      range->max_s_over_r / thresholds.max_s_over_r});
  }
  return worst;
}

TEST_CASE("demo fits agree with those made before the speed-ups, within the stated tolerance",
          "[mechanism]") {
  // tests/data/demo-before-speedups.entries: `sevenfold fit species/*.yaml` by the engine before
  // the changes of docs/performance.md ("Results unchanged"), which change summation orders,
  // level cuts and factorisations at the level of rounding. Stated tolerance: where the mid
  // temperature is the same, the fitted Cp/R (relative), H/RT and S/R differ by less than 1e-8
  // of the species' thresholds at every kelvin of the range (seen: 9.5e-10); where the search
  // settles elsewhere (a flat objective), the worst error in units of the thresholds is at most
  // 2e-3 (relative) worse (seen: none worse), or both are at rounding level (< 1e-6: atoms).
  std::vector<std::string> paths;
  for (const auto& file :
       std::filesystem::directory_iterator(std::string(SEVENFOLD_SOURCE_DIR) + "/species")) {
    if (file.path().extension() == ".yaml") paths.push_back(file.path().string());
  }
  std::sort(paths.begin(), paths.end());
  REQUIRE(paths.size() == 4);
  const std::vector<Species> species = ReadSpeciesFiles(paths);
  // The baseline was made by least squares (the only objective then); minimax fits differ by
  // design, so this regression check runs the least-squares objective, guard off (it is ignored
  // by least squares).
  RegenerateOptions options = Jobs(2);
  options.objective_override = FitObjective::kLeastSquares;
  options.extrapolation_guard_override = ExtrapolationGuard{false, 1.25, 0.2};
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, options);
  EntriesFile before = ReadEntriesFile(std::string(SEVENFOLD_SOURCE_DIR) +
                                       "/tests/data/demo-before-speedups.entries");
  REQUIRE(before.entries.size() == fits.size());
  int same_mid = 0, num_compared = 0;
  for (const SpeciesFit& fit : fits) {
    const Species& one = *fit.species;
    INFO(one.name);
    const Entry& old = *FindEntry(before, one.name);
    const Entry now = MakeEntry(fit, options);
    // The demo's polyatomics went back to the trade's 200-6000 K (issue 14) after the baseline
    // was made: a species whose range changed is another fit problem, not comparable.
    if (old.polynomial.t_low_k != now.polynomial.t_low_k ||
        old.polynomial.t_high_k != now.polynomial.t_high_k) {
      continue;
    }
    ++num_compared;
    const TwoRangePolynomial& p = now.polynomial;
    if (old.polynomial.t_mid_k == p.t_mid_k) {
      ++same_mid;
      const QualityThresholds& thr = one.thresholds;
      double largest = 0.0;
      for (double t = p.t_low_k; t <= p.t_high_k; t += 1.0) {
        const double cp_old = CpOverR(old.polynomial, t);
        largest = std::max({largest,
                            std::fabs(CpOverR(p, t) - cp_old) / cp_old / thr.max_cp_relative,
                            std::fabs(HOverRT(p, t) - HOverRT(old.polynomial, t)) / thr.max_h_over_rt,
                            std::fabs(SOverR(p, t) - SOverR(old.polynomial, t)) / thr.max_s_over_r});
      }
      CHECK(largest < 1e-8);
    }
    const double worst_old = WorstNormalisedError(old.quality, one.thresholds);
    const double worst_now = WorstNormalisedError(now.quality, one.thresholds);
    CHECK((worst_now <= worst_old * (1.0 + 2e-3) || std::max(worst_now, worst_old) < 1e-6));
  }
  // Most mid temperatures are unchanged (seen: 33 of 36 before the range change); the curve
  // check must not be vacuous.
  CHECK(num_compared >= 20);
  CHECK(same_mid >= num_compared * 8 / 10);
}

// The tabulated path against the molecular one: CO2 (constants from memory of the NIST
// Chemistry WebBook, as in tests/data/reference-species.yaml) tabulated from its exact curves,
// read back through the species reader and fitted like any other species.
TEST_CASE("a species fitted from its own tabulated curves gets the same polynomial",
          "[mechanism]") {
  const std::string head =
      "sevenfold-species: 2\n"
      "defaults:\n  fit-temperatures: {low: 200, mid: 1000, high: 6000}\n"
      "species:\n";
  const std::string molecular =
      "  CO2:\n    formula: CO2\n    formation-enthalpy: -393.51 kJ/mol\n    shape: linear\n"
      "    symmetry-number: 2\n    rotational-constants: [0.39021]\n"
      "    vibrations: [1333.0, 667.4, 667.4, 2349.2]\n";
  const Species co2 = ReadSpeciesText(head + molecular, "co2.yaml").at(0);
  const SpeciesThermo exact(co2);
  // Rows every 50 K over the whole fit range, and rows over 300-3000 K only: the fit's range then
  // reaches beyond the table on both sides, where the Wilhoit form takes over.
  const auto table = [&](const std::string& label, double from_k, double to_k) {
    std::ostringstream text;
    text.precision(17);
    text << "  " << label << ":\n    formula: CO2\n    formation-enthalpy: -393.51 kJ/mol\n"
         << "    shape: linear\n    tabulated-cp:\n      reference-entropy: [298.15, "
         << exact.At(298.15).s_j_per_mol_k << "]\n      points:\n";
    for (double t = from_k; t <= to_k + 1e-9; t += 50.0) {
      text << "        - [" << t << ", " << exact.At(t).cp_j_per_mol_k << "]\n";
    }
    return text.str();
  };
  const std::vector<Species> species = ReadSpeciesText(
      head + molecular + table("CO2-full", 200.0, 6000.0) + table("CO2-part", 300.0, 3000.0),
      "co2.yaml");
  REQUIRE(species.size() == 3);
  REQUIRE(species[1].tabulated.has_value());
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, Jobs(2));
  const TwoRangePolynomial& reference = fits[0].fit.polynomial;
  // Rows 50 K apart move Cp by about 1e-5 relative on CO2 (the h^3 scaling of the bound at
  // 50-100 K spacing in tests/statmech_test.cc); two best fits to curves that close differ by a
  // few times that at most.
  constexpr double kFullCp = 2e-4, kFullHOverRT = 1e-4, kFullSOverR = 1e-4;
  // Beyond a table of 300-3000 K the Wilhoit form is an extrapolation, not CO2's physics: above
  // 3000 K both approach the classical 7.5 R (CO2's Cp is within 2 % of it there), below 300 K
  // the table cannot tell where the bending mode freezes out (docs/theory.md, section 12: 1.5 %
  // in Cp at 200 K, seen); 2 % bounds it, and H/RT, S/R carry it over (1.2e-2 seen).
  constexpr double kPartCp = 2e-2, kPartHOverRT = 2e-2, kPartSOverR = 2e-2;
  struct Case {
    std::size_t index;
    double cp_relative, h_over_rt, s_over_r;
  };
  for (const Case& c : {Case{1, kFullCp, kFullHOverRT, kFullSOverR},
                        Case{2, kPartCp, kPartHOverRT, kPartSOverR}}) {
    INFO(species[c.index].name);
    const TwoRangePolynomial& p = fits[c.index].fit.polynomial;
    CHECK(p.t_mid_k == reference.t_mid_k);
    for (double t = 200.0; t <= 6000.0; t += 25.0) {
      INFO(t);
      CHECK_THAT(CpOverR(p, t), Catch::Matchers::WithinRel(CpOverR(reference, t), c.cp_relative));
      CHECK(std::abs(HOverRT(p, t) - HOverRT(reference, t)) <= c.h_over_rt);
      CHECK(std::abs(SOverR(p, t) - SOverR(reference, t)) <= c.s_over_r);
    }
  }
  // The coefficients of the full table's fit: each range's Cp terms a_k T^(k-1) at the range's
  // upper end (the terms of a best fit are strongly correlated, so they are compared as the sum
  // of their moves, against 1000 times the curve tolerance: five monomial terms over one range
  // are conditioned of order 10^3, common practice; seen 123 times on the low range with the
  // minimax fit, whose optimum is not unique, see docs/fitting.md), a6/T against H/RT, a7 against
  // S/R.
  constexpr double kTermCorrelation = 1000.0;
  const TwoRangePolynomial& full = fits[1].fit.polynomial;
  for (const auto& [a, b, t_top] : {std::tuple{full.low, reference.low, full.t_mid_k},
                                    std::tuple{full.high, reference.high, full.t_high_k}}) {
    INFO(t_top);
    double power = 1.0, moved = 0.0;
    for (int k = 0; k < 5; ++k, power *= t_top) moved += std::abs(a[k] - b[k]) * power;
    CHECK(moved <= kTermCorrelation * kFullCp * CpOverR(reference, t_top));
    CHECK(std::abs(a[5] - b[5]) / t_top <= kTermCorrelation * kFullHOverRT);
    CHECK(std::abs(a[6] - b[6]) <= kTermCorrelation * kFullSOverR);
  }
}

}  // namespace
}  // namespace sevenfold

namespace sevenfold {
namespace {

TEST_CASE("an ion's entry states the electron convention of its formation enthalpy",
          "[mechanism]") {
  // OH- with the constants of OH (a stand-in: only the charge matters here).
  const std::string text =
      "sevenfold-species: 2\n"
      "defaults:\n  fit-temperatures: {low: 200, mid: 1000, high: 3000}\n"
      "species:\n"
      "  OH-:\n    formula: OH-\n    formation-enthalpy: -143.2 kJ/mol\n    shape: linear\n"
      "    symmetry-number: 1\n    rotational-constants: [18.9]\n    vibrations: [3700]\n"
      "  OH:\n    formula: OH\n    formation-enthalpy: 37.3 kJ/mol\n    shape: linear\n"
      "    symmetry-number: 1\n    rotational-constants: [18.9]\n    vibrations: [3700]\n"
      "    spin-multiplicity: 2\n";
  const std::vector<Species> species = ReadSpeciesText(text, "ions.yaml");
  REQUIRE(species.size() == 2);
  const RegenerateOptions options = Jobs(1);
  const std::vector<SpeciesFit> fits = FitAllSpecies(species, options);
  CHECK_THAT(MakeEntry(fits[0], options).provenance.model_options,
             Catch::Matchers::EndsWith("ion: formation enthalpy in the thermal electron convention"));
  CHECK_THAT(MakeEntry(fits[1], options).provenance.model_options,
             !Catch::Matchers::Contains("electron convention"));
}

}  // namespace
}  // namespace sevenfold

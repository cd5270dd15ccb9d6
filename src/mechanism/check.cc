// SPDX-License-Identifier: MIT
#include "mechanism/check.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/output_text.h"

namespace sevenfold {

std::string ToString(FindingKind kind) {
  switch (kind) {
    case FindingKind::kMissing: return "missing";
    case FindingKind::kExtra: return "extra";
    case FindingKind::kStale: return "stale";
    case FindingKind::kModelChanged: return "model-changed";
    case FindingKind::kDataChanged: return "data-changed";
    case FindingKind::kRangeChanged: return "range-changed";
    case FindingKind::kCurveChanged: return "curve-changed";
    case FindingKind::kQualityChanged: return "quality-changed";
    case FindingKind::kFitFails: return "fit-fails";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

namespace {


// Keeps the larger of `value` and `*max`, with its temperature (the first one on ties).
void KeepMax(double value, double t_k, double* max, double* max_t_k) {
  if (value > *max) {
    *max = value;
    *max_t_k = t_k;
  }
}

bool NearlyEqual(double a, double b) {
  return std::abs(a - b) <= kRangeRelativeTolerance * std::max(std::abs(a), std::abs(b));
}

bool SameRange(const TwoRangePolynomial& a, const TwoRangePolynomial& b) {
  return NearlyEqual(a.t_low_k, b.t_low_k) && NearlyEqual(a.t_mid_k, b.t_mid_k) &&
         NearlyEqual(a.t_high_k, b.t_high_k);
}

std::string ShortDigest(const std::string& digest) {
  return digest.size() > 12 ? digest.substr(0, 12) : digest;
}

std::string JoinLines(const std::vector<std::string>& lines) {
  std::string text;
  for (const std::string& line : lines) {
    if (!text.empty()) text += "; ";
    text += line;
  }
  return text;
}

// The curve difference of an entry from its regeneration over the temperatures both cover;
// nullopt when the ranges do not overlap.
std::optional<CurveDifference> DifferenceOver(const Entry& committed, const Entry& regenerated) {
  const double low_k = std::max(committed.polynomial.t_low_k, regenerated.polynomial.t_low_k);
  const double high_k = std::min(committed.polynomial.t_high_k, regenerated.polynomial.t_high_k);
  if (!(low_k < high_k)) return std::nullopt;
  return CompareCurves(committed.polynomial, regenerated.polynomial, low_k, high_k);
}

// "Cp 1.2e-05 relative at 215 K, H 3e-06 RT at 1000 K, S 2e-06 R at 1000 K", or "none" when
// the curves are identical at every sample.
std::string DescribeDifference(const CurveDifference& d) {
  if (d.max_cp_relative == 0.0 && d.max_h_over_rt == 0.0 && d.max_s_over_r == 0.0) {
    return "nothing (identical at every sample)";
  }
  return fmt::format("Cp {:.2g} relative at {:.5g} K, H {:.2g} RT at {:.5g} K, S {:.2g} R at {:.5g} K",
                     d.max_cp_relative, d.max_cp_t_k, d.max_h_over_rt, d.max_h_t_k,
                     d.max_s_over_r, d.max_s_t_k);
}

// The parts of a curve difference beyond tolerance, or "" when none.
std::string DescribeExcess(const CurveDifference& d, const CurveTolerances& tol) {
  std::vector<std::string> parts;
  if (d.max_cp_relative > tol.max_cp_relative) {
    parts.push_back(fmt::format("Cp by {:.2g} relative at {:.5g} K (tolerance {:g})",
                                d.max_cp_relative, d.max_cp_t_k, tol.max_cp_relative));
  }
  if (d.max_h_over_rt > tol.max_h_over_rt) {
    parts.push_back(fmt::format("H by {:.2g} RT at {:.5g} K (tolerance {:g})", d.max_h_over_rt,
                                d.max_h_t_k, tol.max_h_over_rt));
  }
  if (d.max_s_over_r > tol.max_s_over_r) {
    parts.push_back(fmt::format("S by {:.2g} R at {:.5g} K (tolerance {:g})", d.max_s_over_r,
                                d.max_s_t_k, tol.max_s_over_r));
  }
  if (parts.empty()) return "";
  return "committed and regenerated curves differ: " + JoinLines(parts);
}

// The fields that come straight from the species input, compared one by one.
std::vector<std::string> DataDifferences(const Entry& committed, const Entry& regenerated) {
  std::vector<std::string> differences;
  const auto composition_text = [](const Entry& entry) {
    std::string text;
    for (const auto& [symbol, count] : entry.composition) {
      text += fmt::format("{}{} {}", text.empty() ? "" : " ", symbol, count);
    }
    return text;
  };
  if (committed.composition != regenerated.composition) {
    differences.push_back(fmt::format("composition {} in the entry, {} now",
                                      composition_text(committed), composition_text(regenerated)));
  }
  if (committed.charge != regenerated.charge) {
    differences.push_back(
        fmt::format("charge {} in the entry, {} now", committed.charge, regenerated.charge));
  }
  if (committed.phase != regenerated.phase) {
    differences.push_back(
        fmt::format("phase {} in the entry, {} now", committed.phase, regenerated.phase));
  }
  if (committed.formation_enthalpy_j_per_mol != regenerated.formation_enthalpy_j_per_mol) {
    differences.push_back(fmt::format("formation enthalpy {} J/mol in the entry, {} J/mol now",
                                      committed.formation_enthalpy_j_per_mol,
                                      regenerated.formation_enthalpy_j_per_mol));
  }
  if (committed.reference_pressure_pa != regenerated.reference_pressure_pa) {
    differences.push_back(fmt::format("reference pressure {} Pa in the entry, {} Pa now",
                                      committed.reference_pressure_pa,
                                      regenerated.reference_pressure_pa));
  }
  return differences;
}

// The fit-fails finding of a species, if any.
std::optional<std::string> FitFailure(const Entry* committed, const SpeciesFit& regenerated) {
  const bool committed_fails = committed != nullptr && !committed->quality.MeetsThresholds();
  const bool regenerated_fails = !regenerated.fit.quality.MeetsThresholds();
  if (regenerated_fails && committed_fails) {
    return "fit misses its quality thresholds (committed entry and regeneration): " +
           JoinLines(regenerated.fit.quality.threshold_failures);
  }
  if (regenerated_fails) {
    return "regenerated fit misses its quality thresholds: " +
           JoinLines(regenerated.fit.quality.threshold_failures);
  }
  if (committed_fails) {
    return "committed entry has verdict fail: " + JoinLines(committed->quality.threshold_failures);
  }
  return std::nullopt;
}

std::string GuardText(const ExtrapolationGuard& guard) {
  return guard.enabled ? fmt::format("factor {} band {}", guard.factor, guard.band) : "off";
}

std::string ScalesText(const ErrorScales& scales) {
  return fmt::format("cp {} h {} s {}", scales.cp_relative, scales.h_over_rt, scales.s_over_r);
}

std::string MidText(const Entry& entry) {
  return entry.fit_settings.t_mid_fixed
             ? fmt::format("fixed at {} K", entry.polynomial.t_mid_k)
             : std::string("auto");
}

// The fit settings of the committed entry that differ from those of this run, each naming the
// option, both values, who asked for this run's value and what to do.
std::vector<std::string> SettingDifferences(const Entry& committed, const Entry& regenerated,
                                            const Species& species,
                                            const RegenerateOptions& regenerate) {
  std::vector<std::string> differences;
  const FitRequest& request = species.fit_request;
  // `option` is the command-line option that asked for this run's value, or nullptr when the
  // species file (file_says) or, failing both, the built-in default did.
  const auto add = [&](const char* field, const std::string& recorded, const std::string& now,
                       const char* option, bool file_says) {
    std::string who, what_to_do;
    if (option != nullptr) {
      who = fmt::format("requested by {}", option);
      what_to_do = fmt::format(
          "drop {} to check the entry as it was made, or run fit with it to remake the entry",
          option);
    } else if (file_says) {
      who = "asked for by the species file";
      what_to_do = "run fit to remake the entry with the species file's setting";
    } else {
      who = "by default (the entry's own setting was not consulted)";
      what_to_do = "check with the settings the entry records (sevenfold check does)";
    }
    differences.push_back(fmt::format("{}: {} in the entry, {} {}; {}", field, recorded, now, who,
                                      what_to_do));
  };
  const EntryFitSettings& c = committed.fit_settings;
  const EntryFitSettings& r = regenerated.fit_settings;
  if (c.objective != r.objective) {
    add("fit-objective", ToString(c.objective), ToString(r.objective),
        regenerate.objective_override ? "--objective" : nullptr, request.objective.has_value());
  }
  if (!(c.extrapolation_guard.enabled == r.extrapolation_guard.enabled &&
        (!c.extrapolation_guard.enabled ||
         (c.extrapolation_guard.factor == r.extrapolation_guard.factor &&
          c.extrapolation_guard.band == r.extrapolation_guard.band)))) {
    add("extrapolation-guard", GuardText(c.extrapolation_guard), GuardText(r.extrapolation_guard),
        regenerate.extrapolation_guard_override ? "--extrapolation-guard" : nullptr,
        request.extrapolation_guard.has_value());
  }
  if (!(c.error_scales.cp_relative == r.error_scales.cp_relative &&
        c.error_scales.h_over_rt == r.error_scales.h_over_rt &&
        c.error_scales.s_over_r == r.error_scales.s_over_r)) {
    add("fit-error-scales", ScalesText(c.error_scales), ScalesText(r.error_scales),
        regenerate.error_scales_override ? "the error-scales override" : nullptr,
        request.error_scales.has_value());
  }
  const bool mid_differs =
      c.t_mid_fixed != r.t_mid_fixed ||
      (c.t_mid_fixed && !NearlyEqual(committed.polynomial.t_mid_k, regenerated.polynomial.t_mid_k));
  if (mid_differs) {
    add("t-mid-choice", MidText(committed), MidText(regenerated),
        regenerate.t_mid_override_k || regenerate.force_auto_mid ? "--mid" : nullptr,
        request.mid_given);
  }
  if (c.continuous_second_derivative != r.continuous_second_derivative) {
    add("cp-curvature-at-mid", c.continuous_second_derivative ? "continuous" : "free",
        r.continuous_second_derivative ? "continuous" : "free",
        regenerate.continuous_second_derivative ? "--smooth-curvature" : nullptr, false);
  }
  if (committed.provenance.model_options != regenerated.provenance.model_options) {
    differences.push_back(fmt::format(
        "model: \"{}\" in the entry, \"{}\" in this run (a sevenfold version that models the "
        "species differently); run fit to remake the entry",
        committed.provenance.model_options, regenerated.provenance.model_options));
  }
  return differences;
}

bool Near(double a, double b, double absolute) { return std::abs(a - b) <= absolute; }
bool NearRelative(double a, double b) {
  return std::abs(a - b) <= kQualityRelativeTolerance * std::max(std::abs(a), std::abs(b));
}

// The recorded quality of the committed entry that differs from the regenerated quality.
std::vector<std::string> QualityDifferences(const FitQuality& c, const FitQuality& r) {
  std::vector<std::string> differences;
  const auto figure = [&](const char* what, double committed, double regenerated) {
    if (!Near(committed, regenerated, kQualityFigureTolerance)) {
      differences.push_back(
          fmt::format("{} {} in the entry, {} regenerated", what, committed, regenerated));
    }
  };
  const std::pair<const char*, const RangeQuality*> ranges[] = {{"low", &c.low_range},
                                                                  {"high", &c.high_range}};
  for (const auto& [name, committed] : ranges) {
    const RangeQuality& regenerated = name[0] == 'l' ? r.low_range : r.high_range;
    if (committed->num_points != regenerated.num_points) {
      differences.push_back(fmt::format("grid-points {} {} in the entry, {} regenerated", name,
                                        committed->num_points, regenerated.num_points));
    }
    const std::string n = name;
    figure(("cp-error " + n + " max").c_str(), committed->max_cp_relative, regenerated.max_cp_relative);
    figure(("cp-error " + n + " rms").c_str(), committed->rms_cp_relative, regenerated.rms_cp_relative);
    figure(("h-error " + n + " max").c_str(), committed->max_h_over_rt, regenerated.max_h_over_rt);
    figure(("h-error " + n + " rms").c_str(), committed->rms_h_over_rt, regenerated.rms_h_over_rt);
    figure(("s-error " + n + " max").c_str(), committed->max_s_over_r, regenerated.max_s_over_r);
    figure(("s-error " + n + " rms").c_str(), committed->rms_s_over_r, regenerated.rms_s_over_r);
    figure(("g-error " + n + " max").c_str(), committed->max_g_over_rt, regenerated.max_g_over_rt);
    figure(("g-error " + n + " rms").c_str(), committed->rms_g_over_rt, regenerated.rms_g_over_rt);
  }
  const ExtrapolationCheck& cx = c.extrapolation;
  const ExtrapolationCheck& rx = r.extrapolation;
  if (cx.sane != rx.sane) {
    differences.push_back(fmt::format("extrapolation {} in the entry, {} regenerated",
                                      cx.sane ? "sane" : "outside-band",
                                      rx.sane ? "sane" : "outside-band"));
  }
  if (!(NearRelative(cx.min_cp_over_r_below, rx.min_cp_over_r_below) &&
        NearRelative(cx.max_cp_over_r_below, rx.max_cp_over_r_below) &&
        NearRelative(cx.min_cp_over_r_above, rx.min_cp_over_r_above) &&
        NearRelative(cx.max_cp_over_r_above, rx.max_cp_over_r_above))) {
    differences.push_back(fmt::format(
        "extrapolation Cp/R below {}..{} above {}..{} in the entry, below {}..{} above {}..{} "
        "regenerated",
        cx.min_cp_over_r_below, cx.max_cp_over_r_below, cx.min_cp_over_r_above,
        cx.max_cp_over_r_above, rx.min_cp_over_r_below, rx.max_cp_over_r_below,
        rx.min_cp_over_r_above, rx.max_cp_over_r_above));
  }
  if (cx.message != rx.message) {
    differences.push_back(fmt::format("extrapolation-note \"{}\" in the entry, \"{}\" regenerated",
                                      cx.message, rx.message));
  }
  const FormLimit& cl = c.form_limit;
  const FormLimit& rl = r.form_limit;
  const auto limit_text = [](const FormLimit& limit) {
    if (!limit.computed) return std::string("not-evaluated");
    return fmt::format("best-threshold-ratio {} widest-passing-range-k {}",
                       limit.best_threshold_ratio,
                       limit.passing_range_found
                           ? fmt::format("{} to {}", limit.passing_t_low_k, limit.passing_t_high_k)
                           : std::string("none"));
  };
  const bool limits_agree =
      cl.computed == rl.computed &&
      (!cl.computed ||
       (NearRelative(cl.best_threshold_ratio, rl.best_threshold_ratio) &&
        cl.passing_range_found == rl.passing_range_found &&
        (!cl.passing_range_found || (NearRelative(cl.passing_t_low_k, rl.passing_t_low_k) &&
                                     NearRelative(cl.passing_t_high_k, rl.passing_t_high_k)))));
  if (!limits_agree) {
    differences.push_back(fmt::format("form-limit {} in the entry, {} regenerated", limit_text(cl),
                                      limit_text(rl)));
  }
  if (c.MeetsThresholds() != r.MeetsThresholds()) {
    differences.push_back(fmt::format("verdict {} in the entry, {} regenerated",
                                      c.MeetsThresholds() ? "pass" : "fail",
                                      r.MeetsThresholds() ? "pass" : "fail"));
  } else if (c.threshold_failures != r.threshold_failures) {
    differences.push_back(fmt::format("failure lines \"{}\" in the entry, \"{}\" regenerated",
                                      JoinLines(c.threshold_failures),
                                      JoinLines(r.threshold_failures)));
  }
  return differences;
}

void CheckOneEntry(const Entry& committed, const SpeciesFit& fit,
                   const RegenerateOptions& regenerate, const CheckOptions& options,
                   std::vector<Finding>* findings) {
  const Species& species = *fit.species;
  const Entry regenerated = MakeEntry(fit, regenerate);
  const auto add = [&](FindingKind kind, std::string message) {
    findings->push_back({kind, species.name, std::move(message), species.location});
  };
  const std::optional<CurveDifference> difference = DifferenceOver(committed, regenerated);
  const std::string consequence =
      difference ? "; regenerated curves differ by " + DescribeDifference(*difference) : "";
  const TwoRangePolynomial& c = committed.polynomial;
  const TwoRangePolynomial& r = regenerated.polynomial;
  const std::vector<std::string> settings =
      SettingDifferences(committed, regenerated, species, regenerate);
  const std::vector<std::string> data = DataDifferences(committed, regenerated);
  const bool same_curves =
      difference && SameRange(c, r) && DescribeExcess(*difference, options.tolerances).empty();
  const std::vector<std::string> quality =
      same_curves ? QualityDifferences(committed.quality, regenerated.quality)
                  : std::vector<std::string>{};

  if (committed.provenance.input_sha256 != species.input_digest) {
    if (same_curves && settings.empty() && data.empty() && quality.empty()) {
      add(FindingKind::kStale,
          fmt::format("input text changed, physics unchanged (input-sha256 {}... in the entry, "
                      "{}... now; the regenerated entry matches the committed one in every "
                      "compared field); run fit to record the new input-sha256",
                      ShortDigest(committed.provenance.input_sha256),
                      ShortDigest(species.input_digest)));
      return;
    }
    add(FindingKind::kStale,
        fmt::format("input changed since the entry was written (input-sha256 {}... in the entry, "
                    "{}... now); run fit again{}",
                    ShortDigest(committed.provenance.input_sha256),
                    ShortDigest(species.input_digest), consequence));
    return;
  }
  if (!settings.empty()) {
    add(FindingKind::kModelChanged,
        fmt::format("entry made differently from this run: {}{}", JoinLines(settings),
                    consequence));
  }
  if (!data.empty()) add(FindingKind::kDataChanged, JoinLines(data));
  if (!settings.empty()) return;

  if (!SameRange(c, r)) {
    add(FindingKind::kRangeChanged,
        fmt::format("temperatures {} {} {} K in the entry, {} {} {} K regenerated", c.t_low_k,
                    c.t_mid_k, c.t_high_k, r.t_low_k, r.t_mid_k, r.t_high_k));
  }
  if (!difference) {
    add(FindingKind::kCurveChanged,
        "committed and regenerated temperature ranges do not overlap; curves not comparable");
  } else if (const std::string excess = DescribeExcess(*difference, options.tolerances);
             !excess.empty()) {
    add(FindingKind::kCurveChanged, excess);
  }
  if (!quality.empty()) {
    add(FindingKind::kQualityChanged,
        "recorded quality differs from the regenerated fit's (a hand edit?): " +
            JoinLines(quality) + "; run fit to rewrite the entry");
  }
}

}  // namespace

CurveDifference CompareCurves(const TwoRangePolynomial& committed,
                              const TwoRangePolynomial& reference, double t_low_k,
                              double t_high_k) {
  SEVENFOLD_ASSERT(t_low_k > 0.0 && t_low_k < t_high_k);
  std::vector<double> temperatures;
  temperatures.reserve(kNumCurveSamples + 3);
  const double log_ratio = std::log(t_high_k / t_low_k);
  for (int i = 0; i < kNumCurveSamples; ++i) {
    temperatures.push_back(i == 0                      ? t_low_k
                           : i == kNumCurveSamples - 1 ? t_high_k
                                                       : t_low_k * std::exp(log_ratio * i /
                                                                             (kNumCurveSamples - 1)));
  }
  for (const double t : {constants::kReferenceTemperature, committed.t_mid_k, reference.t_mid_k}) {
    if (t > t_low_k && t < t_high_k) temperatures.push_back(t);
  }
  std::sort(temperatures.begin(), temperatures.end());

  CurveDifference d;
  for (const double t : temperatures) {
    const double cp_ref = CpOverR(reference, t);
    const double cp_diff = std::abs(CpOverR(committed, t) - cp_ref);
    // A reference Cp of zero only comes from a broken polynomial; any difference then counts as
    // infinitely large, so it is reported.
    const double cp_relative = cp_diff == 0.0 ? 0.0 : cp_diff / std::abs(cp_ref);
    KeepMax(cp_relative, t, &d.max_cp_relative, &d.max_cp_t_k);
    KeepMax(std::abs(HOverRT(committed, t) - HOverRT(reference, t)), t, &d.max_h_over_rt,
            &d.max_h_t_k);
    KeepMax(std::abs(SOverR(committed, t) - SOverR(reference, t)), t, &d.max_s_over_r,
            &d.max_s_t_k);
  }
  return d;
}

CheckResult CheckEntries(const std::vector<SpeciesFit>& regenerated, const EntriesFile& committed,
                         const RegenerateOptions& regenerate, const CheckOptions& options) {
  std::map<std::string, const Entry*> by_name;
  for (const Entry& entry : committed.entries) by_name.emplace(entry.name, &entry);

  CheckResult result;
  std::set<std::string> known;
  for (const SpeciesFit& fit : regenerated) {
    SEVENFOLD_ASSERT(fit.species != nullptr);
    const Species& species = *fit.species;
    result.names.push_back(species.name);
    known.insert(species.name);
    const auto found = by_name.find(species.name);
    const Entry* entry = found == by_name.end() ? nullptr : found->second;
    if (entry == nullptr) {
      result.findings.push_back({FindingKind::kMissing, species.name,
                                 "no entry in the entries file; run fit to add it",
                                 species.location});
    } else {
      CheckOneEntry(*entry, fit, regenerate, options, &result.findings);
    }
    if (const std::optional<std::string> failure = FitFailure(entry, fit)) {
      result.findings.push_back({FindingKind::kFitFails, species.name, *failure, species.location});
    }
  }
  for (const Entry& entry : committed.entries) {
    if (known.count(entry.name) != 0) continue;
    result.names.push_back(entry.name);
    result.findings.push_back(
        {FindingKind::kExtra, entry.name,
         "entry names no species of the species files (removed or renamed?)", entry.location});
  }
  return result;
}

namespace {

// Escapes text for XML 1.0 content or a quoted attribute (core/output_text.h): control
// characters XML 1.0 cannot carry become visible "\xNN", invalid UTF-8 becomes U+FFFD, tab, LF
// and CR become character references.
// XML's own &apos; for the apostrophe (EscapeMarkup writes &#39;, which HTML 4 also knows; its
// output holds "&#39;" only where the text had an apostrophe, since '&' itself is escaped).
std::string XmlEscape(const std::string& text) {
  std::string out = EscapeMarkup(text);
  for (size_t at = out.find("&#39;"); at != std::string::npos; at = out.find("&#39;", at)) {
    out.replace(at, 5, "&apos;");
  }
  return out;
}

}  // namespace

std::string FormatJUnitReport(const CheckResult& result, const std::string& suite_name) {
  std::map<std::string, std::vector<const Finding*>> by_name;
  for (const Finding& finding : result.findings) by_name[finding.species].push_back(&finding);
  const int num_failed = static_cast<int>(by_name.size());

  std::string xml = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  xml += fmt::format(
      "<testsuite name=\"{}\" tests=\"{}\" failures=\"{}\" errors=\"0\" skipped=\"0\">\n",
      XmlEscape(suite_name), result.names.size(), num_failed);
  for (const std::string& name : result.names) {
    const auto found = by_name.find(name);
    if (found == by_name.end()) {
      xml += fmt::format("  <testcase classname=\"{}\" name=\"{}\"/>\n", XmlEscape(suite_name),
                         XmlEscape(name));
      continue;
    }
    xml += fmt::format("  <testcase classname=\"{}\" name=\"{}\">\n", XmlEscape(suite_name),
                       XmlEscape(name));
    for (const Finding* finding : found->second) {
      const std::string kind = ToString(finding->kind);
      const std::string where = finding->location.ToString();
      xml += fmt::format("    <failure type=\"{}\" message=\"{}: {}\">{}{}: {}</failure>\n",
                         kind, kind, XmlEscape(finding->message),
                         where.empty() ? "" : XmlEscape(where) + ": ", kind,
                         XmlEscape(finding->message));
    }
    xml += "  </testcase>\n";
  }
  xml += "</testsuite>\n";
  return xml;
}

}  // namespace sevenfold

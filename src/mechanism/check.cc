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
    case FindingKind::kFitFails: return "fit-fails";
  }
  SEVENFOLD_ASSERT(false);
  return "";
}

namespace {

constexpr double kReferenceTemperatureK = 298.15;

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

// "Cp 1.2e-05 relative at 215 K, H 3e-06 RT at 1000 K, S 2e-06 R at 1000 K".
std::string DescribeDifference(const CurveDifference& d) {
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
      difference ? "; regenerated curves differ by up to " + DescribeDifference(*difference) : "";

  if (committed.provenance.input_sha256 != species.input_digest) {
    add(FindingKind::kStale,
        fmt::format("input changed since the entry was written (input-sha256 {}... in the entry, "
                    "{}... now); run fit again{}",
                    ShortDigest(committed.provenance.input_sha256),
                    ShortDigest(species.input_digest), consequence));
    return;
  }
  if (committed.provenance.model_options != regenerated.provenance.model_options) {
    add(FindingKind::kModelChanged,
        fmt::format("model options differ: \"{}\" in the entry, \"{}\" in this run{}",
                    committed.provenance.model_options, regenerated.provenance.model_options,
                    consequence));
  }
  const std::vector<std::string> data = DataDifferences(committed, regenerated);
  if (!data.empty()) add(FindingKind::kDataChanged, JoinLines(data));
  if (committed.provenance.model_options != regenerated.provenance.model_options) return;

  const TwoRangePolynomial& c = committed.polynomial;
  const TwoRangePolynomial& r = regenerated.polynomial;
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
  for (const double t : {kReferenceTemperatureK, committed.t_mid_k, reference.t_mid_k}) {
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

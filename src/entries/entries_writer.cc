// SPDX-License-Identifier: MIT
// FormatEntries: the canonical text of an entries file (docs/entries-format.md).
#include <cmath>
#include <set>
#include <string>

#include <fmt/format.h>

#include "core/error.h"
#include "entries/entries.h"
#include "entries/entries_syntax.h"

namespace sevenfold {
namespace {

using namespace detail;

// Throws the writer's error for one entry and field.
[[noreturn]] void Refuse(const Entry& entry, const char* field, const std::string& why) {
  throw Error(fmt::format("cannot write entry \"{}\": {}: {}", entry.name, field, why));
}

// Shortest text that reads back to the identical double ({fmt} 9 "{}" is shortest round-trip).
std::string Number(const Entry& entry, const char* field, double value) {
  if (!std::isfinite(value)) Refuse(entry, field, fmt::format("{} is not a finite number", value));
  return fmt::format("{}", value);
}

void CheckWritable(const Entry& entry) {
  if (entry.name.empty()) Refuse(entry, kBlockStart, "the species name is empty");
  if (entry.composition.empty()) Refuse(entry, kFieldComposition, "no elements");
  for (const auto& [symbol, count] : entry.composition) {
    if (!IsElementSymbol(symbol)) {
      Refuse(entry, kFieldComposition, fmt::format("\"{}\" is not an element symbol", symbol));
    }
    if (count < 1) {
      Refuse(entry, kFieldComposition, fmt::format("count {} of {} is not positive", count, symbol));
    }
  }
  if (entry.phase != kPhaseGas) {
    Refuse(entry, kFieldPhase, fmt::format("\"{}\" is not a phase of format version {}",
                                           entry.phase, kEntriesFormatVersion));
  }
  const TwoRangePolynomial& p = entry.polynomial;
  if (!(p.t_low_k > 0.0 && p.t_low_k < p.t_mid_k && p.t_mid_k < p.t_high_k)) {
    Refuse(entry, kFieldTemperatures,
           fmt::format("{} {} {} K; expected 0 < low < mid < high", p.t_low_k, p.t_mid_k,
                       p.t_high_k));
  }
  if (!(entry.reference_pressure_pa > 0.0)) {
    Refuse(entry, kFieldReferencePressure,
           fmt::format("{} Pa is not positive", entry.reference_pressure_pa));
  }
  if (!IsSha256Hex(entry.provenance.input_sha256)) {
    Refuse(entry, kFieldInputSha256,
           fmt::format("\"{}\" is not 64 lowercase hexadecimal digits",
                       entry.provenance.input_sha256));
  }
}

// "low max X at-k T rms Y high max X at-k T rms Y" for one error figure of both ranges.
std::string ErrorPair(const Entry& entry, const char* field, double low_max, double low_at_k,
                      double low_rms, double high_max, double high_at_k, double high_rms) {
  return fmt::format("  {} low max {} at-k {} rms {} high max {} at-k {} rms {}\n", field,
                     Number(entry, field, low_max), Number(entry, field, low_at_k),
                     Number(entry, field, low_rms), Number(entry, field, high_max),
                     Number(entry, field, high_at_k), Number(entry, field, high_rms));
}

void AppendEntry(const Entry& entry, std::string& out) {
  CheckWritable(entry);
  const TwoRangePolynomial& p = entry.polynomial;
  const FitQuality& q = entry.quality;
  const RangeQuality& lo = q.low_range;
  const RangeQuality& hi = q.high_range;
  out += fmt::format("{} {}\n", kBlockStart, QuoteString(entry.name));
  out += fmt::format("  {}", kFieldComposition);
  for (const auto& [symbol, count] : entry.composition) out += fmt::format(" {} {}", symbol, count);
  out += "\n";
  out += fmt::format("  {} {}\n", kFieldCharge, entry.charge);
  out += fmt::format("  {} {}\n", kFieldPhase, entry.phase);
  out += fmt::format("  {} {} {} {}\n", kFieldTemperatures,
                     Number(entry, kFieldTemperatures, p.t_low_k),
                     Number(entry, kFieldTemperatures, p.t_mid_k),
                     Number(entry, kFieldTemperatures, p.t_high_k));
  const std::pair<const char*, const NasaCoefficients*> ranges[] = {
      {kFieldCoefficientsLow, &p.low}, {kFieldCoefficientsHigh, &p.high}};
  for (const auto& [field, coefficients] : ranges) {
    out += fmt::format("  {}", field);
    for (double a : *coefficients) out += " " + Number(entry, field, a);
    out += "\n";
  }
  out += fmt::format("  {} {}\n", kFieldFormationEnthalpy,
                     Number(entry, kFieldFormationEnthalpy, entry.formation_enthalpy_j_per_mol));
  out += fmt::format("  {} {}\n", kFieldReferencePressure,
                     Number(entry, kFieldReferencePressure, entry.reference_pressure_pa));
  out += fmt::format("  {} low {} high {}\n", kFieldGridPoints, lo.num_points, hi.num_points);
  out += ErrorPair(entry, kFieldCpError, lo.max_cp_relative, lo.max_cp_error_t_k,
                   lo.rms_cp_relative, hi.max_cp_relative, hi.max_cp_error_t_k,
                   hi.rms_cp_relative);
  out += ErrorPair(entry, kFieldHError, lo.max_h_over_rt, lo.max_h_error_t_k, lo.rms_h_over_rt,
                   hi.max_h_over_rt, hi.max_h_error_t_k, hi.rms_h_over_rt);
  out += ErrorPair(entry, kFieldSError, lo.max_s_over_r, lo.max_s_error_t_k, lo.rms_s_over_r,
                   hi.max_s_over_r, hi.max_s_error_t_k, hi.rms_s_over_r);
  out += ErrorPair(entry, kFieldGError, lo.max_g_over_rt, lo.max_g_error_t_k, lo.rms_g_over_rt,
                   hi.max_g_over_rt, hi.max_g_error_t_k, hi.rms_g_over_rt);
  const ExtrapolationCheck& x = q.extrapolation;
  out += fmt::format("  {} {} below {} {} above {} {}\n", kFieldExtrapolation,
                     x.sane ? kExtrapolationSane : kExtrapolationOutside,
                     Number(entry, kFieldExtrapolation, x.min_cp_over_r_below),
                     Number(entry, kFieldExtrapolation, x.max_cp_over_r_below),
                     Number(entry, kFieldExtrapolation, x.min_cp_over_r_above),
                     Number(entry, kFieldExtrapolation, x.max_cp_over_r_above));
  if (!x.message.empty()) out += fmt::format("  {} {}\n", kFieldExtrapolationNote, QuoteString(x.message));
  out += fmt::format("  {} {}\n", kFieldVerdict, q.MeetsThresholds() ? kVerdictPass : kVerdictFail);
  for (const std::string& failure : q.threshold_failures) {
    out += fmt::format("  {} {}\n", kFieldFailure, QuoteString(failure));
  }
  const EntryProvenance& source = entry.provenance;
  out += fmt::format("  {} {}\n", kFieldInputSha256, source.input_sha256);
  out += fmt::format("  {} {}\n", kFieldToolVersion, QuoteString(source.tool_version));
  out += fmt::format("  {} {}\n", kFieldModel, QuoteString(source.model_options));
  out += fmt::format("  {} {}\n", kFieldSource, QuoteString(source.source_file));
  out += fmt::format("{}\n", kBlockEnd);
}

}  // namespace

std::string FormatEntries(const EntriesFile& file) {
  if (file.version != kEntriesFormatVersion) {
    throw Error(fmt::format("cannot write entries format version {}; this build writes version {}",
                            file.version, kEntriesFormatVersion));
  }
  std::string out = fmt::format("{} {}\n", kEntriesMagic, kEntriesFormatVersion);
  out += "# Fitted thermochemistry written by sevenfold; the format is described in "
         "docs/entries-format.md.\n";
  std::set<std::string> names;
  for (const Entry& entry : file.entries) {
    if (!names.insert(entry.name).second) {
      throw Error(fmt::format("cannot write entry \"{}\": the species appears twice", entry.name));
    }
    out += "\n";
    AppendEntry(entry, out);
  }
  return out;
}

}  // namespace sevenfold

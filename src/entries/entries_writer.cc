// SPDX-License-Identifier: MIT
// FormatEntries: the canonical text of an entries file (docs/entries-format.md).
#include <cmath>
#include <set>
#include <string>
#include <vector>

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
  if (entry.name.empty()) Refuse(entry, "name", "the species name is empty");
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
  return fmt::format("{} low max {} at-k {} rms {} high max {} at-k {} rms {}", field,
                     Number(entry, field, low_max), Number(entry, field, low_at_k),
                     Number(entry, field, low_rms), Number(entry, field, high_max),
                     Number(entry, field, high_at_k), Number(entry, field, high_rms));
}

// The field lines of one record, without indentation.
std::vector<std::string> FieldLines(const Entry& entry) {
  const TwoRangePolynomial& p = entry.polynomial;
  const FitQuality& q = entry.quality;
  const RangeQuality& lo = q.low_range;
  const RangeQuality& hi = q.high_range;
  const EntryFitSettings& settings = entry.fit_settings;
  std::vector<std::string> lines;
  std::string composition = kFieldComposition;
  for (const auto& [symbol, count] : entry.composition) {
    composition += fmt::format(" {} {}", symbol, count);
  }
  lines.push_back(composition);
  lines.push_back(fmt::format("{} {}", kFieldCharge, entry.charge));
  lines.push_back(fmt::format("{} {}", kFieldPhase, entry.phase));
  lines.push_back(fmt::format("{} low {} mid {} high {}", kFieldTemperatures,
                              Number(entry, kFieldTemperatures, p.t_low_k),
                              Number(entry, kFieldTemperatures, p.t_mid_k),
                              Number(entry, kFieldTemperatures, p.t_high_k)));
  const std::pair<const char*, const NasaCoefficients*> ranges[] = {
      {kFieldCoefficientsLow, &p.low}, {kFieldCoefficientsHigh, &p.high}};
  for (const auto& [field, coefficients] : ranges) {
    std::string line = field;
    for (double a : *coefficients) line += " " + Number(entry, field, a);
    lines.push_back(line);
  }
  lines.push_back(fmt::format("{} {}", kFieldFormationEnthalpy,
                              Number(entry, kFieldFormationEnthalpy,
                                     entry.formation_enthalpy_j_per_mol)));
  lines.push_back(fmt::format("{} {}", kFieldReferencePressure,
                              Number(entry, kFieldReferencePressure, entry.reference_pressure_pa)));
  lines.push_back(fmt::format("{} {}", kFieldFitObjective, ToString(settings.objective)));
  const ErrorScales& scales = settings.error_scales;
  lines.push_back(fmt::format("{} cp {} h {} s {}", kFieldErrorScales,
                              Number(entry, kFieldErrorScales, scales.cp_relative),
                              Number(entry, kFieldErrorScales, scales.h_over_rt),
                              Number(entry, kFieldErrorScales, scales.s_over_r)));
  const ExtrapolationGuard& guard = settings.extrapolation_guard;
  lines.push_back(guard.enabled
                      ? fmt::format("{} factor {} band {}", kFieldExtrapolationGuard,
                                    Number(entry, kFieldExtrapolationGuard, guard.factor),
                                    Number(entry, kFieldExtrapolationGuard, guard.band))
                      : fmt::format("{} {}", kFieldExtrapolationGuard, kGuardOff));
  lines.push_back(
      fmt::format("{} {}", kFieldTMidChoice, settings.t_mid_fixed ? kTMidFixed : kTMidAuto));
  lines.push_back(fmt::format("{} {}", kFieldCurvature,
                              settings.continuous_second_derivative ? kCurvatureContinuous
                                                                    : kCurvatureFree));
  lines.push_back(fmt::format("{} low {} high {}", kFieldGridPoints, lo.num_points, hi.num_points));
  lines.push_back(ErrorPair(entry, kFieldCpError, lo.max_cp_relative, lo.max_cp_error_t_k,
                            lo.rms_cp_relative, hi.max_cp_relative, hi.max_cp_error_t_k,
                            hi.rms_cp_relative));
  lines.push_back(ErrorPair(entry, kFieldHError, lo.max_h_over_rt, lo.max_h_error_t_k,
                            lo.rms_h_over_rt, hi.max_h_over_rt, hi.max_h_error_t_k,
                            hi.rms_h_over_rt));
  lines.push_back(ErrorPair(entry, kFieldSError, lo.max_s_over_r, lo.max_s_error_t_k,
                            lo.rms_s_over_r, hi.max_s_over_r, hi.max_s_error_t_k,
                            hi.rms_s_over_r));
  lines.push_back(ErrorPair(entry, kFieldGError, lo.max_g_over_rt, lo.max_g_error_t_k,
                            lo.rms_g_over_rt, hi.max_g_over_rt, hi.max_g_error_t_k,
                            hi.rms_g_over_rt));
  const ExtrapolationCheck& x = q.extrapolation;
  lines.push_back(fmt::format("{} {} below min {} max {} above min {} max {}", kFieldExtrapolation,
                              x.sane ? kExtrapolationSane : kExtrapolationOutside,
                              Number(entry, kFieldExtrapolation, x.min_cp_over_r_below),
                              Number(entry, kFieldExtrapolation, x.max_cp_over_r_below),
                              Number(entry, kFieldExtrapolation, x.min_cp_over_r_above),
                              Number(entry, kFieldExtrapolation, x.max_cp_over_r_above)));
  if (!x.message.empty()) {
    lines.push_back(fmt::format("{} {}", kFieldExtrapolationNote, QuoteString(x.message)));
  }
  const FormLimit& limit = q.form_limit;
  if (!limit.computed) {
    lines.push_back(fmt::format("{} {}", kFieldFormLimit, kFormLimitNotEvaluated));
  } else {
    const std::string range =
        limit.passing_range_found
            ? fmt::format("low {} high {}", Number(entry, kFieldFormLimit, limit.passing_t_low_k),
                          Number(entry, kFieldFormLimit, limit.passing_t_high_k))
            : std::string(kNone);
    lines.push_back(fmt::format("{} {} best-threshold-ratio {} widest-passing-range-k {}",
                                kFieldFormLimit,
                                limit.AtFormLimit() ? kFormLimitAtLimit : kFormLimitReachable,
                                Number(entry, kFieldFormLimit, limit.best_threshold_ratio),
                                range));
  }
  lines.push_back(
      fmt::format("{} {}", kFieldVerdict, q.MeetsThresholds() ? kVerdictPass : kVerdictFail));
  for (const std::string& failure : q.threshold_failures) {
    lines.push_back(fmt::format("{} {}", kFieldFailure, QuoteString(failure)));
  }
  const EntryProvenance& source = entry.provenance;
  lines.push_back(fmt::format("{} {}", kFieldInputSha256, source.input_sha256));
  lines.push_back(fmt::format("{} {}", kFieldToolVersion, QuoteString(source.tool_version)));
  lines.push_back(fmt::format("{} {}", kFieldModel, QuoteString(source.model_options)));
  lines.push_back(fmt::format("{} {}", kFieldSource, QuoteString(source.source_file)));
  return lines;
}

void AppendEntry(const Entry& entry, std::string& out) {
  CheckWritable(entry);
  const std::vector<std::string> lines = FieldLines(entry);
  out += fmt::format("{} {} {} {} {}\n", QuoteString(entry.name), kRecordVersionWord,
                     kEntriesFormatVersion, kFieldLinesWord, lines.size());
  for (const std::string& line : lines) out += "  " + line + "\n";
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
  // What the writer writes, the reader reads: an entry the reader would refuse (a value outside
  // its physical bounds, a formation enthalpy that disagrees with the coefficients) is refused
  // here, so no file is written that sevenfold cannot read back.
  try {
    ParseEntries(out, "the written text");
  } catch (const Error& e) {
    throw Error(fmt::format("cannot write the entries: the reader would refuse them: {}",
                            e.what()));
  }
  return out;
}

}  // namespace sevenfold

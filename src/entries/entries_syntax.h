// SPDX-License-Identifier: MIT
// Keywords of the entries format shared by its writer and reader (docs/entries-format.md).
// Internal to the entries module.
#pragma once

#include <string>

namespace sevenfold::detail {

// The record header: `"NAME" record-version 2 field-lines N` at the left margin.
inline constexpr const char* kRecordVersionWord = "record-version";
inline constexpr const char* kFieldLinesWord = "field-lines";

// Field keywords in the order the writer emits them; field lines are indented.
inline constexpr const char* kFieldComposition = "composition";
inline constexpr const char* kFieldCharge = "charge";
inline constexpr const char* kFieldPhase = "phase";
inline constexpr const char* kFieldTemperatures = "temperatures-k";
inline constexpr const char* kFieldCoefficientsLow = "coefficients-low";
inline constexpr const char* kFieldCoefficientsHigh = "coefficients-high";
inline constexpr const char* kFieldFormationEnthalpy = "formation-enthalpy-j-per-mol";
inline constexpr const char* kFieldReferencePressure = "reference-pressure-pa";
inline constexpr const char* kFieldFitObjective = "fit-objective";
inline constexpr const char* kFieldErrorScales = "fit-error-scales";
inline constexpr const char* kFieldExtrapolationGuard = "extrapolation-guard";
inline constexpr const char* kFieldTMidChoice = "t-mid-choice";
inline constexpr const char* kFieldCurvature = "cp-curvature-at-mid";
inline constexpr const char* kFieldGridPoints = "grid-points";
inline constexpr const char* kFieldCpError = "cp-error";
inline constexpr const char* kFieldHError = "h-error";
inline constexpr const char* kFieldSError = "s-error";
inline constexpr const char* kFieldGError = "g-error";
inline constexpr const char* kFieldExtrapolation = "extrapolation-cp-over-r";
inline constexpr const char* kFieldExtrapolationNote = "extrapolation-note";  // optional
inline constexpr const char* kFieldFormLimit = "form-limit";
inline constexpr const char* kFieldVerdict = "verdict";
inline constexpr const char* kFieldFailure = "failure";  // repeated, one per failure
inline constexpr const char* kFieldInputSha256 = "input-sha256";
inline constexpr const char* kFieldToolVersion = "tool-version";
inline constexpr const char* kFieldModel = "model";
inline constexpr const char* kFieldSource = "source";

inline constexpr const char* kPhaseGas = "gas";
inline constexpr const char* kVerdictPass = "pass";
inline constexpr const char* kVerdictFail = "fail";
inline constexpr const char* kExtrapolationSane = "sane";
inline constexpr const char* kExtrapolationOutside = "outside-band";
inline constexpr const char* kGuardOff = "off";
inline constexpr const char* kTMidFixed = "fixed";
inline constexpr const char* kTMidAuto = "auto";
inline constexpr const char* kCurvatureContinuous = "continuous";
inline constexpr const char* kCurvatureFree = "free";
inline constexpr const char* kFormLimitNotEvaluated = "not-evaluated";
inline constexpr const char* kFormLimitAtLimit = "at-limit";
inline constexpr const char* kFormLimitReachable = "reachable";
inline constexpr const char* kNone = "none";

// The words of version 1's record layout, recognised only to refuse them with a message that
// names the change.
inline constexpr const char* kVersion1BlockStart = "species";
inline constexpr const char* kVersion1BlockEnd = "end";

// True for an element symbol as the format accepts it: an ASCII capital followed by up to two
// ASCII lowercase letters ("C", "Cl", "D").
inline bool IsElementSymbol(const std::string& text) {
  if (text.empty() || text.size() > 3 || text[0] < 'A' || text[0] > 'Z') return false;
  for (std::size_t i = 1; i < text.size(); ++i) {
    if (text[i] < 'a' || text[i] > 'z') return false;
  }
  return true;
}

// `text` in double quotes: backslash and quote escaped, control characters as \n, \t, \r or
// \xHH; everything else (UTF-8 included) as is. The reader undoes exactly this.
inline std::string QuoteString(const std::string& text) {
  static constexpr char kHex[] = "0123456789abcdef";
  std::string out = "\"";
  for (unsigned char c : text) {
    switch (c) {
      case '\\': out += "\\\\"; break;
      case '"': out += "\\\""; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      case '\r': out += "\\r"; break;
      default:
        if (c < 0x20 || c == 0x7f) {
          out += "\\x";
          out += kHex[c >> 4];
          out += kHex[c & 15];
        } else {
          out += static_cast<char>(c);
        }
    }
  }
  return out + "\"";
}

// True for 64 lowercase hexadecimal digits (a SHA-256 digest).
inline bool IsSha256Hex(const std::string& text) {
  if (text.size() != 64) return false;
  for (char c : text) {
    if (!((c >= '0' && c <= '9') || (c >= 'a' && c <= 'f'))) return false;
  }
  return true;
}

}  // namespace sevenfold::detail

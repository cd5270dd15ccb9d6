// SPDX-License-Identifier: MIT
// The Markdown and JSON documents of the report.
#include <fmt/format.h>

#include <string_view>
#include <cmath>

#include "core/output_text.h"
#include "report/report_document.h"

namespace sevenfold {
namespace {

std::string Fixed(double value, int decimals) {
  if (!std::isfinite(value)) return "n/a";
  std::string text = fmt::format("{:.{}f}", value, decimals);
  if (text.find_first_not_of("-0.") == std::string::npos && text[0] == '-') text.erase(0, 1);
  return text;
}

double MaxOf(double a, double b) { return a > b ? a : b; }

// The verdict cell, with what the form's limit says when the fit recorded it.
std::string Verdict(const EntryAssessment& a) {
  std::string verdict = a.quality.MeetsThresholds() ? "pass" : "**FAIL**";
  if (a.quality.form_limit.AtFormLimit()) {
    verdict += fmt::format(" (form's limit, best {:.2f} of thr.)",
                           a.quality.form_limit.best_threshold_ratio);
  } else if (a.quality.form_limit.computed) {
    verdict += " (a better fit exists)";
  }
  return verdict;
}

// Markdown table cells: names are shown literally. A cell holds inline content only, so what
// must not act is inline syntax: code spans, emphasis and strike-through, links and images,
// HTML tags and entities, math, autolinks and the cell separator. Those characters are
// backslash-escaped (CommonMark allows it for any ASCII punctuation); line breaks become spaces
// and control characters are written visibly. Other punctuation stays as it is, so that names
// such as H2-cryo remain readable in a log.
std::string MarkdownCell(const std::string& text) {
  static constexpr std::string_view kInlineSyntax = "\\`*_[]<>!&|~$:";
  std::string out;
  for (const char c : VisibleControls(text, false)) {
    if (kInlineSyntax.find(c) != std::string_view::npos) out += '\\';
    out += c;
  }
  return out;
}

// JSON ------------------------------------------------------------------------------------------

// Shortest round-trip form; JSON has no NaN or infinity, so those become null.
std::string JsonNumber(double value) {
  if (!std::isfinite(value)) return "null";
  return fmt::format("{}", value);
}

std::string JsonStrings(const std::vector<std::string>& items) {
  std::string out = "[";
  for (size_t i = 0; i < items.size(); ++i) out += (i ? ", " : "") + JsonString(items[i]);
  return out + "]";
}

std::string JsonOptionalString(const std::string& text) {
  return text.empty() ? "null" : JsonString(text);
}

std::string JsonFigure(double max, double rms, double max_at_k) {
  return fmt::format("{{\"max\": {}, \"rms\": {}, \"max_at_k\": {}}}",
                     JsonNumber(max),
                     JsonNumber(rms),
                     JsonNumber(max_at_k));
}

std::string JsonRange(const RangeQuality& q, const std::string& indent) {
  std::string out = "{\n";
  out += indent + "  \"num_points\": " + std::to_string(q.num_points) + ",\n";
  out += indent + "  \"cp_relative\": " +
         JsonFigure(q.max_cp_relative, q.rms_cp_relative, q.max_cp_error_t_k) + ",\n";
  out += indent +
         "  \"h_over_rt\": " + JsonFigure(q.max_h_over_rt, q.rms_h_over_rt, q.max_h_error_t_k) +
         ",\n";
  out += indent +
         "  \"s_over_r\": " + JsonFigure(q.max_s_over_r, q.rms_s_over_r, q.max_s_error_t_k) + ",\n";
  out += indent +
         "  \"g_over_rt\": " + JsonFigure(q.max_g_over_rt, q.rms_g_over_rt, q.max_g_error_t_k) +
         "\n";
  return out + indent + "}";
}

std::string JsonAssessment(const EntryAssessment& a, const std::string& indent) {
  const std::string in = indent + "  ";
  const TwoRangePolynomial& p = a.polynomial;
  std::string out = "{\n";
  out += in + "\"verdict\": " + JsonString(a.quality.MeetsThresholds() ? "pass" : "fail") + ",\n";
  out += in + "\"failures\": " + JsonStrings(a.quality.threshold_failures) + ",\n";
  out += in + "\"max_normalised_error\": " + JsonNumber(a.max_normalised_error) + ",\n";
  if (a.worst.quantity.empty()) {
    out += in + "\"worst\": null,\n";
  } else {
    out += in + fmt::format(
                    "\"worst\": {{\"quantity\": {}, \"range\": {}, \"t_k\": {}, "
                    "\"normalised\": {}}},\n",
                    JsonString(a.worst.quantity),
                    JsonString(a.worst.range),
                    JsonNumber(a.worst.t_k),
                    JsonNumber(a.worst.normalised));
  }
  out += in + fmt::format("\"temperatures_k\": {{\"low\": {}, \"mid\": {}, \"high\": {}}},\n",
                          JsonNumber(p.t_low_k),
                          JsonNumber(p.t_mid_k),
                          JsonNumber(p.t_high_k));
  out += in + "\"ranges\": {\n";
  out += in + "  \"low\": " + JsonRange(a.quality.low_range, in + "  ") + ",\n";
  out += in + "  \"high\": " + JsonRange(a.quality.high_range, in + "  ") + "\n";
  out += in + "},\n";
  const FormLimit& limit = a.quality.form_limit;
  if (limit.computed) {
    out += in + fmt::format(
                    "\"form_limit\": {{\"at_limit\": {}, \"best_threshold_ratio\": {}, "
                    "\"passing_range_k\": {}, \"text\": {}}},\n",
                    limit.AtFormLimit() ? "true" : "false",
                    JsonNumber(limit.best_threshold_ratio),
                    limit.passing_range_found
                        ? fmt::format("[{}, {}]",
                                      JsonNumber(limit.passing_t_low_k),
                                      JsonNumber(limit.passing_t_high_k))
                        : std::string("null"),
                    JsonString(FormLimitText(limit)));
  } else {
    out += in + "\"form_limit\": null,\n";
  }
  const ExtrapolationCheck& e = a.quality.extrapolation;
  out += in + fmt::format(
                  "\"extrapolation\": {{\"sane\": {}, \"below\": {{\"min_cp_over_r\": {}, "
                  "\"max_cp_over_r\": {}}}, \"above\": {{\"min_cp_over_r\": {}, "
                  "\"max_cp_over_r\": {}}}, \"message\": {}}}\n",
                  e.sane ? "true" : "false",
                  JsonNumber(e.min_cp_over_r_below),
                  JsonNumber(e.max_cp_over_r_below),
                  JsonNumber(e.min_cp_over_r_above),
                  JsonNumber(e.max_cp_over_r_above),
                  JsonString(e.message));
  return out + indent + "}";
}

}  // namespace

std::string FormatReportMarkdown(const ReportData& data) {
  const bool has_baseline = !data.baseline_file.empty();
  std::string md;
  const int num_failing = data.NumFailing();
  md += fmt::format("### sevenfold report: {} of {} fits fail their thresholds\n\n",
                    num_failing,
                    data.species.size());
  md +=
      "| species | verdict | max \\|dCp\\|/Cp % | max \\|dH\\|/RT | max \\|dS\\|/R | T_mid K | "
      "worst T K |";
  if (has_baseline) md += " baseline |";
  md += "\n| --- | --- | ---: | ---: | ---: | ---: | ---: |";
  if (has_baseline) md += " --- |";
  md += "\n";
  for (const SpeciesReport& s : data.species) {
    const EntryAssessment& a = s.fit;
    md += fmt::format(
        "| {} | {} | {} | {} | {} | {} | {} |",
        MarkdownCell(s.name),
        Verdict(a),
        Fixed(100.0 * MaxOf(a.quality.low_range.max_cp_relative, a.quality.high_range.max_cp_relative), 3),
        Fixed(MaxOf(a.quality.low_range.max_h_over_rt, a.quality.high_range.max_h_over_rt), 5),
        Fixed(MaxOf(a.quality.low_range.max_s_over_r, a.quality.high_range.max_s_over_r), 5),
        fmt::format("{:g}", a.polynomial.t_mid_k),
        a.worst.quantity.empty() ? std::string("n/a") : fmt::format("{:g}", a.worst.t_k));
    if (has_baseline) {
      md += s.baseline ? fmt::format(" {} ({} of thr.) |",
                                     s.baseline->quality.MeetsThresholds() ? "pass" : "FAIL",
                                     Fixed(s.baseline->max_normalised_error, 2))
                       : std::string(" none |");
    }
    md += "\n";
  }
  md +=
      "\nIn input order. Maxima over each range's fit-grid points, fit minus exact; worst T is "
      "where the figure nearest its threshold sits.";
  if (data.NumExtrapolationWarnings() > 0) {
    md += fmt::format(" {} fit(s) extrapolate outside the sane Cp band (see index.html).",
                      data.NumExtrapolationWarnings());
  }
  md += fmt::format("\nsevenfold {}; {}\n", MarkdownCell(data.tool_version), kReportCaution);
  return md;
}

std::string FormatReportJson(const ReportData& data) {
  std::string json = "{\n";
  json += "  \"format\": \"sevenfold-report\",\n";
  json += fmt::format("  \"format_version\": {},\n", kReportJsonVersion);
  json += "  \"tool_version\": " + JsonString(data.tool_version) + ",\n";
  json += "  \"caution\": " + JsonString(kReportCaution) + ",\n";
  json += "  \"inputs\": {\n";
  json += "    \"species_files\": " + JsonStrings(data.species_files) + ",\n";
  json += "    \"entries_file\": " + JsonOptionalString(data.entries_file) + ",\n";
  json += "    \"baseline_file\": " + JsonOptionalString(data.baseline_file) + ",\n";
  json += "    \"mid\": " + JsonOptionalString(data.mid_setting) + "\n";
  json += "  },\n";
  json += fmt::format("  \"num_species\": {},\n", data.species.size());
  json += fmt::format("  \"num_failing\": {},\n", data.NumFailing());
  json += fmt::format("  \"num_extrapolation_warnings\": {},\n", data.NumExtrapolationWarnings());
  json += "  \"entries_without_species\": " + JsonStrings(data.entries_without_species) + ",\n";
  json += "  \"baseline_entries_without_species\": " +
          JsonStrings(data.baseline_entries_without_species) + ",\n";
  json += "  \"species\": [";
  for (size_t i = 0; i < data.species.size(); ++i) {
    const SpeciesReport& s = data.species[i];
    json += i ? ",\n" : "\n";
    json += "    {\n";
    json += fmt::format("      \"rank\": {},\n", i + 1);
    json += "      \"name\": " + JsonString(s.name) + ",\n";
    json += "      \"source\": " + JsonString(s.source) + ",\n";
    json += "      \"input_sha256\": " + JsonString(s.input_sha256) + ",\n";
    json += "      \"entry_input_sha256\": " + JsonString(s.entry_sha256) + ",\n";
    json += "      \"model\": " + JsonString(s.model) + ",\n";
    json += "      \"reference_pressure_pa\": " + JsonNumber(s.reference_pressure_pa) + ",\n";
    json += fmt::format(
        "      \"thresholds\": {{\"cp_relative\": {}, \"h_over_rt\": {}, \"s_over_r\": {}}},\n",
        JsonNumber(s.thresholds.max_cp_relative),
        JsonNumber(s.thresholds.max_h_over_rt),
        JsonNumber(s.thresholds.max_s_over_r));
    json += "      \"fit\": " + JsonAssessment(s.fit, "      ") + ",\n";
    json += "      \"baseline\": " +
            (s.baseline ? JsonAssessment(*s.baseline, "      ") : std::string("null")) + ",\n";
    json += "      \"notes\": " + JsonStrings(s.notes) + "\n";
    json += "    }";
  }
  json += data.species.empty() ? "]\n" : "\n  ]\n";
  json += "}\n";
  return json;
}

}  // namespace sevenfold

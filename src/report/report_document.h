// SPDX-License-Identifier: MIT
// The three documents of `sevenfold report`, built as strings from ReportData: a self-contained
// HTML page with inline SVG plots, a compact Markdown summary and a JSON file with every figure.
// All three are deterministic: they depend only on the data (no dates, no thread count).
// What they show and every JSON field: docs/report.md.
#pragma once

#include <string>

#include "report/report_data.h"

namespace sevenfold {

// The caution every report carries, verbatim.
inline constexpr const char* kReportCaution =
    "Results are model estimates; check them against evaluated data; defer to local codes and "
    "licensed engineering practice for any safety decision.";

// The version of the JSON layout (field "format_version").
inline constexpr int kReportJsonVersion = 1;

// index.html: title, provenance, caution, summary table in input order, then one section per
// species (same order) with plots of Cp, H - H298, S and -(G - H298)/T, exact versus fitted
// (and baseline), and under each the error of the fit with its threshold band. No scripts, no
// external resources; a print stylesheet is included.
std::string FormatReportHtml(const ReportData& data);

// summary.md: one Markdown table, in input order (species, verdict, max |dCp|/Cp %,
// max |dH|/RT, max |dS|/R, T_mid, worst T; with a baseline also the baseline's verdict and
// worst figure).
std::string FormatReportMarkdown(const ReportData& data);

// summary.json: every figure of the report (not the sampled curves), species in input order.
std::string FormatReportJson(const ReportData& data);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// The HTML page of the report. Layout and colours are our own; the palette is the colour-blind
// safe set of Okabe & Ito (2008), and every curve also differs by width or dash pattern so that
// a greyscale print keeps them apart.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "report/report_document.h"
#include "report/report_svg.h"

namespace sevenfold {
namespace {

// Okabe-Ito colours.
constexpr const char* kSkyBlue = "#56b4e9";
constexpr const char* kVermillion = "#d55e00";
constexpr const char* kReddishPurple = "#cc79a7";
constexpr const char* kYellow = "#f0e442";

const LineStyle kExactStyle{kSkyBlue, 4.5, ""};
const LineStyle kFittedStyle{kVermillion, 1.6, ""};
const LineStyle kBaselineStyle{kReddishPurple, 1.8, "7 4"};
const LineStyle kMidStyle{"#333333", 1.1, "6 3 1.5 3"};
const LineStyle kLimitStyle{"#888888", 0.8, ""};

constexpr double kPlotWidthPx = 470.0;
constexpr double kValuePlotHeightPx = 275.0;
constexpr double kErrorPlotHeightPx = 185.0;
// The error plots show at least this multiple of the threshold, so the band never fills them.
constexpr double kErrorRangeOverThreshold = 1.6;

std::string Num(double value, int decimals) {
  if (!std::isfinite(value)) return "n/a";
  std::string text = fmt::format("{:.{}f}", value, decimals);
  if (text.find_first_not_of("-0.") == std::string::npos && text[0] == '-') text.erase(0, 1);
  return text;
}

std::string Kelvin(double t_k) { return fmt::format("{:g}", t_k); }

std::string PressureText(double pa) {
  if (pa == 1.0e5) return "1 bar (100000 Pa)";
  if (pa == 101325.0) return "1 atm (101325 Pa)";
  return fmt::format("{:g} Pa", pa);
}

const char* QuantityName(const std::string& key) {
  if (key == "cp") return "Cp";
  if (key == "h") return "H";
  if (key == "s") return "S";
  return "G";
}

struct Quantity {
  const char* key;
  const char* title;
  const char* y_label;
  const std::vector<double> CurveSet::*values;
  const char* error_title;
  const char* error_label;
  const std::vector<double> ErrorCurves::*errors;
};

const Quantity kQuantities[] = {
    {"cp",
     "Heat capacity Cp",
     "Cp / (J mol\u207b\u00b9 K\u207b\u00b9)",
     &CurveSet::cp_j_per_mol_k,
     "Cp error (fit \u2212 exact) / exact",
     "\u0394Cp/Cp / %",
     &ErrorCurves::cp_percent},
    {"h",
     "Enthalpy H \u2212 H(298.15 K)",
     "H \u2212 H\u2082\u2089\u2088 / (kJ mol\u207b\u00b9)",
     &CurveSet::h_minus_h298_kj_per_mol,
     "H error (fit \u2212 exact) / RT",
     "\u0394H/RT",
     &ErrorCurves::h_over_rt},
    {"s",
     "Entropy S\u00b0",
     "S / (J mol\u207b\u00b9 K\u207b\u00b9)",
     &CurveSet::s_j_per_mol_k,
     "S error (fit \u2212 exact) / R",
     "\u0394S/R",
     &ErrorCurves::s_over_r},
    {"g",
     "Gibbs function \u2212(G \u2212 H(298.15 K))/T",
     "\u2212(G \u2212 H\u2082\u2089\u2088)/T / (J mol\u207b\u00b9 K\u207b\u00b9)",
     &CurveSet::gibbs_function_j_per_mol_k,
     "G error (fit \u2212 exact) / RT",
     "\u0394G/RT",
     &ErrorCurves::g_over_rt},
};

// The half-width of a quantity's threshold band, in the units of its error curve.
double ErrorThreshold(const std::string& key, const QualityThresholds& thr) {
  if (key == "cp") return 100.0 * thr.max_cp_relative;
  if (key == "h") return thr.max_h_over_rt;
  if (key == "s") return thr.max_s_over_r;
  // |dG/RT| = |dH/RT - dS/R| <= |dH|/RT + |dS|/R: the bound the H and S thresholds imply.
  return thr.max_h_over_rt + thr.max_s_over_r;
}

std::string BandLabel(const std::string& key, const QualityThresholds& thr) {
  if (key == "cp") return fmt::format("threshold \u00b1{:g} %", 100.0 * thr.max_cp_relative);
  if (key == "g") {
    return fmt::format("\u00b1{:g}: H + S thresholds", thr.max_h_over_rt + thr.max_s_over_r);
  }
  return fmt::format("threshold \u00b1{:g}", key == "h" ? thr.max_h_over_rt : thr.max_s_over_r);
}

bool Inside(double t, const TwoRangePolynomial& p) { return t >= p.t_low_k && t <= p.t_high_k; }

std::vector<PlotSpan> ExtrapolationSpans(const TwoRangePolynomial& p, double x_min, double x_max) {
  return {PlotSpan{x_min, p.t_low_k, "#f2f2f2", true, "extrapolation"},
          PlotSpan{p.t_high_k, x_max, "#f2f2f2", true, ""}};
}

std::vector<PlotMarker> RangeMarkers(const TwoRangePolynomial& p) {
  return {PlotMarker{p.t_low_k, fmt::format("T_low {} K", Kelvin(p.t_low_k)), kLimitStyle},
          PlotMarker{p.t_mid_k, fmt::format("T_mid {} K", Kelvin(p.t_mid_k)), kMidStyle},
          PlotMarker{p.t_high_k, fmt::format("T_high {} K", Kelvin(p.t_high_k)), kLimitStyle}};
}

std::string ValuePlot(const SpeciesReport& s, const Quantity& q, int rank) {
  const ReportCurves& c = s.curves;
  const TwoRangePolynomial& p = s.fit.polynomial;
  PlotSpec spec;
  spec.id = fmt::format("s{}-{}", rank, q.key);
  spec.css_class = "plot value-plot";
  spec.attributes = {{"data-species", s.name}, {"data-quantity", q.key}, {"data-kind", "value"}};
  spec.title = q.title;
  spec.width_px = kPlotWidthPx;
  spec.height_px = kValuePlotHeightPx;
  spec.x = PlotAxis{c.t_k.front(), c.t_k.back(), AxisScale::kLog, "T / K (log scale)"};

  // The y range follows the exact curve and the fits inside their own ranges; a polynomial that
  // runs away while extrapolating leaves the plot instead of flattening everything else.
  double low = INFINITY, high = -INFINITY;
  const auto include = [&](double v) {
    if (std::isfinite(v)) {
      low = std::min(low, v);
      high = std::max(high, v);
    }
  };
  const std::vector<double>& exact = c.exact.*q.values;
  const std::vector<double>& fitted = c.fitted.*q.values;
  const std::vector<double>& old = c.baseline.*q.values;
  for (size_t i = 0; i < c.t_k.size(); ++i) {
    include(exact[i]);
    if (Inside(c.t_k[i], p)) include(fitted[i]);
    if (s.baseline && Inside(c.t_k[i], s.baseline->polynomial)) include(old[i]);
  }
  if (!(high >= low)) {
    low = 0.0;
    high = 1.0;
  }
  // Pad by 4 % of the span, and by at least 2 % of the value so that a flat curve (Cp of an
  // atom) gets a readable axis instead of one resolving rounding noise.
  const double pad = std::max(0.04 * (high - low),
                              std::max(0.02 * std::max(std::fabs(low), std::fabs(high)), 1e-9));
  const auto [y_min, y_max] = NiceRange(low - pad, high + pad, 5);
  spec.y = PlotAxis{y_min, y_max, AxisScale::kLinear, q.y_label};
  spec.spans = ExtrapolationSpans(p, spec.x.min, spec.x.max);
  spec.markers = RangeMarkers(p);
  spec.series.push_back(PlotSeries{c.t_k, exact, kExactStyle, "exact", "exact"});
  if (s.baseline)
    spec.series.push_back(PlotSeries{c.t_k, old, kBaselineStyle, "baseline fit", "baseline"});
  spec.series.push_back(PlotSeries{c.t_k, fitted, kFittedStyle, "fit", "fitted"});
  return RenderPlot(spec);
}

std::string ErrorPlot(const SpeciesReport& s, const Quantity& q, int rank) {
  const ReportCurves& c = s.curves;
  const TwoRangePolynomial& p = s.fit.polynomial;
  PlotSpec spec;
  spec.id = fmt::format("s{}-{}-error", rank, q.key);
  spec.css_class = "plot error-plot";
  spec.attributes = {{"data-species", s.name}, {"data-quantity", q.key}, {"data-kind", "error"}};
  spec.title = q.error_title;
  spec.width_px = kPlotWidthPx;
  spec.height_px = kErrorPlotHeightPx;
  spec.x = PlotAxis{c.t_k.front(), c.t_k.back(), AxisScale::kLog, "T / K (log scale)"};
  const double threshold = ErrorThreshold(q.key, s.thresholds);
  double half = kErrorRangeOverThreshold * threshold;
  const std::vector<double>& fitted = c.fitted_error.*q.errors;
  const std::vector<double>& old = c.baseline_error.*q.errors;
  for (size_t i = 0; i < c.t_k.size(); ++i) {
    if (Inside(c.t_k[i], p) && std::isfinite(fitted[i]))
      half = std::max(half, 1.1 * std::fabs(fitted[i]));
    if (s.baseline && Inside(c.t_k[i], s.baseline->polynomial) && std::isfinite(old[i])) {
      half = std::max(half, 1.1 * std::fabs(old[i]));
    }
  }
  const auto [y_min, y_max] = NiceRange(-half, half, 4);
  spec.y = PlotAxis{y_min, y_max, AxisScale::kLinear, q.error_label};
  spec.zero_line = true;
  spec.spans = ExtrapolationSpans(p, spec.x.min, spec.x.max);
  spec.spans.front().label.clear();  // the value plot above already explains the hatching
  spec.bands.push_back(
      PlotBand{-threshold, threshold, kYellow, 0.45, "#8c7e00", BandLabel(q.key, s.thresholds)});
  RangeMarkers(p).swap(spec.markers);
  for (PlotMarker& marker : spec.markers) marker.label.clear();
  if (s.baseline) {
    spec.series.push_back(PlotSeries{c.t_k, old, kBaselineStyle, "baseline fit", "baseline"});
  }
  spec.series.push_back(PlotSeries{c.t_k, fitted, kFittedStyle, "fit", "fitted"});
  return RenderPlot(spec);
}

// One table row of range figures: Cp max, Cp RMS (in %), H, S, G max and RMS. A maximum above
// its threshold is marked (bold, and a trailing "!" that survives greyscale and copy-paste).
std::string RangeCells(const RangeQuality& q, const QualityThresholds& thr) {
  const auto mark = [](const std::string& text, bool over) {
    return over ? "<td class=\"over\">" + text + "&#8201;!</td>" : "<td>" + text + "</td>";
  };
  std::string cells;
  cells += mark(Num(100.0 * q.max_cp_relative, 3), q.max_cp_relative > thr.max_cp_relative);
  cells += "<td>" + Num(100.0 * q.rms_cp_relative, 3) + "</td>";
  cells += mark(Num(q.max_h_over_rt, 5), q.max_h_over_rt > thr.max_h_over_rt);
  cells += "<td>" + Num(q.rms_h_over_rt, 5) + "</td>";
  cells += mark(Num(q.max_s_over_r, 5), q.max_s_over_r > thr.max_s_over_r);
  cells += "<td>" + Num(q.rms_s_over_r, 5) + "</td>";
  cells += "<td>" + Num(q.max_g_over_rt, 5) + "</td>";
  cells += "<td>" + Num(q.rms_g_over_rt, 5) + "</td>";
  return cells;
}

const char* kFigureHeader =
    "<th rowspan=\"2\">range</th>"
    "<th colspan=\"2\">|\u0394Cp|/Cp, %</th><th colspan=\"2\">|\u0394H|/RT</th>"
    "<th colspan=\"2\">|\u0394S|/R</th><th colspan=\"2\">|\u0394G|/RT</th>";
const char* kFigureSubHeader =
    "<th>max</th><th>RMS</th><th>max</th><th>RMS</th><th>max</th><th>RMS</th><th>max</th>"
    "<th>RMS</th>";

std::string VerdictBadge(bool pass) {
  return pass ? "<span class=\"verdict pass\">pass</span>"
              : "<span class=\"verdict fail\">FAIL</span>";
}

std::string WorstText(const WorstFigure& w) {
  if (w.quantity.empty()) return "n/a";
  return fmt::format(
      "{} in the {} range at {} K", QuantityName(w.quantity), w.range, Kelvin(w.t_k));
}

const char* kStyle = R"(
:root { color-scheme: light; }
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, Helvetica, sans-serif; color: #1b1b1b;
  background: #ffffff; margin: 0 auto; max-width: 1060px; padding: 18px 22px 40px;
  font-size: 14px; line-height: 1.45; }
h1 { font-size: 23px; margin: 0 0 4px; }
h2 { font-size: 18px; margin: 28px 0 8px; border-bottom: 2px solid #1b1b1b; padding-bottom: 3px; }
h3 { font-size: 15px; margin: 16px 0 6px; }
.subtitle { color: #555555; margin: 0 0 12px; }
.caution { border-left: 5px solid #e69f00; background: #fff6e0; padding: 8px 12px; margin: 12px 0; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 14px; margin: 6px 0; }
dl.facts dt { color: #555555; }
dl.facts dd { margin: 0; overflow-wrap: anywhere; }
code, .mono { font-family: "DejaVu Sans Mono", "Liberation Mono", monospace; font-size: 12px; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; font-size: 12.5px; margin: 6px 0; }
th, td { padding: 2px 5px; text-align: right; border-bottom: 1px solid #dddddd; white-space: nowrap; }
thead th { background: #f3f3f3; border-bottom: 1px solid #999999; text-align: center; }
td.name, th.name { text-align: left; }
tr.species-start td { border-top: 1px solid #999999; }
td.over { font-weight: bold; background: #fde3d6; }
.verdict { display: inline-block; padding: 0 6px; border-radius: 3px; font-weight: bold; font-size: 12px; }
.verdict.pass { color: #005c40; border: 1px solid #009e73; }
.verdict.fail { color: #ffffff; background: #b3401a; border: 1px solid #b3401a; }
ul.failures { border-left: 5px solid #d55e00; background: #fdeee6; padding: 6px 12px 6px 30px; margin: 8px 0; }
ul.notes { color: #333333; margin: 6px 0; }
.panels { display: grid; grid-template-columns: repeat(2, minmax(0, 1fr)); gap: 18px 22px; margin-top: 10px; }
figure { margin: 0; }
svg.plot { display: block; width: 100%; height: auto; font-family: inherit; }
svg.error-plot { margin-top: 2px; }
.key { font-size: 12.5px; color: #333333; }
.key span.swatch { display: inline-block; width: 26px; height: 0; vertical-align: middle; margin: 0 4px 0 12px; }
a { color: #0060a8; }
.wide { overflow-x: auto; }
@media screen and (max-width: 760px) { .panels { grid-template-columns: 1fr; } }
@media print {
  @page { size: A4; margin: 12mm; }
  body { max-width: none; padding: 0; font-size: 10pt; }
  .wide { overflow: visible; }
  table { font-size: 8pt; }
  a { color: inherit; text-decoration: none; }
  section.species { break-before: page; }
  figure, table, .caution { break-inside: avoid; }
  .caution, td.over, .verdict, ul.failures { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
)";

std::string SpeciesSection(const SpeciesReport& s, int rank) {
  const TwoRangePolynomial& p = s.fit.polynomial;
  std::string html;
  html += fmt::format(
      "<section class=\"species\" id=\"s{}\" data-species=\"{}\">\n", rank, EscapeXml(s.name));
  html += fmt::format(
      "<h2>{}. {} {}</h2>\n", rank, EscapeXml(s.name), VerdictBadge(s.fit.quality.MeetsThresholds()));
  html += "<dl class=\"facts\">\n";
  html += fmt::format("<dt>species data</dt><dd><code>{}</code></dd>\n", EscapeXml(s.source));
  html +=
      fmt::format("<dt>ranges</dt><dd>{} K to {} K (low), {} K to {} K (high); T_mid {} K</dd>\n",
                  Kelvin(p.t_low_k),
                  Kelvin(p.t_mid_k),
                  Kelvin(p.t_mid_k),
                  Kelvin(p.t_high_k),
                  Kelvin(p.t_mid_k));
  html +=
      fmt::format("<dt>standard pressure</dt><dd>{}</dd>\n", PressureText(s.reference_pressure_pa));
  html += fmt::format(
      "<dt>thresholds</dt><dd>|\u0394Cp|/Cp {:g} %, |\u0394H|/RT {:g}, |\u0394S|/R {:g} (per "
      "range, max over the fit grid)</dd>\n",
      100.0 * s.thresholds.max_cp_relative,
      s.thresholds.max_h_over_rt,
      s.thresholds.max_s_over_r);
  html += fmt::format("<dt>worst figure</dt><dd>{} of its threshold: {}</dd>\n",
                      Num(s.fit.max_normalised_error, 2),
                      WorstText(s.fit.worst));
  html += fmt::format(
      "<dt>extrapolation</dt><dd>Cp/R {} to {} below T_low, {} to {} above T_high: {}</dd>\n",
      Num(s.fit.quality.extrapolation.min_cp_over_r_below, 3),
      Num(s.fit.quality.extrapolation.max_cp_over_r_below, 3),
      Num(s.fit.quality.extrapolation.min_cp_over_r_above, 3),
      Num(s.fit.quality.extrapolation.max_cp_over_r_above, 3),
      s.fit.quality.extrapolation.sane ? "inside the sane band" : "<strong>outside the sane band</strong>");
  if (const std::string limit = FormLimitText(s.fit.quality.form_limit); !limit.empty()) {
    html += fmt::format("<dt>form's limit</dt><dd class=\"form-limit\">{}</dd>\n", EscapeXml(limit));
  }
  if (!s.model.empty()) html += fmt::format("<dt>model</dt><dd>{}</dd>\n", EscapeXml(s.model));
  html += fmt::format("<dt>input digest</dt><dd><code>{}</code></dd>\n", EscapeXml(s.input_sha256));
  html += "</dl>\n";
  if (!s.fit.quality.threshold_failures.empty()) {
    html += "<ul class=\"failures\">\n";
    for (const std::string& f : s.fit.quality.threshold_failures) html += "<li>" + EscapeXml(f) + "</li>\n";
    html += "</ul>\n";
  }
  if (!s.notes.empty()) {
    html += "<ul class=\"notes\">\n";
    for (const std::string& n : s.notes) html += "<li>" + EscapeXml(n) + "</li>\n";
    html += "</ul>\n";
  }
  html += "<table class=\"figures\"><thead><tr><th class=\"name\" rowspan=\"2\">entry</th>";
  html += kFigureHeader;
  html += "</tr><tr>";
  html += kFigureSubHeader;
  html += "</tr></thead><tbody>\n";
  const auto rows = [&](const char* label, const EntryAssessment& a) {
    html += fmt::format(
        "<tr class=\"species-start\"><td class=\"name\" rowspan=\"2\">{}</td><td>low</td>{}</tr>\n",
        label,
        RangeCells(a.quality.low_range, s.thresholds));
    html += fmt::format("<tr><td>high</td>{}</tr>\n", RangeCells(a.quality.high_range, s.thresholds));
  };
  rows("fit", s.fit);
  if (s.baseline) {
    rows(s.baseline->quality.MeetsThresholds() ? "baseline (pass)" : "baseline (FAIL)", *s.baseline);
  }
  html += "</tbody></table>\n";
  html += "<div class=\"panels\">\n";
  for (const Quantity& q : kQuantities) {
    html += fmt::format("<figure class=\"panel\" data-quantity=\"{}\">\n", q.key);
    html += ValuePlot(s, q, rank);
    html += "\n";
    html += ErrorPlot(s, q, rank);
    html += "\n</figure>\n";
  }
  html += "</div>\n</section>\n";
  return html;
}

}  // namespace

std::string FormatReportHtml(const ReportData& data) {
  const int num_failing = data.NumFailing();
  const bool has_baseline = !data.baseline_file.empty();
  std::string html;
  html += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  html += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  html += "<meta name=\"generator\" content=\"sevenfold " + EscapeXml(data.tool_version) + "\">\n";
  html += "<title>sevenfold fit report</title>\n<style>" + std::string(kStyle) + "</style>\n";
  html += "</head>\n<body>\n<header>\n";
  html += "<h1>Fit report: NASA 7-coefficient polynomials versus exact curves</h1>\n";
  html += fmt::format(
      "<p class=\"subtitle\">{} species; {} fail their quality thresholds; {} with an "
      "extrapolation outside the sane band.</p>\n",
      data.species.size(),
      num_failing,
      data.NumExtrapolationWarnings());
  html += "<p class=\"caution\"><strong>Caution.</strong> " + EscapeXml(kReportCaution) + "</p>\n";
  html += "</header>\n";

  html += "<section id=\"provenance\">\n<h2>Provenance</h2>\n<dl class=\"facts\">\n";
  html += "<dt>tool</dt><dd>sevenfold " + EscapeXml(data.tool_version) + "</dd>\n";
  html += "<dt>species files</dt><dd>";
  for (size_t i = 0; i < data.species_files.size(); ++i) {
    html += (i ? ", " : "") + std::string("<code>") + EscapeXml(data.species_files[i]) + "</code>";
  }
  html += "</dd>\n";
  html += "<dt>entries</dt><dd>";
  if (data.entries_file.empty()) {
    html += "fitted in this run";
    html += data.mid_setting.empty() ? " (each species' own T_mid setting)"
                                     : fmt::format(" (--mid {})", EscapeXml(data.mid_setting));
  } else {
    html += "<code>" + EscapeXml(data.entries_file) + "</code>";
  }
  html += "</dd>\n";
  html += "<dt>baseline</dt><dd>";
  html += has_baseline ? "<code>" + EscapeXml(data.baseline_file) + "</code>" : std::string("none");
  html += "</dd>\n";
  html +=
      "<dt>exact curves</dt><dd>statistical mechanics of each species' data, ideal gas; "
      "errors measured on the fit grid of each entry's range</dd>\n";
  html += "</dl>\n";
  if (!data.entries_without_species.empty()) {
    html += "<p>Entries with no species in the species files (not judged): ";
    for (size_t i = 0; i < data.entries_without_species.size(); ++i) {
      html += (i ? ", " : "") + EscapeXml(data.entries_without_species[i]);
    }
    html += ".</p>\n";
  }
  if (!data.baseline_entries_without_species.empty()) {
    html += "<p>Baseline entries with no species in the species files: ";
    for (size_t i = 0; i < data.baseline_entries_without_species.size(); ++i) {
      html += (i ? ", " : "") + EscapeXml(data.baseline_entries_without_species[i]);
    }
    html += ".</p>\n";
  }
  html += "</section>\n";

  html += "<section id=\"summary\">\n<h2>Summary, in input order</h2>\n";
  html +=
      "<p>Errors of each range over its fit-grid points, fit minus exact. "
      "\u201cworst / threshold\u201d is the largest of the Cp, H and S maxima divided by its "
      "threshold: above 1 the fit fails. Figures over their threshold are marked "
      "<span class=\"mono\">!</span>.</p>\n";
  html +=
      "<div class=\"wide\"><table class=\"summary\"><thead><tr><th rowspan=\"2\">#</th>"
      "<th class=\"name\" rowspan=\"2\">species</th><th rowspan=\"2\">verdict</th>"
      "<th rowspan=\"2\">worst /<br>threshold</th><th rowspan=\"2\">worst at</th>";
  html += kFigureHeader;
  html += "<th rowspan=\"2\">T_mid<br>K</th>";
  if (has_baseline) html += "<th rowspan=\"2\">baseline<br>worst / thr.</th>";
  html += "</tr><tr>";
  html += kFigureSubHeader;
  html += "</tr></thead>\n<tbody>\n";
  int rank = 0;
  for (const SpeciesReport& s : data.species) {
    ++rank;
    std::string baseline_cell;
    if (has_baseline) {
      baseline_cell = s.baseline ? fmt::format("<td rowspan=\"2\">{}{}</td>",
                                               Num(s.baseline->max_normalised_error, 2),
                                               s.baseline->quality.MeetsThresholds() ? "" : " FAIL")
                                 : "<td rowspan=\"2\">none</td>";
    }
    html += fmt::format(
        "<tr class=\"species-start\"><td rowspan=\"2\">{}</td>"
        "<td class=\"name\" rowspan=\"2\"><a href=\"#s{}\">{}</a></td><td rowspan=\"2\">{}</td>"
        "<td rowspan=\"2\">{}</td><td rowspan=\"2\">{}</td><td>low</td>{}<td "
        "rowspan=\"2\">{}</td>{}</tr>\n",
        rank,
        rank,
        EscapeXml(s.name),
        VerdictBadge(s.fit.quality.MeetsThresholds()),
        Num(s.fit.max_normalised_error, 2),
        s.fit.worst.quantity.empty()
            ? "n/a"
            : fmt::format("{} {} K", QuantityName(s.fit.worst.quantity), Kelvin(s.fit.worst.t_k)),
        RangeCells(s.fit.quality.low_range, s.thresholds),
        Kelvin(s.fit.polynomial.t_mid_k),
        baseline_cell);
    html += fmt::format("<tr><td>high</td>{}</tr>\n", RangeCells(s.fit.quality.high_range, s.thresholds));
  }
  html += "</tbody></table></div>\n</section>\n";

  html += "<section id=\"reading\">\n<h2>How to read the plots</h2>\n<p class=\"key\">";
  html += fmt::format(
      "<span class=\"swatch\" style=\"border-top: 4.5px solid {}\"></span>exact "
      "(statistical mechanics, drawn only where the model is defined, 10 K to 20000 K)",
      kSkyBlue);
  html += fmt::format("<span class=\"swatch\" style=\"border-top: 2px solid {}\"></span>fit",
                      kVermillion);
  if (has_baseline) {
    html += fmt::format(
        "<span class=\"swatch\" style=\"border-top: 2px dashed {}\"></span>baseline "
        "fit (<code>{}</code>)",
        kReddishPurple,
        EscapeXml(data.baseline_file));
  }
  html +=
      "</p>\n<p>Temperature runs on a log scale from half T_low to 1.5 T_high. The hatched "
      "grey regions are outside the fitted range: the polynomial is extrapolated there. "
      "The dash-dot line marks T_mid. Under each quantity its error, fit minus exact "
      "(relative for Cp, over RT for H and G, over R for S), with the threshold as a yellow "
      "band; H - H298 of a fit uses the polynomial's own value at 298.15 K, while its error "
      "compares absolute enthalpies (formation enthalpy included).</p>\n</section>\n";

  rank = 0;
  for (const SpeciesReport& s : data.species) html += SpeciesSection(s, ++rank);

  html += "<footer><p class=\"subtitle\">Written by sevenfold " + EscapeXml(data.tool_version) +
          ". Field definitions: docs/report.md.</p></footer>\n";
  html += "</body>\n</html>\n";
  return html;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "report/report_svg.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <utility>

#include "core/error.h"

namespace sevenfold {
namespace {

// Layout, px. The font sizes match the report's stylesheet; widths of text are estimated from
// the character count (DejaVu Sans and similar sans faces average about 0.6 em per character).
constexpr double kFontPx = 11.0;
constexpr double kTitleFontPx = 13.0;
constexpr double kCharWidthEm = 0.62;
constexpr double kMarginLeftPx = 64.0;
constexpr double kMarginRightPx = 16.0;
constexpr double kMarginBottomPx = 40.0;
constexpr double kTitleHeightPx = 20.0;
constexpr double kLegendRowPx = 16.0;
constexpr double kMarkerRowPx = 13.0;
constexpr int kNumMarkerRows = 2;
constexpr double kTickLengthPx = 4.0;
constexpr double kHatchSpacingPx = 7.0;
constexpr double kLegendSampleWidthPx = 24.0;

// Coordinates with two decimals: 0.01 px is far below what any display resolves, and a fixed
// format keeps the output byte-stable.
std::string Px(double value) {
  std::string text = fmt::format("{:.2f}", value);
  if (text == "-0.00") text = "0.00";
  return text;
}

double TextWidth(const std::string& text, double font_px) {
  // Count UTF-8 code points, not bytes.
  int num_chars = 0;
  for (const unsigned char c : text) {
    if ((c & 0xC0) != 0x80) ++num_chars;
  }
  return num_chars * font_px * kCharWidthEm;
}

double Transform(const PlotAxis& axis, double value) {
  if (axis.scale == AxisScale::kLog) {
    if (!(value > 0.0)) return std::nan("");
    return (std::log(value) - std::log(axis.min)) / (std::log(axis.max) - std::log(axis.min));
  }
  return (value - axis.min) / (axis.max - axis.min);
}

struct Rect {
  double left, top, right, bottom;
};

struct Point {
  double x, y;
};

// Liang-Barsky: clips the segment a-b to `r`. Returns false when nothing is left; otherwise the
// parameters t0 <= t1 of the visible part.
bool ClipSegment(const Point& a, const Point& b, const Rect& r, double& t0, double& t1) {
  t0 = 0.0;
  t1 = 1.0;
  const double dx = b.x - a.x, dy = b.y - a.y;
  const double p[4] = {-dx, dx, -dy, dy};
  const double q[4] = {a.x - r.left, r.right - a.x, a.y - r.top, r.bottom - a.y};
  for (int i = 0; i < 4; ++i) {
    if (p[i] == 0.0) {
      if (q[i] < 0.0) return false;
      continue;
    }
    const double t = q[i] / p[i];
    if (p[i] < 0.0) {
      t0 = std::max(t0, t);
    } else {
      t1 = std::min(t1, t);
    }
    if (t0 > t1) return false;
  }
  return true;
}

// Splits a path of pixel points (non-finite points break it) into pieces clipped to `r`.
std::vector<std::vector<Point>> ClipPath(const std::vector<Point>& points, const Rect& r) {
  std::vector<std::vector<Point>> pieces;
  bool open = false;
  for (size_t i = 1; i < points.size(); ++i) {
    const Point& a = points[i - 1];
    const Point& b = points[i];
    if (!std::isfinite(a.x) || !std::isfinite(a.y) || !std::isfinite(b.x) || !std::isfinite(b.y)) {
      open = false;
      continue;
    }
    double t0 = 0.0, t1 = 1.0;
    if (!ClipSegment(a, b, r, t0, t1)) {
      open = false;
      continue;
    }
    const Point start{a.x + t0 * (b.x - a.x), a.y + t0 * (b.y - a.y)};
    const Point end{a.x + t1 * (b.x - a.x), a.y + t1 * (b.y - a.y)};
    if (!open || t0 > 0.0) {
      pieces.push_back({start});
    }
    pieces.back().push_back(end);
    open = t1 >= 1.0;
  }
  return pieces;
}

std::string PolylinePoints(const std::vector<Point>& piece) {
  std::string text;
  for (const Point& p : piece) {
    if (!text.empty()) text += ' ';
    text += Px(p.x) + "," + Px(p.y);
  }
  return text;
}

std::string StrokeAttributes(const LineStyle& style) {
  std::string text =
      fmt::format("stroke=\"{}\" stroke-width=\"{}\"", EscapeXml(style.colour), Px(style.width_px));
  if (!style.dash.empty()) text += fmt::format(" stroke-dasharray=\"{}\"", EscapeXml(style.dash));
  return text;
}

// Linear ticks: multiples of a 1-2-5 step for about `target` ticks.
double LinearStep(double span, int target) {
  const double raw = span / std::max(1, target);
  const double magnitude = std::pow(10.0, std::floor(std::log10(raw)));
  const double normalised = raw / magnitude;
  const double factor = normalised < 1.5   ? 1.0
                        : normalised < 3.0 ? 2.0
                        : normalised < 7.0 ? 5.0
                                           : 10.0;
  return factor * magnitude;
}

std::vector<double> LinearTicks(double min, double max, int target) {
  const double step = LinearStep(max - min, target);
  std::vector<double> ticks;
  const double first = std::ceil(min / step - 1e-9);
  const double last = std::floor(max / step + 1e-9);
  for (double k = first; k <= last; k += 1.0) {
    double value = k * step;
    if (std::fabs(value) < 1e-9 * step) value = 0.0;
    ticks.push_back(value);
  }
  return ticks;
}

std::vector<double> LogTicks(double min, double max, const std::vector<double>& mantissas) {
  std::vector<double> ticks;
  const int first_decade = static_cast<int>(std::floor(std::log10(min))) - 1;
  const int last_decade = static_cast<int>(std::ceil(std::log10(max))) + 1;
  for (int decade = first_decade; decade <= last_decade; ++decade) {
    for (const double m : mantissas) {
      // Parse the decimal text so that 0.2, 20, 2000 are the doubles nearest those decimals.
      const double value = std::stod(fmt::format("{}e{}", m, decade));
      if (value >= min * (1 - 1e-12) && value <= max * (1 + 1e-12)) ticks.push_back(value);
    }
  }
  return ticks;
}

}  // namespace

std::string EscapeXml(const std::string& text) {
  std::string out;
  out.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

std::string FormatTickLabel(double value, double spacing) {
  int decimals = 0;
  if (spacing > 0.0 && std::isfinite(spacing)) {
    decimals = std::max(0, static_cast<int>(std::ceil(-std::log10(spacing) - 1e-9)));
  }
  decimals = std::min(decimals, 12);
  std::string text = fmt::format("{:.{}f}", value, decimals);
  if (text.find_first_not_of("-0.") == std::string::npos && text[0] == '-') text.erase(0, 1);
  // A typographic minus reads better than a hyphen in tick labels.
  if (!text.empty() && text[0] == '-') text = "\u2212" + text.substr(1);
  return text;
}

std::pair<double, double> NiceRange(double low, double high, int target) {
  if (!(high > low)) {
    const double half = std::max(std::fabs(low) * 0.1, 1e-9);
    low -= half;
    high += half;
  }
  const double step = LinearStep(high - low, target);
  return {std::floor(low / step + 1e-9) * step, std::ceil(high / step - 1e-9) * step};
}

std::vector<double> AxisTicks(const PlotAxis& axis, int target) {
  if (axis.scale == AxisScale::kLinear) return LinearTicks(axis.min, axis.max, target);
  for (const std::vector<double>& mantissas :
       {std::vector<double>{1, 2, 5}, std::vector<double>{1, 3}, std::vector<double>{1}}) {
    const std::vector<double> ticks = LogTicks(axis.min, axis.max, mantissas);
    if (ticks.size() >= 3 && static_cast<int>(ticks.size()) <= target + 2) return ticks;
  }
  const std::vector<double> decades = LogTicks(axis.min, axis.max, {1});
  if (decades.size() >= 3) {
    // Very wide range: every n-th decade.
    const size_t stride = (decades.size() + target - 1) / target;
    std::vector<double> ticks;
    for (size_t i = 0; i < decades.size(); i += stride) ticks.push_back(decades[i]);
    return ticks;
  }
  // Less than about a decade: round linear values, placed on the log scale.
  return LinearTicks(axis.min, axis.max, target);
}

std::string RenderPlot(const PlotSpec& spec) {
  SEVENFOLD_ASSERT(spec.x.max > spec.x.min && spec.y.max > spec.y.min);
  SEVENFOLD_ASSERT(spec.x.scale != AxisScale::kLog || spec.x.min > 0.0);
  SEVENFOLD_ASSERT(spec.y.scale != AxisScale::kLog || spec.y.min > 0.0);
  SEVENFOLD_ASSERT(std::isfinite(spec.x.min) && std::isfinite(spec.x.max) &&
                   std::isfinite(spec.y.min) && std::isfinite(spec.y.max));

  // Legend entries, laid out in rows under the title.
  struct LegendItem {
    std::string label;
    const PlotSeries* series = nullptr;
    const PlotBand* band = nullptr;
    const PlotSpan* span = nullptr;
    double x = 0.0;
    int row = 0;
  };
  std::vector<LegendItem> legend;
  for (const PlotSeries& s : spec.series) {
    if (!s.label.empty()) legend.push_back({s.label, &s, nullptr});
  }
  for (const PlotBand& b : spec.bands) {
    if (!b.label.empty()) legend.push_back({b.label, nullptr, &b});
  }
  for (const PlotSpan& s : spec.spans) {
    if (!s.label.empty()) legend.push_back({s.label, nullptr, nullptr, &s});
  }
  const double legend_left = 4.0;
  const double legend_right = spec.width_px - kMarginRightPx;
  int num_legend_rows = 0;
  {
    double x = legend_left;
    int row = 0;
    for (LegendItem& item : legend) {
      const double width = kLegendSampleWidthPx + 6.0 + TextWidth(item.label, kFontPx) + 16.0;
      if (x > legend_left && x + width > legend_right) {
        ++row;
        x = legend_left;
      }
      item.x = x;
      item.row = row;
      x += width;
    }
    num_legend_rows = legend.empty() ? 0 : row + 1;
  }
  const bool has_marker_labels = std::any_of(spec.markers.begin(),
                                             spec.markers.end(),
                                             [](const PlotMarker& m) { return !m.label.empty(); });
  const double title_height = spec.title.empty() ? 4.0 : kTitleHeightPx;
  const double legend_top = title_height;
  const double marker_top = legend_top + num_legend_rows * kLegendRowPx;
  const double plot_top = marker_top + (has_marker_labels ? kNumMarkerRows * kMarkerRowPx : 4.0);
  const Rect area{
      kMarginLeftPx, plot_top, spec.width_px - kMarginRightPx, spec.height_px - kMarginBottomPx};
  SEVENFOLD_ASSERT(area.bottom - area.top > 10.0 && area.right - area.left > 10.0);

  const auto to_px_x = [&](double x) {
    return area.left + Transform(spec.x, x) * (area.right - area.left);
  };
  const auto to_px_y = [&](double y) {
    return area.bottom - Transform(spec.y, y) * (area.bottom - area.top);
  };
  const auto clamp_x = [&](double px) { return std::clamp(px, area.left, area.right); };
  const auto clamp_y = [&](double px) { return std::clamp(px, area.top, area.bottom); };

  std::string svg;
  // No xmlns: inline <svg> in HTML needs none, and the page must contain no URL at all.
  svg += "<svg";
  if (!spec.id.empty()) svg += fmt::format(" id=\"{}\"", EscapeXml(spec.id));
  if (!spec.css_class.empty()) svg += fmt::format(" class=\"{}\"", EscapeXml(spec.css_class));
  for (const auto& [name, value] : spec.attributes) {
    svg += fmt::format(" {}=\"{}\"", name, EscapeXml(value));
  }
  svg += fmt::format(" viewBox=\"0 0 {} {}\" width=\"{}\" height=\"{}\" role=\"img\"",
                     Px(spec.width_px),
                     Px(spec.height_px),
                     Px(spec.width_px),
                     Px(spec.height_px));
  svg += fmt::format(" font-size=\"{}\">\n", Px(kFontPx));
  if (!spec.title.empty()) {
    svg += fmt::format("<title>{}</title>\n", EscapeXml(spec.title));
    svg += fmt::format(
        "<text class=\"plot-title\" x=\"{}\" y=\"{}\" font-size=\"{}\" "
        "font-weight=\"bold\">{}</text>\n",
        Px(4.0),
        Px(14.0),
        Px(kTitleFontPx),
        EscapeXml(spec.title));
  }

  // Background and spans (extrapolation regions) first, so everything else draws over them.
  svg += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"#ffffff\"/>\n",
                     Px(area.left),
                     Px(area.top),
                     Px(area.right - area.left),
                     Px(area.bottom - area.top));
  for (const PlotSpan& span : spec.spans) {
    const double left = clamp_x(to_px_x(span.x_low));
    const double right = clamp_x(to_px_x(span.x_high));
    if (!(right > left)) continue;
    svg += "<g class=\"span\">";
    svg += fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\"/>",
                       Px(left),
                       Px(area.top),
                       Px(right - left),
                       Px(area.bottom - area.top),
                       EscapeXml(span.fill));
    if (span.hatched) {
      const Rect box{left, area.top, right, area.bottom};
      const double height = area.bottom - area.top;
      std::string hatch;
      for (double x0 = left - height; x0 < right; x0 += kHatchSpacingPx) {
        double t0 = 0.0, t1 = 1.0;
        const Point a{x0, area.bottom}, b{x0 + height, area.top};
        if (!ClipSegment(a, b, box, t0, t1)) continue;
        hatch += fmt::format("M{} {}L{} {}",
                             Px(a.x + t0 * height),
                             Px(a.y - t0 * height),
                             Px(a.x + t1 * height),
                             Px(a.y - t1 * height));
      }
      if (!hatch.empty()) {
        svg += fmt::format(
            "<path d=\"{}\" stroke=\"#b0b0b0\" stroke-width=\"0.60\" fill=\"none\"/>", hatch);
      }
    }
    svg += "</g>\n";
  }

  // Bands (threshold bands).
  for (const PlotBand& band : spec.bands) {
    const double top = clamp_y(to_px_y(band.y_high));
    const double bottom = clamp_y(to_px_y(band.y_low));
    if (!(bottom > top) || !std::isfinite(top) || !std::isfinite(bottom)) continue;
    svg += fmt::format(
        "<g class=\"band\"><rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" "
        "fill-opacity=\"{}\"/>",
        Px(area.left),
        Px(top),
        Px(area.right - area.left),
        Px(bottom - top),
        EscapeXml(band.fill),
        Px(band.opacity));
    if (!band.edge_colour.empty()) {
      for (const double y : {band.y_low, band.y_high}) {
        const double py = to_px_y(y);
        if (py < area.top || py > area.bottom) continue;
        svg += fmt::format(
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"{}\" "
            "stroke-width=\"0.80\" stroke-dasharray=\"3 2\"/>",
            Px(area.left),
            Px(py),
            Px(area.right),
            Px(py),
            EscapeXml(band.edge_colour));
      }
    }
    svg += "</g>\n";
  }

  // Grid and tick labels.
  const int x_target = std::max(3, static_cast<int>((area.right - area.left) / 70.0));
  const int y_target = std::max(3, static_cast<int>((area.bottom - area.top) / 32.0));
  const std::vector<double> x_ticks = AxisTicks(spec.x, x_target);
  const std::vector<double> y_ticks = AxisTicks(spec.y, y_target);
  const auto spacing_of = [](const PlotAxis& axis, const std::vector<double>& ticks, double v) {
    if (axis.scale == AxisScale::kLog && ticks.size() >= 2 && ticks[1] / ticks[0] > 1.5) {
      return std::pow(10.0, std::floor(std::log10(v) + 1e-9));
    }
    return ticks.size() >= 2 ? ticks[1] - ticks[0] : 1.0;
  };
  svg += "<g class=\"grid\" stroke=\"#dddddd\" stroke-width=\"0.80\">";
  for (const double t : x_ticks) {
    const double px = to_px_x(t);
    svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/>",
                       Px(px),
                       Px(area.top),
                       Px(px),
                       Px(area.bottom));
  }
  for (const double t : y_ticks) {
    const double py = to_px_y(t);
    svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"/>",
                       Px(area.left),
                       Px(py),
                       Px(area.right),
                       Px(py));
  }
  svg += "</g>\n";
  if (spec.zero_line && spec.y.scale == AxisScale::kLinear && spec.y.min < 0.0 &&
      spec.y.max > 0.0) {
    const double py = to_px_y(0.0);
    svg += fmt::format(
        "<line class=\"zero\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" "
        "stroke=\"#888888\" stroke-width=\"0.80\"/>\n",
        Px(area.left),
        Px(py),
        Px(area.right),
        Px(py));
  }

  // Markers (range limits, mid temperature), labels above the plot in up to two rows.
  std::vector<std::vector<std::pair<double, double>>> occupied(kNumMarkerRows);
  for (const PlotMarker& marker : spec.markers) {
    const double px = to_px_x(marker.x);
    if (!(px >= area.left - 0.01 && px <= area.right + 0.01)) continue;
    svg += fmt::format("<line class=\"marker\" x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" {}/>",
                       Px(px),
                       Px(area.top),
                       Px(px),
                       Px(area.bottom),
                       StrokeAttributes(marker.style));
    if (!marker.label.empty()) {
      const double half = TextWidth(marker.label, kFontPx - 1) / 2 + 3.0;
      double left = px - half, right = px + half;
      if (left < 2.0) {
        right += 2.0 - left;
        left = 2.0;
      }
      if (right > spec.width_px - 2.0) {
        left -= right - (spec.width_px - 2.0);
        right = spec.width_px - 2.0;
      }
      int row = kNumMarkerRows - 1;  // nearest the plot first
      for (; row >= 0; --row) {
        const bool free =
            std::none_of(occupied[row].begin(), occupied[row].end(), [&](const auto& o) {
              return left < o.second && right > o.first;
            });
        if (free) break;
      }
      if (row >= 0) {
        occupied[row].push_back({left, right});
        svg += fmt::format(
            "<text x=\"{}\" y=\"{}\" text-anchor=\"middle\" font-size=\"{}\" "
            "fill=\"#333333\">{}</text>",
            Px((left + right) / 2),
            Px(marker_top + (row + 1) * kMarkerRowPx - 3.0),
            Px(kFontPx - 1),
            EscapeXml(marker.label));
      }
    }
    svg += "\n";
  }

  // Series, clipped to the plot area.
  for (const PlotSeries& s : spec.series) {
    SEVENFOLD_ASSERT(s.x.size() == s.y.size());
    std::vector<Point> points;
    points.reserve(s.x.size());
    for (size_t i = 0; i < s.x.size(); ++i) points.push_back({to_px_x(s.x[i]), to_px_y(s.y[i])});
    const std::vector<std::vector<Point>> pieces = ClipPath(points, area);
    svg += "<g";
    if (!s.css_class.empty()) svg += fmt::format(" class=\"{}\"", EscapeXml(s.css_class));
    svg += fmt::format(" fill=\"none\" {} stroke-linejoin=\"round\">", StrokeAttributes(s.style));
    for (const std::vector<Point>& piece : pieces) {
      if (piece.size() < 2) continue;
      svg += fmt::format("<polyline points=\"{}\"/>", PolylinePoints(piece));
    }
    svg += "</g>\n";
  }

  // Frame, ticks and labels.
  svg += fmt::format(
      "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" "
      "stroke=\"#333333\" stroke-width=\"1.00\"/>\n",
      Px(area.left),
      Px(area.top),
      Px(area.right - area.left),
      Px(area.bottom - area.top));
  svg += "<g class=\"ticks\" fill=\"#222222\">";
  for (const double t : x_ticks) {
    const double px = to_px_x(t);
    svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#333333\"/>",
                       Px(px),
                       Px(area.bottom),
                       Px(px),
                       Px(area.bottom + kTickLengthPx));
    svg += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>",
                       Px(px),
                       Px(area.bottom + kTickLengthPx + kFontPx + 1.0),
                       EscapeXml(FormatTickLabel(t, spacing_of(spec.x, x_ticks, t))));
  }
  for (const double t : y_ticks) {
    const double py = to_px_y(t);
    svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke=\"#333333\"/>",
                       Px(area.left - kTickLengthPx),
                       Px(py),
                       Px(area.left),
                       Px(py));
    svg += fmt::format("<text x=\"{}\" y=\"{}\" text-anchor=\"end\">{}</text>",
                       Px(area.left - kTickLengthPx - 2.0),
                       Px(py + kFontPx * 0.35),
                       EscapeXml(FormatTickLabel(t, spacing_of(spec.y, y_ticks, t))));
  }
  svg += "</g>\n";
  if (!spec.x.label.empty()) {
    svg += fmt::format(
        "<text class=\"axis-label\" x=\"{}\" y=\"{}\" text-anchor=\"middle\">{}</text>\n",
        Px((area.left + area.right) / 2),
        Px(spec.height_px - 6.0),
        EscapeXml(spec.x.label));
  }
  if (!spec.y.label.empty()) {
    const double cx = 12.0, cy = (area.top + area.bottom) / 2;
    svg += fmt::format(
        "<text class=\"axis-label\" x=\"{}\" y=\"{}\" text-anchor=\"middle\" "
        "transform=\"rotate(-90 {} {})\">{}</text>\n",
        Px(cx),
        Px(cy),
        Px(cx),
        Px(cy),
        EscapeXml(spec.y.label));
  }

  // Legend.
  if (!legend.empty()) {
    svg += "<g class=\"legend\">";
    for (const LegendItem& item : legend) {
      const double y = legend_top + item.row * kLegendRowPx + kLegendRowPx / 2;
      if (item.series != nullptr) {
        svg += fmt::format("<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" {}/>",
                           Px(item.x),
                           Px(y),
                           Px(item.x + kLegendSampleWidthPx),
                           Px(y),
                           StrokeAttributes(item.series->style));
      } else if (item.span != nullptr) {
        const double left = item.x, top = y - 5.0, size = 10.0;
        svg += fmt::format(
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" "
            "stroke=\"#b0b0b0\" stroke-width=\"0.60\"/>",
            Px(left),
            Px(top),
            Px(kLegendSampleWidthPx),
            Px(size),
            EscapeXml(item.span->fill));
        if (item.span->hatched) {
          std::string hatch;
          const Rect box{left, top, left + kLegendSampleWidthPx, top + size};
          for (double x0 = left - size; x0 < box.right; x0 += kHatchSpacingPx) {
            double t0 = 0.0, t1 = 1.0;
            const Point a{x0, box.bottom}, b{x0 + size, box.top};
            if (!ClipSegment(a, b, box, t0, t1)) continue;
            hatch += fmt::format("M{} {}L{} {}",
                                 Px(a.x + t0 * size),
                                 Px(a.y - t0 * size),
                                 Px(a.x + t1 * size),
                                 Px(a.y - t1 * size));
          }
          if (!hatch.empty()) {
            svg += fmt::format(
                "<path d=\"{}\" stroke=\"#b0b0b0\" stroke-width=\"0.60\" fill=\"none\"/>", hatch);
          }
        }
      } else {
        svg += fmt::format(
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" "
            "fill-opacity=\"{}\" stroke=\"{}\" stroke-width=\"0.80\"/>",
            Px(item.x),
            Px(y - 4.0),
            Px(kLegendSampleWidthPx),
            Px(8.0),
            EscapeXml(item.band->fill),
            Px(item.band->opacity),
            EscapeXml(item.band->edge_colour.empty() ? item.band->fill : item.band->edge_colour));
      }
      svg += fmt::format("<text x=\"{}\" y=\"{}\">{}</text>",
                         Px(item.x + kLegendSampleWidthPx + 5.0),
                         Px(y + kFontPx * 0.35),
                         EscapeXml(item.label));
    }
    svg += "</g>\n";
  }
  svg += "</svg>";
  return svg;
}

}  // namespace sevenfold

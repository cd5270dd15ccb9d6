// SPDX-License-Identifier: MIT
// The SVG plot writer, in four parts: element builders (escaped text, paths, rectangles), tick
// computation, geometry (axis transforms, clipping, decimation, the hatch pattern) and one
// function per layer of the plot, which RenderPlot stacks in drawing order.
#include "report/report_svg.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <utility>

#include "core/error.h"
#include "core/output_text.h"

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
// A curve is drawn through the fewest of its points that keep it within this distance of the
// full polyline (Ramer-Douglas-Peucker). A quarter of a pixel at the plot's own size is below
// what a screen shows with the line widths used (0.8 px and wider), and it cuts the ~250 sampled
// points of a smooth curve to a few dozen.
constexpr double kDecimationTolerancePx = 0.25;

// ---- Element builders ------------------------------------------------------------------------

// Coordinates are written in tenths of a pixel: far below what a display resolves at these
// sizes, and a fixed grid keeps the output byte-stable.
long Tenths(double value) {
  SEVENFOLD_ASSERT(std::isfinite(value) && std::fabs(value) < 1e9);
  return std::lround(value * 10.0);
}

std::string TenthsText(long tenths) {
  const long magnitude = tenths < 0 ? -tenths : tenths;
  std::string text = (tenths < 0 ? "-" : "") + std::to_string(magnitude / 10);
  if (magnitude % 10 != 0) text += "." + std::to_string(magnitude % 10);
  return text;
}

std::string Px(double value) { return TenthsText(Tenths(value)); }

struct Point {
  double x, y;
};

struct Rect {
  double left, top, right, bottom;
  double Width() const { return right - left; }
  double Height() const { return bottom - top; }
};

// SVG path data in its compact form: an absolute move, then relative lines whose command letter
// is written once (later pairs repeat it implicitly), and absolute vertical or horizontal lines.
// Relative steps are taken between the rounded points, so rounding never accumulates.
class PathData {
 public:
  void MoveTo(Point p) {
    x_ = Tenths(p.x);
    y_ = Tenths(p.y);
    d_ += "M" + TenthsText(x_);
    AppendNumber(y_);
    last_ = 'M';
  }
  void LineTo(Point p) {
    const long x = Tenths(p.x), y = Tenths(p.y);
    if (last_ != 'l') {
      d_ += 'l';
      last_ = 'l';
      d_ += TenthsText(x - x_);
    } else {
      AppendNumber(x - x_);
    }
    AppendNumber(y - y_);
    x_ = x;
    y_ = y;
  }
  void VerticalTo(double y) {
    y_ = Tenths(y);
    d_ += "V" + TenthsText(y_);
    last_ = 'V';
  }
  void HorizontalTo(double x) {
    x_ = Tenths(x);
    d_ += "H" + TenthsText(x_);
    last_ = 'H';
  }
  bool empty() const { return d_.empty(); }
  const std::string& str() const { return d_; }

 private:
  // A number after another needs a separator unless its own minus sign is one.
  void AppendNumber(long tenths) {
    if (tenths >= 0) d_ += ' ';
    d_ += TenthsText(tenths);
  }
  std::string d_;
  long x_ = 0, y_ = 0;
  char last_ = 0;
};

std::string Attribute(const char* name, const std::string& value) {
  return fmt::format(" {}=\"{}\"", name, EscapeXml(value));
}

std::string Stroke(const LineStyle& style) {
  std::string text = Attribute("stroke", style.colour) + Attribute("stroke-width", Px(style.width_px));
  if (!style.dash.empty()) text += Attribute("stroke-dasharray", style.dash);
  return text;
}

std::string TextElement(Point at, const std::string& text, const std::string& attributes = "") {
  return fmt::format(
      "<text x=\"{}\" y=\"{}\"{}>{}</text>", Px(at.x), Px(at.y), attributes, EscapeXml(text));
}

std::string RectElement(const Rect& r, const std::string& attributes) {
  return fmt::format("<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"{}/>",
                     Px(r.left),
                     Px(r.top),
                     Px(r.Width()),
                     Px(r.Height()),
                     attributes);
}

std::string PathElement(const PathData& d, const std::string& attributes) {
  if (d.empty()) return "";
  return "<path d=\"" + d.str() + "\"" + attributes + "/>";
}

double TextWidth(const std::string& text, double font_px) {
  // Count UTF-8 code points, not bytes.
  int num_chars = 0;
  for (const unsigned char c : text) {
    if ((c & 0xC0) != 0x80) ++num_chars;
  }
  return num_chars * font_px * kCharWidthEm;
}

// ---- Ticks -----------------------------------------------------------------------------------

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

// The spacing that decides how many decimals the label of tick `value` needs.
double TickSpacing(const PlotAxis& axis, const std::vector<double>& ticks, double value) {
  if (axis.scale == AxisScale::kLog && ticks.size() >= 2 && ticks[1] / ticks[0] > 1.5) {
    return std::pow(10.0, std::floor(std::log10(value) + 1e-9));
  }
  return ticks.size() >= 2 ? ticks[1] - ticks[0] : 1.0;
}

// ---- Geometry --------------------------------------------------------------------------------

double Transform(const PlotAxis& axis, double value) {
  if (axis.scale == AxisScale::kLog) {
    if (!(value > 0.0)) return std::nan("");
    return (std::log(value) - std::log(axis.min)) / (std::log(axis.max) - std::log(axis.min));
  }
  return (value - axis.min) / (axis.max - axis.min);
}

// Where the plot sits in the SVG and how data maps onto it.
struct Frame {
  Rect area;
  PlotAxis x, y;
  double ToPxX(double value) const { return area.left + Transform(x, value) * area.Width(); }
  double ToPxY(double value) const { return area.bottom - Transform(y, value) * area.Height(); }
  bool ContainsX(double px) const { return px >= area.left - 0.01 && px <= area.right + 0.01; }
  bool ContainsY(double py) const { return py >= area.top - 0.01 && py <= area.bottom + 0.01; }
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
    if (!open || t0 > 0.0) pieces.push_back({start});
    pieces.back().push_back(end);
    open = t1 >= 1.0;
  }
  return pieces;
}

double DistanceToSegment(const Point& p, const Point& a, const Point& b) {
  const double dx = b.x - a.x, dy = b.y - a.y;
  const double length_squared = dx * dx + dy * dy;
  double t = length_squared > 0.0 ? ((p.x - a.x) * dx + (p.y - a.y) * dy) / length_squared : 0.0;
  t = std::clamp(t, 0.0, 1.0);
  return std::hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
}

// Ramer-Douglas-Peucker: the points of `piece` needed to stay within `tolerance` of it. The
// ends are always kept, so clipped pieces still meet the plot's edge exactly.
std::vector<Point> Decimate(const std::vector<Point>& piece, double tolerance) {
  if (piece.size() <= 2) return piece;
  std::vector<bool> keep(piece.size(), false);
  keep.front() = keep.back() = true;
  std::vector<std::pair<size_t, size_t>> stack{{0, piece.size() - 1}};
  while (!stack.empty()) {
    const auto [first, last] = stack.back();
    stack.pop_back();
    double farthest = -1.0;
    size_t at = first;
    for (size_t i = first + 1; i < last; ++i) {
      const double d = DistanceToSegment(piece[i], piece[first], piece[last]);
      if (d > farthest) {
        farthest = d;
        at = i;
      }
    }
    if (farthest > tolerance) {
      keep[at] = true;
      stack.push_back({first, at});
      stack.push_back({at, last});
    }
  }
  std::vector<Point> kept;
  for (size_t i = 0; i < piece.size(); ++i) {
    if (keep[i]) kept.push_back(piece[i]);
  }
  return kept;
}

// The one hatch of the writer: a tile of diagonal lines (with the corner pieces that make tiles
// join), used as the fill of hatched spans and of their legend sample. The pattern lives inside
// the same <svg>, so the element stays self-contained.
std::string HatchPattern(const std::string& id) {
  const double s = kHatchSpacingPx;
  PathData d;
  d.MoveTo({0.0, s});
  d.LineTo({s, 0.0});
  d.MoveTo({-1.0, 1.0});
  d.LineTo({1.0, -1.0});
  d.MoveTo({s - 1.0, s + 1.0});
  d.LineTo({s + 1.0, s - 1.0});
  return fmt::format(
      "<defs><pattern id=\"{}\" patternUnits=\"userSpaceOnUse\" width=\"{}\" height=\"{}\">{}"
      "</pattern></defs>\n",
      EscapeXml(id),
      Px(s),
      Px(s),
      PathElement(d, " stroke=\"#b0b0b0\" stroke-width=\"0.6\" fill=\"none\""));
}

// ---- Layout ----------------------------------------------------------------------------------

struct LegendItem {
  std::string label;
  const PlotSeries* series = nullptr;
  const PlotBand* band = nullptr;
  const PlotSpan* span = nullptr;
  double x = 0.0;
  int row = 0;
};

struct Layout {
  Frame frame;
  double legend_top = 0.0;
  double marker_top = 0.0;
  std::vector<LegendItem> legend;
  std::vector<double> x_ticks, y_ticks;
  std::string hatch_id;  // "" when nothing is hatched
};

// Legend entries in rows under the title; returns the number of rows.
int LayOutLegend(const PlotSpec& spec, std::vector<LegendItem>& legend) {
  for (const PlotSeries& s : spec.series) {
    if (!s.label.empty()) legend.push_back({s.label, &s});
  }
  for (const PlotBand& b : spec.bands) {
    if (!b.label.empty()) legend.push_back({b.label, nullptr, &b});
  }
  for (const PlotSpan& s : spec.spans) {
    if (!s.label.empty()) legend.push_back({s.label, nullptr, nullptr, &s});
  }
  const double left = 4.0, right = spec.width_px - kMarginRightPx;
  double x = left;
  int row = 0;
  for (LegendItem& item : legend) {
    const double width = kLegendSampleWidthPx + 6.0 + TextWidth(item.label, kFontPx) + 16.0;
    if (x > left && x + width > right) {
      ++row;
      x = left;
    }
    item.x = x;
    item.row = row;
    x += width;
  }
  return legend.empty() ? 0 : row + 1;
}

Layout LayOut(const PlotSpec& spec) {
  Layout layout;
  const int num_legend_rows = LayOutLegend(spec, layout.legend);
  const bool has_marker_labels = std::any_of(spec.markers.begin(),
                                             spec.markers.end(),
                                             [](const PlotMarker& m) { return !m.label.empty(); });
  layout.legend_top = spec.title.empty() ? 4.0 : kTitleHeightPx;
  layout.marker_top = layout.legend_top + num_legend_rows * kLegendRowPx;
  const double plot_top =
      layout.marker_top + (has_marker_labels ? kNumMarkerRows * kMarkerRowPx : 4.0);
  layout.frame.area = Rect{
      kMarginLeftPx, plot_top, spec.width_px - kMarginRightPx, spec.height_px - kMarginBottomPx};
  SEVENFOLD_ASSERT(layout.frame.area.Height() > 10.0 && layout.frame.area.Width() > 10.0);
  layout.frame.x = spec.x;
  layout.frame.y = spec.y;
  const int x_target = std::max(3, static_cast<int>(layout.frame.area.Width() / 70.0));
  const int y_target = std::max(3, static_cast<int>(layout.frame.area.Height() / 32.0));
  layout.x_ticks = AxisTicks(spec.x, x_target);
  layout.y_ticks = AxisTicks(spec.y, y_target);
  if (std::any_of(spec.spans.begin(), spec.spans.end(), [](const PlotSpan& s) {
        return s.hatched;
      })) {
    layout.hatch_id = (spec.id.empty() ? std::string("plot") : spec.id) + "-hatch";
  }
  return layout;
}

// ---- Layers, in drawing order ----------------------------------------------------------------

std::string OpeningLayer(const PlotSpec& spec, const Layout& layout) {
  // No xmlns: inline <svg> in HTML needs none, and the page must contain no URL at all.
  std::string svg = "<svg";
  if (!spec.id.empty()) svg += Attribute("id", spec.id);
  if (!spec.css_class.empty()) svg += Attribute("class", spec.css_class);
  for (const auto& [name, value] : spec.attributes) svg += Attribute(name.c_str(), value);
  svg += fmt::format(" viewBox=\"0 0 {0} {1}\" width=\"{0}\" height=\"{1}\" role=\"img\"",
                     Px(spec.width_px),
                     Px(spec.height_px));
  svg += fmt::format(" font-size=\"{}\">\n", Px(kFontPx));
  if (!spec.title.empty()) {
    svg += "<title>" + EscapeXml(spec.title) + "</title>\n";
    svg += TextElement({4.0, 14.0},
                       spec.title,
                       fmt::format(" class=\"plot-title\" font-size=\"{}\" font-weight=\"bold\"",
                                   Px(kTitleFontPx))) +
           "\n";
  }
  if (!layout.hatch_id.empty()) svg += HatchPattern(layout.hatch_id);
  return svg;
}

// The white plot area and the spans (extrapolation regions), so everything else draws over them.
std::string SpansLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  std::string svg = RectElement(f.area, " fill=\"#ffffff\"") + "\n";
  for (const PlotSpan& span : spec.spans) {
    const double left = std::clamp(f.ToPxX(span.x_low), f.area.left, f.area.right);
    const double right = std::clamp(f.ToPxX(span.x_high), f.area.left, f.area.right);
    if (!(right > left)) continue;
    const Rect box{left, f.area.top, right, f.area.bottom};
    svg += "<g class=\"span\">" + RectElement(box, Attribute("fill", span.fill));
    if (span.hatched) svg += RectElement(box, " fill=\"url(#" + EscapeXml(layout.hatch_id) + ")\"");
    svg += "</g>\n";
  }
  return svg;
}

// Horizontal bands (thresholds), with optional dashed edges.
std::string BandsLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  std::string svg;
  for (const PlotBand& band : spec.bands) {
    const double top = std::clamp(f.ToPxY(band.y_high), f.area.top, f.area.bottom);
    const double bottom = std::clamp(f.ToPxY(band.y_low), f.area.top, f.area.bottom);
    if (!(bottom > top) || !std::isfinite(top) || !std::isfinite(bottom)) continue;
    svg += "<g class=\"band\">";
    svg += RectElement({f.area.left, top, f.area.right, bottom},
                       Attribute("fill", band.fill) + Attribute("fill-opacity", Px(band.opacity)));
    if (!band.edge_colour.empty()) {
      PathData edges;
      for (const double y : {band.y_low, band.y_high}) {
        const double py = f.ToPxY(y);
        if (!f.ContainsY(py)) continue;
        edges.MoveTo({f.area.left, py});
        edges.HorizontalTo(f.area.right);
      }
      svg += PathElement(edges,
                         Attribute("stroke", band.edge_colour) +
                             " stroke-width=\"0.8\" stroke-dasharray=\"3 2\"");
    }
    svg += "</g>\n";
  }
  return svg;
}

std::string GridLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  PathData grid;
  for (const double t : layout.x_ticks) {
    grid.MoveTo({f.ToPxX(t), f.area.top});
    grid.VerticalTo(f.area.bottom);
  }
  for (const double t : layout.y_ticks) {
    grid.MoveTo({f.area.left, f.ToPxY(t)});
    grid.HorizontalTo(f.area.right);
  }
  std::string svg =
      PathElement(grid, " class=\"grid\" stroke=\"#dddddd\" stroke-width=\"0.8\" fill=\"none\"") +
      "\n";
  if (spec.zero_line && spec.y.scale == AxisScale::kLinear && spec.y.min < 0.0 &&
      spec.y.max > 0.0) {
    PathData zero;
    zero.MoveTo({f.area.left, f.ToPxY(0.0)});
    zero.HorizontalTo(f.area.right);
    svg += PathElement(zero, " class=\"zero\" stroke=\"#888888\" stroke-width=\"0.8\"") + "\n";
  }
  return svg;
}

// Vertical marker lines (range limits, mid temperature), labels above the plot in up to two rows.
std::string MarkersLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  std::string svg;
  std::vector<std::vector<std::pair<double, double>>> occupied(kNumMarkerRows);
  for (const PlotMarker& marker : spec.markers) {
    const double px = f.ToPxX(marker.x);
    if (!f.ContainsX(px)) continue;
    PathData line;
    line.MoveTo({px, f.area.top});
    line.VerticalTo(f.area.bottom);
    svg += PathElement(line, " class=\"marker\"" + Stroke(marker.style));
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
        svg += TextElement({(left + right) / 2, layout.marker_top + (row + 1) * kMarkerRowPx - 3.0},
                           marker.label,
                           fmt::format(" text-anchor=\"middle\" font-size=\"{}\" fill=\"#333333\"",
                                       Px(kFontPx - 1)));
      }
    }
    svg += "\n";
  }
  return svg;
}

// Series, clipped to the plot area and decimated: one path per series.
std::string SeriesLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  std::string svg;
  for (const PlotSeries& s : spec.series) {
    SEVENFOLD_ASSERT(s.x.size() == s.y.size());
    std::vector<Point> points;
    points.reserve(s.x.size());
    for (size_t i = 0; i < s.x.size(); ++i) points.push_back({f.ToPxX(s.x[i]), f.ToPxY(s.y[i])});
    PathData d;
    for (const std::vector<Point>& piece : ClipPath(points, f.area)) {
      if (piece.size() < 2) continue;
      const std::vector<Point> kept = Decimate(piece, kDecimationTolerancePx);
      d.MoveTo(kept.front());
      for (size_t i = 1; i < kept.size(); ++i) d.LineTo(kept[i]);
    }
    std::string attributes;
    if (!s.css_class.empty()) attributes += Attribute("class", s.css_class);
    attributes += " fill=\"none\"" + Stroke(s.style) + " stroke-linejoin=\"round\"";
    // An empty series still gets its (empty) element, so a reader of the SVG finds every curve.
    svg += d.empty() ? "<path d=\"\"" + attributes + "/>\n" : PathElement(d, attributes) + "\n";
  }
  return svg;
}

// The frame, tick marks and tick labels.
std::string AxesLayer(const PlotSpec& spec, const Layout& layout) {
  const Frame& f = layout.frame;
  std::string svg =
      RectElement(f.area, " fill=\"none\" stroke=\"#333333\" stroke-width=\"1\"") + "\n";
  PathData marks;
  for (const double t : layout.x_ticks) {
    marks.MoveTo({f.ToPxX(t), f.area.bottom});
    marks.VerticalTo(f.area.bottom + kTickLengthPx);
  }
  for (const double t : layout.y_ticks) {
    marks.MoveTo({f.area.left - kTickLengthPx, f.ToPxY(t)});
    marks.HorizontalTo(f.area.left);
  }
  svg += PathElement(marks, " stroke=\"#333333\"");
  svg += "<g class=\"ticks\" fill=\"#222222\" text-anchor=\"middle\">";
  for (const double t : layout.x_ticks) {
    svg += TextElement({f.ToPxX(t), f.area.bottom + kTickLengthPx + kFontPx + 1.0},
                       FormatTickLabel(t, TickSpacing(spec.x, layout.x_ticks, t)));
  }
  svg += "</g><g class=\"ticks\" fill=\"#222222\" text-anchor=\"end\">";
  for (const double t : layout.y_ticks) {
    svg += TextElement({f.area.left - kTickLengthPx - 2.0, f.ToPxY(t) + kFontPx * 0.35},
                       FormatTickLabel(t, TickSpacing(spec.y, layout.y_ticks, t)));
  }
  svg += "</g>\n";
  return svg;
}

std::string AxisLabelsLayer(const PlotSpec& spec, const Layout& layout) {
  const Rect& area = layout.frame.area;
  std::string svg;
  if (!spec.x.label.empty()) {
    svg += TextElement({(area.left + area.right) / 2, spec.height_px - 6.0},
                       spec.x.label,
                       " class=\"axis-label\" text-anchor=\"middle\"") +
           "\n";
  }
  if (!spec.y.label.empty()) {
    const double cx = 12.0, cy = (area.top + area.bottom) / 2;
    svg += TextElement({cx, cy},
                       spec.y.label,
                       fmt::format(" class=\"axis-label\" text-anchor=\"middle\" "
                                   "transform=\"rotate(-90 {} {})\"",
                                   Px(cx),
                                   Px(cy))) +
           "\n";
  }
  return svg;
}

std::string LegendLayer(const Layout& layout) {
  if (layout.legend.empty()) return "";
  std::string svg = "<g class=\"legend\">";
  for (const LegendItem& item : layout.legend) {
    const double y = layout.legend_top + item.row * kLegendRowPx + kLegendRowPx / 2;
    if (item.series != nullptr) {
      PathData sample;
      sample.MoveTo({item.x, y});
      sample.HorizontalTo(item.x + kLegendSampleWidthPx);
      svg += PathElement(sample, Stroke(item.series->style));
    } else if (item.span != nullptr) {
      const Rect box{item.x, y - 5.0, item.x + kLegendSampleWidthPx, y + 5.0};
      svg += RectElement(box,
                         Attribute("fill", item.span->fill) +
                             " stroke=\"#b0b0b0\" stroke-width=\"0.6\"");
      if (item.span->hatched && !layout.hatch_id.empty()) {
        svg += RectElement(box, " fill=\"url(#" + EscapeXml(layout.hatch_id) + ")\"");
      }
    } else {
      const PlotBand& band = *item.band;
      svg += RectElement(
          {item.x, y - 4.0, item.x + kLegendSampleWidthPx, y + 4.0},
          Attribute("fill", band.fill) + Attribute("fill-opacity", Px(band.opacity)) +
              Attribute("stroke", band.edge_colour.empty() ? band.fill : band.edge_colour) +
              " stroke-width=\"0.8\"");
    }
    svg += TextElement({item.x + kLegendSampleWidthPx + 5.0, y + kFontPx * 0.35}, item.label);
  }
  return svg + "</g>\n";
}

}  // namespace

std::string EscapeXml(const std::string& text) { return EscapeMarkup(text); }

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
  const Layout layout = LayOut(spec);
  return OpeningLayer(spec, layout) + SpansLayer(spec, layout) + BandsLayer(spec, layout) +
         GridLayer(spec, layout) + MarkersLayer(spec, layout) + SeriesLayer(spec, layout) +
         AxesLayer(spec, layout) + AxisLabelsLayer(spec, layout) + LegendLayer(layout) + "</svg>";
}

}  // namespace sevenfold

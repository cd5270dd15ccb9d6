// SPDX-License-Identifier: MIT
// A small, general SVG line-plot writer: axes with round ticks (linear or logarithmic), polylines
// with dash patterns, horizontal bands, shaded and hatched vertical spans, marker lines and a
// legend. Output is a string, deterministic (coordinates in tenths of a pixel, fixed formatting),
// self-contained (no scripts, no references to anything outside the element: the one hatch
// pattern is defined inside it) and compact: curves are clipped to the plot area by the writer
// itself and decimated to what a screen can show, as relative path data.
#pragma once

#include <string>
#include <utility>
#include <vector>

namespace sevenfold {

enum class AxisScale { kLinear, kLog };

struct PlotAxis {
  double min = 0.0;  // data range shown; min < max (both > 0 on a log axis)
  double max = 1.0;
  AxisScale scale = AxisScale::kLinear;
  std::string label;  // with the unit, e.g. "T / K"
};

// How a line is drawn. Colours are CSS colours; dash is an SVG dash array ("" = solid).
struct LineStyle {
  std::string colour = "#000000";
  double width_px = 1.5;
  std::string dash;
};

// A polyline through (x[i], y[i]); a non-finite y (or x) breaks the line into pieces.
struct PlotSeries {
  std::vector<double> x;
  std::vector<double> y;
  LineStyle style;
  std::string label;      // shown in the legend when not empty
  std::string css_class;  // class attribute of the <g> holding the polylines
};

// A horizontal band y_low <= y <= y_high across the whole plot (a threshold band, say).
struct PlotBand {
  double y_low = 0.0;
  double y_high = 0.0;
  std::string fill = "#f0e442";
  double opacity = 0.3;
  std::string edge_colour;  // "" for no edge lines
  std::string label;        // legend text when not empty
};

// A vertical span x_low <= x <= x_high (an extrapolation region, say), optionally hatched with
// diagonal lines so that it stays visible in greyscale print.
struct PlotSpan {
  double x_low = 0.0;
  double x_high = 0.0;
  std::string fill = "#eeeeee";
  bool hatched = true;
  std::string label;  // legend text when not empty (give it to one of several alike spans)
};

// A vertical line across the plot at x, labelled at the top.
struct PlotMarker {
  double x = 0.0;
  std::string label;
  LineStyle style{"#555555", 1.0, "5 3 1 3"};
};

struct PlotSpec {
  // id attribute of the <svg>; "" for none. Give one when several plots share a page: the
  // hatch pattern's id is derived from it.
  std::string id;
  std::string css_class;  // class attribute of the <svg>
  std::vector<std::pair<std::string, std::string>> attributes;  // extra attributes, escaped here
  std::string title;                                            // written above the plot
  double width_px = 460.0;
  double height_px = 280.0;
  PlotAxis x;
  PlotAxis y;
  std::vector<PlotSpan> spans;
  std::vector<PlotBand> bands;
  std::vector<PlotMarker> markers;
  std::vector<PlotSeries> series;
  bool zero_line = false;  // a thin line at y = 0
};

// The complete <svg> element for `spec`. Every number in it is finite, coordinates are in tenths
// of a pixel; each series is one <path> (class = its css_class) clipped to the plot area and
// decimated to within a quarter pixel. Aborts (SEVENFOLD_ASSERT) on an empty or inverted axis
// range, or a non-positive log-axis bound: the caller builds the ranges.
std::string RenderPlot(const PlotSpec& spec);

// Round tick values inside [min, max]: for a linear axis multiples of 1, 2 or 5 times a power
// of ten, about `target` of them; for a log axis 1-2-5 (or 1..9) times powers of ten, or linear
// ticks when the range spans too little of a decade for that.
std::vector<double> AxisTicks(const PlotAxis& axis, int target);

// A tick label: the value with as many decimals as the tick spacing needs (0 for 100, 200, ...;
// 2 for 0.05, 0.10, ...), never "-0".
std::string FormatTickLabel(double value, double spacing);

// [low, high] widened to round values (multiples of the tick step for about `target` ticks);
// low == high is widened around the value. Used for automatic y ranges.
std::pair<double, double> NiceRange(double low, double high, int target);

// Text escaped for XML/HTML content and attribute values (& < > " ').
std::string EscapeXml(const std::string& text);

}  // namespace sevenfold

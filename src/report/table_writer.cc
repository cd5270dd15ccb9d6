// SPDX-License-Identifier: MIT
#include "report/table_writer.h"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/error.h"
#include "core/output_text.h"

namespace sevenfold {

std::string ToString(TableFormat format) {
  switch (format) {
    case TableFormat::kText: return "text";
    case TableFormat::kCsv: return "csv";
    case TableFormat::kJson: return "json";
  }
  return "text";
}

std::optional<TableFormat> ParseTableFormat(const std::string& text) {
  for (TableFormat format : {TableFormat::kText, TableFormat::kCsv, TableFormat::kJson}) {
    if (ToString(format) == text) return format;
  }
  return std::nullopt;
}

double GibbsFunction(const ThermoPoint& point) {
  return point.s_j_per_mol_k - point.h_minus_h298_j_per_mol / point.t_k;
}

namespace {

// A CSV text cell per RFC 4180 (quoted when it holds a comma, a quote, CR or LF; quotes doubled),
// and neutralised for spreadsheets: a cell starting with =, +, -, @, tab or CR would be read as a
// formula, so it gets a leading apostrophe (the usual defence against CSV formula injection).
// CSV goes to terminals too (`table --format csv`), so control characters, line breaks
// included, are written visibly first. Only text cells go through here.
std::string CsvTextCell(const std::string& raw) {
  std::string text = VisibleControls(raw, false);
  if (!text.empty() && std::string("=+-@\t\r").find(text[0]) != std::string::npos) {
    text = "'" + text;
  }
  if (text.find_first_of(",\"\r\n") == std::string::npos) return text;
  std::string quoted = "\"";
  for (const char c : text) {
    quoted += c;
    if (c == '"') quoted += '"';
  }
  return quoted + "\"";
}

std::string PressureLabel(double pressure_pa) {
  if (pressure_pa == constants::kStandardPressureBar) return "1 bar";
  if (pressure_pa == constants::kStandardPressureAtm) return "1 atm";
  return fmt::format("{} Pa", pressure_pa);
}

// The three formation cells: text (fixed width), CSV (empty when unknown) or JSON (null).
std::string FormationText(const std::optional<FormationPoint>& f) {
  if (!f) return fmt::format(" {:>10} {:>10} {:>8}", kNoFormationValue, kNoFormationValue,
                             kNoFormationValue);
  return fmt::format(" {:>10.3f} {:>10.3f} {:>8.3f}", f->dfh_j_per_mol / 1000.0,
                     f->dfg_j_per_mol / 1000.0, f->log10_kf);
}

std::string FormationCsv(const std::optional<FormationPoint>& f) {
  if (!f) return ",,,";
  return fmt::format(",{},{},{}", f->dfh_j_per_mol / 1000.0, f->dfg_j_per_mol / 1000.0,
                     f->log10_kf);
}

std::string FormationJson(const std::optional<FormationPoint>& f) {
  if (!f) return ", \"dfH\": null, \"dfG\": null, \"log10Kf\": null";
  return fmt::format(", \"dfH\": {}, \"dfG\": {}, \"log10Kf\": {}", f->dfh_j_per_mol / 1000.0,
                     f->dfg_j_per_mol / 1000.0, f->log10_kf);
}

bool HasRangeColumn(const std::vector<TableRow>& rows) {
  return !rows.empty() && rows.front().outside_range.has_value();
}

std::string FormatText(const std::vector<TableRow>& rows) {
  std::string out;
  std::string current;
  bool marked = false;  // a row of the current species is outside its range
  const auto footnote = [&]() {
    if (marked) {
      out += fmt::format("{} outside the entry's fitted range: the polynomial extrapolates\n",
                         kOutsideRangeMarker);
    }
    marked = false;
  };
  for (const TableRow& row : rows) {
    if (row.species != current || out.empty()) {
      footnote();
      current = row.species;
      if (!out.empty()) out += "\n";
      out += fmt::format("{}  (ideal gas, standard pressure {})\n",
                         VisibleControls(row.species, false),
                         PressureLabel(row.standard_pressure_pa));
      out += fmt::format("{:>10} {:>10} {:>10} {:>11} {:>12} {:>12} {:>10} {:>10} {:>8}\n", "T",
                         "Cp", "S", "H-H298", "H", "-(G-H298)/T", "dfH", "dfG", "log10Kf");
      out += fmt::format("{:>10} {:>10} {:>10} {:>11} {:>12} {:>12} {:>10} {:>10} {:>8}\n", "K",
                         "J/mol/K", "J/mol/K", "kJ/mol", "kJ/mol", "J/mol/K", "kJ/mol", "kJ/mol",
                         "1");
    }
    const ThermoPoint& p = row.point;
    const bool outside = row.outside_range.value_or(false);
    marked = marked || outside;
    out += fmt::format("{:>10.2f} {:>10.3f} {:>10.3f} {:>11.3f} {:>12.3f} {:>12.3f}{}{}\n",
                       p.t_k, p.cp_j_per_mol_k, p.s_j_per_mol_k,
                       p.h_minus_h298_j_per_mol / 1000.0, p.h_j_per_mol / 1000.0,
                       GibbsFunction(p), FormationText(row.formation),
                       outside ? std::string(" ") + kOutsideRangeMarker : std::string());
  }
  footnote();
  return out;
}

std::string FormatCsv(const std::vector<TableRow>& rows) {
  const bool range_column = HasRangeColumn(rows);
  std::string out = std::string(kTableCsvHeader) +
                    (range_column ? std::string(",") + kOutsideRangeColumn : std::string()) + "\n";
  for (const TableRow& row : rows) {
    const ThermoPoint& p = row.point;
    out += fmt::format("{},{},{},{},{},{},{}{}{}\n", CsvTextCell(row.species), p.t_k,
                       p.cp_j_per_mol_k, p.s_j_per_mol_k, p.h_minus_h298_j_per_mol / 1000.0,
                       p.h_j_per_mol / 1000.0, GibbsFunction(p), FormationCsv(row.formation),
                       range_column ? (row.outside_range.value_or(false) ? ",true" : ",false")
                                    : "");
  }
  return out;
}

std::string FormatJson(const std::vector<TableRow>& rows) {
  // {"units": {...}, "species": [{"name": ..., "rows": [{"T": ..., ...}, ...]}, ...]}
  std::string out =
      "{\n  \"units\": {\"T\": \"K\", \"Cp\": \"J/mol/K\", \"S\": \"J/mol/K\", "
      "\"H-H298\": \"kJ/mol\", \"H\": \"kJ/mol\", \"-(G-H298)/T\": \"J/mol/K\", "
      "\"dfH\": \"kJ/mol\", \"dfG\": \"kJ/mol\", \"log10Kf\": \"1\"},\n"
      "  \"species\": [";
  std::string current;
  bool first_species = true;
  bool first_row = true;
  for (const TableRow& row : rows) {
    if (first_species || row.species != current) {
      if (!first_species) out += "\n    ]},";
      out += fmt::format("\n    {{\"name\": {}, \"pressure_pa\": {}, \"rows\": [",
                         JsonString(row.species), row.standard_pressure_pa);
      current = row.species;
      first_species = false;
      first_row = true;
    }
    const ThermoPoint& p = row.point;
    out += fmt::format(
        "{}\n      {{\"T\": {}, \"Cp\": {}, \"S\": {}, \"H-H298\": {}, \"H\": {}, "
        "\"-(G-H298)/T\": {}{}{}}}",
        first_row ? "" : ",", p.t_k, p.cp_j_per_mol_k, p.s_j_per_mol_k,
        p.h_minus_h298_j_per_mol / 1000.0, p.h_j_per_mol / 1000.0, GibbsFunction(p),
        FormationJson(row.formation),
        row.outside_range ? fmt::format(", \"{}\": {}", kOutsideRangeColumn,
                                        *row.outside_range ? "true" : "false")
                          : std::string());
    first_row = false;
  }
  if (!first_species) out += "\n    ]}";
  out += "\n  ]\n}\n";
  return out;
}

}  // namespace

std::string FormatTable(const std::vector<TableRow>& rows, TableFormat format) {
  switch (format) {
    case TableFormat::kText: return FormatText(rows);
    case TableFormat::kCsv: return FormatCsv(rows);
    case TableFormat::kJson: return FormatJson(rows);
  }
  return FormatText(rows);
}

std::vector<double> DefaultTableTemperatures(double low_k, double high_k) {
  std::vector<double> temperatures = {low_k};
  const double reference = constants::kReferenceTemperature;
  if (reference > low_k && reference < high_k) temperatures.push_back(reference);
  for (double t = std::floor(low_k / 100.0) * 100.0 + 100.0; t < high_k;
       t += (t < 2000.0 ? 100.0 : 500.0)) {
    if (t > low_k) temperatures.push_back(t);
  }
  temperatures.push_back(high_k);
  std::sort(temperatures.begin(), temperatures.end());
  temperatures.erase(std::unique(temperatures.begin(), temperatures.end()), temperatures.end());
  return temperatures;
}

std::vector<double> SteppedTemperatures(double from_k, double to_k, double step_k) {
  if (!(step_k > 0.0) || !(to_k >= from_k) || !std::isfinite(from_k) || !std::isfinite(to_k)) {
    throw Error(fmt::format("temperature range: expected --from <= --to and --step > 0 (got "
                            "from {} K, to {} K, step {} K)",
                            from_k, to_k, step_k));
  }
  const double count = std::floor((to_k - from_k) / step_k + 1e-9);
  if (count > 1.0e6) throw Error("temperature range: more than a million temperatures requested");
  std::vector<double> temperatures;
  for (int i = 0; i <= static_cast<int>(count); ++i) temperatures.push_back(from_k + i * step_k);
  return temperatures;
}

}  // namespace sevenfold

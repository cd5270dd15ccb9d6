// SPDX-License-Identifier: MIT
// Thermodynamic tables as text for people, CSV and JSON for tools. Used for exact tables
// (sevenfold table) and for tables evaluated from fitted entries (sevenfold eval), so the two
// can be compared with ordinary diff tools.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "formation/formation.h"
#include "statmech/species_thermo.h"

namespace sevenfold {

enum class TableFormat { kText, kCsv, kJson };
std::string ToString(TableFormat format);
std::optional<TableFormat> ParseTableFormat(const std::string& text);

struct TableRow {
  std::string species;
  double standard_pressure_pa = 1.0e5;  // the pressure the entropy refers to
  ThermoPoint point;
  // Set for rows evaluated from a fitted entry (eval): whether t_k lies outside the entry's
  // [T_low, T_high], where the polynomial extrapolates. Unset for exact tables.
  std::optional<bool> outside_range;
  // Formation properties at t_k against the elements' reference states (docs/cli.md); unset
  // where they cannot be computed: text shows kNoFormationValue, CSV an empty cell, JSON null.
  std::optional<FormationPoint> formation;
};

// The text cell of a formation property that could not be computed.
inline constexpr const char* kNoFormationValue = "n/a";

// The column eval adds to CSV and JSON; text marks such rows with kOutsideRangeMarker and a
// footnote per species.
inline constexpr const char* kOutsideRangeColumn = "outside_range";
inline constexpr const char* kOutsideRangeMarker = "*";

// The CSV header, fixed: species,T/K,Cp/(J/mol/K),S/(J/mol/K),H-H298/(kJ/mol),H/(kJ/mol),
// -(G-H298)/T/(J/mol/K),dfH/(kJ/mol),dfG/(kJ/mol),log10Kf. CSV and JSON numbers are in shortest
// round-trip form.
inline constexpr const char* kTableCsvHeader =
    "species,T/K,Cp/(J/mol/K),S/(J/mol/K),H-H298/(kJ/mol),H/(kJ/mol),-(G-H298)/T/(J/mol/K),"
    "dfH/(kJ/mol),dfG/(kJ/mol),log10Kf";

// -(G - H298)/T = S - (H - H298)/T, J/(mol K): the Gibbs-energy function of the tables.
double GibbsFunction(const ThermoPoint& point);

// Formats rows (grouped by species in the given order). Text and JSON state each species'
// standard pressure; the CSV header is fixed, so CSV users take it from the species file. When
// the rows carry outside_range (eval), CSV gains the column outside_range (true/false), JSON a
// key of that name per row, and text a marker column with a footnote under each species.
std::string FormatTable(const std::vector<TableRow>& rows, TableFormat format);

// The default temperatures of a table over [low_k, high_k]: both ends, 298.15 K when inside, and
// round temperatures in between (every 100 K up to 2000 K, every 500 K above).
std::vector<double> DefaultTableTemperatures(double low_k, double high_k);

// Temperatures from_k, from_k + step_k, ..., up to to_k inclusive (within 1e-9 step).
std::vector<double> SteppedTemperatures(double from_k, double to_k, double step_k);

}  // namespace sevenfold

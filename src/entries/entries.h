// SPDX-License-Identifier: MIT
// The entries file: sevenfold's own line-oriented text format holding one fitted two-range
// polynomial per species with its fit quality and provenance. Grammar, field meanings and units,
// and a worked example: docs/entries-format.md.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "core/error.h"
#include "core/fit_settings.h"
#include "fit/polynomial.h"
#include "fit/quality.h"

namespace sevenfold {

// The format version this build writes and reads.
// Version 2 replaced the "species NAME" ... "end" blocks of version 1 by records that open with a
// header line and hold indented field lines, and added the fit settings and the form limit.
inline constexpr int kEntriesFormatVersion = 2;
// The first word of every entries file.
inline constexpr const char* kEntriesMagic = "sevenfold-entries";

// Where an entry came from.
struct EntryProvenance {
  std::string input_sha256;   // 64 lowercase hex digits: digest of the species' input
  std::string tool_version;   // version of sevenfold that wrote the entry
  std::string model_options;  // the physical model, free text (fit settings: EntryFitSettings)
  std::string source_file;    // the species file, as given to the tool
};

// The settings that shaped the fit, recorded so that `check` can regenerate the entry the way it
// was made (docs/entries-format.md, docs/cli.md "check").
struct EntryFitSettings {
  FitObjective objective = FitObjective::kMinimax;
  ErrorScales error_scales;
  ExtrapolationGuard extrapolation_guard;
  // True when T_mid was fixed (by the species file or --mid); false when chosen automatically.
  bool t_mid_fixed = false;
  // True when d2Cp/dT2 was also made continuous at T_mid.
  bool continuous_second_derivative = false;
};

// The largest number of evaluation temperatures one request may ask for (`eval --step`, the
// default table of a range): a million rows is far more than any table anyone reads, and keeps
// a hostile range from allocating without bound.
inline constexpr int kMaxEvaluationTemperatures = 1000000;

struct Entry {
  std::string name;
  // Element symbol and count, in the order of the input.
  std::vector<std::pair<std::string, int>> composition;
  int charge = 0;
  std::string phase = "gas";  // version 1 knows "gas" only
  TwoRangePolynomial polynomial;
  double formation_enthalpy_j_per_mol = 0.0;  // at 298.15 K
  double reference_pressure_pa = 1.0e5;       // standard pressure of the entropy
  EntryFitSettings fit_settings;
  FitQuality quality;  // how well the polynomial follows the exact curves (docs/fitting.md)
  EntryProvenance provenance;
  // Where the block starts when read from a file (file empty for entries made in memory).
  // Not written.
  SourceLocation location;
};

struct EntriesFile {
  int version = kEntriesFormatVersion;
  std::vector<Entry> entries;
};

// The text of `file` in the canonical layout: the header line, one comment line, then one block
// per entry in the given order. Numbers are written in the shortest form that reads back to the
// identical double, so FormatEntries(ParseEntries(FormatEntries(f))) == FormatEntries(f).
// Throws Error naming the species and field when an entry cannot be written (a non-finite
// number, a malformed digest or element symbol, temperatures out of order, an empty name).
std::string FormatEntries(const EntriesFile& file);

// Reads entries from `text`; `file_name` is used in error messages only. Comments and blank
// lines are skipped. Throws Error "file:line:column: found ..., expected ..." on malformed input:
// a wrong header or version (version 1 and its "species ... end" blocks with a message naming
// the change), text that is not UTF-8, an unknown or repeated field, a missing field, a record
// with fewer or more field lines than its header states, a non-numeric or non-finite number, a
// value outside its physical bounds (docs/entries-format.md, "Bounds"), a repeated species name,
// a text larger than kMaxInputFileBytes, and so on.
EntriesFile ParseEntries(const std::string& text, const std::string& file_name);

// Reads and parses the file at `path` (at most kMaxInputFileBytes). Throws Error naming the path
// when it cannot be read.
EntriesFile ReadEntriesFile(const std::string& path);

}  // namespace sevenfold

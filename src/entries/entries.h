// SPDX-License-Identifier: MIT
// The entries file: sevenfold's own line-oriented text format holding one fitted two-range
// polynomial per species with its fit quality and provenance. Grammar, field meanings and units,
// and a worked example: docs/entries-format.md.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "core/error.h"
#include "fit/polynomial.h"
#include "fit/quality.h"

namespace sevenfold {

// The format version this build writes and reads.
inline constexpr int kEntriesFormatVersion = 1;
// The first word of every entries file.
inline constexpr const char* kEntriesMagic = "sevenfold-entries";

// Where an entry came from.
struct EntryProvenance {
  std::string input_sha256;   // 64 lowercase hex digits: digest of the species' input
  std::string tool_version;   // version of sevenfold that wrote the entry
  std::string model_options;  // the physical model and fit options, free text
  std::string source_file;    // the species file, as given to the tool
};

struct Entry {
  std::string name;
  // Element symbol and count, in the order of the input.
  std::vector<std::pair<std::string, int>> composition;
  int charge = 0;
  std::string phase = "gas";  // version 1 knows "gas" only
  TwoRangePolynomial polynomial;
  double formation_enthalpy_j_per_mol = 0.0;  // at 298.15 K
  double reference_pressure_pa = 1.0e5;       // standard pressure of the entropy
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
// a wrong header or version, an unknown or repeated field, a missing field, a block without
// "end", a non-numeric or non-finite number, a repeated species name, and so on.
EntriesFile ParseEntries(const std::string& text, const std::string& file_name);

// Reads and parses the file at `path`. Throws Error naming the path when it cannot be read.
EntriesFile ReadEntriesFile(const std::string& path);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Reads species files (YAML, schema in docs/species-schema.md) into validated Species.
// The only part of sevenfold that uses yaml-cpp.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "core/read_file.h"
#include "species/species.h"

namespace sevenfold {

// Files above this size are refused before parsing (a species list is kilobytes; this bounds the
// memory and time a hostile or mistaken input can cost).
inline constexpr std::size_t kMaxSpeciesFileBytes = kMaxInputFileBytes;  // core/read_file.h

// Reads and validates every file, in order, and returns all species in file order. The species of
// a file are parsed on up to num_jobs threads (0: the machine's hardware threads); the result does
// not depend on it.
// Throws one Error listing every problem found in all files, one per line, each line
// "file:line:column: species 'NAME': <key>: <what was found>; expected <what>" (lines and columns
// 1-based). Species names must be unique across all files. Unreadable or oversized files are
// reported with the path and the system's reason.
std::vector<Species> ReadSpeciesFiles(const std::vector<std::string>& paths, int num_jobs = 1);

// As ReadSpeciesFiles for one in-memory document; `file_name` is used in locations only.
std::vector<Species> ReadSpeciesText(const std::string& text,
                                     const std::string& file_name,
                                     int num_jobs = 1);

namespace detail {
// As ReadSpeciesText. A file whose layout a text scan is sure of is read species item by species
// item (small node trees, parallel); anything else, and any file with a problem, is read as one
// document. For tests: allow_split false forces the whole-document reading, and *split_used (when
// not null) tells whether the item-by-item reading gave the result.
std::vector<Species> ReadSpeciesTextForTesting(const std::string& text,
                                               const std::string& file_name,
                                               bool allow_split,
                                               int num_jobs,
                                               bool* split_used);
}  // namespace detail

}  // namespace sevenfold

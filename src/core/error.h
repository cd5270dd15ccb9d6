// SPDX-License-Identifier: MIT
// The one exception type for bad input, and the assertion for broken invariants.
#pragma once

#include <cstdio>
#include <cstdlib>
#include <stdexcept>
#include <string>

namespace sevenfold {

// Where in an input file something was found. Lines and columns are 1-based; 0 means unknown.
struct SourceLocation {
  std::string file;
  int line = 0;
  int column = 0;

  // "file:line:column", dropping the parts that are unknown.
  std::string ToString() const {
    std::string text = file;
    if (line > 0) {
      text += ":" + std::to_string(line);
      if (column > 0) text += ":" + std::to_string(column);
    }
    return text;
  }
};

// Bad input or an impossible request from the user. what() is the full message, location first:
//   "species/h2o.yaml:14:7: vibrations[2]: must be positive (got -1595 cm^-1)".
class Error : public std::runtime_error {
 public:
  explicit Error(const std::string& message) : std::runtime_error(message) {}
  Error(const SourceLocation& where, const std::string& message)
      : std::runtime_error(where.file.empty() ? message : where.ToString() + ": " + message),
        location_(where) {}

  const SourceLocation& location() const { return location_; }

 private:
  SourceLocation location_;
};

}  // namespace sevenfold

// A broken internal invariant: a bug in sevenfold, never a user mistake. Aborts with file:line.
#define SEVENFOLD_ASSERT(condition)                                                       \
  do {                                                                                    \
    if (!(condition)) {                                                                   \
      std::fprintf(stderr, "%s:%d: internal invariant failed: %s\n", __FILE__, __LINE__, \
                   #condition);                                                           \
      std::abort();                                                                       \
    }                                                                                     \
  } while (false)

// SPDX-License-Identifier: MIT
// Checks of a species file's raw text made before YAML parsing: its bytes (UTF-8, YAML's character
// set) and the number of YAML documents it holds.
#pragma once

#include <optional>
#include <string>

namespace sevenfold::detail {

// The first byte of `text` that is not valid UTF-8 or is a control character YAML forbids
// (C0 controls other than tab, line feed and carriage return, and DEL), with its 1-based line and
// column (columns count characters). nullopt when the whole text is clean. YAML streams are
// Unicode (YAML 1.2, section 5.1); yaml-cpp does not check this itself, and a name with broken
// bytes would otherwise reach the entries file, which must be UTF-8.
struct BadByte {
  unsigned char byte = 0;
  int line = 1;
  int column = 1;
  bool control = false;
};
std::optional<BadByte> FindBadByte(const std::string& text);

// The 1-based line where a second YAML document starts, 0 when there is none: a line "---"
// (alone or followed by a space) after a line with content, or a line with content after a
// "..." end marker. Comments, blank lines and %-directives are not content.
int SecondDocumentLine(const std::string& text);

}  // namespace sevenfold::detail

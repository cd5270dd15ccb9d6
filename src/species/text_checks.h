// SPDX-License-Identifier: MIT
// Checks of a species file's raw text made before YAML parsing: the number of YAML documents it
// holds, and how deep its flow collections nest. (Its bytes are checked by core/utf8.h, the
// validator both readers share.)
#pragma once

#include <optional>
#include <string>

namespace sevenfold::detail {

// The 1-based line where a second YAML document starts, 0 when there is none: a line "---"
// (alone or followed by a space) after a line with content, or a line with content after a
// "..." end marker. Comments, blank lines and %-directives are not content.
int SecondDocumentLine(const std::string& text);

// Flow collections ("[" and "{") nested deeper than this are refused before YAML parsing: a
// species file needs 3 levels ([[0, 2], [9375.4, 2]] inside a flow map), while yaml-cpp spends
// seconds and gigabytes on a file of millions of nested brackets before it fails.
inline constexpr int kMaxFlowNesting = 64;

struct TextPosition {
  int line = 0;
  int column = 0;
};

// The position (1-based) of the first "[" or "{" opening level kMaxFlowNesting + 1, outside
// quoted scalars and comments; nullopt when there is none.
std::optional<TextPosition> TooDeepFlowNesting(const std::string& text);

}  // namespace sevenfold::detail

// SPDX-License-Identifier: MIT
// Checks of a species file's raw text made before YAML parsing: the number of YAML documents it
// holds. (Its bytes are checked by core/utf8.h, the validator both readers share.)
#pragma once

#include <string>

namespace sevenfold::detail {

// The 1-based line where a second YAML document starts, 0 when there is none: a line "---"
// (alone or followed by a space) after a line with content, or a line with content after a
// "..." end marker. Comments, blank lines and %-directives are not content.
int SecondDocumentLine(const std::string& text);

}  // namespace sevenfold::detail

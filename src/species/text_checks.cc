// SPDX-License-Identifier: MIT
#include "species/text_checks.h"

#include <cstddef>

namespace sevenfold::detail {

std::optional<BadByte> FindBadByte(const std::string& text) {
  BadByte at;
  std::size_t i = 0;
  while (i < text.size()) {
    const unsigned char lead = static_cast<unsigned char>(text[i]);
    at.byte = lead;
    if (lead < 0x80) {
      if ((lead < 0x20 && lead != '\t' && lead != '\n' && lead != '\r') || lead == 0x7f) {
        at.control = true;
        return at;
      }
      ++i;
      if (lead == '\n') {
        ++at.line;
        at.column = 1;
      } else {
        ++at.column;
      }
      continue;
    }
    // Well-formed sequences per the Unicode Standard, table 3-7: no overlong forms, no
    // surrogates, nothing above U+10FFFF.
    int length = 0;
    unsigned char second_min = 0x80, second_max = 0xbf;
    if (lead >= 0xc2 && lead <= 0xdf) {
      length = 2;
    } else if (lead >= 0xe0 && lead <= 0xef) {
      length = 3;
      if (lead == 0xe0) second_min = 0xa0;
      if (lead == 0xed) second_max = 0x9f;
    } else if (lead >= 0xf0 && lead <= 0xf4) {
      length = 4;
      if (lead == 0xf0) second_min = 0x90;
      if (lead == 0xf4) second_max = 0x8f;
    } else {
      return at;
    }
    if (i + length > text.size()) return at;
    for (int k = 1; k < length; ++k) {
      const unsigned char next = static_cast<unsigned char>(text[i + k]);
      const unsigned char low = k == 1 ? second_min : 0x80, high = k == 1 ? second_max : 0xbf;
      if (next < low || next > high) return at;
    }
    i += static_cast<std::size_t>(length);
    ++at.column;
  }
  return std::nullopt;
}

int SecondDocumentLine(const std::string& text) {
  const auto is_marker = [](const std::string& line, const char* marker) {
    return line.compare(0, 3, marker) == 0 &&
           (line.size() == 3 || line[3] == ' ' || line[3] == '\t' || line[3] == '\r');
  };
  bool seen_content = false, ended = false;
  int number = 0;
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string::npos) end = text.size();
    const std::string line = text.substr(start, end - start);
    start = end + 1;
    ++number;
    const std::size_t first = line.find_first_not_of(" \t\r");
    if (first == std::string::npos || line[first] == '#' || line[0] == '%') continue;
    if (is_marker(line, "---")) {
      if (seen_content || ended) return number;
      // "--- value": the document's content starts on this line.
      const std::size_t rest = line.find_first_not_of(" \t\r", 3);
      if (rest != std::string::npos && line[rest] != '#') seen_content = true;
      continue;
    }
    if (is_marker(line, "...")) {
      ended = true;
      continue;
    }
    if (ended) return number;
    seen_content = true;
  }
  return 0;
}

}  // namespace sevenfold::detail

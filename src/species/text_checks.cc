// SPDX-License-Identifier: MIT
#include "species/text_checks.h"

#include <cstddef>

namespace sevenfold::detail {

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

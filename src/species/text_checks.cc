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

std::optional<TextPosition> TooDeepFlowNesting(const std::string& text) {
  enum class State { kPlain, kSingleQuoted, kDoubleQuoted, kComment };
  State state = State::kPlain;
  int depth = 0, line = 1, column = 0;
  char previous = '\n';
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    ++column;
    if (c == '\n') {
      ++line;
      column = 0;
      if (state == State::kComment) state = State::kPlain;
      previous = c;
      continue;
    }
    switch (state) {
      case State::kComment:
        break;
      case State::kSingleQuoted:
        if (c == '\'') {
          if (i + 1 < text.size() && text[i + 1] == '\'') {
            ++i;  // '' is a quote inside the scalar
            ++column;
          } else {
            state = State::kPlain;
          }
        }
        break;
      case State::kDoubleQuoted:
        if (c == '\\') {
          ++i;  // an escape: the next character is part of the scalar
          ++column;
        } else if (c == '"') {
          state = State::kPlain;
        }
        break;
      case State::kPlain:
        if (c == '#' && (previous == ' ' || previous == '\t' || previous == '\n')) {
          state = State::kComment;
        } else if (c == '\'') {
          state = State::kSingleQuoted;
        } else if (c == '"') {
          state = State::kDoubleQuoted;
        } else if (c == '[' || c == '{') {
          if (++depth > kMaxFlowNesting) return TextPosition{line, column};
        } else if ((c == ']' || c == '}') && depth > 0) {
          --depth;
        }
        break;
    }
    previous = c;
  }
  return std::nullopt;
}

}  // namespace sevenfold::detail

// SPDX-License-Identifier: MIT
#include "species/item_split.h"

#include "species/species_schema.h"

namespace sevenfold::detail {
namespace {

using schema::kFormatKey;

// True when text[pos, end) is only spaces, optionally followed by a comment after a space.
bool OnlyComment(const std::string& text, std::size_t pos, std::size_t end) {
  const std::size_t start = pos;
  while (pos < end && text[pos] == ' ') ++pos;
  return pos == end || (text[pos] == '#' && pos > start);
}

// Scans the content text[begin, end) of one line, carrying the flow-collection depth across lines.
// False where the split cannot be sure of YAML's reading: a tab or carriage return, a quoted
// scalar not closed on its line, a bracket that may be part of a plain scalar, or an indicator
// with a meaning at the start of a token (anchor, alias, tag, block scalar, complex key, directive,
// reserved). Brackets and indicators inside quotes or comments do not count.
bool ScanLineForSplit(const std::string& text, std::size_t begin, std::size_t end, int* depth) {
  char previous = ' ';
  for (std::size_t i = begin; i < end; ++i) {
    const char c = text[i];
    // YAML starts a token (a node, a quoted scalar, a flow collection) only after these.
    const bool token_start =
        previous == ' ' || previous == '[' || previous == '{' || previous == ',' || previous == ':';
    if (c == '\t' || c == '\r') return false;
    if (c == '#' && previous == ' ') return true;  // a comment runs to the end of the line
    if (token_start && (c == '"' || c == '\'')) {
      std::size_t j = i + 1;
      for (; j < end; ++j) {
        if (text[j] == '\t' || text[j] == '\r') return false;
        if (c == '"' && text[j] == '\\') {
          ++j;  // an escaped character, possibly a quote
        } else if (text[j] == c) {
          if (c == '\'' && j + 1 < end && text[j + 1] == '\'') {
            ++j;  // '' is a quote inside a single-quoted scalar
          } else {
            break;
          }
        }
      }
      if (j >= end) return false;
      i = j;
      previous = c;
      continue;
    }
    if (c == '[' || c == '{') {
      if (*depth == 0 && !token_start) return false;
      ++*depth;
    } else if (c == ']' || c == '}') {
      if (*depth == 0) return false;
      --*depth;
    } else if (token_start && (c == '&' || c == '*' || c == '!' || c == '|' || c == '>' ||
                               c == '?' || c == '@' || c == '`' || c == '%')) {
      return false;
    }
    previous = c;
  }
  return true;
}

}  // namespace

std::optional<SpeciesItemsSplit> SplitSpeciesItems(const std::string& text) {
  enum class Phase { kTop, kFirstItem, kItems };
  Phase phase = Phase::kTop;
  SpeciesItemsSplit split;
  bool seen_content = false, seen_species = false, in_top_key = false;
  int depth = 0;
  std::size_t item_indent = 0, items_end = text.size();
  int line = -1;
  for (std::size_t next = 0; next < text.size();) {
    ++line;
    const std::size_t begin = next;
    std::size_t end = text.find('\n', begin);
    next = end == std::string::npos ? text.size() : end + 1;
    if (end == std::string::npos) end = text.size();
    if (end > begin && text[end - 1] == '\r') --end;
    std::size_t first = begin;
    while (first < end && text[first] == ' ') ++first;
    if (first == end || text[first] == '#') continue;  // blank or comment: no effect on the split
    const std::size_t indent = first - begin;
    // An item is a label key of the species map: a line at the items' indentation.
    const bool item_start = indent > 0 && text[first] != '-';
    const int depth_before = depth;
    if (!ScanLineForSplit(text, first, end, &depth)) return std::nullopt;
    if (phase != Phase::kTop) {
      if (item_start && depth_before == 0 &&
          (phase == Phase::kFirstItem || indent == item_indent)) {
        if (phase == Phase::kFirstItem) item_indent = indent;
        phase = Phase::kItems;
        split.items.push_back(SpeciesItemsSplit::Item{begin, 0, line});
        continue;
      }
      if (phase == Phase::kItems && indent > item_indent) continue;  // inside the current item
      if (phase == Phase::kFirstItem || indent > 0 || depth_before != 0) return std::nullopt;
      items_end = begin;  // a top-level key closes the species block
      phase = Phase::kTop;
    }
    if (indent > 0) {
      if (!in_top_key) return std::nullopt;
      continue;  // inside the value of `defaults`
    }
    if (depth_before != 0) return std::nullopt;
    if (text.compare(first, 3, "---") == 0 && (first + 3 == end || text[first + 3] == ' ')) {
      if (seen_content || !OnlyComment(text, first + 3, end)) return std::nullopt;
      continue;
    }
    seen_content = true;
    if (text.compare(first, kFormatKey.size() + 1, std::string(kFormatKey) + ":") == 0) {
      continue;  // the format key: its value is checked when the skeleton is read
    }
    if (text.compare(first, 8, "species:") == 0) {
      if (seen_species || !OnlyComment(text, first + 8, end)) return std::nullopt;
      seen_species = in_top_key = true;
      phase = Phase::kFirstItem;
    } else if (text.compare(first, 9, "defaults:") == 0 &&
               (first + 9 == end || text[first + 9] == ' ')) {
      in_top_key = true;
    } else {
      return std::nullopt;
    }
  }
  if (phase == Phase::kFirstItem || depth != 0 || split.items.empty()) return std::nullopt;
  for (std::size_t i = 0; i < split.items.size(); ++i) {
    split.items[i].end = i + 1 < split.items.size() ? split.items[i + 1].begin : items_end;
  }
  split.skeleton = text.substr(0, split.items.front().begin) + text.substr(items_end);
  return split;
}

}  // namespace sevenfold::detail

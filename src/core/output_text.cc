// SPDX-License-Identifier: MIT
#include "core/output_text.h"

#include <fmt/format.h>

namespace sevenfold {
namespace {

constexpr char32_t kInvalid = 0xFFFFFFFF;

// Decodes the code point at text[at] and advances `at`; returns kInvalid (advancing one byte)
// for a byte that does not start a valid, shortest-form sequence.
char32_t NextCodePoint(std::string_view text, size_t& at) {
  const auto byte = [&](size_t i) { return static_cast<unsigned char>(text[i]); };
  const unsigned char lead = byte(at);
  if (lead < 0x80) {
    ++at;
    return lead;
  }
  int length = 0;
  char32_t c = 0, min = 0;
  if ((lead & 0xE0) == 0xC0) {
    length = 2;
    c = lead & 0x1F;
    min = 0x80;
  } else if ((lead & 0xF0) == 0xE0) {
    length = 3;
    c = lead & 0x0F;
    min = 0x800;
  } else if ((lead & 0xF8) == 0xF0) {
    length = 4;
    c = lead & 0x07;
    min = 0x10000;
  } else {
    ++at;
    return kInvalid;
  }
  if (at + length > text.size()) {
    ++at;
    return kInvalid;
  }
  for (int i = 1; i < length; ++i) {
    if ((byte(at + i) & 0xC0) != 0x80) {
      ++at;
      return kInvalid;
    }
    c = (c << 6) | (byte(at + i) & 0x3F);
  }
  if (c < min || c > 0x10FFFF || (c >= 0xD800 && c <= 0xDFFF)) {
    ++at;
    return kInvalid;
  }
  at += length;
  return c;
}

void AppendUtf8(std::string& out, char32_t c) {
  if (c < 0x80) {
    out += static_cast<char>(c);
  } else if (c < 0x800) {
    out += static_cast<char>(0xC0 | (c >> 6));
    out += static_cast<char>(0x80 | (c & 0x3F));
  } else if (c < 0x10000) {
    out += static_cast<char>(0xE0 | (c >> 12));
    out += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (c & 0x3F));
  } else {
    out += static_cast<char>(0xF0 | (c >> 18));
    out += static_cast<char>(0x80 | ((c >> 12) & 0x3F));
    out += static_cast<char>(0x80 | ((c >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (c & 0x3F));
  }
}

constexpr char32_t kReplacement = 0xFFFD;

void AppendVisible(std::string& out, char32_t c) {
  out += c < 0x100 ? fmt::format("\\x{:02x}", static_cast<unsigned>(c))
                   : fmt::format("\\u{:04x}", static_cast<unsigned>(c));
}

// Calls visit(code_point) for each code point, kReplacement standing for invalid bytes.
template <typename Visit>
void ForEachCodePoint(std::string_view text, Visit visit) {
  for (size_t at = 0; at < text.size();) {
    const char32_t c = NextCodePoint(text, at);
    visit(c == kInvalid ? kReplacement : c);
  }
}

}  // namespace

bool IsControlCodePoint(char32_t c, bool allow_tab_and_newline) {
  if (c == '\t' || c == '\n') return !allow_tab_and_newline;
  if (c < 0x20 || (c >= 0x7F && c <= 0x9F)) return true;
  return c == 0x061C || c == 0x200E || c == 0x200F || (c >= 0x202A && c <= 0x202E) ||
         (c >= 0x2066 && c <= 0x2069);
}

std::string ValidUtf8(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  ForEachCodePoint(text, [&](char32_t c) { AppendUtf8(out, c); });
  return out;
}

std::string VisibleControls(std::string_view text, bool keep_lines) {
  std::string out;
  out.reserve(text.size());
  ForEachCodePoint(text, [&](char32_t c) {
    if (IsControlCodePoint(c, keep_lines)) {
      AppendVisible(out, c);
    } else {
      AppendUtf8(out, c);
    }
  });
  return out;
}

std::string EscapeMarkup(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  ForEachCodePoint(text, [&](char32_t c) {
    switch (c) {
      case '&': out += "&amp;"; return;
      case '<': out += "&lt;"; return;
      case '>': out += "&gt;"; return;
      case '"': out += "&quot;"; return;
      case '\'': out += "&#39;"; return;
      case '\t': out += "&#9;"; return;
      case '\n': out += "&#10;"; return;
      case '\r': out += "&#13;"; return;
      default: break;
    }
    if (IsControlCodePoint(c, true)) {
      AppendVisible(out, c);
    } else {
      AppendUtf8(out, c);
    }
  });
  return out;
}

std::string JsonString(std::string_view text) {
  std::string out = "\"";
  out.reserve(text.size() + 2);
  ForEachCodePoint(text, [&](char32_t c) {
    switch (c) {
      case '"': out += "\\\""; return;
      case '\\': out += "\\\\"; return;
      case '\n': out += "\\n"; return;
      case '\r': out += "\\r"; return;
      case '\t': out += "\\t"; return;
      default: break;
    }
    if (IsControlCodePoint(c, false) || c == 0x2028 || c == 0x2029) {
      out += fmt::format("\\u{:04x}", static_cast<unsigned>(c));
    } else {
      AppendUtf8(out, c);
    }
  });
  return out + "\"";
}

}  // namespace sevenfold

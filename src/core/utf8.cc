// SPDX-License-Identifier: MIT
#include "core/utf8.h"

namespace sevenfold {

const char* Utf8Problem::Describe() const {
  switch (kind) {
    case Utf8ProblemKind::kIllFormed: return "which is not valid UTF-8";
    case Utf8ProblemKind::kNoncharacter: return "which starts a Unicode noncharacter";
    case Utf8ProblemKind::kControl: return "a control character";
  }
  return "which is not valid UTF-8";
}

namespace {

// Noncharacters (Unicode Standard, section 23.7): U+FDD0..U+FDEF and the last two code points
// of every plane.
bool IsNoncharacter(char32_t code_point) {
  return (code_point >= 0xfdd0 && code_point <= 0xfdef) || (code_point & 0xfffe) == 0xfffe;
}

}  // namespace

std::optional<Utf8Problem> FindUtf8Problem(std::string_view text) {
  Utf8Problem at;
  std::size_t i = 0;
  while (i < text.size()) {
    const unsigned char lead = static_cast<unsigned char>(text[i]);
    at.byte = lead;
    at.offset = i;
    if (lead < 0x80) {
      if ((lead < 0x20 && lead != '\t' && lead != '\n' && lead != '\r') || lead == 0x7f) {
        at.kind = Utf8ProblemKind::kControl;
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
    // Well-formed sequences per the Unicode Standard, table 3-7: the second byte's range
    // excludes overlong forms (E0, F0), surrogates (ED) and code points above U+10FFFF (F4).
    at.kind = Utf8ProblemKind::kIllFormed;
    int length = 0;
    unsigned char second_min = 0x80, second_max = 0xbf;
    char32_t code_point = 0;
    if (lead >= 0xc2 && lead <= 0xdf) {
      length = 2;
      code_point = lead & 0x1f;
    } else if (lead >= 0xe0 && lead <= 0xef) {
      length = 3;
      code_point = lead & 0x0f;
      if (lead == 0xe0) second_min = 0xa0;
      if (lead == 0xed) second_max = 0x9f;
    } else if (lead >= 0xf0 && lead <= 0xf4) {
      length = 4;
      code_point = lead & 0x07;
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
      code_point = (code_point << 6) | (next & 0x3f);
    }
    if (IsNoncharacter(code_point)) {
      at.kind = Utf8ProblemKind::kNoncharacter;
      return at;
    }
    i += static_cast<std::size_t>(length);
    ++at.column;
  }
  return std::nullopt;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// The one UTF-8 validator of the input readers (species files and entries files), so that both
// accept exactly the same text.
#pragma once

#include <optional>
#include <string_view>

namespace sevenfold {

// Why a byte was refused.
enum class Utf8ProblemKind {
  kIllFormed,     // not a well-formed sequence (Unicode Standard, table 3-7): a stray byte, an
                  // overlong form such as E0 80 AF, a surrogate such as ED A0 80, a code point
                  // above U+10FFFF, or a sequence cut short
  kNoncharacter,  // a well-formed noncharacter: U+FDD0..U+FDEF or U+nFFFE / U+nFFFF
  kControl,       // a C0 control other than tab, line feed and carriage return (NUL included),
                  // or DEL
};

// The first refused byte of a text, with its 1-based line and column (columns count characters).
struct Utf8Problem {
  Utf8ProblemKind kind = Utf8ProblemKind::kIllFormed;
  unsigned char byte = 0;     // the first byte of the refused character
  std::size_t offset = 0;     // its offset in the text
  int line = 1;
  int column = 1;
  // "which is not valid UTF-8", "a Unicode noncharacter", "a control character".
  const char* Describe() const;
};

// The first problem of `text`, or nullopt when it is clean UTF-8 (tab, LF and CR allowed).
std::optional<Utf8Problem> FindUtf8Problem(std::string_view text);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Text on its way into an output document or onto a terminal. Names and paths are data: these
// functions make sure they can never act as markup, break a document's syntax or send control
// sequences to a terminal, whatever bytes they hold (docs/robustness.md, "Hostile names").
#pragma once

#include <string>
#include <string_view>

namespace sevenfold {

// `text` with every byte that is not part of a valid UTF-8 sequence (stray continuation bytes,
// overlong forms, surrogates, values above U+10FFFF, truncated sequences) replaced by U+FFFD.
std::string ValidUtf8(std::string_view text);

// Whether code point `c` is a control character a terminal or a text renderer may act on:
// C0 controls (tab and line feed aside), DEL, C1 controls, and the bidirectional formatting
// characters (U+061C, U+200E, U+200F, U+202A..U+202E, U+2066..U+2069), which reorder the text
// around them when displayed.
bool IsControlCodePoint(char32_t c, bool allow_tab_and_newline);

// `text` as valid UTF-8 with every control code point (IsControlCodePoint, tab and newline
// allowed only when `keep_lines`) written visibly: "\x1b" below U+0100, "\u202e" above, and
// U+FFFD for invalid bytes. What the command line prints to a terminal goes through this.
std::string VisibleControls(std::string_view text, bool keep_lines = true);

// Escaped for XML 1.0 and HTML, in content and in single- or double-quoted attribute values:
// & < > " ' become references; tab, LF, CR become character references (so attribute
// normalisation keeps them); every other control code point is written visibly as in
// VisibleControls (XML 1.0 cannot carry C0 controls at all); invalid UTF-8 becomes U+FFFD.
std::string EscapeMarkup(std::string_view text);

// A JSON string literal, quotes included (RFC 8259): valid UTF-8 (U+FFFD for invalid bytes),
// with ", \ and every code point below U+0020 escaped, and the other control code points
// (IsControlCodePoint: DEL, C1, bidirectional formatting), U+2028 and U+2029 as \u escapes too,
// so the literal is also safe to paste into JavaScript or to print on a terminal.
std::string JsonString(std::string_view text);

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
#include "species/formula.h"

#include <algorithm>
#include <cctype>
#include <cstdlib>

#include "core/elements.h"

namespace sevenfold {
namespace {

bool IsUpper(char c) { return c >= 'A' && c <= 'Z'; }
bool IsLower(char c) { return c >= 'a' && c <= 'z'; }
bool IsDigit(char c) { return c >= '0' && c <= '9'; }

// A printable description of the character at `pos`, for "what was found".
std::string CharAt(std::string_view text, std::size_t pos) {
  if (pos >= text.size()) return "the end of the formula";
  const unsigned char c = static_cast<unsigned char>(text[pos]);
  if (c < 0x20 || c >= 0x7f) return "a character that is not printable ASCII";
  return std::string("'") + text[pos] + "'";
}

class Parser {
 public:
  Parser(std::string_view text, FormulaError* error) : text_(text), error_(error) {}

  std::optional<ParsedFormula> Parse() {
    ParsedFormula formula;
    if (text_.empty()) return Fail(0, "an empty formula", "element symbols such as CH4");
    std::vector<std::pair<std::string, long>> counts;
    if (!ParseParts(&counts, /*depth=*/0)) return std::nullopt;
    if (pos_ < text_.size() && text_[pos_] == ')') {
      return Fail(pos_, "')' without a matching '('", "balanced parentheses");
    }
    if (pos_ < text_.size() && (text_[pos_] == '+' || text_[pos_] == '-')) {
      if (!ParseCharge(&formula.charge)) return std::nullopt;
    }
    if (pos_ < text_.size()) {
      return Fail(pos_,
                  CharAt(text_, pos_),
                  "an element symbol (upper-case letter first), a count, parentheses, or a "
                  "charge (+, -, +2) at the end");
    }
    for (const auto& [symbol, count] : counts) {
      formula.counts.emplace_back(symbol, static_cast<int>(count));
    }
    return formula;
  }

 private:
  std::nullopt_t Fail(std::size_t offset, std::string found, std::string expected) {
    *error_ = FormulaError{offset, std::move(found), std::move(expected)};
    return std::nullopt;
  }

  // A count (1 when absent); false on a malformed or oversized one.
  bool ParseCount(long* count) {
    *count = 1;
    if (pos_ >= text_.size() || !IsDigit(text_[pos_])) return true;
    const std::size_t start = pos_;
    if (text_[pos_] == '0') {
      Fail(pos_, "'0'", "a count of at least 1 without a leading zero");
      return false;
    }
    long value = 0;
    while (pos_ < text_.size() && IsDigit(text_[pos_])) {
      value = value * 10 + (text_[pos_] - '0');
      ++pos_;
      if (value > kMaxAtomsPerElement) {
        Fail(start,
             "a count above " + std::to_string(kMaxAtomsPerElement),
             "at most " + std::to_string(kMaxAtomsPerElement) + " atoms of one element");
        return false;
      }
    }
    *count = value;
    return true;
  }

  static void Add(std::vector<std::pair<std::string, long>>* counts,
                  const std::string& symbol,
                  long count) {
    auto it = std::find_if(
        counts->begin(), counts->end(), [&](const auto& entry) { return entry.first == symbol; });
    if (it == counts->end()) {
      counts->emplace_back(symbol, count);
    } else {
      it->second += count;
    }
  }

  bool ParseParts(std::vector<std::pair<std::string, long>>* counts, int depth) {
    const std::size_t start = pos_;
    while (pos_ < text_.size()) {
      const char c = text_[pos_];
      if (IsUpper(c)) {
        const std::size_t symbol_start = pos_;
        std::string symbol(1, c);
        ++pos_;
        if (pos_ < text_.size() && IsLower(text_[pos_])) symbol += text_[pos_++];
        if (!AtomicWeightGPerMol(symbol)) {
          Fail(symbol_start,
               "unknown element '" + symbol + "'",
               "an element symbol such as C, O, Cl or D (docs/species-schema.md lists them)");
          return false;
        }
        long count = 0;
        if (!ParseCount(&count)) return false;
        Add(counts, symbol, count);
      } else if (c == '(') {
        const std::size_t open = pos_;
        ++pos_;
        if (depth >= 8) {
          Fail(open, "parentheses nested more than 8 deep", "a flatter formula");
          return false;
        }
        std::vector<std::pair<std::string, long>> inner;
        if (!ParseParts(&inner, depth + 1)) return false;
        if (pos_ >= text_.size() || text_[pos_] != ')') {
          Fail(pos_ < text_.size() ? pos_ : text_.size(),
               CharAt(text_, pos_),
               "')' closing the '(' at character " + std::to_string(open + 1));
          return false;
        }
        ++pos_;
        long count = 0;
        if (!ParseCount(&count)) return false;
        for (const auto& [symbol, n] : inner) Add(counts, symbol, n * count);
      } else {
        break;
      }
      for (const auto& entry : *counts) {
        if (entry.second > kMaxAtomsPerElement) {
          Fail(start,
               std::to_string(entry.second) + " atoms of " + entry.first,
               "at most " + std::to_string(kMaxAtomsPerElement) + " atoms of one element");
          return false;
        }
      }
    }
    if (pos_ == start) {
      Fail(pos_, CharAt(text_, pos_), "an element symbol (upper-case letter first) or '('");
      return false;
    }
    return true;
  }

  bool ParseCharge(int* charge) {
    const char sign = text_[pos_];
    const std::size_t start = pos_;
    int magnitude = 0;
    if (pos_ + 1 < text_.size() && IsDigit(text_[pos_ + 1])) {
      ++pos_;
      long value = 0;
      if (!ParseCount(&value)) return false;
      magnitude = static_cast<int>(value);
    } else {
      while (pos_ < text_.size() && text_[pos_] == sign) {
        ++magnitude;
        ++pos_;
      }
    }
    if (magnitude > kMaxFormulaCharge) {
      Fail(start,
           "a charge of " + std::to_string(magnitude),
           "a charge of magnitude at most " + std::to_string(kMaxFormulaCharge));
      return false;
    }
    *charge = sign == '+' ? magnitude : -magnitude;
    return true;
  }

  std::string_view text_;
  FormulaError* error_;
  std::size_t pos_ = 0;
};

}  // namespace

std::optional<ParsedFormula> ParseFormula(std::string_view text, FormulaError* error) {
  return Parser(text, error).Parse();
}

std::string FormatFormula(const std::vector<std::pair<std::string, int>>& counts, int charge) {
  std::string text;
  for (const auto& [symbol, count] : counts) {
    text += symbol;
    if (count != 1) text += std::to_string(count);
  }
  if (charge != 0) {
    text += charge > 0 ? '+' : '-';
    if (std::abs(charge) != 1) text += std::to_string(std::abs(charge));
  }
  return text;
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// ParseEntries and ReadEntriesFile: the reader of the entries format (docs/entries-format.md).
// Every complaint names file:line:column, what was found and what was expected.
#include <charconv>
#include <cmath>
#include <initializer_list>
#include <limits>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <system_error>
#include <vector>

#include <fmt/format.h>

#include "core/constants.h"
#include "core/elements.h"
#include "core/error.h"
#include "core/input_bounds.h"
#include "core/read_file.h"
#include "core/utf8.h"
#include "entries/entries.h"
#include "entries/entries_syntax.h"
#include "core/constants.h"

namespace sevenfold {
namespace {

using namespace detail;
using constants::kMaxTemperatureK;
using constants::kMinTemperatureK;

// Every field keyword, in the writer's order (the list of the unknown-field message).
constexpr const char* kAllFields[] = {
    kFieldComposition,       kFieldCharge,          kFieldPhase,
    kFieldTemperatures,      kFieldCoefficientsLow, kFieldCoefficientsHigh,
    kFieldFormationEnthalpy, kFieldReferencePressure, kFieldFitObjective,
    kFieldErrorScales,       kFieldExtrapolationGuard, kFieldTMidChoice,
    kFieldCurvature,         kFieldGridPoints,      kFieldCpError,
    kFieldHError,            kFieldSError,          kFieldGError,
    kFieldExtrapolation,     kFieldExtrapolationNote, kFieldFormLimit,
    kFieldVerdict,           kFieldFailure,         kFieldInputSha256,
    kFieldToolVersion,       kFieldModel,           kFieldSource};

// The largest field-lines count of a record header: 27 fields plus one line per missed
// threshold (at most 8: two ranges times Cp, H, S, G) leave room for far fewer; the cap only
// keeps a hostile count meaningful.
constexpr int kMaxFieldLines = 1000;
// Points per range at which Cp, H and S must be finite (geometric in T over the whole range,
// both ends and T_mid included): a 4th-degree polynomial overflows, if at all, at the top end,
// which is always sampled; the interior points catch a NaN of cancelling infinities.
constexpr int kNumFiniteSamples = 64;
// How far H(298.15 K) of the coefficients may lie from the stated formation enthalpy, in R T:
// the fit pins H at 298.15 K exactly (docs/fitting.md), so only rounding separates them (about
// 1e-13 RT for H/RT of order 100); 1e-6 RT, the tolerance of `check`'s curve comparison, is far
// above that and far below any error that matters (the H threshold is 2e-3 RT).
constexpr double kFormationEnthalpyToleranceRT = 1e-6;
// Bounds of figures that have no physical limit of their own.
constexpr double kHuge = std::numeric_limits<double>::max();
constexpr double kTiny = std::numeric_limits<double>::min();

// A word or a double-quoted string of one line. Columns are 1-based and count UTF-8 code points.
struct Token {
  std::string text;  // unescaped content for strings
  bool quoted = false;
  int column = 0;
  int end_column = 0;  // just past the token
};

// A line that holds at least one token (blank and comment-only lines are skipped).
struct Line {
  int number = 0;
  bool indented = false;  // starts with a space or tab
  std::vector<Token> tokens;
  int end_column = 1;  // just past the last token: where "end of line" is reported
};

// How a token is shown in messages.
std::string Describe(const Token& token) {
  return token.quoted ? "the string " + QuoteString(token.text) : "\"" + token.text + "\"";
}

// Length of the UTF-8 sequence starting with `lead`, 0 when `lead` cannot start one.
int Utf8Length(unsigned char lead) {
  if (lead < 0x80) return 1;
  if (lead >= 0xc2 && lead <= 0xdf) return 2;
  if (lead >= 0xe0 && lead <= 0xef) return 3;
  if (lead >= 0xf0 && lead <= 0xf4) return 4;
  return 0;
}

int HexDigit(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

class Reader;

// The values after a field keyword, consumed left to right.
class Cursor {
 public:
  Cursor(const Reader& reader, const Line& line, std::size_t first)
      : reader_(reader), line_(line), next_(first) {}

  const Token& Next(const std::string& expected);
  void Word(const std::string& word);
  double Number(const std::string& what);
  int Integer(const std::string& what);
  std::string String(const std::string& what);
  bool AtEnd() const { return next_ >= line_.tokens.size(); }
  // Column of the token consumed last (of the line's first token before any).
  int LastColumn() const { return line_.tokens[next_ > 0 ? next_ - 1 : 0].column; }
  // Text of the token consumed last.
  const std::string& LastText() const { return line_.tokens[next_ > 0 ? next_ - 1 : 0].text; }
  void Finish();

 private:
  const Reader& reader_;
  const Line& line_;
  std::size_t next_;
};

class Reader {
 public:
  Reader(const std::string& text, const std::string& file_name) : text_(text), file_(file_name) {}

  EntriesFile Read() {
    if (text_.size() > kMaxInputFileBytes) {
      Fail(1, 1, "found a text larger than 16 MiB, refused before parsing; expected at most 16 MiB");
    }
    if (const std::optional<Utf8Problem> bad = FindUtf8Problem(text_)) {
      Fail(bad->line, bad->column,
           fmt::format("found the byte 0x{:02x}, {}, expected UTF-8 text{}",
                       static_cast<unsigned>(bad->byte), bad->Describe(),
                       bad->kind == Utf8ProblemKind::kControl
                           ? " (control characters only as escapes inside quoted strings)"
                           : ""));
    }
    EntriesFile file;
    file.version = ReadHeader();
    std::map<std::string, int> first_line_of;
    Line line;
    while (NextLine(&line)) {
      const Token& key = line.tokens[0];
      if (line.indented) {
        Fail(line.number, key.column,
             fmt::format("found the indented line {} outside any record, expected a record "
                         "header at the left margin ({} {} {} {} N)",
                         Describe(key), QuoteString("NAME"), kRecordVersionWord,
                         kEntriesFormatVersion, kFieldLinesWord));
      }
      if (!key.quoted) {
        if (key.text == kVersion1BlockStart || key.text == kVersion1BlockEnd) {
          Fail(line.number, key.column,
               fmt::format("found \"{}\" at the left margin: the \"species NAME\" ... \"end\" "
                           "blocks of format version 1 were replaced in version 2 by records "
                           "that open with a header line {} {} {} {} N and hold indented "
                           "field lines; expected a record header (docs/entries-format.md)",
                           key.text, QuoteString("NAME"), kRecordVersionWord,
                           kEntriesFormatVersion, kFieldLinesWord));
        }
        Fail(line.number, key.column,
             fmt::format("found {} at the left margin, expected a record header {} {} {} {} N "
                         "(field lines are indented)",
                         Describe(key), QuoteString("NAME"), kRecordVersionWord,
                         kEntriesFormatVersion, kFieldLinesWord));
      }
      Entry entry = ReadRecord(line);
      const auto [it, inserted] = first_line_of.emplace(entry.name, line.number);
      if (!inserted) {
        Fail(line.number, line.tokens[0].column,
             fmt::format("found species {} a second time (first at line {}), expected each "
                         "species once",
                         QuoteString(entry.name), it->second));
      }
      file.entries.push_back(std::move(entry));
    }
    return file;
  }

  [[noreturn]] void Fail(int line, int column, const std::string& message) const {
    throw Error(SourceLocation{file_, line, column}, message);
  }

 private:
  // The verdict line of the record being read; checked against its failure lines at the end.
  bool recorded_pass_ = true;
  bool recorded_at_limit_ = false;

  // Reads the next raw line (without its end of line) into *raw; false at the end of the text.
  bool RawLine(std::string_view* raw) {
    if (position_ >= text_.size()) return false;
    std::size_t end = text_.find('\n', position_);
    if (end == std::string::npos) end = text_.size();
    *raw = std::string_view(text_).substr(position_, end - position_);
    if (!raw->empty() && raw->back() == '\r') raw->remove_suffix(1);
    position_ = end + 1;
    ++line_number_;
    return true;
  }

  // The next line holding tokens; false at the end of the text.
  bool NextLine(Line* line) {
    if (has_pending_) {
      *line = std::move(pending_);
      has_pending_ = false;
      return true;
    }
    std::string_view raw;
    while (RawLine(&raw)) {
      *line = Tokenize(raw, line_number_);
      if (!line->tokens.empty()) return true;
    }
    return false;
  }

  Line Tokenize(std::string_view raw, int number) const {
    Line line;
    line.number = number;
    line.indented = !raw.empty() && (raw[0] == ' ' || raw[0] == '\t');
    std::size_t i = 0;
    int column = 1;
    // Advances over one UTF-8 character, checking it.
    auto advance = [&]() {
      const int length = Utf8Length(static_cast<unsigned char>(raw[i]));
      bool valid = length > 0 && i + length <= raw.size();
      for (int k = 1; valid && k < length; ++k) {
        valid = (static_cast<unsigned char>(raw[i + k]) & 0xc0) == 0x80;
      }
      if (!valid) {
        Fail(number, column,
             fmt::format("found the byte 0x{:02x}, which does not start valid UTF-8, expected "
                         "UTF-8 text",
                         static_cast<unsigned>(static_cast<unsigned char>(raw[i]))));
      }
      // A raw control character (tab aside) is never written: strings carry them as escapes.
      // Refusing them here also keeps them out of the messages that echo a token.
      const unsigned char byte = static_cast<unsigned char>(raw[i]);
      if ((byte < 0x20 && byte != '\t') || byte == 0x7f) {
        Fail(number, column,
             fmt::format("found the control character 0x{:02x}, expected text (control "
                         "characters only as escapes inside quoted strings)",
                         static_cast<unsigned>(byte)));
      }
      i += static_cast<std::size_t>(length);
      ++column;
    };
    while (i < raw.size()) {
      const char c = raw[i];
      if (c == ' ' || c == '\t') {
        advance();
        continue;
      }
      if (c == '#') break;
      Token token;
      token.column = column;
      if (c == '"') {
        token.quoted = true;
        advance();
        bool closed = false;
        while (i < raw.size()) {
          const char d = raw[i];
          if (d == '"') {
            advance();
            closed = true;
            break;
          }
          if (d != '\\') {
            const std::size_t from = i;
            advance();
            token.text.append(raw.substr(from, i - from));
            continue;
          }
          const int escape_column = column;
          const char e = i + 1 < raw.size() ? raw[i + 1] : '\0';
          if (e == '\\' || e == '"' || e == 'n' || e == 't' || e == 'r') {
            token.text += e == 'n' ? '\n' : e == 't' ? '\t' : e == 'r' ? '\r' : e;
            advance();
            advance();
          } else if (e == 'x' && i + 3 < raw.size() && HexDigit(raw[i + 2]) >= 0 &&
                     HexDigit(raw[i + 3]) >= 0 && HexDigit(raw[i + 2]) < 8) {
            // Only ASCII escapes: a byte above 0x7f alone is not UTF-8, and the writer puts
            // non-ASCII text as is (found by fuzzing, docs/robustness.md).
            token.text += static_cast<char>(HexDigit(raw[i + 2]) * 16 + HexDigit(raw[i + 3]));
            for (int k = 0; k < 4; ++k) advance();
          } else {
            Fail(number, escape_column,
                 fmt::format("found the escape \"\\{}\", expected one of \\\\ \\\" \\n \\t \\r "
                             "\\xHH",
                             e == '\0' ? std::string() : std::string(1, e)));
          }
        }
        if (!closed) {
          Fail(number, column, "found end of line inside a quoted string, expected a closing \"");
        }
        if (i < raw.size() && raw[i] != ' ' && raw[i] != '\t' && raw[i] != '#') {
          Fail(number, column,
               fmt::format("found \"{}\" right after a quoted string, expected a space",
                           std::string(1, raw[i])));
        }
      } else {
        const std::size_t from = i;
        while (i < raw.size() && raw[i] != ' ' && raw[i] != '\t' && raw[i] != '#') {
          if (raw[i] == '"') {
            Fail(number, column,
                 fmt::format("found a quote inside the word \"{}\", expected quotes only around "
                             "a whole string",
                             std::string(raw.substr(from, i - from + 1))));
          }
          advance();
        }
        token.text = std::string(raw.substr(from, i - from));
      }
      token.end_column = column;
      line.end_column = column;
      line.tokens.push_back(std::move(token));
    }
    return line;
  }

  int ReadHeader() {
    const std::string expected = fmt::format("the header \"{} {}\"", kEntriesMagic,
                                             kEntriesFormatVersion);
    std::string_view raw;
    if (!RawLine(&raw)) Fail(1, 1, "found end of file, expected " + expected);
    const Line line = Tokenize(raw, 1);
    if (line.tokens.empty()) Fail(1, 1, "found an empty line, expected " + expected);
    const Token& magic = line.tokens[0];
    if (magic.quoted || magic.text != kEntriesMagic) {
      Fail(1, magic.column, fmt::format("found {}, expected {}", Describe(magic), expected));
    }
    Cursor values(*this, line, 1);
    const Token& version_token = line.tokens.size() > 1 ? line.tokens[1] : magic;
    const int version = values.Integer("the format version");
    if (version == 1) {
      Fail(1, version_token.column,
           fmt::format("found format version 1, whose records are \"species NAME\" ... "
                       "\"end\" blocks; expected {}, the version this build reads, which opens "
                       "each record with a header line {} {} {} {} N, holds its fields on "
                       "indented lines and records the fit settings: run fit again, or convert "
                       "the file (docs/entries-format.md, \"Versions\")",
                       kEntriesFormatVersion, QuoteString("NAME"), kRecordVersionWord,
                       kEntriesFormatVersion, kFieldLinesWord));
    }
    if (version != kEntriesFormatVersion) {
      Fail(1, version_token.column,
           fmt::format("found format version {}, expected {} (the version this build reads)",
                       version, kEntriesFormatVersion));
    }
    values.Finish();
    return version;
  }

  // Reads the record whose header is `start` and its field lines.
  Entry ReadRecord(const Line& start) {
    Entry entry;
    Cursor head(*this, start, 0);
    entry.name = head.String("the species name");
    if (entry.name.empty()) {
      Fail(start.number, start.tokens[0].column,
           "found an empty species name, expected at least one character");
    }
    const std::string species = QuoteString(entry.name);
    head.Word(kRecordVersionWord);
    const int record_version = head.Integer("the record version");
    if (record_version != kEntriesFormatVersion) {
      Fail(start.number, head.LastColumn(),
           fmt::format("found record-version {} in record {}, expected {} (the format version "
                       "of this file)",
                       record_version, species, kEntriesFormatVersion));
    }
    head.Word(kFieldLinesWord);
    const int num_declared = head.Integer("the number of field lines");
    const int count_column = head.LastColumn();
    if (num_declared < 1 || num_declared > kMaxFieldLines) {
      Fail(start.number, count_column,
           fmt::format("found field-lines {}, expected a count from 1 to {}", num_declared,
                       kMaxFieldLines));
    }
    head.Finish();
    entry.location = SourceLocation{file_, start.number, start.tokens[0].column};

    std::map<std::string, int> seen;  // field -> line
    recorded_pass_ = true;
    recorded_at_limit_ = false;
    int verdict_column = 1;
    int first_failure_line = 0, first_failure_column = 1;
    int num_lines = 0;
    Line line;
    while (true) {
      if (!NextLine(&line)) {
        if (num_lines < num_declared) {
          Fail(line_number_ + 1, 1,
               fmt::format("found end of file after {} of the {} field lines of record {} "
                           "(header at line {}), expected {} (a truncated file?)",
                           num_lines, num_declared, species, start.number, num_declared));
        }
        break;
      }
      if (!line.indented) {
        if (num_lines < num_declared) {
          Fail(line.number, line.tokens[0].column,
               fmt::format("found {} at the left margin after {} of the {} field lines of record "
                           "{} (header at line {}), expected the remaining field lines, indented",
                           Describe(line.tokens[0]), num_lines, num_declared, species,
                           start.number));
        }
        pending_ = std::move(line);
        has_pending_ = true;
        break;
      }
      const Token& key = line.tokens[0];
      if (++num_lines > num_declared) {
        Fail(line.number, key.column,
             fmt::format("found field line {} of record {} whose header (line {}) states {}, "
                         "expected a record header at the left margin",
                         num_lines, species, start.number, num_declared));
      }
      if (key.quoted) {
        Fail(line.number, key.column,
             fmt::format("found {}, expected a field name", Describe(key)));
      }
      if (key.text != kFieldFailure) {
        const auto [it, inserted] = seen.emplace(key.text, line.number);
        if (!inserted && IsKnownField(key.text)) {
          Fail(line.number, key.column,
               fmt::format("found a second \"{}\" line in species {} (first at line {}), "
                           "expected each field once",
                           key.text, species, it->second));
        }
      } else if (first_failure_line == 0) {
        first_failure_line = line.number;
        first_failure_column = key.column;
      }
      if (key.text == kFieldVerdict) verdict_column = key.column;
      ReadField(line, entry);
    }
    for (const char* field : kAllFields) {
      // Every field is required but the optional note and the repeatable failure lines.
      if (field == std::string_view(kFieldExtrapolationNote) ||
          field == std::string_view(kFieldFailure)) {
        continue;
      }
      if (seen.count(field) == 0) {
        Fail(start.number, start.tokens[0].column,
             fmt::format("found record {} without a \"{}\" line, expected one", species,
                         field));
      }
    }
    const FitQuality& quality = entry.quality;
    if (!recorded_pass_ && quality.threshold_failures.empty()) {
      Fail(seen[kFieldVerdict], verdict_column,
           fmt::format("found verdict \"{}\" in species {} without any \"{}\" line, expected at "
                       "least one",
                       kVerdictFail, species, kFieldFailure));
    }
    if (recorded_pass_ && !quality.threshold_failures.empty()) {
      Fail(first_failure_line, first_failure_column,
           fmt::format("found a \"{}\" line in species {} whose verdict is \"{}\", expected none",
                       kFieldFailure, species, kVerdictPass));
    }
    CheckCurves(entry, seen[kFieldCoefficientsLow], seen[kFieldCoefficientsHigh],
                seen[kFieldFormationEnthalpy]);
    return entry;
  }

  // Cp, H and S of both ranges finite over the range, and H(298.15 K) equal to the formation
  // enthalpy when 298.15 K lies inside the range (the fit pins it there).
  void CheckCurves(const Entry& entry, int low_line, int high_line, int formation_line) const {
    const TwoRangePolynomial& p = entry.polynomial;
    const double log_ratio = std::log(p.t_high_k / p.t_low_k);
    for (int i = 0; i <= kNumFiniteSamples; ++i) {
      const double t = i == kNumFiniteSamples ? p.t_high_k
                                              : p.t_low_k * std::exp(log_ratio * i / kNumFiniteSamples);
      for (const double t_k : {t, p.t_mid_k}) {
        for (const NasaCoefficients* a : {&p.low, &p.high}) {
          if (!std::isfinite(CpOverR(*a, t_k)) || !std::isfinite(HOverRT(*a, t_k)) ||
              !std::isfinite(SOverR(*a, t_k))) {
            Fail(a == &p.high ? high_line : low_line, 1,
                 fmt::format("found coefficients of species {} whose Cp, H or S is not finite at "
                             "{} K, expected finite values across the range",
                             QuoteString(entry.name), t_k));
          }
        }
      }
    }
    const double t_ref = constants::kReferenceTemperature;
    if (t_ref >= p.t_low_k && t_ref <= p.t_high_k) {
      const double h_over_rt = HOverRT(p, t_ref);
      const double stated = entry.formation_enthalpy_j_per_mol / (constants::kGasConstant * t_ref);
      if (!(std::abs(h_over_rt - stated) <= kFormationEnthalpyToleranceRT)) {
        Fail(formation_line, 1,
             fmt::format("found formation enthalpy {} J/mol in species {} but H(298.15 K) = {} "
                         "J/mol from its coefficients, expected them to agree within {} R T",
                         entry.formation_enthalpy_j_per_mol, QuoteString(entry.name),
                         h_over_rt * constants::kGasConstant * t_ref,
                         kFormationEnthalpyToleranceRT));
      }
    }
  }

  static bool IsKnownField(const std::string& key) {
    for (const char* field : kAllFields) {
      if (key == field) return true;
    }
    return false;
  }

  // A word that must be one of `words`; returns its index.
  int Choice(Cursor& values, const Line& line, std::initializer_list<const char*> words) {
    std::string expected;
    for (const char* word : words) {
      expected += (expected.empty() ? "" : " or ") + fmt::format("\"{}\"", word);
    }
    const Token& token = values.Next(expected);
    int index = 0;
    for (const char* word : words) {
      if (!token.quoted && token.text == word) return index;
      ++index;
    }
    Fail(line.number, token.column, fmt::format("found {}, expected {}", Describe(token), expected));
  }

  // A number within [low, high]; `rule` says what is expected, e.g. "a temperature within
  // [10, 20000] K".
  double Bounded(Cursor& values, const Line& line, const std::string& what, double low,
                 double high, const std::string& rule) {
    const double value = values.Number(what);
    if (!(value >= low && value <= high)) {
      Fail(line.number, values.LastColumn(),
           fmt::format("found {} ({}), expected {}", values.LastText(), what, rule));
    }
    return value;
  }

  // "low max X at-k T rms Y high max X at-k T rms Y".
  void ReadErrorPair(Cursor& values, const Line& line, const std::string& field,
                     double* low_max, double* low_at_k, double* low_rms, double* high_max,
                     double* high_at_k, double* high_rms) {
    const auto figure = [&](const std::string& what) {
      return Bounded(values, line, field + " " + what, 0.0, kHuge, "a non-negative number");
    };
    const auto where = [&](const std::string& what) {
      return Bounded(values, line, field + " " + what, 0.0, kMaxTemperatureK,
                     fmt::format("a temperature within [0, {}] K", kMaxTemperatureK));
    };
    values.Word("low");
    values.Word("max");
    *low_max = figure("low max");
    values.Word("at-k");
    *low_at_k = where("low at-k");
    values.Word("rms");
    *low_rms = figure("low rms");
    values.Word("high");
    values.Word("max");
    *high_max = figure("high max");
    values.Word("at-k");
    *high_at_k = where("high at-k");
    values.Word("rms");
    *high_rms = figure("high rms");
  }

  void ReadField(const Line& line, Entry& entry) {
    const Token& key = line.tokens[0];
    const std::string& field = key.text;
    Cursor values(*this, line, 1);
    TwoRangePolynomial& p = entry.polynomial;
    RangeQuality& lo = entry.quality.low_range;
    RangeQuality& hi = entry.quality.high_range;
    EntryFitSettings& settings = entry.fit_settings;
    if (field == kFieldComposition) {
      do {
        const Token& symbol = values.Next("an element symbol");
        if (symbol.quoted || !IsElementSymbol(symbol.text) ||
            !AtomicWeightGPerMol(symbol.text)) {
          Fail(line.number, symbol.column,
               fmt::format("found {}, expected the symbol of a known element such as C or Cl",
                           Describe(symbol)));
        }
        for (const auto& [earlier, count] : entry.composition) {
          if (earlier == symbol.text) {
            Fail(line.number, symbol.column,
                 fmt::format("found element {} a second time, expected each element once",
                             symbol.text));
          }
        }
        const int count = values.Integer("the count of " + symbol.text);
        if (count < 1 || count > kMaxAtomCount) {
          Fail(line.number, values.LastColumn(),
               fmt::format("found count {} of {}, expected a positive count of at most {}", count,
                           symbol.text, kMaxAtomCount));
        }
        entry.composition.emplace_back(symbol.text, count);
      } while (!values.AtEnd());
    } else if (field == kFieldCharge) {
      entry.charge = values.Integer("the charge");
      if (entry.charge < -kMaxChargeMagnitude || entry.charge > kMaxChargeMagnitude) {
        Fail(line.number, values.LastColumn(),
             fmt::format("found charge {}, expected a charge within [-{}, {}]", entry.charge,
                         kMaxChargeMagnitude, kMaxChargeMagnitude));
      }
    } else if (field == kFieldPhase) {
      const Token& phase = values.Next("the phase");
      if (phase.quoted || phase.text != kPhaseGas) {
        Fail(line.number, phase.column,
             fmt::format("found {}, expected \"{}\" (the only phase of format version {})",
                         Describe(phase), kPhaseGas, kEntriesFormatVersion));
      }
      entry.phase = phase.text;
    } else if (field == kFieldTemperatures) {
      const std::string rule = fmt::format("a temperature within [{}, {}] K (the engine's range)",
                                           kMinTemperatureK, kMaxTemperatureK);
      values.Word("low");
      p.t_low_k = Bounded(values, line, "the low temperature", kMinTemperatureK,
                          kMaxTemperatureK, rule);
      const int column = values.LastColumn();
      values.Word("mid");
      p.t_mid_k = Bounded(values, line, "the mid temperature", kMinTemperatureK,
                          kMaxTemperatureK, rule);
      values.Word("high");
      p.t_high_k = Bounded(values, line, "the high temperature", kMinTemperatureK,
                           kMaxTemperatureK, rule);
      if (!(p.t_low_k < p.t_mid_k && p.t_mid_k < p.t_high_k)) {
        Fail(line.number, column,
             fmt::format("found temperatures {} {} {} K, expected low < mid < high", p.t_low_k,
                         p.t_mid_k, p.t_high_k));
      }
    } else if (field == kFieldCoefficientsLow || field == kFieldCoefficientsHigh) {
      NasaCoefficients& a = field == kFieldCoefficientsLow ? p.low : p.high;
      for (int k = 0; k < 7; ++k) a[k] = values.Number(fmt::format("coefficient a{}", k + 1));
    } else if (field == kFieldFormationEnthalpy) {
      entry.formation_enthalpy_j_per_mol =
          Bounded(values, line, "the formation enthalpy in J/mol", -kMaxFormationEnthalpyJPerMol,
                  kMaxFormationEnthalpyJPerMol,
                  fmt::format("a formation enthalpy of magnitude at most {} J/mol",
                              kMaxFormationEnthalpyJPerMol));
    } else if (field == kFieldReferencePressure) {
      entry.reference_pressure_pa = values.Number("the reference pressure in Pa");
      if (entry.reference_pressure_pa != constants::kStandardPressureBar &&
          entry.reference_pressure_pa != constants::kStandardPressureAtm) {
        Fail(line.number, values.LastColumn(),
             fmt::format("found {} Pa, expected a standard pressure: 100000 (1 bar) or 101325 "
                         "(1 atm)",
                         values.LastText()));
      }
    } else if (field == kFieldFitObjective) {
      settings.objective = Choice(values, line, {"minimax", "least-squares"}) == 0
                               ? FitObjective::kMinimax
                               : FitObjective::kLeastSquares;
      SEVENFOLD_ASSERT(ToString(FitObjective::kMinimax) == "minimax" &&
                       ToString(FitObjective::kLeastSquares) == "least-squares");
    } else if (field == kFieldErrorScales) {
      const std::string rule = "a scale within (0, 1]";
      ErrorScales& scales = settings.error_scales;
      values.Word("cp");
      scales.cp_relative = Bounded(values, line, "the Cp error scale", kTiny, 1.0, rule);
      values.Word("h");
      scales.h_over_rt = Bounded(values, line, "the H error scale", kTiny, 1.0, rule);
      values.Word("s");
      scales.s_over_r = Bounded(values, line, "the S error scale", kTiny, 1.0, rule);
    } else if (field == kFieldExtrapolationGuard) {
      const Token& first = values.Next("\"off\" or \"factor\"");
      if (!first.quoted && first.text == kGuardOff) {
        settings.extrapolation_guard.enabled = false;
      } else {
        if (first.quoted || first.text != "factor") {
          Fail(line.number, first.column,
               fmt::format("found {}, expected \"off\" or \"factor\"", Describe(first)));
        }
        const double factor = values.Number("the guard's factor");
        const int column = values.LastColumn();
        const std::string factor_text = values.LastText();
        values.Word("band");
        values.Number("the guard's band");
        const std::optional<ExtrapolationGuard> guard =
            ParseExtrapolationGuard(factor_text + ":" + values.LastText());
        if (!guard) {
          Fail(line.number, column,
               fmt::format("found factor {} band {}, expected 1 < factor <= 4 and "
                           "0 < band <= 1",
                           factor, values.LastText()));
        }
        settings.extrapolation_guard = *guard;
      }
    } else if (field == kFieldTMidChoice) {
      settings.t_mid_fixed = Choice(values, line, {kTMidFixed, kTMidAuto}) == 0;
    } else if (field == kFieldCurvature) {
      settings.continuous_second_derivative =
          Choice(values, line, {kCurvatureContinuous, kCurvatureFree}) == 0;
    } else if (field == kFieldGridPoints) {
      values.Word("low");
      lo.num_points = values.Integer("the number of low-range grid points");
      if (lo.num_points < 0) {
        Fail(line.number, values.LastColumn(),
             fmt::format("found {} grid points, expected a non-negative count", lo.num_points));
      }
      values.Word("high");
      hi.num_points = values.Integer("the number of high-range grid points");
      if (hi.num_points < 0) {
        Fail(line.number, values.LastColumn(),
             fmt::format("found {} grid points, expected a non-negative count", hi.num_points));
      }
    } else if (field == kFieldCpError) {
      ReadErrorPair(values, line, field, &lo.max_cp_relative, &lo.max_cp_error_t_k,
                    &lo.rms_cp_relative, &hi.max_cp_relative, &hi.max_cp_error_t_k,
                    &hi.rms_cp_relative);
    } else if (field == kFieldHError) {
      ReadErrorPair(values, line, field, &lo.max_h_over_rt, &lo.max_h_error_t_k,
                    &lo.rms_h_over_rt, &hi.max_h_over_rt, &hi.max_h_error_t_k,
                    &hi.rms_h_over_rt);
    } else if (field == kFieldSError) {
      ReadErrorPair(values, line, field, &lo.max_s_over_r, &lo.max_s_error_t_k,
                    &lo.rms_s_over_r, &hi.max_s_over_r, &hi.max_s_error_t_k, &hi.rms_s_over_r);
    } else if (field == kFieldGError) {
      ReadErrorPair(values, line, field, &lo.max_g_over_rt, &lo.max_g_error_t_k,
                    &lo.rms_g_over_rt, &hi.max_g_over_rt, &hi.max_g_error_t_k,
                    &hi.rms_g_over_rt);
    } else if (field == kFieldExtrapolation) {
      ExtrapolationCheck& x = entry.quality.extrapolation;
      x.sane = Choice(values, line, {kExtrapolationSane, kExtrapolationOutside}) == 0;
      const auto pair = [&](const char* side, double* min, double* max) {
        values.Word(side);
        values.Word("min");
        *min = values.Number(fmt::format("the lowest Cp/R {} the range", side));
        const int column = values.LastColumn();
        values.Word("max");
        *max = values.Number(fmt::format("the highest Cp/R {} the range", side));
        if (!(*min <= *max)) {
          Fail(line.number, column,
               fmt::format("found min {} above max {} ({}), expected min <= max", *min, *max,
                           side));
        }
      };
      pair("below", &x.min_cp_over_r_below, &x.max_cp_over_r_below);
      pair("above", &x.min_cp_over_r_above, &x.max_cp_over_r_above);
    } else if (field == kFieldExtrapolationNote) {
      entry.quality.extrapolation.message = values.String("the extrapolation note");
    } else if (field == kFieldFormLimit) {
      FormLimit& limit = entry.quality.form_limit;
      const int state =
          Choice(values, line, {kFormLimitNotEvaluated, kFormLimitAtLimit, kFormLimitReachable});
      if (state != 0) {
        limit.computed = true;
        values.Word("best-threshold-ratio");
        limit.best_threshold_ratio =
            Bounded(values, line, "the best threshold ratio", 0.0, kHuge, "a non-negative number");
        if (limit.AtFormLimit() != (state == 1)) {
          Fail(line.number, values.LastColumn(),
               fmt::format("found best-threshold-ratio {} with \"{}\", expected \"{}\" exactly "
                           "when the ratio exceeds 1",
                           values.LastText(), state == 1 ? kFormLimitAtLimit : kFormLimitReachable,
                           kFormLimitAtLimit));
        }
        values.Word("widest-passing-range-k");
        const Token& next = values.Next("\"none\" or \"low\"");
        if (next.quoted || (next.text != kNone && next.text != "low")) {
          Fail(line.number, next.column,
               fmt::format("found {}, expected \"none\" or \"low\"", Describe(next)));
        }
        if (next.text == "low") {
          const std::string rule = fmt::format("a temperature within [{}, {}] K",
                                               kMinTemperatureK, kMaxTemperatureK);
          limit.passing_range_found = true;
          limit.passing_t_low_k = Bounded(values, line, "the passing range's low end",
                                          kMinTemperatureK, kMaxTemperatureK, rule);
          const int column = values.LastColumn();
          values.Word("high");
          limit.passing_t_high_k = Bounded(values, line, "the passing range's high end",
                                           kMinTemperatureK, kMaxTemperatureK, rule);
          if (!(limit.passing_t_low_k < limit.passing_t_high_k)) {
            Fail(line.number, column,
                 fmt::format("found the passing range {} to {} K, expected low < high",
                             limit.passing_t_low_k, limit.passing_t_high_k));
          }
        }
      }
    } else if (field == kFieldVerdict) {
      recorded_pass_ = Choice(values, line, {kVerdictPass, kVerdictFail}) == 0;
    } else if (field == kFieldFailure) {
      entry.quality.threshold_failures.push_back(values.String("the failure text"));
    } else if (field == kFieldInputSha256) {
      const Token& digest = values.Next("the SHA-256 digest");
      if (digest.quoted || !IsSha256Hex(digest.text)) {
        Fail(line.number, digest.column,
             fmt::format("found {}, expected 64 lowercase hexadecimal digits", Describe(digest)));
      }
      entry.provenance.input_sha256 = digest.text;
    } else if (field == kFieldToolVersion) {
      entry.provenance.tool_version = values.String("the tool version");
    } else if (field == kFieldModel) {
      entry.provenance.model_options = values.String("the model description");
    } else if (field == kFieldSource) {
      entry.provenance.source_file = values.String("the source file");
    } else {
      std::string known;
      for (const char* name : kAllFields) known += (known.empty() ? "" : ", ") + std::string(name);
      Fail(line.number, key.column,
           fmt::format("found unknown field \"{}\", expected one of {}", field, known));
    }
    values.Finish();
  }

  const std::string& text_;
  std::string file_;
  // A line read ahead (the header that ends the record before it), returned by NextLine next.
  Line pending_;
  bool has_pending_ = false;
  std::size_t position_ = 0;
  int line_number_ = 0;
};

const Token& Cursor::Next(const std::string& expected) {
  if (AtEnd()) {
    reader_.Fail(line_.number, line_.end_column, "found end of line, expected " + expected);
  }
  return line_.tokens[next_++];
}

void Cursor::Word(const std::string& word) {
  const Token& token = Next("\"" + word + "\"");
  if (token.quoted || token.text != word) {
    reader_.Fail(line_.number, token.column,
                 fmt::format("found {}, expected \"{}\"", Describe(token), word));
  }
}

double Cursor::Number(const std::string& what) {
  const Token& token = Next("a number (" + what + ")");
  double value = 0.0;
  const char* begin = token.text.data();
  const char* end = begin + token.text.size();
  const auto [stop, error] = std::from_chars(begin, end, value);
  if (token.quoted || error == std::errc::invalid_argument || stop != end) {
    reader_.Fail(line_.number, token.column,
                 fmt::format("found {}, expected a number ({})", Describe(token), what));
  }
  if (error == std::errc::result_out_of_range || !std::isfinite(value)) {
    reader_.Fail(line_.number, token.column,
                 fmt::format("found {}, expected a finite number ({})", Describe(token), what));
  }
  return value;
}

int Cursor::Integer(const std::string& what) {
  const Token& token = Next("an integer (" + what + ")");
  int value = 0;
  const char* begin = token.text.data();
  const char* end = begin + token.text.size();
  const auto [stop, error] = std::from_chars(begin, end, value);
  if (token.quoted || error != std::errc() || stop != end) {
    reader_.Fail(line_.number, token.column,
                 fmt::format("found {}, expected an integer ({})", Describe(token), what));
  }
  return value;
}

std::string Cursor::String(const std::string& what) {
  const Token& token = Next(what);
  if (!token.quoted) {
    reader_.Fail(line_.number, token.column,
                 fmt::format("found {}, expected {} in double quotes", Describe(token), what));
  }
  return token.text;
}

void Cursor::Finish() {
  if (!AtEnd()) {
    const Token& extra = line_.tokens[next_];
    reader_.Fail(line_.number, extra.column,
                 fmt::format("found {}, expected end of line", Describe(extra)));
  }
}

}  // namespace

EntriesFile ParseEntries(const std::string& text, const std::string& file_name) {
  return Reader(text, file_name).Read();
}

EntriesFile ReadEntriesFile(const std::string& path) {
  return ParseEntries(ReadInputFile(path, "entries file"), path);
}

}  // namespace sevenfold

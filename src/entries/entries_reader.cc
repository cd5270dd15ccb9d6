// SPDX-License-Identifier: MIT
// ParseEntries and ReadEntriesFile: the reader of the entries format (docs/entries-format.md).
// Every complaint names file:line:column, what was found and what was expected.
#include <cerrno>
#include <charconv>
#include <cmath>
#include <cstring>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <string_view>
#include <system_error>
#include <vector>

#include <fmt/format.h>

#include "core/error.h"
#include "entries/entries.h"
#include "entries/entries_syntax.h"

namespace sevenfold {
namespace {

using namespace detail;

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
    EntriesFile file;
    file.version = ReadHeader();
    std::map<std::string, int> first_line_of;
    Line line;
    while (NextLine(&line)) {
      const Token& key = line.tokens[0];
      if (key.quoted || key.text != kBlockStart) {
        Fail(line.number, key.column,
             fmt::format("found {}, expected \"{}\" to open a block", Describe(key), kBlockStart));
      }
      Entry entry = ReadBlock(line);
      const auto [it, inserted] = first_line_of.emplace(entry.name, line.number);
      if (!inserted) {
        Fail(line.number, line.tokens[1].column,
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
  // The verdict line of the block being read; checked against its failure lines at the end.
  bool recorded_pass_ = true;

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
    if (version != kEntriesFormatVersion) {
      Fail(1, version_token.column,
           fmt::format("found format version {}, expected {} (the version this build reads)",
                       version, kEntriesFormatVersion));
    }
    values.Finish();
    return version;
  }

  Entry ReadBlock(const Line& start) {
    Entry entry;
    Cursor head(*this, start, 1);
    entry.name = head.String("the species name");
    head.Finish();
    if (entry.name.empty()) {
      Fail(start.number, start.tokens[1].column,
           "found an empty species name, expected at least one character");
    }
    entry.location = SourceLocation{file_, start.number, start.tokens[0].column};
    const std::string species = QuoteString(entry.name);

    static const char* const kRequired[] = {
        kFieldComposition,      kFieldCharge,           kFieldPhase,          kFieldTemperatures,
        kFieldCoefficientsLow,  kFieldCoefficientsHigh, kFieldFormationEnthalpy,
        kFieldReferencePressure, kFieldGridPoints,      kFieldCpError,        kFieldHError,
        kFieldSError,           kFieldGError,           kFieldExtrapolation,  kFieldVerdict,
        kFieldInputSha256,      kFieldToolVersion,      kFieldModel,          kFieldSource};
    std::map<std::string, int> seen;  // field -> line
    recorded_pass_ = true;
    int verdict_column = 1;
    int first_failure_line = 0, first_failure_column = 1;
    Line line;
    while (true) {
      if (!NextLine(&line)) {
        Fail(line_number_ + 1, 1,
             fmt::format("found end of file inside the block of species {} (opened at line {}), "
                         "expected \"{}\"",
                         species, start.number, kBlockEnd));
      }
      const Token& key = line.tokens[0];
      if (key.quoted) {
        Fail(line.number, key.column,
             fmt::format("found {}, expected a field name or \"{}\"", Describe(key), kBlockEnd));
      }
      if (key.text == kBlockEnd) {
        Cursor(*this, line, 1).Finish();
        break;
      }
      if (key.text == kBlockStart) {
        Fail(line.number, key.column,
             fmt::format("found \"{}\" inside the block of species {} (opened at line {}), "
                         "expected \"{}\" first",
                         kBlockStart, species, start.number, kBlockEnd));
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
    for (const char* field : kRequired) {
      if (seen.count(field) == 0) {
        Fail(line.number, line.tokens[0].column,
             fmt::format("found \"{}\" but species {} has no \"{}\" line, expected one before "
                         "\"{}\"",
                         kBlockEnd, species, field, kBlockEnd));
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
    return entry;
  }

  static bool IsKnownField(const std::string& key) {
    static const char* const kAll[] = {
        kFieldComposition,      kFieldCharge,          kFieldPhase,
        kFieldTemperatures,     kFieldCoefficientsLow, kFieldCoefficientsHigh,
        kFieldFormationEnthalpy, kFieldReferencePressure, kFieldGridPoints,
        kFieldCpError,          kFieldHError,          kFieldSError,
        kFieldGError,           kFieldExtrapolation,   kFieldExtrapolationNote,
        kFieldVerdict,          kFieldFailure,         kFieldInputSha256,
        kFieldToolVersion,      kFieldModel,           kFieldSource};
    for (const char* field : kAll) {
      if (key == field) return true;
    }
    return false;
  }

  // "low max X at-k T rms Y high max X at-k T rms Y".
  void ReadErrorPair(Cursor& values, const std::string& field, double* low_max, double* low_at_k,
                     double* low_rms, double* high_max, double* high_at_k, double* high_rms) {
    values.Word("low");
    values.Word("max");
    *low_max = values.Number(field + " low max");
    values.Word("at-k");
    *low_at_k = values.Number(field + " low at-k");
    values.Word("rms");
    *low_rms = values.Number(field + " low rms");
    values.Word("high");
    values.Word("max");
    *high_max = values.Number(field + " high max");
    values.Word("at-k");
    *high_at_k = values.Number(field + " high at-k");
    values.Word("rms");
    *high_rms = values.Number(field + " high rms");
  }

  void ReadField(const Line& line, Entry& entry) {
    const Token& key = line.tokens[0];
    const std::string& field = key.text;
    Cursor values(*this, line, 1);
    TwoRangePolynomial& p = entry.polynomial;
    RangeQuality& lo = entry.quality.low_range;
    RangeQuality& hi = entry.quality.high_range;
    if (field == kFieldComposition) {
      do {
        const Token& symbol = values.Next("an element symbol");
        if (symbol.quoted || !IsElementSymbol(symbol.text)) {
          Fail(line.number, symbol.column,
               fmt::format("found {}, expected an element symbol such as C or Cl",
                           Describe(symbol)));
        }
        const int count = values.Integer("the count of " + symbol.text);
        if (count < 1) {
          Fail(line.number, values.LastColumn(),
               fmt::format("found count {} of {}, expected a positive count", count, symbol.text));
        }
        entry.composition.emplace_back(symbol.text, count);
      } while (!values.AtEnd());
    } else if (field == kFieldCharge) {
      entry.charge = values.Integer("the charge");
    } else if (field == kFieldPhase) {
      const Token& phase = values.Next("the phase");
      if (phase.quoted || phase.text != kPhaseGas) {
        Fail(line.number, phase.column,
             fmt::format("found {}, expected \"{}\" (the only phase of format version {})",
                         Describe(phase), kPhaseGas, kEntriesFormatVersion));
      }
      entry.phase = phase.text;
    } else if (field == kFieldTemperatures) {
      p.t_low_k = values.Number("the low temperature");
      const int column = values.LastColumn();
      p.t_mid_k = values.Number("the mid temperature");
      p.t_high_k = values.Number("the high temperature");
      if (!(p.t_low_k > 0.0 && p.t_low_k < p.t_mid_k && p.t_mid_k < p.t_high_k)) {
        Fail(line.number, column,
             fmt::format("found temperatures {} {} {} K, expected 0 < low < mid < high",
                         p.t_low_k, p.t_mid_k, p.t_high_k));
      }
    } else if (field == kFieldCoefficientsLow || field == kFieldCoefficientsHigh) {
      NasaCoefficients& a = field == kFieldCoefficientsLow ? p.low : p.high;
      for (int k = 0; k < 7; ++k) a[k] = values.Number(fmt::format("coefficient a{}", k + 1));
    } else if (field == kFieldFormationEnthalpy) {
      entry.formation_enthalpy_j_per_mol = values.Number("the formation enthalpy in J/mol");
    } else if (field == kFieldReferencePressure) {
      entry.reference_pressure_pa = values.Number("the reference pressure in Pa");
      if (!(entry.reference_pressure_pa > 0.0)) {
        Fail(line.number, values.LastColumn(),
             fmt::format("found {} Pa, expected a positive pressure", values.LastText()));
      }
    } else if (field == kFieldGridPoints) {
      values.Word("low");
      lo.num_points = values.Integer("the number of low-range grid points");
      values.Word("high");
      hi.num_points = values.Integer("the number of high-range grid points");
    } else if (field == kFieldCpError) {
      ReadErrorPair(values, field, &lo.max_cp_relative, &lo.max_cp_error_t_k, &lo.rms_cp_relative,
                    &hi.max_cp_relative, &hi.max_cp_error_t_k, &hi.rms_cp_relative);
    } else if (field == kFieldHError) {
      ReadErrorPair(values, field, &lo.max_h_over_rt, &lo.max_h_error_t_k, &lo.rms_h_over_rt,
                    &hi.max_h_over_rt, &hi.max_h_error_t_k, &hi.rms_h_over_rt);
    } else if (field == kFieldSError) {
      ReadErrorPair(values, field, &lo.max_s_over_r, &lo.max_s_error_t_k, &lo.rms_s_over_r,
                    &hi.max_s_over_r, &hi.max_s_error_t_k, &hi.rms_s_over_r);
    } else if (field == kFieldGError) {
      ReadErrorPair(values, field, &lo.max_g_over_rt, &lo.max_g_error_t_k, &lo.rms_g_over_rt,
                    &hi.max_g_over_rt, &hi.max_g_error_t_k, &hi.rms_g_over_rt);
    } else if (field == kFieldExtrapolation) {
      ExtrapolationCheck& x = entry.quality.extrapolation;
      const Token& state = values.Next("\"sane\" or \"outside-band\"");
      if (state.quoted || (state.text != kExtrapolationSane && state.text != kExtrapolationOutside)) {
        Fail(line.number, state.column,
             fmt::format("found {}, expected \"{}\" or \"{}\"", Describe(state),
                         kExtrapolationSane, kExtrapolationOutside));
      }
      x.sane = state.text == kExtrapolationSane;
      values.Word("below");
      x.min_cp_over_r_below = values.Number("the lowest Cp/R below the range");
      x.max_cp_over_r_below = values.Number("the highest Cp/R below the range");
      values.Word("above");
      x.min_cp_over_r_above = values.Number("the lowest Cp/R above the range");
      x.max_cp_over_r_above = values.Number("the highest Cp/R above the range");
    } else if (field == kFieldExtrapolationNote) {
      entry.quality.extrapolation.message = values.String("the extrapolation note");
    } else if (field == kFieldVerdict) {
      const Token& verdict = values.Next("\"pass\" or \"fail\"");
      if (verdict.quoted || (verdict.text != kVerdictPass && verdict.text != kVerdictFail)) {
        Fail(line.number, verdict.column,
             fmt::format("found {}, expected \"{}\" or \"{}\"", Describe(verdict), kVerdictPass,
                         kVerdictFail));
      }
      recorded_pass_ = verdict.text == kVerdictPass;
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
      entry.provenance.model_options = values.String("the model options");
    } else if (field == kFieldSource) {
      entry.provenance.source_file = values.String("the source file");
    } else {
      Fail(line.number, key.column,
           fmt::format("found unknown field \"{}\", expected one of composition, charge, phase, "
                       "temperatures-k, coefficients-low, coefficients-high, "
                       "formation-enthalpy-j-per-mol, reference-pressure-pa, grid-points, "
                       "cp-error, h-error, s-error, g-error, extrapolation, extrapolation-note, "
                       "verdict, failure, input-sha256, tool-version, model, source or end",
                       field));
    }
    values.Finish();
  }

  const std::string& text_;
  std::string file_;
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
  std::ifstream in(path, std::ios::binary);
  if (!in) throw Error(path + ": cannot open: " + std::strerror(errno));
  std::ostringstream content;
  content << in.rdbuf();
  if (in.bad()) throw Error(path + ": cannot read: " + std::strerror(errno));
  return ParseEntries(content.str(), path);
}

}  // namespace sevenfold

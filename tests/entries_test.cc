// SPDX-License-Identifier: MIT
// Tests of the entries module: the canonical layout, exact round trips, the precise error text of
// malformed files, and file reading and atomic writing.
#include <dirent.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <limits>
#include <sstream>
#include <string>
#include <vector>

#include <catch2/catch.hpp>

#include "core/atomic_file.h"
#include "core/constants.h"
#include "core/error.h"
#include "core/read_file.h"
#include "entries/entries.h"
#include "fit/polynomial.h"

namespace sevenfold {
namespace {

// Arbitrary serialisation test data: these numbers carry no physical claim beyond what the reader
// demands (finite curves, the formation enthalpy equal to H(298.15 K) of the coefficients). They
// include values whose shortest round-trip text is long (0.1 + 0.2), tiny and huge magnitudes, a
// subnormal and a negative zero, so the round trip is tested on the hard cases of double <-> text.
Entry SampleEntry() {
  Entry entry;
  entry.name = "CO";
  entry.composition = {{"C", 1}, {"O", 1}};
  entry.charge = 0;
  entry.polynomial.t_low_k = 200.0;
  entry.polynomial.t_mid_k = 1000.0;
  entry.polynomial.t_high_k = 6000.0;
  entry.polynomial.low = {3.5, 0.1 + 0.2, -5.0e-7, 2.4e-9, -1.4e-12, -14344.0, 3.75};
  entry.polynomial.high = {-0.0, 1.0e-300, 5e-324, 6.1e-11, -6.75e-15, -14151.5, 2.0 / 3.0};
  // H(298.15 K) of the low coefficients, as the reader requires.
  entry.formation_enthalpy_j_per_mol = constants::kGasConstant * constants::kReferenceTemperature *
                                       HOverRT(entry.polynomial.low, constants::kReferenceTemperature);
  entry.reference_pressure_pa = 100000.0;
  RangeQuality& lo = entry.quality.low_range;
  lo.num_points = 91;
  lo.max_cp_relative = 0.0012;
  lo.max_cp_error_t_k = 200.0;
  lo.rms_cp_relative = 0.0004;
  lo.max_h_over_rt = 0.0003;
  lo.max_h_error_t_k = 298.15;
  lo.rms_h_over_rt = 0.0001;
  lo.max_s_over_r = 0.0002;
  lo.max_s_error_t_k = 990.0;
  lo.rms_s_over_r = 0.0001;
  lo.max_g_over_rt = 0.0001;
  lo.max_g_error_t_k = 990.0;
  lo.rms_g_over_rt = 5e-5;
  RangeQuality& hi = entry.quality.high_range;
  hi.num_points = 121;
  hi.max_cp_relative = 0.0025;
  hi.max_cp_error_t_k = 6000.0;
  hi.rms_cp_relative = 0.001;
  hi.max_h_over_rt = 0.0004;
  hi.max_h_error_t_k = 1000.0;
  hi.rms_h_over_rt = 0.0002;
  hi.max_s_over_r = 0.0003;
  hi.max_s_error_t_k = 1000.0;
  hi.rms_s_over_r = 0.0001;
  hi.max_g_over_rt = 0.0002;
  hi.max_g_error_t_k = 1025.0;
  hi.rms_g_over_rt = 1.7976931348623157e308;  // the largest double
  ExtrapolationCheck& x = entry.quality.extrapolation;
  x.min_cp_over_r_below = 3.49;
  x.max_cp_over_r_below = 3.51;
  x.min_cp_over_r_above = 4.5;
  x.max_cp_over_r_above = 4.75;
  entry.provenance.input_sha256 = std::string(32, 'a') + std::string(32, '7');
  entry.provenance.tool_version = "0.1.0";
  entry.fit_settings.objective = FitObjective::kLeastSquares;
  entry.fit_settings.error_scales = {0.01, 0.003, 0.0025};
  entry.fit_settings.extrapolation_guard = {true, 1.5, 0.1};
  entry.fit_settings.t_mid_fixed = true;
  entry.fit_settings.continuous_second_derivative = true;
  entry.provenance.model_options = "rotor=quantum vibration=harmonic";
  entry.provenance.source_file = "species/co.yaml";
  return entry;
}

// The canonical text of SampleEntry() alone, line by line (numbers in the comments).
const char* const kSampleText =
    "sevenfold-entries 2\n"  // 1
    "# Fitted thermochemistry written by sevenfold; the format is described in docs/entries-format.md.\n"  // 2
    "\n"  // 3
    "\"CO\" record-version 2 field-lines 25\n"  // 4
    "  composition C 1 O 1\n"  // 5
    "  charge 0\n"  // 6
    "  phase gas\n"  // 7
    "  temperatures-k low 200 mid 1000 high 6000\n"  // 8
    "  coefficients-low 3.5 0.30000000000000004 -5e-07 2.4e-09 -1.4e-12 -14344 3.75\n"  // 9
    "  coefficients-high -0 1e-300 5e-324 6.1e-11 -6.75e-15 -14151.5 0.6666666666666666\n"  // 10
    "  formation-enthalpy-j-per-mol 276.0622659828193\n"  // 11
    "  reference-pressure-pa 100000\n"  // 12
    "  fit-objective least-squares\n"  // 13
    "  fit-error-scales cp 0.01 h 0.003 s 0.0025\n"  // 14
    "  extrapolation-guard factor 1.5 band 0.1\n"  // 15
    "  t-mid-choice fixed\n"  // 16
    "  cp-curvature-at-mid continuous\n"  // 17
    "  grid-points low 91 high 121\n"  // 18
    "  cp-error low max 0.0012 at-k 200 rms 0.0004 high max 0.0025 at-k 6000 rms 0.001\n"  // 19
    "  h-error low max 0.0003 at-k 298.15 rms 0.0001 high max 0.0004 at-k 1000 rms 0.0002\n"  // 20
    "  s-error low max 0.0002 at-k 990 rms 0.0001 high max 0.0003 at-k 1000 rms 0.0001\n"  // 21
    "  g-error low max 0.0001 at-k 990 rms 5e-05 high max 0.0002 at-k 1025 rms 1.7976931348623157e+308\n"  // 22
    "  extrapolation-cp-over-r sane below min 3.49 max 3.51 above min 4.5 max 4.75\n"  // 23
    "  form-limit not-evaluated\n"  // 24
    "  verdict pass\n"  // 25
    "  input-sha256 aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa77777777777777777777777777777777\n"  // 26
    "  tool-version \"0.1.0\"\n"  // 27
    "  model \"rotor=quantum vibration=harmonic\"\n"  // 28
    "  source \"species/co.yaml\"\n";  // 29

EntriesFile SampleFile() {
  EntriesFile file;
  file.entries.push_back(SampleEntry());
  return file;
}

// Replaces the first occurrence of `from` in `text` (which must be there) by `to`.
std::string Edit(std::string text, const std::string& from, const std::string& to) {
  const std::size_t at = text.find(from);
  REQUIRE(at != std::string::npos);
  return text.replace(at, from.size(), to);
}

bool SameBits(double a, double b) { return std::memcmp(&a, &b, sizeof a) == 0; }

// A fresh empty folder under the system's temporary folder.
std::string MakeScratchFolder() {
  const char* base = std::getenv("TMPDIR");
  std::string pattern = std::string(base && *base ? base : "/tmp") + "/sevenfold-entries-XXXXXX";
  std::vector<char> buffer(pattern.begin(), pattern.end());
  buffer.push_back('\0');
  REQUIRE(mkdtemp(buffer.data()) != nullptr);
  return buffer.data();
}

std::vector<std::string> FolderContents(const std::string& folder) {
  std::vector<std::string> names;
  DIR* dir = opendir(folder.c_str());
  REQUIRE(dir != nullptr);
  while (const dirent* item = readdir(dir)) {
    const std::string name = item->d_name;
    if (name != "." && name != "..") names.push_back(name);
  }
  closedir(dir);
  return names;
}

std::string ReadWhole(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream content;
  content << in.rdbuf();
  return content.str();
}

}  // namespace

TEST_CASE("entries are written in the canonical layout", "[entries]") {
  CHECK(FormatEntries(SampleFile()) == kSampleText);
  CHECK(FormatEntries(EntriesFile{}) ==
        "sevenfold-entries 2\n# Fitted thermochemistry written by sevenfold; the format is "
        "described in docs/entries-format.md.\n");
}

TEST_CASE("writing, reading and writing again gives identical bytes and doubles", "[entries]") {
  EntriesFile file = SampleFile();
  Entry failing = SampleEntry();
  failing.name = "N2+ (excited \"A\" state)\tπ";  // quotes, a tab and UTF-8 in a name
  failing.composition = {{"N", 2}};
  failing.charge = 1;
  failing.quality.threshold_failures = {"low range: max |dCp|/Cp = 0.71 % at 215 K exceeds 0.5 %",
                                        "high range: max |dS|/R = 0.0031 at 5000 K exceeds 0.002"};
  failing.quality.extrapolation.sane = false;
  failing.quality.extrapolation.message =
      "above the range: Cp/R = 1.8 at 9000 K is outside the sane band [2, 8.5]";
  failing.quality.form_limit = {true, 1.31, true, 300.0, 4500.0};
  failing.fit_settings = EntryFitSettings{};
  failing.fit_settings.extrapolation_guard.enabled = false;
  failing.provenance.model_options = "back\\slash\nnewline \x01 control";
  file.entries.push_back(failing);

  const std::string first = FormatEntries(file);
  const EntriesFile read = ParseEntries(first, "round.entries");
  const std::string second = FormatEntries(read);
  CHECK(second == first);

  REQUIRE(read.entries.size() == 2);
  CHECK(read.version == kEntriesFormatVersion);
  for (std::size_t i = 0; i < 2; ++i) {
    const Entry& a = file.entries[i];
    const Entry& b = read.entries[i];
    CHECK(b.name == a.name);
    CHECK(b.composition == a.composition);
    CHECK(b.charge == a.charge);
    for (int k = 0; k < 7; ++k) {
      CHECK(SameBits(b.polynomial.low[k], a.polynomial.low[k]));
      CHECK(SameBits(b.polynomial.high[k], a.polynomial.high[k]));
    }
    CHECK(SameBits(b.polynomial.t_mid_k, a.polynomial.t_mid_k));
    CHECK(b.formation_enthalpy_j_per_mol == a.formation_enthalpy_j_per_mol);
    CHECK(b.reference_pressure_pa == a.reference_pressure_pa);
    CHECK(b.quality.low_range.rms_g_over_rt == a.quality.low_range.rms_g_over_rt);
    CHECK(b.quality.high_range.num_points == a.quality.high_range.num_points);
    CHECK(b.quality.extrapolation.sane == a.quality.extrapolation.sane);
    CHECK(b.quality.extrapolation.message == a.quality.extrapolation.message);
    CHECK(b.quality.MeetsThresholds() == a.quality.MeetsThresholds());
    CHECK(b.quality.threshold_failures == a.quality.threshold_failures);
    CHECK(b.provenance.input_sha256 == a.provenance.input_sha256);
    CHECK(b.provenance.model_options == a.provenance.model_options);
    CHECK(b.provenance.source_file == a.provenance.source_file);
    CHECK(b.fit_settings.objective == a.fit_settings.objective);
    CHECK(b.fit_settings.error_scales.s_over_r == a.fit_settings.error_scales.s_over_r);
    CHECK(b.fit_settings.extrapolation_guard.enabled == a.fit_settings.extrapolation_guard.enabled);
    CHECK(b.fit_settings.extrapolation_guard.factor == a.fit_settings.extrapolation_guard.factor);
    CHECK(b.fit_settings.t_mid_fixed == a.fit_settings.t_mid_fixed);
    CHECK(b.fit_settings.continuous_second_derivative ==
          a.fit_settings.continuous_second_derivative);
    CHECK(b.quality.form_limit.computed == a.quality.form_limit.computed);
    CHECK(b.quality.form_limit.AtFormLimit() == a.quality.form_limit.AtFormLimit());
    CHECK(b.quality.form_limit.best_threshold_ratio == a.quality.form_limit.best_threshold_ratio);
    CHECK(b.quality.form_limit.passing_t_high_k == a.quality.form_limit.passing_t_high_k);
  }
  CHECK(read.entries[1].location.ToString() == "round.entries:31:1");
  CHECK(first.find("  form-limit at-limit best-threshold-ratio 1.31 widest-passing-range-k low 300 "
                   "high 4500\n") != std::string::npos);
  CHECK(first.find("  extrapolation-guard off\n") != std::string::npos);
  CHECK(std::signbit(read.entries[0].polynomial.high[0]));  // -0 stays negative zero
}

TEST_CASE("comments, blank lines, CRLF and any field order are accepted", "[entries]") {
  std::string text = kSampleText;
  text = Edit(text, "  charge 0\n", "# a comment line\n\n  charge 0   # trailing comment\n");
  // Move the phase line to the end of the record; a blank line inside a record carries nothing.
  text = Edit(text, "  phase gas\n", "\n");
  text += "  phase gas\n";
  std::string crlf;
  for (char c : text) crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  CHECK(FormatEntries(ParseEntries(text, "t")) == kSampleText);
  CHECK(FormatEntries(ParseEntries(crlf, "t")) == kSampleText);
}

TEST_CASE("the worked example of docs/entries-format.md reads back to itself", "[entries]") {
  // The document shows a complete file between the marker lines; keeping it readable and
  // canonical keeps the specification honest.
  const std::string doc = ReadWhole(std::string(SEVENFOLD_SOURCE_DIR) + "/docs/entries-format.md");
  const std::string begin_marker = "<!-- example begin -->\n```\n";
  const std::size_t begin = doc.find(begin_marker);
  REQUIRE(begin != std::string::npos);
  const std::size_t end = doc.find("```\n<!-- example end -->", begin);
  REQUIRE(end != std::string::npos);
  const std::string example = doc.substr(begin + begin_marker.size(), end - begin - begin_marker.size());
  const EntriesFile file = ParseEntries(example, "docs/entries-format.md");
  REQUIRE(file.entries.size() >= 1);
  CHECK(FormatEntries(file) == example);
  // The document works the evaluation at 298.15 K by hand; the same figures must come out of
  // polynomial.h. Quoted there to 4 decimals, hence half a unit of the last digit as tolerance.
  // H(298.15 K) equals the formation enthalpy because the fit pins it (docs/fitting.md).
  const Entry& entry = file.entries.front();
  constexpr double kR = constants::kGasConstant;
  constexpr double kT = constants::kReferenceTemperature;
  constexpr double kHalfLastDigit = 0.5e-4;
  CHECK(std::fabs(kR * CpOverR(entry.polynomial, kT) - 37.1534) <= kHalfLastDigit);
  CHECK(std::fabs(kR * SOverR(entry.polynomial, kT) - 213.7900) <= kHalfLastDigit);
  CHECK(std::fabs(kR * kT * HOverRT(entry.polynomial, kT) - entry.formation_enthalpy_j_per_mol) <=
        1e-9 * std::fabs(entry.formation_enthalpy_j_per_mol));
  CHECK(std::fabs(kR * CpOverR(entry.polynomial, 1500.0) - 58.0606) <= kHalfLastDigit);
}

TEST_CASE("malformed entries files are rejected with file:line:column, found and expected",
          "[entries]") {
  const std::string good = kSampleText;
  auto error_of = [](const std::string& text) -> std::string {
    try {
      ParseEntries(text, "bad.entries");
    } catch (const Error& error) {
      return error.what();
    }
    return "no error";
  };

  SECTION("wrong version") {
    CHECK(error_of(Edit(good, "sevenfold-entries 2", "sevenfold-entries 3")) ==
          "bad.entries:1:19: found format version 3, expected 2 (the version this build reads)");
  }
  SECTION("the record layout of version 1 is refused with a message naming the change") {
    const std::string old =
        "sevenfold-entries 1\n\nspecies \"CO\"\n  composition C 1 O 1\nend\n";
    CHECK_THAT(error_of(old),
               Catch::StartsWith("bad.entries:1:19: found format version 1, whose records are "
                                 "\"species NAME\" ... \"end\" blocks; expected 2"));
    CHECK_THAT(error_of(Edit(good, "\"CO\" record-version 2 field-lines 25", "species \"CO\"")),
               Catch::StartsWith("bad.entries:4:1: found \"species\" at the left margin: the "
                                 "\"species NAME\" ... \"end\" blocks of format version 1 were "
                                 "replaced in version 2"));
    CHECK_THAT(error_of(good + "end\n"),
               Catch::StartsWith("bad.entries:30:1: found \"end\" at the left margin: the "
                                 "\"species NAME\" ... \"end\" blocks"));
  }
  SECTION("wrong header") {
    CHECK(error_of(Edit(good, "sevenfold-entries 2", "thermo entries")) ==
          "bad.entries:1:1: found \"thermo\", expected the header \"sevenfold-entries 2\"");
    CHECK(error_of("") ==
          "bad.entries:1:1: found end of file, expected the header \"sevenfold-entries 2\"");
    CHECK(error_of(Edit(good, "sevenfold-entries 2", "sevenfold-entries one")) ==
          "bad.entries:1:19: found \"one\", expected an integer (the format version)");
  }
  SECTION("record header") {
    CHECK(error_of(Edit(good, "record-version 2", "record-version 1")) ==
          "bad.entries:4:21: found record-version 1 in record \"CO\", expected 2 (the format "
          "version of this file)");
    CHECK(error_of(Edit(good, "field-lines 25", "field-lines 0")) ==
          "bad.entries:4:35: found field-lines 0, expected a count from 1 to 1000");
    CHECK(error_of(Edit(good, "\"CO\" record-version", "CO record-version")) ==
          "bad.entries:4:1: found \"CO\" at the left margin, expected a record header \"NAME\" "
          "record-version 2 field-lines N (field lines are indented)");
  }
  SECTION("truncated record") {
    CHECK(error_of(good.substr(0, good.find("  model"))) ==
          "bad.entries:28:1: found end of file after 23 of the 25 field lines of record \"CO\" "
          "(header at line 4), expected 25 (a truncated file?)");
    const std::string record = good.substr(good.find("\"CO\""));
    CHECK(error_of(good.substr(0, good.find("  model")) + Edit(record, "\"CO\"", "\"N2\"")) ==
          "bad.entries:28:1: found the string \"N2\" at the left margin after 23 of the 25 field "
          "lines of record \"CO\" (header at line 4), expected the remaining field lines, "
          "indented");
    CHECK(error_of(good + "  phase gas\n") ==
          "bad.entries:30:3: found field line 26 of record \"CO\" whose header (line 4) states "
          "25, expected a record header at the left margin");
  }
  SECTION("missing field") {
    CHECK(error_of(Edit(Edit(good, "  charge 0\n", ""), "field-lines 25", "field-lines 24")) ==
          "bad.entries:4:1: found record \"CO\" without a \"charge\" line, expected one");
  }
  SECTION("non-numeric number") {
    CHECK(error_of(Edit(good, "-5e-07", "-5e-07x")) ==
          "bad.entries:9:44: found \"-5e-07x\", expected a number (coefficient a3)");
    CHECK(error_of(Edit(good, "reference-pressure-pa 100000", "reference-pressure-pa \"1e5\"")) ==
          "bad.entries:12:25: found the string \"1e5\", expected a number (the reference "
          "pressure in Pa)");
    CHECK(error_of(Edit(good, "charge 0", "charge +1")) ==
          "bad.entries:6:10: found \"+1\", expected an integer (the charge)");
  }
  SECTION("NaN and infinity") {
    CHECK(error_of(Edit(good, "3.75\n", "nan\n")) ==
          "bad.entries:9:75: found \"nan\", expected a finite number (coefficient a7)");
    CHECK(error_of(Edit(good, "276.0622659828193", "inf")) ==
          "bad.entries:11:32: found \"inf\", expected a finite number (the formation enthalpy "
          "in J/mol)");
    CHECK(error_of(Edit(good, "276.0622659828193", "1e999")) ==
          "bad.entries:11:32: found \"1e999\", expected a finite number (the formation enthalpy "
          "in J/mol)");
  }
  SECTION("duplicate species") {
    const std::string record = good.substr(good.find("\"CO\""));
    CHECK(error_of(good + "\n" + record) ==
          "bad.entries:31:1: found species \"CO\" a second time (first at line 4), expected each "
          "species once");
  }
  SECTION("duplicate field") {
    CHECK(error_of(Edit(Edit(good, "  phase gas\n", "  phase gas\n  phase gas\n"),
                        "field-lines 25", "field-lines 26")) ==
          "bad.entries:8:3: found a second \"phase\" line in species \"CO\" (first at line 7), "
          "expected each field once");
  }
  SECTION("unknown field") {
    CHECK(error_of(Edit(good, "  charge 0\n", "  colour blue\n")) ==
          "bad.entries:6:3: found unknown field \"colour\", expected one of composition, charge, "
          "phase, temperatures-k, coefficients-low, coefficients-high, "
          "formation-enthalpy-j-per-mol, reference-pressure-pa, fit-objective, fit-error-scales, "
          "extrapolation-guard, t-mid-choice, cp-curvature-at-mid, grid-points, cp-error, "
          "h-error, s-error, g-error, extrapolation-cp-over-r, extrapolation-note, form-limit, "
          "verdict, failure, input-sha256, tool-version, model, source");
  }
  SECTION("missing and extra values") {
    CHECK(error_of(Edit(good, " 3.75\n", "\n")) ==
          "bad.entries:9:74: found end of line, expected a number (coefficient a7)");
    CHECK(error_of(Edit(good, "charge 0", "charge 0 0")) ==
          "bad.entries:6:12: found \"0\", expected end of line");
    CHECK(error_of(Edit(good, "low max 0.0012", "low maximum 0.0012")) ==
          "bad.entries:19:16: found \"maximum\", expected \"max\"");
  }
  SECTION("values out of their domain") {
    CHECK(error_of(Edit(good, "low 200 mid 1000", "low 1000 mid 200")) ==
          "bad.entries:8:22: found temperatures 1000 200 6000 K, expected low < mid < high");
    CHECK(error_of(Edit(good, "high 6000", "high 1e12")) ==
          "bad.entries:8:40: found 1e12 (the high temperature), expected a temperature within "
          "[10, 20000] K (the engine's range)");
    CHECK(error_of(Edit(good, "phase gas", "phase liquid")) ==
          "bad.entries:7:9: found \"liquid\", expected \"gas\" (the only phase of format version "
          "2)");
    CHECK(error_of(Edit(good, "composition C 1", "composition c 1")) ==
          "bad.entries:5:15: found \"c\", expected the symbol of a known element such as C or Cl");
    CHECK(error_of(Edit(good, "composition C 1", "composition Xx 1")) ==
          "bad.entries:5:15: found \"Xx\", expected the symbol of a known element such as C or "
          "Cl");
    CHECK(error_of(Edit(good, "composition C 1 O 1", "composition C 1 C 1")) ==
          "bad.entries:5:19: found element C a second time, expected each element once");
    CHECK(error_of(Edit(good, "composition C 1", "composition C 0")) ==
          "bad.entries:5:17: found count 0 of C, expected a positive count of at most 1000");
    CHECK(error_of(Edit(good, "charge 0", "charge 101")) ==
          "bad.entries:6:10: found charge 101, expected a charge within [-100, 100]");
    CHECK(error_of(Edit(good, "reference-pressure-pa 100000", "reference-pressure-pa 1e-300")) ==
          "bad.entries:12:25: found 1e-300 Pa, expected a standard pressure: 100000 (1 bar) or "
          "101325 (1 atm)");
    CHECK(error_of(Edit(good, "grid-points low 91", "grid-points low -1")) ==
          "bad.entries:18:19: found -1 grid points, expected a non-negative count");
    CHECK(error_of(Edit(good, "factor 1.5", "factor 0.5")) ==
          "bad.entries:15:30: found factor 0.5 band 0.1, expected 1 < factor <= 4 and 0 < band "
          "<= 1");
    CHECK(error_of(Edit(good, "fit-objective least-squares", "fit-objective median")) ==
          "bad.entries:13:17: found \"median\", expected \"minimax\" or \"least-squares\"");
    CHECK(error_of(Edit(good, "input-sha256 aaaa", "input-sha256 Aaaa")) ==
          "bad.entries:26:16: found \"Aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa77777777777777777777777777777777\", "
          "expected 64 lowercase hexadecimal digits");
    CHECK(error_of(Edit(good, "form-limit not-evaluated",
                        "form-limit reachable best-threshold-ratio 1.5 widest-passing-range-k none")) ==
          "bad.entries:24:45: found best-threshold-ratio 1.5 with \"reachable\", expected "
          "\"at-limit\" exactly when the ratio exceeds 1");
  }
  SECTION("curves that are not finite or disagree with the formation enthalpy") {
    CHECK(error_of(Edit(good, "6.1e-11", "1e300")) ==
          "bad.entries:10:1: found coefficients of species \"CO\" whose Cp, H or S is not finite "
          "at 1000 K, expected finite values across the range");
    CHECK_THAT(error_of(Edit(good, "276.0622659828193", "-110530")),
               Catch::StartsWith("bad.entries:11:1: found formation enthalpy -110530 J/mol in "
                                 "species \"CO\" but H(298.15 K) = 276.06226598"));
  }
  SECTION("verdict disagrees with the failure lines") {
    CHECK(error_of(Edit(good, "verdict pass", "verdict fail")) ==
          "bad.entries:25:3: found verdict \"fail\" in species \"CO\" without any \"failure\" "
          "line, expected at least one");
    CHECK(error_of(Edit(Edit(good, "  verdict pass\n", "  verdict pass\n  failure \"x\"\n"),
                        "field-lines 25", "field-lines 26")) ==
          "bad.entries:26:3: found a \"failure\" line in species \"CO\" whose verdict is "
          "\"pass\", expected none");
  }
  SECTION("broken strings and text") {
    CHECK(error_of(Edit(good, "\"0.1.0\"", "\"0.1.0")) ==
          "bad.entries:27:22: found end of line inside a quoted string, expected a closing \"");
    CHECK(error_of(Edit(good, "\"0.1.0\"", "\"0.\\q\"")) ==
          "bad.entries:27:19: found the escape \"\\q\", expected one of \\\\ \\\" \\n \\t \\r "
          "\\xHH");
    CHECK(error_of(Edit(good, "\"0.1.0\"", "0.1.0")) ==
          "bad.entries:27:16: found \"0.1.0\", expected the tool version in double quotes");
    CHECK(error_of(Edit(good, "species/co.yaml", "species/\xff.yaml")) ==
          "bad.entries:29:19: found the byte 0xff, which is not valid UTF-8, expected UTF-8 text");
    // A surrogate (ED A0 80) and an overlong form (E0 80 AF), refused as the species reader
    // refuses them (Unicode Standard, table 3-7), and a noncharacter (U+FFFF, EF BF BF).
    CHECK(error_of(Edit(good, "species/co.yaml", "species/\xed\xa0\x80.yaml")) ==
          "bad.entries:29:19: found the byte 0xed, which is not valid UTF-8, expected UTF-8 text");
    CHECK(error_of(Edit(good, "species/co.yaml", "species/\xe0\x80\xaf.yaml")) ==
          "bad.entries:29:19: found the byte 0xe0, which is not valid UTF-8, expected UTF-8 text");
    CHECK(error_of(Edit(good, "species/co.yaml", "species/\xef\xbf\xbf.yaml")) ==
          "bad.entries:29:19: found the byte 0xef, which starts a Unicode noncharacter, expected "
          "UTF-8 text");
    CHECK(error_of(Edit(good, "\"CO\" record", "CO record")) ==
          "bad.entries:4:1: found \"CO\" at the left margin, expected a record header \"NAME\" "
          "record-version 2 field-lines N (field lines are indented)");
  }
  SECTION("text outside a record") {
    CHECK(error_of(Edit(good, "\n\"CO\"", "\n  charge 0\n\"CO\"")) ==
          "bad.entries:4:3: found the indented line \"charge\" outside any record, expected a "
          "record header at the left margin (\"NAME\" record-version 2 field-lines N)");
  }
  SECTION("a text above the size cap") {
    CHECK_THAT(error_of(good + std::string(kMaxInputFileBytes, '#')),
               Catch::EndsWith("found a text larger than 16 MiB, refused before parsing; "
                               "expected at most 16 MiB"));
  }
}

TEST_CASE("entries files are written atomically and read back", "[entries]") {
  const std::string folder = MakeScratchFolder();
  const std::string path = folder + "/mechanism.entries";
  WriteFileAtomically(path, FormatEntries(SampleFile()));
  CHECK(ReadWhole(path) == kSampleText);
  // Replacing keeps one file and leaves no temporary behind.
  WriteFileAtomically(path, kSampleText);
  CHECK(FolderContents(folder) == std::vector<std::string>{"mechanism.entries"});

  const EntriesFile read = ReadEntriesFile(path);
  REQUIRE(read.entries.size() == 1);
  CHECK(read.entries[0].location.ToString() == path + ":4:1");
  CHECK(FormatEntries(read) == kSampleText);

  CHECK_THROWS_WITH(ReadEntriesFile(folder + "/missing.entries"),
                    folder + "/missing.entries: cannot open entries file: No such file or "
                             "directory; expected a readable file");
  CHECK_THROWS_WITH(WriteFileAtomically(folder + "/no/such/folder/x.entries", "x"),
                    folder + "/no/such/folder/x.entries: cannot create a temporary file beside "
                             "it: No such file or directory");
  // A folder in the way of the rename: the error names the path and the temporary is removed.
  const std::string blocker = folder + "/blocker";
  REQUIRE(mkdir(blocker.c_str(), 0755) == 0);
  REQUIRE(mkdir((blocker + "/inside").c_str(), 0755) == 0);
  CHECK_THROWS_WITH(WriteFileAtomically(blocker, "x"),
                    blocker + ": cannot replace: Is a directory");
  std::vector<std::string> left = FolderContents(folder);
  std::sort(left.begin(), left.end());
  CHECK(left == std::vector<std::string>{"blocker", "mechanism.entries"});

  rmdir((blocker + "/inside").c_str());
  rmdir(blocker.c_str());
  unlink(path.c_str());
  rmdir(folder.c_str());
}

TEST_CASE("entries that cannot be read back are refused by the writer", "[entries]") {
  EntriesFile file = SampleFile();
  file.entries[0].polynomial.low[2] = std::numeric_limits<double>::quiet_NaN();
  CHECK_THROWS_WITH(FormatEntries(file),
                    "cannot write entry \"CO\": coefficients-low: nan is not a finite number");
  file = SampleFile();
  file.entries[0].provenance.input_sha256 = "abc";
  CHECK_THROWS_WITH(FormatEntries(file),
                    "cannot write entry \"CO\": input-sha256: \"abc\" is not 64 lowercase "
                    "hexadecimal digits");
  file = SampleFile();
  file.entries.push_back(file.entries[0]);
  CHECK_THROWS_WITH(FormatEntries(file),
                    "cannot write entry \"CO\": the species appears twice");
  // Whatever the reader would refuse, the writer refuses: here a formation enthalpy that
  // H(298.15 K) of the coefficients contradicts, and a charge beyond the bounds.
  file = SampleFile();
  file.entries[0].formation_enthalpy_j_per_mol += 1000.0;
  CHECK_THROWS_WITH(FormatEntries(file),
                    Catch::StartsWith("cannot write the entries: the reader would refuse them: "
                                      "the written text:11:1: found formation enthalpy"));
  file = SampleFile();
  file.entries[0].charge = 1000;
  CHECK_THROWS_WITH(FormatEntries(file),
                    Catch::Contains("found charge 1000, expected a charge within [-100, 100]"));
}

}  // namespace sevenfold

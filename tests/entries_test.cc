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
#include "entries/entries.h"
#include "fit/polynomial.h"

namespace sevenfold {
namespace {

// Arbitrary serialisation test data: these numbers carry no physical claim. They include values
// whose shortest round-trip text is long (0.1 + 0.2), tiny and huge magnitudes, a subnormal and
// a negative zero, so the round trip is tested on the hard cases of double <-> text.
Entry SampleEntry() {
  Entry entry;
  entry.name = "CO";
  entry.composition = {{"C", 1}, {"O", 1}};
  entry.charge = 0;
  entry.polynomial.t_low_k = 200.0;
  entry.polynomial.t_mid_k = 1000.0;
  entry.polynomial.t_high_k = 6000.0;
  entry.polynomial.low = {3.5, 0.1 + 0.2, -5.0e-7, 2.4e-9, -1.4e-12, -14344.0, 3.75};
  entry.polynomial.high = {-0.0, 1.0e-300, 5e-324, 1.7976931348623157e308, -6.75e-15,
                           -14151.5, 2.0 / 3.0};
  entry.formation_enthalpy_j_per_mol = -110530.0;
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
  hi.rms_g_over_rt = 6e-5;
  ExtrapolationCheck& x = entry.quality.extrapolation;
  x.min_cp_over_r_below = 3.49;
  x.max_cp_over_r_below = 3.51;
  x.min_cp_over_r_above = 4.5;
  x.max_cp_over_r_above = 4.75;
  entry.provenance.input_sha256 = std::string(32, 'a') + std::string(32, '7');
  entry.provenance.tool_version = "0.1.0";
  entry.provenance.model_options = "rotor=quantum vibration=harmonic t_mid=auto";
  entry.provenance.source_file = "species/co.yaml";
  return entry;
}

// The canonical text of SampleEntry() alone, line by line (numbers in the comments).
const char* const kSampleText =
    "sevenfold-entries 1\n"  // 1
    "# Fitted thermochemistry written by sevenfold; the format is described in "
    "docs/entries-format.md.\n"  // 2
    "\n"  // 3
    "species \"CO\"\n"  // 4
    "  composition C 1 O 1\n"  // 5
    "  charge 0\n"  // 6
    "  phase gas\n"  // 7
    "  temperatures-k 200 1000 6000\n"  // 8
    "  coefficients-low 3.5 0.30000000000000004 -5e-07 2.4e-09 -1.4e-12 -14344 3.75\n"  // 9
    "  coefficients-high -0 1e-300 5e-324 1.7976931348623157e+308 -6.75e-15 -14151.5 "
    "0.6666666666666666\n"  // 10
    "  formation-enthalpy-j-per-mol -110530\n"  // 11
    "  reference-pressure-pa 100000\n"  // 12
    "  grid-points low 91 high 121\n"  // 13
    "  cp-error low max 0.0012 at-k 200 rms 0.0004 high max 0.0025 at-k 6000 rms 0.001\n"  // 14
    "  h-error low max 0.0003 at-k 298.15 rms 0.0001 high max 0.0004 at-k 1000 rms 0.0002\n"
    "  s-error low max 0.0002 at-k 990 rms 0.0001 high max 0.0003 at-k 1000 rms 0.0001\n"
    "  g-error low max 0.0001 at-k 990 rms 5e-05 high max 0.0002 at-k 1025 rms 6e-05\n"  // 17
    "  extrapolation sane below 3.49 3.51 above 4.5 4.75\n"  // 18
    "  verdict pass\n"  // 19
    "  input-sha256 aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa77777777777777777777777777777777\n"  // 20
    "  tool-version \"0.1.0\"\n"  // 21
    "  model \"rotor=quantum vibration=harmonic t_mid=auto\"\n"  // 22
    "  source \"species/co.yaml\"\n"  // 23
    "end\n";  // 24

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
        "sevenfold-entries 1\n# Fitted thermochemistry written by sevenfold; the format is "
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
  }
  CHECK(read.entries[1].location.ToString() == "round.entries:26:1");
  CHECK(std::signbit(read.entries[0].polynomial.high[0]));  // -0 stays negative zero
}

TEST_CASE("comments, blank lines, CRLF and any field order are accepted", "[entries]") {
  std::string text = kSampleText;
  text = Edit(text, "  charge 0\n", "# a comment line\n\n  charge 0   # trailing comment\n");
  // Move the phase line to the end of the block.
  text = Edit(text, "  phase gas\n", "");
  text = Edit(text, "end\n", "  phase gas\nend\n");
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
    CHECK(error_of(Edit(good, "sevenfold-entries 1", "sevenfold-entries 2")) ==
          "bad.entries:1:19: found format version 2, expected 1 (the version this build reads)");
  }
  SECTION("wrong header") {
    CHECK(error_of(Edit(good, "sevenfold-entries 1", "thermo entries")) ==
          "bad.entries:1:1: found \"thermo\", expected the header \"sevenfold-entries 1\"");
    CHECK(error_of("") ==
          "bad.entries:1:1: found end of file, expected the header \"sevenfold-entries 1\"");
    CHECK(error_of(Edit(good, "sevenfold-entries 1", "sevenfold-entries one")) ==
          "bad.entries:1:19: found \"one\", expected an integer (the format version)");
  }
  SECTION("truncated block") {
    CHECK(error_of(good.substr(0, good.find("  model"))) ==
          "bad.entries:22:1: found end of file inside the block of species \"CO\" (opened at "
          "line 4), expected \"end\"");
    CHECK(error_of(Edit(good, "end\n", "") + good.substr(good.find("species"))) ==
          "bad.entries:24:1: found \"species\" inside the block of species \"CO\" (opened at "
          "line 4), expected \"end\" first");
  }
  SECTION("missing field") {
    CHECK(error_of(Edit(good, "  charge 0\n", "")) ==
          "bad.entries:23:1: found \"end\" but species \"CO\" has no \"charge\" line, expected "
          "one before \"end\"");
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
    CHECK(error_of(Edit(good, "-110530", "inf")) ==
          "bad.entries:11:32: found \"inf\", expected a finite number (the formation enthalpy "
          "in J/mol)");
    CHECK(error_of(Edit(good, "-110530", "1e999")) ==
          "bad.entries:11:32: found \"1e999\", expected a finite number (the formation enthalpy "
          "in J/mol)");
  }
  SECTION("duplicate species") {
    const std::string block = good.substr(good.find("species"));
    CHECK(error_of(good + "\n" + block) ==
          "bad.entries:26:9: found species \"CO\" a second time (first at line 4), expected each "
          "species once");
  }
  SECTION("duplicate field") {
    CHECK(error_of(Edit(good, "  phase gas\n", "  phase gas\n  phase gas\n")) ==
          "bad.entries:8:3: found a second \"phase\" line in species \"CO\" (first at line 7), "
          "expected each field once");
  }
  SECTION("unknown field") {
    CHECK(error_of(Edit(good, "  charge 0\n", "  colour blue\n")) ==
          "bad.entries:6:3: found unknown field \"colour\", expected one of composition, charge, "
          "phase, temperatures-k, coefficients-low, coefficients-high, "
          "formation-enthalpy-j-per-mol, reference-pressure-pa, grid-points, cp-error, h-error, "
          "s-error, g-error, extrapolation, extrapolation-note, verdict, failure, input-sha256, "
          "tool-version, model, source or end");
  }
  SECTION("missing and extra values") {
    CHECK(error_of(Edit(good, " 3.75\n", "\n")) ==
          "bad.entries:9:74: found end of line, expected a number (coefficient a7)");
    CHECK(error_of(Edit(good, "charge 0", "charge 0 0")) ==
          "bad.entries:6:12: found \"0\", expected end of line");
    CHECK(error_of(Edit(good, "low max 0.0012", "low maximum 0.0012")) ==
          "bad.entries:14:16: found \"maximum\", expected \"max\"");
  }
  SECTION("values out of their domain") {
    CHECK(error_of(Edit(good, "200 1000 6000", "1000 200 6000")) ==
          "bad.entries:8:18: found temperatures 1000 200 6000 K, expected 0 < low < mid < high");
    CHECK(error_of(Edit(good, "phase gas", "phase liquid")) ==
          "bad.entries:7:9: found \"liquid\", expected \"gas\" (the only phase of format version "
          "1)");
    CHECK(error_of(Edit(good, "composition C 1", "composition c 1")) ==
          "bad.entries:5:15: found \"c\", expected an element symbol such as C or Cl");
    CHECK(error_of(Edit(good, "composition C 1", "composition C 0")) ==
          "bad.entries:5:17: found count 0 of C, expected a positive count");
    CHECK(error_of(Edit(good, "input-sha256 aaaa", "input-sha256 Aaaa")) ==
          "bad.entries:20:16: found \"Aaaaaaaaaaaaaaaaaaaaaaaaaaaaaaaa77777777777777777777777777777777\", "
          "expected 64 lowercase hexadecimal digits");
  }
  SECTION("verdict disagrees with the failure lines") {
    CHECK(error_of(Edit(good, "verdict pass", "verdict fail")) ==
          "bad.entries:19:3: found verdict \"fail\" in species \"CO\" without any \"failure\" "
          "line, expected at least one");
    CHECK(error_of(Edit(good, "  verdict pass\n", "  verdict pass\n  failure \"x\"\n")) ==
          "bad.entries:20:3: found a \"failure\" line in species \"CO\" whose verdict is "
          "\"pass\", expected none");
  }
  SECTION("broken strings and text") {
    CHECK(error_of(Edit(good, "\"0.1.0\"", "\"0.1.0")) ==
          "bad.entries:21:22: found end of line inside a quoted string, expected a closing \"");
    CHECK(error_of(Edit(good, "\"0.1.0\"", "\"0.\\q\"")) ==
          "bad.entries:21:19: found the escape \"\\q\", expected one of \\\\ \\\" \\n \\t \\r "
          "\\xHH");
    CHECK(error_of(Edit(good, "\"0.1.0\"", "0.1.0")) ==
          "bad.entries:21:16: found \"0.1.0\", expected the tool version in double quotes");
    CHECK(error_of(Edit(good, "species/co.yaml", "species/\xff.yaml")) ==
          "bad.entries:23:19: found the byte 0xff, which does not start valid UTF-8, expected "
          "UTF-8 text");
    CHECK(error_of(Edit(good, "species \"CO\"", "species CO")) ==
          "bad.entries:4:9: found \"CO\", expected the species name in double quotes");
  }
  SECTION("text outside a block") {
    CHECK(error_of(good + "charge 0\n") ==
          "bad.entries:25:1: found \"charge\", expected \"species\" to open a block");
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
                    folder + "/missing.entries: cannot open: No such file or directory");
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
}

}  // namespace sevenfold

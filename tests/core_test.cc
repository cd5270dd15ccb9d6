// SPDX-License-Identifier: MIT
// Tests of the core helpers: quantities with units, atomic weights, SHA-256, output files and
// output text.
#include <fcntl.h>
#include <signal.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>

#include "core/atomic_file.h"
#include "core/constants.h"
#include "core/digest.h"
#include "core/elements.h"
#include "core/error.h"
#include "core/read_file.h"
#include "core/output_text.h"
#include "core/parallel.h"
#include "core/units.h"
#include "core/utf8.h"

namespace sevenfold {
namespace {

// Unit conversions are products of exactly defined constants: agreement to a few ulps.
constexpr double kConversionRelativeTolerance = 1.0e-14;
// Reference conversion factors below are quoted to 10 significant figures.
constexpr double kQuotedTenFiguresTolerance = 1.0e-9;

const SourceLocation kWhere{"input.yaml", 3, 7};

}  // namespace

TEST_CASE("energies with units convert to joules per mole", "[core]") {
  using Catch::Matchers::WithinRel;
  CHECK_THAT(ParseEnergyJPerMol("-110.53 kJ/mol", kWhere),
             WithinRel(-110530.0, kConversionRelativeTolerance));
  // Thermochemical calorie = 4.184 J exactly (NIST SP 811, 2008, appendix B.8).
  CHECK_THAT(ParseEnergyJPerMol("1 kcal/mol", kWhere),
             WithinRel(4184.0, kConversionRelativeTolerance));
  CHECK_THAT(ParseEnergyJPerMol("250 J/mol", kWhere),
             WithinRel(250.0, kConversionRelativeTolerance));
  // 1 eV per molecule = F x 1 V = 96485.33212 J/mol (CODATA 2018 Faraday constant, exact).
  CHECK_THAT(ParseEnergyJPerMol("1 eV", kWhere),
             WithinRel(96485.33212, kQuotedTenFiguresTolerance));
  // 1 cm^-1 = N_A h c: CODATA 2018 molar Planck constant N_A h = 3.990312712e-10 J s/mol (exact,
  // quoted to 10 figures; from memory) times c = 2.99792458e10 cm/s.
  CHECK_THAT(ParseEnergyJPerMol("1 cm^-1", kWhere),
             WithinRel(3.990312712e-10 * 2.99792458e10, kQuotedTenFiguresTolerance));
  // A bare number means kJ/mol (project convention, docs/species-schema.md).
  CHECK_THAT(ParseEnergyJPerMol("-393.51", kWhere),
             WithinRel(-393510.0, kConversionRelativeTolerance));
  CHECK_THAT(ParseEnergyJPerMol("  +2.5e1kJ/mol ", kWhere),
             WithinRel(25000.0, kConversionRelativeTolerance));
}

TEST_CASE("pressures with units convert to pascal", "[core]") {
  using Catch::Matchers::WithinRel;
  // 1 atm = 101325 Pa and 1 bar = 1e5 Pa, both exact by definition (NIST SP 811, 2008).
  CHECK_THAT(ParsePressurePa("1 atm", kWhere), WithinRel(101325.0, kConversionRelativeTolerance));
  CHECK_THAT(ParsePressurePa("1 bar", kWhere), WithinRel(1.0e5, kConversionRelativeTolerance));
  CHECK_THAT(ParsePressurePa("101.325 kPa", kWhere),
             WithinRel(101325.0, kConversionRelativeTolerance));
  CHECK_THAT(ParsePressurePa("5 Pa", kWhere), WithinRel(5.0, kConversionRelativeTolerance));
  CHECK_THAT(ParsePressurePa("2", kWhere), WithinRel(2.0e5, kConversionRelativeTolerance));
}

TEST_CASE("an unknown unit is rejected with the text, the location and the accepted units",
          "[core]") {
  REQUIRE_THROWS_WITH(ParseEnergyJPerMol("-110.53 kJ", kWhere),
                      Catch::StartsWith("input.yaml:3:7: '-110.53 kJ' has unknown unit 'kJ'") &&
                          Catch::Contains("kJ/mol, kcal/mol, J/mol, eV, cm^-1") &&
                          Catch::Contains("a bare number means kJ/mol"));
  REQUIRE_THROWS_WITH(ParsePressurePa("1 torr", kWhere),
                      Catch::StartsWith("input.yaml:3:7: '1 torr' has unknown unit 'torr'") &&
                          Catch::Contains("bar, atm, Pa, kPa"));
  REQUIRE_THROWS_AS(ParseEnergyJPerMol("kJ/mol", kWhere), Error);
  REQUIRE_THROWS_WITH(ParseEnergyJPerMol("abc", kWhere),
                      Catch::Contains("'abc' does not start with a number"));
}

TEST_CASE("non-finite and non-positive quantities are rejected", "[core]") {
  REQUIRE_THROWS_WITH(ParseEnergyJPerMol("inf kJ/mol", kWhere),
                      Catch::Contains("'inf kJ/mol' is not a finite number"));
  REQUIRE_THROWS_WITH(ParseEnergyJPerMol("nan", kWhere), Catch::Contains("is not a finite number"));
  REQUIRE_THROWS_WITH(ParseEnergyJPerMol("1e400 J/mol", kWhere), Catch::Contains("1e400"));
  REQUIRE_THROWS_WITH(ParsePressurePa("-1 bar", kWhere),
                      Catch::Contains("'-1 bar' is not positive"));
  REQUIRE_THROWS_WITH(ParsePressurePa("0", kWhere), Catch::Contains("is not positive"));
  CHECK_FALSE(ParsePlainNumber("1.5x").has_value());
  CHECK_FALSE(ParsePlainNumber("").has_value());
  CHECK(ParsePlainNumber(" -2.5e-3 ").value() == -2.5e-3);
}

TEST_CASE("atomic weights agree with the IUPAC table shipped in python3-ase", "[core]") {
  // tests/data/atomic_weights_ase_iupac2016.txt was generated from python3-ase (see its header).
  // Our values are the 2021 abridged ones, rounded to at most five significant figures: rounding
  // moves a value by at most 5e-5 relative (leading digit 1); the 2016 -> 2021 changes among our
  // elements (Ar: 39.948 -> conventional 39.95) are of the same size. Hence 1e-4 relative.
  constexpr double kAbridgedRelativeTolerance = 1.0e-4;
  std::ifstream file(std::string(SEVENFOLD_SOURCE_DIR) +
                     "/tests/data/atomic_weights_ase_iupac2016.txt");
  REQUIRE(file.good());
  std::set<std::string> seen;
  std::string line;
  while (std::getline(file, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    std::string symbol;
    double reference = 0.0;
    REQUIRE(static_cast<bool>(fields >> symbol >> reference));
    INFO("element " << symbol);
    const std::optional<double> ours = AtomicWeightGPerMol(symbol);
    REQUIRE(ours.has_value());
    CHECK_THAT(*ours, Catch::Matchers::WithinRel(reference, kAbridgedRelativeTolerance));
    seen.insert(symbol);
  }
  // Every element of our table (apart from the isotopes D and T) is covered by the reference file.
  for (const std::string& symbol : KnownElementSymbols()) {
    if (symbol == "D" || symbol == "T") continue;
    INFO("element " << symbol);
    CHECK(seen.count(symbol) == 1);
  }
  CHECK(seen.size() + 2 == KnownElementSymbols().size());
}

TEST_CASE("deuterium and tritium masses agree with CODATA nuclear masses plus an electron",
          "[core]") {
  // CODATA 2018 (from memory): A_r(d) = 2.013553212745, A_r(t) = 3.01550071621,
  // A_r(e) = 5.48579909065e-4. The atom is nucleus + electron - binding energy; 13.6 eV is
  // 1.46e-8 u. The CODATA digits quoted from memory limit the comparison to about 1e-9 u.
  constexpr double kBindingAmu = 13.6 / 931.49410242e6;  // eV / (u c^2 in eV), CODATA 2018
  constexpr double kIsotopeToleranceAmu = 1.0e-9;
  const double deuterium = 2.013553212745 + constants::kElectronMassInAmu - kBindingAmu;
  const double tritium = 3.01550071621 + constants::kElectronMassInAmu - kBindingAmu;
  CHECK(std::fabs(AtomicWeightGPerMol("D").value() - deuterium) < kIsotopeToleranceAmu);
  CHECK(std::fabs(AtomicWeightGPerMol("T").value() - tritium) < kIsotopeToleranceAmu);
}

TEST_CASE("unknown element symbols are not guessed", "[core]") {
  CHECK_FALSE(AtomicWeightGPerMol("Xx").has_value());
  CHECK_FALSE(AtomicWeightGPerMol("c").has_value());  // symbols are case-sensitive
  CHECK_FALSE(AtomicWeightGPerMol("CO").has_value());
  CHECK_FALSE(AtomicWeightGPerMol("Tc").has_value());  // no standard atomic weight
}

TEST_CASE("SHA-256 reproduces the FIPS 180-4 example messages", "[core]") {
  // NIST FIPS 180-4 examples (csrc.nist.gov "Examples with Intermediate Values", SHA-256):
  // one-block "abc", the empty message, the two-block 448-bit message; and the NIST test of
  // one million 'a'. Digests from memory, confirmed with coreutils sha256sum.
  CHECK(Sha256Hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(Sha256Hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  CHECK(Sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
        "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  CHECK(Sha256Hex(std::string(1000000, 'a')) ==
        "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

TEST_CASE("SHA-256 pads correctly at every block boundary", "[core]") {
  // Lengths around the padding edges (55/56 and 119/120 bytes: the length field fits or spills
  // into a new block; 63/64/65: a full block). Digests from coreutils sha256sum 9.1 on
  // `head -c N /dev/zero | tr '\0' a`.
  const std::pair<int, const char*> cases[] = {
      {55, "9f4390f8d30c2dd92ec9f095b65e2b9ae9b0a925a5258e241c9f1e910f734318"},
      {56, "b35439a4ac6f0948b6d6f9e3c6af0f5f590ce20f1bde7090ef7970686ec6738a"},
      {63, "7d3e74a05d7db15bce4ad9ec0658ea98e3f06eeecf16b4c6fff2da457ddc2f34"},
      {64, "ffe054fe7ae0cb6dc65c3af9b61d5209f439851db43d0ba5997337df154668eb"},
      {65, "635361c48bb9eab14198e76ea8ab7f1a41685d6ad62aa9146d301d4f17eb0ae0"},
      {119, "31eba51c313a5c08226adf18d4a359cfdfd8d2e816b13f4af952f7ea6584dcfb"},
      {120, "2f3d335432c70b580af0e8e1b3674a7c020d683aa5f73aaaedfdc55af904c21c"},
  };
  for (const auto& [length, digest] : cases) {
    INFO("length " << length);
    CHECK(Sha256Hex(std::string(length, 'a')) == digest);
  }
}

}  // namespace sevenfold

// The one UTF-8 validator of both readers. Byte sequences from the Unicode Standard, table 3-7
// (well-formed UTF-8 byte sequences), and section 23.7 (noncharacters).
TEST_CASE("the UTF-8 validator accepts well-formed text and locates the first bad byte",
          "[core]") {
  using sevenfold::FindUtf8Problem;
  using sevenfold::Utf8ProblemKind;
  CHECK_FALSE(FindUtf8Problem("plain ASCII\twith tab\r\nand lines\n").has_value());
  // U+00E9, U+03C0, U+20AC, U+1F600, U+10FFFD: 2-, 3- and 4-byte forms, the last plane's top.
  CHECK_FALSE(FindUtf8Problem("\xc3\xa9 \xcf\x80 \xe2\x82\xac \xf0\x9f\x98\x80 \xf4\x8f\xbf\xbd")
                  .has_value());
  struct Case {
    const char* text;
    Utf8ProblemKind kind;
    int column;
  };
  const Case cases[] = {
      {"ab\xed\xa0\x80", Utf8ProblemKind::kIllFormed, 3},     // surrogate U+D800
      {"ab\xe0\x80\xaf", Utf8ProblemKind::kIllFormed, 3},     // overlong form of '/'
      {"ab\xc0\xaf", Utf8ProblemKind::kIllFormed, 3},         // overlong 2-byte form
      {"ab\xf4\x90\x80\x80", Utf8ProblemKind::kIllFormed, 3}, // U+110000, above U+10FFFF
      {"ab\xf5\x80\x80\x80", Utf8ProblemKind::kIllFormed, 3}, // lead byte F5
      {"ab\x80", Utf8ProblemKind::kIllFormed, 3},             // stray continuation byte
      {"ab\xe2\x82", Utf8ProblemKind::kIllFormed, 3},         // sequence cut short
      {"ab\xef\xbf\xbf", Utf8ProblemKind::kNoncharacter, 3},  // U+FFFF
      {"ab\xef\xbf\xbe", Utf8ProblemKind::kNoncharacter, 3},  // U+FFFE
      {"ab\xef\xb7\x90", Utf8ProblemKind::kNoncharacter, 3},  // U+FDD0
      {"ab\xf0\x9f\xbf\xbf", Utf8ProblemKind::kNoncharacter, 3},  // U+1FFFF
      {"ab\x7f", Utf8ProblemKind::kControl, 3},               // DEL
      {"ab\x01", Utf8ProblemKind::kControl, 3},
  };
  for (const Case& c : cases) {
    INFO(c.text);
    const auto problem = FindUtf8Problem(c.text);
    REQUIRE(problem.has_value());
    CHECK(problem->kind == c.kind);
    CHECK(problem->line == 1);
    CHECK(problem->column == c.column);
    CHECK(problem->offset == 2);
  }
  // A raw NUL inside the text, on the third line, after a 2-byte character.
  const std::string with_nul = std::string("x\ny\n\xc3\xa9") + '\0';
  const auto nul = FindUtf8Problem(with_nul);
  REQUIRE(nul.has_value());
  CHECK(nul->kind == Utf8ProblemKind::kControl);
  CHECK(nul->byte == 0);
  CHECK(nul->line == 3);
  CHECK(nul->column == 2);
}

TEST_CASE("input files are read whole up to the 16 MiB cap", "[core]") {
  namespace fs = std::filesystem;
  const fs::path dir = fs::temp_directory_path() / "sevenfold_core_read_file";
  fs::create_directories(dir);
  const std::string small = (dir / "small.txt").string();
  std::ofstream(small, std::ios::binary) << std::string("abc\0def", 7);
  CHECK(sevenfold::ReadInputFile(small, "test file") == std::string("abc\0def", 7));
  // Exactly at the cap is accepted, one byte more is refused.
  const std::string at_cap = (dir / "at-cap.txt").string();
  std::ofstream(at_cap, std::ios::binary) << std::string(sevenfold::kMaxInputFileBytes, 'x');
  CHECK(sevenfold::ReadInputFile(at_cap, "test file").size() == sevenfold::kMaxInputFileBytes);
  std::ofstream(at_cap, std::ios::binary | std::ios::app) << 'x';
  CHECK_THROWS_WITH(sevenfold::ReadInputFile(at_cap, "test file"),
                    at_cap + ": test file is larger than 16 MiB, refused before parsing; "
                             "expected a file of at most 16 MiB");
  // An endless device is refused at the cap, not read forever.
  CHECK_THROWS_WITH(sevenfold::ReadInputFile("/dev/zero", "entries file"),
                    Catch::Contains("/dev/zero: entries file is larger than 16 MiB"));
  CHECK_THROWS_WITH(sevenfold::ReadInputFile((dir / "missing").string(), "entries file"),
                    (dir / "missing").string() + ": cannot open entries file: No such file or "
                                                 "directory; expected a readable file");
  fs::remove_all(dir);
}
namespace sevenfold {
namespace {

namespace fs = std::filesystem;

// A fresh folder under the system temporary directory, removed at the end of the test.
struct ScratchFolder {
  ScratchFolder() {
    static int counter = 0;
    path = fs::temp_directory_path() /
           ("sevenfold_core_" + std::to_string(getpid()) + "_" + std::to_string(++counter));
    fs::remove_all(path);
    fs::create_directories(path);
  }
  ~ScratchFolder() { fs::remove_all(path); }
  std::string File(const std::string& name) const { return (path / name).string(); }
  std::set<std::string> Listing() const {
    std::set<std::string> names;
    for (const auto& entry : fs::directory_iterator(path)) {
      names.insert(entry.path().filename().string());
    }
    return names;
  }
  fs::path path;
};

std::string Slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

void Put(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
}

mode_t ModeOf(const std::string& path) {
  struct stat info;
  REQUIRE(stat(path.c_str(), &info) == 0);
  return info.st_mode & 07777;
}

}  // namespace

TEST_CASE("a new output file honours the umask, a replaced one keeps its mode but no set-id bits",
          "[core]") {
  ScratchFolder folder;
  const mode_t old_mask = umask(027);
  WriteFileAtomically(folder.File("new.txt"), "new\n");
  umask(old_mask);
  CHECK(ModeOf(folder.File("new.txt")) == 0640);

  Put(folder.File("kept.txt"), "old\n");
  REQUIRE(chmod(folder.File("kept.txt").c_str(), 06751) == 0);
  const bool root = geteuid() == 0;
  if (root) REQUIRE(chown(folder.File("kept.txt").c_str(), 1234, 5678) == 0);
  WriteFileAtomically(folder.File("kept.txt"), "new\n");
  CHECK(Slurp(folder.File("kept.txt")) == "new\n");
  CHECK(ModeOf(folder.File("kept.txt")) == 0751);
  if (root) {
    struct stat info;
    REQUIRE(stat(folder.File("kept.txt").c_str(), &info) == 0);
    CHECK(info.st_uid == 1234u);
    CHECK(info.st_gid == 5678u);
  } else {
    WARN("not root: the owner and group check needs chown");
  }
  CHECK(folder.Listing() == std::set<std::string>{"new.txt", "kept.txt"});
}

TEST_CASE("outputs that are not regular files are written in place or refused, never replaced",
          "[core]") {
  ScratchFolder folder;
  // A character device: written in place, still a device afterwards.
  WriteFileAtomically("/dev/null", "discarded\n");
  struct stat info;
  REQUIRE(stat("/dev/null", &info) == 0);
  CHECK(S_ISCHR(info.st_mode));

  // A FIFO with a reader: the bytes arrive through it, and it stays a FIFO.
  const std::string fifo = folder.File("fifo");
  REQUIRE(mkfifo(fifo.c_str(), 0600) == 0);
  const int reader = open(fifo.c_str(), O_RDONLY | O_NONBLOCK);
  REQUIRE(reader >= 0);
  WriteFileAtomically(fifo, "through the pipe\n");
  char buffer[64] = {};
  CHECK(read(reader, buffer, sizeof buffer - 1) == 17);
  CHECK(std::string(buffer) == "through the pipe\n");
  close(reader);
  REQUIRE(lstat(fifo.c_str(), &info) == 0);
  CHECK(S_ISFIFO(info.st_mode));

  // A link to a regular file stays a link; its target gets the content.
  Put(folder.File("target.txt"), "old\n");
  fs::create_symlink(folder.File("target.txt"), folder.File("link.txt"));
  WriteFileAtomically(folder.File("link.txt"), "new\n");
  CHECK(fs::is_symlink(folder.File("link.txt")));
  CHECK(Slurp(folder.File("target.txt")) == "new\n");

  // A folder and a link to nothing are refused, and nothing is left behind.
  fs::create_directory(folder.File("folder"));
  CHECK_THROWS_WITH(WriteFileAtomically(folder.File("folder"), "x"),
                    Catch::Contains("folder: cannot replace: Is a directory"));
  fs::create_symlink(folder.File("missing"), folder.File("dangling"));
  CHECK_THROWS_WITH(WriteFileAtomically(folder.File("dangling"), "x"),
                    Catch::Contains("dangling: is a symbolic link to nothing"));
  CHECK(fs::is_symlink(folder.File("dangling")));
  CHECK(folder.Listing() ==
        std::set<std::string>{"fifo", "target.txt", "link.txt", "folder", "dangling"});
}

TEST_CASE("an output whose name is at the file system's limit gets a temporary that fits",
          "[core]") {
  ScratchFolder folder;
  const long name_max = pathconf(folder.path.c_str(), _PC_NAME_MAX);
  REQUIRE(name_max > 20);
  const std::string name = std::string(static_cast<size_t>(name_max) - 4, 'x') + ".txt";
  WriteFileAtomically(folder.File(name), "long\n");
  CHECK(Slurp(folder.File(name)) == "long\n");
  CHECK(folder.Listing() == std::set<std::string>{name});
}

TEST_CASE("a batch is all or nothing: a failure before the commit leaves every old file",
          "[core]") {
  ScratchFolder folder;
  Put(folder.File("a.txt"), "old a\n");
  Put(folder.File("b.txt"), "old b\n");
  fs::create_directory(folder.File("c"));
  {
    OutputBatch batch;
    batch.Add(folder.File("a.txt"), "new a\n");
    batch.Add(folder.File("b.txt"), "new b\n");
    CHECK(folder.Listing().size() == 5);  // two temporaries beside the old files
    CHECK_THROWS_WITH(batch.Add(folder.File("c"), "new c\n"), Catch::Contains("cannot replace"));
  }
  CHECK(Slurp(folder.File("a.txt")) == "old a\n");
  CHECK(Slurp(folder.File("b.txt")) == "old b\n");
  CHECK(folder.Listing() == std::set<std::string>{"a.txt", "b.txt", "c"});

  OutputBatch batch;
  batch.Add(folder.File("a.txt"), "new a\n");
  batch.Add(folder.File("b.txt"), "new b\n");
  batch.Commit();
  CHECK(Slurp(folder.File("a.txt")) == "new a\n");
  CHECK(Slurp(folder.File("b.txt")) == "new b\n");
  CHECK(folder.Listing() == std::set<std::string>{"a.txt", "b.txt", "c"});
}

TEST_CASE("pending temporaries are removed on request (as the signal handler does)", "[core]") {
  ScratchFolder folder;
  Put(folder.File("a.txt"), "old a\n");
  OutputBatch batch;
  batch.Add(folder.File("a.txt"), "new a\n");
  CHECK(folder.Listing().size() == 2);
  RemovePendingTemporaries();
  CHECK(folder.Listing() == std::set<std::string>{"a.txt"});
  CHECK(Slurp(folder.File("a.txt")) == "old a\n");
}

TEST_CASE("an output that is the same file as an input is refused", "[core]") {
  ScratchFolder folder;
  Put(folder.File("species.yaml"), "species: []\n");
  REQUIRE(link(folder.File("species.yaml").c_str(), folder.File("hard-link.yaml").c_str()) == 0);
  fs::create_symlink(folder.File("species.yaml"), folder.File("soft-link.yaml"));
  const std::vector<std::string> inputs = {folder.File("other.yaml"), folder.File("species.yaml")};
  CHECK_THROWS_WITH(RefuseOutputThatIsAnInput(folder.File("hard-link.yaml"), inputs),
                    Catch::Contains("hard-link.yaml: is the same file as the input") &&
                        Catch::Contains("species.yaml"));
  CHECK_THROWS(RefuseOutputThatIsAnInput(folder.File("soft-link.yaml"), inputs));
  Put(folder.File("out.entries"), "x\n");
  CHECK_THROWS(RefuseOutputThatIsAnInput(folder.File("out.entries"), {}, folder.File("out.entries")));
  CHECK_NOTHROW(RefuseOutputThatIsAnInput(folder.File("out.entries"), inputs));
  CHECK_NOTHROW(RefuseOutputThatIsAnInput(folder.File("missing.entries"), inputs));
}

}  // namespace sevenfold

namespace sevenfold {

TEST_CASE("errors stored per item are joined in item order and thrown once", "[core]") {
  CHECK_NOTHROW(ThrowJoinedErrors({"", "", ""}));
  CHECK_NOTHROW(ThrowJoinedErrors({}));
  CHECK_THROWS_WITH(ThrowJoinedErrors({"", "b.yaml:2:1: second", "", "a.yaml:9:1: fourth"}),
                    "b.yaml:2:1: second\na.yaml:9:1: fourth");
}

}  // namespace sevenfold

namespace sevenfold {

TEST_CASE("SIGINT while fit waits to write its output ends it with 130, writing nothing", "[core]") {
  // The output is a FIFO without a reader: fit computes, then blocks opening it (the kernel's
  // wait_for_partner), the place where the output would be written. SIGINT must end it with
  // 128 + 2 and leave nothing beside the FIFO (src/cli/interrupt.cc).
  ScratchFolder folder;
  const std::string fifo = folder.File("out.entries");
  REQUIRE(mkfifo(fifo.c_str(), 0600) == 0);
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    const int null_fd = open("/dev/null", O_RDWR);
    dup2(null_fd, 0);
    dup2(null_fd, 1);
    dup2(null_fd, 2);
    if (chdir(SEVENFOLD_SOURCE_DIR) != 0) _exit(99);
    execl(SEVENFOLD_BINARY, SEVENFOLD_BINARY, "fit", "-q", "--allow-poor-fits", "--mid", "1000",
          "tests/data/reference-species.yaml", "-o", fifo.c_str(), static_cast<char*>(nullptr));
    _exit(98);
  }
  const std::string wchan = "/proc/" + std::to_string(pid) + "/wchan";
  bool blocked = false;
  for (int i = 0; i < 1200 && !blocked; ++i) {  // up to 60 s on a busy machine
    blocked = Slurp(wchan).find("partner") != std::string::npos;
    if (!blocked) usleep(50000);
  }
  kill(pid, SIGINT);
  int raw = 0;
  REQUIRE(waitpid(pid, &raw, 0) == pid);
  CHECK(blocked);
  REQUIRE(WIFEXITED(raw));
  CHECK(WEXITSTATUS(raw) == 130);
  CHECK(folder.Listing() == std::set<std::string>{"out.entries"});
}

}  // namespace sevenfold

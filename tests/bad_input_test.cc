// SPDX-License-Identifier: MIT
// Hostile and malformed input, run through the real binary (docs/robustness.md): every case of
// tests/data/bad-input/ must exit 2 with file:line:column, what was found and what was expected,
// within 20 s; a failing `fit` must never create, change or truncate its output file.
#include <signal.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include <catch2/catch.hpp>
#include <fmt/format.h>

#include "entries/entries.h"
#include "run_binary.h"

namespace {

namespace fs = std::filesystem;

const std::string kCorpusDir = "tests/data/bad-input/";
// Every case must finish well within this; a hang or a runaway loop shows as exit 124.
constexpr int kTimeoutSeconds = 20;
// At least this many cases: the robustness issue asks for 60 or more.
constexpr std::size_t kMinCorpusCases = 60;

using sevenfold::testing::ReadWhole;
using sevenfold::testing::RunResult;

void WriteWhole(const std::string& path, const std::string& content) {
  std::ofstream out(path, std::ios::binary);
  out << content;
}

// A fresh, empty folder under the system temporary directory, removed with its content on exit.
class TempDir {
 public:
  TempDir() {
    static int counter = 0;
    path_ = fs::temp_directory_path() /
            ("sevenfold_bad_input_" + std::to_string(getpid()) + "_" + std::to_string(++counter));
    fs::remove_all(path_);
    fs::create_directories(path_);
  }
  ~TempDir() {
    std::error_code ignored;
    fs::remove_all(path_, ignored);
  }
  std::string File(const std::string& name) const { return (path_ / name).string(); }
  const fs::path& path() const { return path_; }
  // Names of everything in the folder, sorted.
  std::set<std::string> Listing() const {
    std::set<std::string> names;
    for (const auto& item : fs::directory_iterator(path_)) names.insert(item.path().filename());
    return names;
  }

 private:
  fs::path path_;
};

// Runs the binary under `timeout` (a hang shows as exit 124), after `prefix` (shell commands such
// as "ulimit -f 4;").
RunResult Run(const std::string& arguments, const std::string& prefix = "") {
  return sevenfold::testing::RunBinary(arguments, prefix, kTimeoutSeconds);
}

std::string ReplaceAll(std::string text, const std::string& from, const std::string& to) {
  for (std::size_t at = text.find(from); at != std::string::npos; at = text.find(from, at)) {
    text.replace(at, from.size(), to);
    at += to.size();
  }
  return text;
}

struct Case {
  std::vector<std::string> files;  // relative to kCorpusDir
  std::string expected;            // substring of the message, paths without kCorpusDir
};

std::vector<Case> LoadCases() {
  std::ifstream in(std::string(SEVENFOLD_SOURCE_DIR) + "/" + kCorpusDir + "expected-errors.txt");
  std::vector<Case> cases;
  std::string line;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    const std::size_t bar = line.find(" | ");
    REQUIRE(bar != std::string::npos);
    Case one;
    std::istringstream names(line.substr(0, bar));
    for (std::string name; names >> name;) one.files.push_back(name);
    one.expected = line.substr(bar + 3);
    cases.push_back(one);
  }
  return cases;
}

// The arguments naming a case's files, relative to the source directory.
std::string CaseArguments(const Case& one) {
  std::string arguments;
  for (const std::string& file : one.files) arguments += " " + kCorpusDir + file;
  return arguments;
}

bool IsEntriesCase(const Case& one) {
  return one.files.front().size() > 8 &&
         one.files.front().substr(one.files.front().size() - 8) == ".entries";
}

// True when a line of `message` starts with "[error: ]file:line:column: " with positive line
// and column. (Hand-written: std::regex draws false -Wmaybe-uninitialized warnings from GCC 12
// under the sanitizers.)
bool HasLocation(const std::string& message) {
  std::istringstream lines(message);
  for (std::string line; std::getline(lines, line);) {
    if (line.rfind("error: ", 0) == 0) line = line.substr(7);
    const std::size_t end = line.find(": ");
    if (end == std::string::npos) continue;
    // "file:line:column": the last two colon-separated fields are positive integers.
    const std::string head = line.substr(0, end);
    const std::size_t second = head.rfind(':');
    if (second == std::string::npos || second == 0) continue;
    const std::size_t first = head.rfind(':', second - 1);
    if (first == std::string::npos || first == 0) continue;
    const std::string row = head.substr(first + 1, second - first - 1);
    const std::string column = head.substr(second + 1);
    const auto positive = [](const std::string& digits) {
      return !digits.empty() && digits[0] != '0' &&
             digits.find_first_not_of("0123456789") == std::string::npos;
    };
    if (positive(row) && positive(column)) return true;
  }
  return false;
}

TEST_CASE("the bad-input corpus lists every file and has at least 60 cases", "[bad_input]") {
  const std::vector<Case> cases = LoadCases();
  CHECK(cases.size() >= kMinCorpusCases);
  std::set<std::string> listed;
  for (const Case& one : cases) listed.insert(one.files.begin(), one.files.end());
  for (const auto& item : fs::directory_iterator(std::string(SEVENFOLD_SOURCE_DIR) + "/" +
                                                 kCorpusDir)) {
    const std::string name = item.path().filename();
    if (name == "expected-errors.txt") continue;
    INFO(name);
    CHECK(listed.count(name) == 1);
  }
}

TEST_CASE("docs/robustness.md states the corpus's own counts", "[bad_input]") {
  // "N cases: S species cases in F files ... and E entries files": counted from the corpus here,
  // so that a new case cannot leave the document behind.
  std::string doc = ReadWhole(std::string(SEVENFOLD_SOURCE_DIR) + "/docs/robustness.md");
  std::replace(doc.begin(), doc.end(), '\n', ' ');
  int num_species_cases = 0, num_entries_cases = 0, num_species_files = 0, num_entries_files = 0;
  for (const Case& one : LoadCases()) {
    (one.files.front().rfind("s", 0) == 0 ? num_species_cases : num_entries_cases) += 1;
    for (const std::string& file : one.files) {
      (file.rfind("s", 0) == 0 ? num_species_files : num_entries_files) += 1;
    }
  }
  const std::string expected = fmt::format(
      "holds malformed and hostile inputs, {} cases: {} species cases in {} files",
      num_species_cases + num_entries_cases, num_species_cases, num_species_files);
  CHECK_THAT(doc, Catch::Contains(expected));
  CHECK_THAT(doc, Catch::Contains(fmt::format("and {} entries files", num_entries_files)));
}

TEST_CASE("every bad input exits 2 with its location and the expected message", "[bad_input]") {
  for (const Case& one : LoadCases()) {
    const std::string command = IsEntriesCase(one) ? "eval" : "table";
    const RunResult run = Run(command + CaseArguments(one) + " --at 300");
    const std::string message = ReplaceAll(run.err, kCorpusDir, "");
    INFO(command << CaseArguments(one) << "\nstderr: " << run.err);
    CHECK(run.exit_status == 2);
    CHECK(run.out.empty());
    CHECK_THAT(message, Catch::Contains(one.expected));
    CHECK(HasLocation(message));
    CHECK_THAT(message, Catch::Contains("expected"));
    CHECK_THAT(message, !Catch::Contains("internal error"));
  }
}

TEST_CASE("a species file above 16 MiB is refused before parsing", "[bad_input]") {
  TempDir dir;
  const std::string path = dir.File("huge.yaml");
  {
    // A valid species followed by comment lines: only the size is wrong.
    std::ofstream out(path, std::ios::binary);
    out << "sevenfold-species: 2\nspecies:\n  Ar:\n    formula: Ar\n    formation-enthalpy: 0\n"
           "    shape: atom\n";
    const std::string comment = "# " + std::string(1000, 'x') + "\n";
    for (std::size_t written = 0; written <= (std::size_t{16} << 20); written += comment.size()) {
      out << comment;
    }
  }
  REQUIRE(fs::file_size(path) > (std::size_t{16} << 20));
  const RunResult run = Run("table " + path);
  INFO(run.err);
  CHECK(run.exit_status == 2);
  CHECK(run.out.empty());
  CHECK_THAT(run.err, Catch::Contains(path + ": species file is larger than 16 MiB"));
  CHECK_THAT(run.err, Catch::Contains("expected a file of at most 16 MiB"));
}

TEST_CASE("fit on bad input neither creates nor changes its output file", "[bad_input]") {
  const std::vector<std::string> bad_cases = {
      "s27-negative-vibration.yaml", "s31-huge-rotational-constant.yaml", "s63-non-utf8.yaml",
      "s65-deep-nesting.yaml",       "s66-alias-bomb.yaml",
      "s71-duplicate-a.yaml " + kCorpusDir + "s71-duplicate-b.yaml"};
  for (const std::string& files : bad_cases) {
    INFO(files);
    TempDir dir;
    // No previous file: none may appear.
    const RunResult fresh = Run("fit -q " + kCorpusDir + files + " -o " + dir.File("new.entries"));
    CHECK(fresh.exit_status == 2);
    CHECK(dir.Listing().empty());
    // A previous file: it must keep every byte, and no temporary may be left beside it.
    const std::string previous = "sevenfold-entries 1\n# the previous content\n";
    WriteWhole(dir.File("old.entries"), previous);
    const RunResult again = Run("fit -q " + kCorpusDir + files + " -o " + dir.File("old.entries"));
    CHECK(again.exit_status == 2);
    CHECK(ReadWhole(dir.File("old.entries")) == previous);
    CHECK(dir.Listing() == std::set<std::string>{"old.entries"});
  }
}

// A good run's output, written once per process (about a second in Release).
const std::string& GoodEntries() {
  static const std::string content = [] {
    TempDir dir;
    const RunResult run = Run("fit -q --allow-poor-fits tests/data/reference-species.yaml --mid 1000 -o " +
                              dir.File("good.entries"));
    REQUIRE(run.exit_status == 0);
    return ReadWhole(dir.File("good.entries"));
  }();
  return content;
}

TEST_CASE("a write that fails midway leaves the previous entries file intact", "[bad_input]") {
  // File-size limit: the kernel refuses bytes beyond it with EFBIG even for root (SIGXFSZ is
  // ignored so that write() fails instead of killing the process). 4 KiB is below the size of
  // the new entries file, so the temporary fills up and the write fails in the middle.
  REQUIRE(GoodEntries().size() > 4 * 1024);
  TempDir dir;
  const std::string previous = "sevenfold-entries 1\n# previous content that must survive\n";
  WriteWhole(dir.File("out.entries"), previous);
  const RunResult run =
      Run("fit -q --allow-poor-fits tests/data/reference-species.yaml --mid 1000 -o " + dir.File("out.entries"),
          "trap \"\" XFSZ; ulimit -f 4;");
  INFO(run.err);
  CHECK(run.exit_status == 2);
  CHECK_THAT(run.err, Catch::Contains(dir.File("out.entries") + ": cannot write: File too large"));
  CHECK(ReadWhole(dir.File("out.entries")) == previous);
  CHECK(dir.Listing() == std::set<std::string>{"out.entries"});
}

TEST_CASE("fit into a folder that cannot take the file fails cleanly, also for root",
          "[bad_input]") {
  TempDir dir;
  // The parent is a regular file: no permission bit matters, root fails too (ENOTDIR).
  WriteWhole(dir.File("plain"), "not a folder\n");
  const RunResult under_file =
      Run("fit -q --allow-poor-fits tests/data/reference-species.yaml --mid 1000 -o " + dir.File("plain/x.entries"));
  CHECK(under_file.exit_status == 2);
  CHECK_THAT(under_file.err, Catch::Contains("cannot create a temporary file beside it"));
  CHECK(ReadWhole(dir.File("plain")) == "not a folder\n");

  // The output path is an existing folder: the temporary is written, the rename fails
  // (EISDIR), and the temporary must be removed again.
  fs::create_directory(dir.File("folder"));
  WriteWhole(dir.File("folder/inside.txt"), "kept\n");
  const RunResult onto_folder =
      Run("fit -q --allow-poor-fits tests/data/reference-species.yaml --mid 1000 -o " + dir.File("folder"));
  CHECK(onto_folder.exit_status == 2);
  CHECK_THAT(onto_folder.err, Catch::Contains(dir.File("folder") + ": cannot replace"));
  CHECK(dir.Listing() == std::set<std::string>{"folder", "plain"});
  CHECK(ReadWhole(dir.File("folder/inside.txt")) == "kept\n");

  // /proc refuses new files for every user.
  const RunResult proc =
      Run("fit -q tests/data/reference-species.yaml --mid 1000 -o /proc/sevenfold-test.entries");
  CHECK(proc.exit_status == 2);
  CHECK_FALSE(fs::exists("/proc/sevenfold-test.entries"));
}

// Runs `fit` on `species_path` into `output`, sends SIGKILL after `delay`, and waits.
// Returns true when the process was killed (false when it finished first).
bool FitAndKill(const std::string& species_path,
                const std::string& output,
                std::chrono::microseconds delay) {
  const pid_t child = fork();
  REQUIRE(child >= 0);
  if (child == 0) {
    // Quiet child: no progress bar, output to /dev/null.
    if (std::freopen("/dev/null", "w", stdout) == nullptr ||
        std::freopen("/dev/null", "w", stderr) == nullptr) {
      _exit(126);
    }
    execl(SEVENFOLD_BINARY, SEVENFOLD_BINARY, "fit", "-q", "-j", "1", "--mid", "1000",
          species_path.c_str(), "-o", output.c_str(), static_cast<char*>(nullptr));
    _exit(127);
  }
  std::this_thread::sleep_for(delay);
  kill(child, SIGKILL);
  int status = 0;
  waitpid(child, &status, 0);
  return WIFSIGNALED(status) && WTERMSIG(status) == SIGKILL;
}

TEST_CASE("a fit killed at any moment leaves the old or the complete new file", "[bad_input]") {
  TempDir dir;
  // Many small species make a large output whose write takes a measurable time.
  const std::string species_path = dir.File("many.yaml");
  {
    std::ofstream out(species_path);
    out << "sevenfold-species: 2\nspecies:\n";
    for (int i = 0; i < 300; ++i) {
      out << "  Ar" << i << ":\n    formula: Ar\n    formation-enthalpy: 0\n"
          << "    shape: atom\n";
    }
  }
  const std::string output = dir.File("out.entries");
  // The complete new content, from an undisturbed run.
  REQUIRE(Run("fit -q -j 1 --mid 1000 " + species_path + " -o " + output).exit_status == 0);
  const std::string complete = ReadWhole(output);
  REQUIRE(sevenfold::ParseEntries(complete, output).entries.size() == 300);
  fs::remove(output);

  // How long an undisturbed run takes, to spread the kills over the whole run.
  const auto start = std::chrono::steady_clock::now();
  REQUIRE(Run("fit -q -j 1 --mid 1000 " + species_path + " -o " + dir.File("timing.entries"))
              .exit_status == 0);
  const auto full = std::chrono::duration_cast<std::chrono::microseconds>(
      std::chrono::steady_clock::now() - start);
  fs::remove(dir.File("timing.entries"));

  const std::string previous = "sevenfold-entries 1\n# previous content\n";
  int num_old = 0, num_new = 0, num_temporaries = 0;
  const auto kill_after = [&](std::chrono::microseconds delay) {
    WriteWhole(output, previous);
    FitAndKill(species_path, output, delay);
    const std::string now = ReadWhole(output);
    INFO("kill after " << delay.count() << " us");
    // Never anything in between: the destination is the old bytes or the complete new ones.
    const bool is_old = now == previous;
    const bool is_new = now == complete;
    CHECK((is_old || is_new));
    num_old += is_old;
    num_new += is_new;
    // A SIGKILL cannot be caught, so a kill during the write leaves the temporary behind; it is
    // named after the destination (docs/robustness.md) and is never the destination itself.
    for (const std::string& name : dir.Listing()) {
      if (name == "many.yaml" || name == "out.entries") continue;
      ++num_temporaries;
      CHECK(name.rfind("out.entries.tmp-", 0) == 0);
      fs::remove(dir.File(name));
    }
  };
  // Kill times from 30 % to 140 % of a full run; the late ones land near or after the write.
  constexpr int kNumTries = 12;
  for (int k = 0; k < kNumTries; ++k) kill_after(full * (30 + 10 * k) / 100);
  // Both outcomes must occur. A whole run takes only tens of milliseconds, so on a busy machine
  // (ctest runs suites in parallel) one run can be much slower or faster than the timed one: a
  // missing outcome is looked for further out, doubling or halving the delay (at most 8 more
  // kills each way), every kill checked as above.
  auto late = full * 140 / 100;
  for (int extra = 0; extra < 8 && num_new == 0; ++extra) kill_after(late *= 2);
  auto early = full * 30 / 100;
  for (int extra = 0; extra < 8 && num_old == 0; ++extra) kill_after(early /= 2);
  CHECK(num_old > 0);
  CHECK(num_new > 0);
  WARN("kills: " << num_old << " left the old file, " << num_new << " the new one, "
                 << num_temporaries << " left a temporary");
}

}  // namespace

// SPDX-License-Identifier: MIT
// The sevenfold executable run as a user runs it: output, exit status and error text.
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <sys/wait.h>
#include <unistd.h>

#include <catch2/catch.hpp>

namespace {

struct RunResult {
  int exit_status = -1;
  std::string out;
  std::string err;
};

std::string ReadWhole(const std::string& path) {
  std::ifstream in(path);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

// Runs the binary with `arguments` from the source directory; captures stdout and stderr in
// files under the system temporary directory.
RunResult Run(const std::string& arguments) {
  static int counter = 0;
  const std::filesystem::path stem = std::filesystem::temp_directory_path() /
      ("sevenfold_cli_test_" + std::to_string(getpid()) + "_" + std::to_string(++counter));
  const std::string out_path = stem.string() + ".out", err_path = stem.string() + ".err";
  const std::string command = std::string("cd ") + SEVENFOLD_SOURCE_DIR + " && " +
                              SEVENFOLD_BINARY + " " + arguments + " >" + out_path + " 2>" +
                              err_path + " </dev/null";
  const int raw = std::system(command.c_str());
  RunResult result;
  result.exit_status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  result.out = ReadWhole(out_path);
  result.err = ReadWhole(err_path);
  std::filesystem::remove(out_path);
  std::filesystem::remove(err_path);
  return result;
}

TEST_CASE("table prints the fixed CSV header and JANAF-close values", "[cli]") {
  const RunResult run =
      Run("table tests/data/reference-species.yaml --species N2 --at 298.15,1000 --format csv");
  REQUIRE(run.exit_status == 0);
  std::istringstream lines(run.out);
  std::string header, first, second;
  std::getline(lines, header);
  std::getline(lines, first);
  std::getline(lines, second);
  CHECK(header ==
        "species,T/K,Cp/(J/mol/K),S/(J/mol/K),H-H298/(kJ/mol),H/(kJ/mol),-(G-H298)/T/(J/mol/K)");
  double t = 0, cp = 0, s = 0, dh = 0, h = 0, g = 0;
  REQUIRE(std::sscanf(first.c_str(), "N2,%lf,%lf,%lf,%lf,%lf,%lf", &t, &cp, &s, &dh, &h, &g) == 6);
  // JANAF 4th ed. (Chase 1998), N2 at 298.15 K: Cp 29.124, S 191.609 J/(mol K) (from memory);
  // the rigid-rotor/harmonic model is within 0.5 % there (see statmech_test).
  CHECK(t == 298.15);
  CHECK(cp == Approx(29.124).epsilon(0.005));
  CHECK(s == Approx(191.609).epsilon(0.005));
  CHECK(dh == 0.0);
  // -(G-H298)/T equals S at 298.15 K by definition.
  CHECK(g == Approx(s).epsilon(1e-12));
}

TEST_CASE("table text output states the standard pressure and units", "[cli]") {
  const RunResult run = Run("table tests/data/reference-species.yaml --species Ar");
  REQUIRE(run.exit_status == 0);
  CHECK_THAT(run.out, Catch::Contains("standard pressure 1 bar"));
  CHECK_THAT(run.out, Catch::Contains("J/mol/K"));
  CHECK_THAT(run.out, Catch::Contains("298.15"));
}

TEST_CASE("table json output is produced for every species", "[cli]") {
  const RunResult run = Run("table tests/data/reference-species.yaml --at 500 --format json");
  REQUIRE(run.exit_status == 0);
  for (const char* name : {"\"N2\"", "\"CO2\"", "\"H2O\"", "\"Ar\""}) {
    CHECK_THAT(run.out, Catch::Contains(name));
  }
}

TEST_CASE("a bad species file exits 2 naming file, line and column", "[cli]") {
  const RunResult run = Run("table tests/data/bad-vibration.yaml");
  CHECK(run.exit_status == 2);
  CHECK_THAT(run.err, Catch::Contains("tests/data/bad-vibration.yaml:9:"));
  CHECK_THAT(run.err, Catch::Contains("imaginary"));
  CHECK(run.out.empty());
}

TEST_CASE("usage errors exit 2 and help exits 0", "[cli]") {
  CHECK(Run("table").exit_status == 2);
  CHECK(Run("frobnicate").exit_status == 2);
  CHECK(Run("table tests/data/reference-species.yaml --species Xx").exit_status == 2);
  CHECK(Run("table tests/data/reference-species.yaml --at 5").exit_status == 2);
  const RunResult help = Run("--help-all");
  CHECK(help.exit_status == 0);
  CHECK_THAT(help.out, Catch::Contains("table"));
}

}  // namespace

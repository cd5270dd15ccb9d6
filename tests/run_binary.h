// SPDX-License-Identifier: MIT
// For the tests that run the sevenfold binary (cli, report, bad_input): the whole content of a
// file, and one run of the binary from the source directory with stdout and stderr captured.
// Needs SEVENFOLD_SOURCE_DIR and SEVENFOLD_BINARY (tests/CMakeLists.txt).
#pragma once

#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace sevenfold::testing {

struct RunResult {
  int exit_status = -1;  // -1 when killed by a signal
  std::string out;
  std::string err;
};

inline std::string ReadWhole(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buffer;
  buffer << in.rdbuf();
  return buffer.str();
}

// Runs the binary with `arguments` from the source directory, after `prefix` (shell commands such
// as "ulimit -f 4;"), under `timeout timeout_seconds` when that is positive. stdin is empty;
// stdout and stderr go through files under the system temporary directory, removed afterwards.
// Arguments must not contain single quotes (the command runs inside /bin/sh -c '...').
inline RunResult RunBinary(const std::string& arguments, const std::string& prefix = "",
                           int timeout_seconds = 0) {
  static int counter = 0;
  const std::string stem =
      (std::filesystem::temp_directory_path() /
       ("sevenfold_test_run_" + std::to_string(getpid()) + "_" + std::to_string(++counter)))
          .string();
  const std::string timeout =
      timeout_seconds > 0 ? "timeout " + std::to_string(timeout_seconds) + " " : "";
  const std::string command = "cd " + std::string(SEVENFOLD_SOURCE_DIR) + " && " + prefix +
                              " exec " + timeout + SEVENFOLD_BINARY + " " + arguments + " >" +
                              stem + ".out 2>" + stem + ".err </dev/null";
  const int raw = std::system(("/bin/sh -c '" + command + "'").c_str());
  RunResult result;
  result.exit_status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  result.out = ReadWhole(stem + ".out");
  result.err = ReadWhole(stem + ".err");
  std::filesystem::remove(stem + ".out");
  std::filesystem::remove(stem + ".err");
  return result;
}

}  // namespace sevenfold::testing

// SPDX-License-Identifier: MIT
// libFuzzer target: the entries reader. Any input must either parse or throw sevenfold::Error.
// What parses must write back (FormatEntries) and read again to the same text: the writer and
// the reader agree on every accepted file. Anything else (another exception, a crash, a
// sanitizer report, a round trip that differs, a hang) is a finding. See docs/robustness.md.
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>

#include "core/error.h"
#include "entries/entries.h"

namespace {

[[noreturn]] void Finding(const std::string& what) {
  std::fprintf(stderr, "entries_fuzzer finding: %s\n", what.c_str());
  std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  sevenfold::EntriesFile file;
  try {
    file = sevenfold::ParseEntries(text, "fuzz.entries");
  } catch (const sevenfold::Error&) {
    return 0;  // rejected with a message: the expected outcome for bad input
  }
  std::string written;
  try {
    written = sevenfold::FormatEntries(file);
  } catch (const sevenfold::Error& e) {
    Finding(std::string("accepted by the reader but refused by the writer: ") + e.what());
  }
  try {
    const std::string again = sevenfold::FormatEntries(sevenfold::ParseEntries(written, "again"));
    if (again != written) Finding("write -> read -> write changed the text");
  } catch (const sevenfold::Error& e) {
    Finding(std::string("the writer's own output does not read back: ") + e.what());
  }
  return 0;
}

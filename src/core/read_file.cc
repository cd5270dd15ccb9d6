// SPDX-License-Identifier: MIT
#include "core/read_file.h"

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/error.h"

namespace sevenfold {

std::string ReadInputFile(const std::string& path, const std::string& what) {
  std::FILE* file = std::fopen(path.c_str(), "rb");
  if (file == nullptr) {
    throw Error(path + ": cannot open " + what + ": " + std::strerror(errno) +
                "; expected a readable file");
  }
  std::string text;
  char buffer[1 << 16];
  while (true) {
    const std::size_t num_read = std::fread(buffer, 1, sizeof buffer, file);
    text.append(buffer, num_read);
    if (text.size() > kMaxInputFileBytes) {
      std::fclose(file);
      throw Error(path + ": " + what +
                  " is larger than 16 MiB, refused before parsing; expected a file of at most "
                  "16 MiB");
    }
    if (num_read < sizeof buffer) {
      if (std::ferror(file)) {
        const int error_number = errno;
        std::fclose(file);
        throw Error(path + ": cannot read " + what + ": " + std::strerror(error_number) +
                    "; expected a readable file");
      }
      break;
    }
  }
  std::fclose(file);
  return text;
}

}  // namespace sevenfold

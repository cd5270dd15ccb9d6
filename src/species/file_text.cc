// SPDX-License-Identifier: MIT
#include "species/file_text.h"

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "species/species_reader.h"

namespace sevenfold::detail {

std::optional<std::string> ReadSpeciesFileText(const std::string& path, std::string* problem) {
  errno = 0;
  std::FILE* file = std::fopen(path.c_str(), "rb");
  if (file == nullptr) {
    *problem = (path + ": cannot open species file: " + std::strerror(errno) +
                      "; expected a readable file");
    return std::nullopt;
  }
  std::string text;
  char buffer[1 << 16];
  while (true) {
    const std::size_t num_read = std::fread(buffer, 1, sizeof buffer, file);
    text.append(buffer, num_read);
    if (text.size() > kMaxSpeciesFileBytes) {
      std::fclose(file);
      *problem = (path +
                        ": species file is larger than 16 MiB, refused before parsing; "
                        "expected a file of at most 16 MiB");
      return std::nullopt;
    }
    if (num_read < sizeof buffer) {
      if (std::ferror(file)) {
        const int error_number = errno;
        std::fclose(file);
        *problem = (path + ": cannot read species file: " + std::strerror(error_number) +
                          "; expected a readable file");
        return std::nullopt;
      }
      break;
    }
  }
  std::fclose(file);
  return text;
}

}  // namespace sevenfold::detail

// SPDX-License-Identifier: MIT
// Reading a species file's bytes, with the size cap.
#pragma once

#include <optional>
#include <string>

namespace sevenfold::detail {

// The whole file, or nullopt with *problem set to "PATH: <what went wrong>; expected ..." when it
// cannot be opened or read, or is above kMaxSpeciesFileBytes (refused before it is all read).
std::optional<std::string> ReadSpeciesFileText(const std::string& path, std::string* problem);

}  // namespace sevenfold::detail

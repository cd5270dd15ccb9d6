// SPDX-License-Identifier: MIT
// Reading a whole input file with the one size cap of the readers (species and entries files).
#pragma once

#include <cstddef>
#include <string>

namespace sevenfold {

// The largest input file the readers accept: 16 MiB. A species list or an entries file of a
// large mechanism (a few thousand species) is a few MiB; the cap keeps a wrong path (a disk
// image, /dev/zero) from exhausting memory before parsing starts.
inline constexpr std::size_t kMaxInputFileBytes = std::size_t{16} << 20;

// The bytes of the file at `path`. `what` names the kind of file in messages ("entries file").
// Throws Error "PATH: cannot open WHAT: REASON; expected a readable file", "PATH: cannot read
// WHAT: REASON; ..." or "PATH: WHAT is larger than 16 MiB, refused before parsing; expected a
// file of at most 16 MiB" (reading stops at the cap, so /dev/zero is refused too).
std::string ReadInputFile(const std::string& path, const std::string& what);

}  // namespace sevenfold

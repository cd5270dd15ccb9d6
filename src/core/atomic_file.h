// SPDX-License-Identifier: MIT
// Replacing a file's content in one step, so a reader never sees half a file.
#pragma once

#include <string>

namespace sevenfold {

// Writes `content` to `path` atomically: a temporary file in the same folder receives the bytes,
// is flushed and fsync'ed, then renamed over `path` (POSIX rename is atomic within a file
// system); the folder is fsync'ed after the rename. An existing file's permission bits are kept;
// a new file gets 0644. On any failure the temporary is removed and Error is thrown naming the
// path and the system's reason (strerror), e.g.
//   "out/entries.txt: cannot write: No space left on device".
void WriteFileAtomically(const std::string& path, const std::string& content);

}  // namespace sevenfold

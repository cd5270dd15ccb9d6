// SPDX-License-Identifier: MIT
// WriteFileAtomically: temporary file, fsync, rename.
#include "core/atomic_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>
#include <vector>

#include "core/error.h"

namespace sevenfold {
namespace {

std::string Reason(int error_number) { return std::strerror(error_number); }

// The folder holding `path` ("." for a bare file name).
std::string FolderOf(const std::string& path) {
  const std::size_t slash = path.find_last_of('/');
  if (slash == std::string::npos) return ".";
  if (slash == 0) return "/";
  return path.substr(0, slash);
}

}  // namespace

void WriteFileAtomically(const std::string& path, const std::string& content) {
  if (path.empty()) throw Error("cannot write a file with an empty path");
  // mkstemp wants a writable template ending in XXXXXX.
  std::string pattern = path + ".tmp-XXXXXX";
  std::vector<char> temporary(pattern.begin(), pattern.end());
  temporary.push_back('\0');
  const int fd = mkstemp(temporary.data());
  if (fd < 0) {
    throw Error(path + ": cannot create a temporary file beside it: " + Reason(errno));
  }
  const std::string temporary_path(temporary.data());
  // Removes the temporary and throws; errno is read before anything can change it.
  auto fail = [&](const std::string& what, int error_number, bool close_fd) {
    if (close_fd) close(fd);
    unlink(temporary_path.c_str());
    throw Error(path + ": " + what + ": " + Reason(error_number));
  };

  struct stat existing;
  const mode_t mode = stat(path.c_str(), &existing) == 0 ? (existing.st_mode & 07777) : 0644;
  if (fchmod(fd, mode) != 0) fail("cannot set permissions", errno, true);

  const char* data = content.data();
  std::size_t remaining = content.size();
  while (remaining > 0) {
    const ssize_t written = write(fd, data, remaining);
    if (written < 0) {
      if (errno == EINTR) continue;
      fail("cannot write", errno, true);
    }
    data += written;
    remaining -= static_cast<std::size_t>(written);
  }
  if (fsync(fd) != 0) fail("cannot flush to disk", errno, true);
  if (close(fd) != 0) fail("cannot close", errno, false);
  if (rename(temporary_path.c_str(), path.c_str()) != 0) fail("cannot replace", errno, false);

  // Make the rename itself durable. Best effort: some file systems refuse fsync on a folder.
  const int folder_fd = open(FolderOf(path).c_str(), O_RDONLY | O_DIRECTORY);
  if (folder_fd >= 0) {
    fsync(folder_fd);
    close(folder_fd);
  }
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// OutputBatch: temporaries beside their targets, fsync, renames with SIGINT/SIGTERM blocked.
#include "core/atomic_file.h"

#include <fcntl.h>
#include <limits.h>
#include <pthread.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <chrono>
#include <cstdlib>
#include <cstring>
#include <mutex>
#include <set>
#include <string>
#include <vector>

#include "core/error.h"

namespace sevenfold {
namespace {

std::string Reason(int error_number) { return std::strerror(error_number); }

// The folder holding `path` ("." for a bare file name) and the name inside it.
std::string FolderOf(const std::string& path) {
  const std::size_t slash = path.find_last_of('/');
  if (slash == std::string::npos) return ".";
  if (slash == 0) return "/";
  return path.substr(0, slash);
}

std::string NameOf(const std::string& path) {
  const std::size_t slash = path.find_last_of('/');
  return slash == std::string::npos ? path : path.substr(slash + 1);
}

// ---- Registry of live temporaries, readable from a signal handler -----------------------------
// Fixed slots, so the handler touches no allocator: a slot's path is written while in_use is
// false and published by setting it (release); the handler reads in_use (acquire) then the path.
constexpr int kMaxPendingTemporaries = 64;
struct PendingSlot {
  std::atomic<bool> in_use{false};
  char path[PATH_MAX];
};
PendingSlot g_pending[kMaxPendingTemporaries];
std::mutex g_pending_mutex;  // between threads that register; never taken by the handler

int RegisterTemporary(const std::string& path) {
  if (path.size() >= PATH_MAX) return -1;
  std::lock_guard<std::mutex> lock(g_pending_mutex);
  for (int i = 0; i < kMaxPendingTemporaries; ++i) {
    if (g_pending[i].in_use.load(std::memory_order_acquire)) continue;
    std::memcpy(g_pending[i].path, path.c_str(), path.size() + 1);
    g_pending[i].in_use.store(true, std::memory_order_release);
    return i;
  }
  return -1;
}

void ReleaseTemporary(int slot) {
  if (slot >= 0) g_pending[slot].in_use.store(false, std::memory_order_release);
}

// SIGINT, SIGTERM and SIGHUP held back in this thread for the object's lifetime: a temporary is
// registered in the same breath as it is created, and a batch's renames are not split. (Files are
// written after the worker threads of a command have ended, so this thread is the only one.)
class TerminationSignalsHeld {
 public:
  TerminationSignalsHeld() {
    sigset_t set;
    sigemptyset(&set);
    sigaddset(&set, SIGINT);
    sigaddset(&set, SIGTERM);
    sigaddset(&set, SIGHUP);
    pthread_sigmask(SIG_BLOCK, &set, &old_);
  }
  ~TerminationSignalsHeld() { pthread_sigmask(SIG_SETMASK, &old_, nullptr); }
  TerminationSignalsHeld(const TerminationSignalsHeld&) = delete;
  TerminationSignalsHeld& operator=(const TerminationSignalsHeld&) = delete;

 private:
  sigset_t old_;
};

// "NAME.tmp-XXXXXXXX" beside `destination`, NAME cut (at a UTF-8 character boundary) so that the
// whole name fits the folder's limit.
std::string TemporaryPath(const std::string& destination, unsigned attempt) {
  static std::atomic<unsigned> counter{0};
  const auto now = static_cast<unsigned long long>(
      std::chrono::steady_clock::now().time_since_epoch().count());
  const unsigned long long mixed = (static_cast<unsigned long long>(getpid()) << 32) ^
                                   (now * 0x9E3779B97F4A7C15ull) ^ (++counter * 0x632BE5ABull) ^
                                   attempt;
  static const char kDigits[] = "0123456789abcdefghijklmnopqrstuvwxyz";
  std::string suffix = ".tmp-";
  unsigned long long bits = mixed ^ (mixed >> 29);
  for (int i = 0; i < 8; ++i) {
    suffix += kDigits[bits % 36];
    bits /= 36;
  }
  const std::string folder = FolderOf(destination);
  std::string name = NameOf(destination);
  long name_max = pathconf(folder.c_str(), _PC_NAME_MAX);
  if (name_max <= 0) name_max = NAME_MAX;
  const std::size_t room = static_cast<std::size_t>(name_max) > suffix.size()
                               ? static_cast<std::size_t>(name_max) - suffix.size()
                               : 0;
  if (name.size() > room) {
    std::size_t cut = room;
    while (cut > 0 && (static_cast<unsigned char>(name[cut]) & 0xC0) == 0x80) --cut;
    name.resize(cut);
  }
  const std::size_t slash = destination.find_last_of('/');
  const std::string prefix = slash == std::string::npos ? "" : destination.substr(0, slash + 1);
  return prefix + name + suffix;
}

void WriteAll(int fd, const std::string& content) {
  const char* data = content.data();
  std::size_t remaining = content.size();
  while (remaining > 0) {
    const ssize_t written = write(fd, data, remaining);
    if (written < 0) {
      if (errno == EINTR) continue;
      throw errno;
    }
    data += written;
    remaining -= static_cast<std::size_t>(written);
  }
}

const char* KindOf(mode_t mode) {
  if (S_ISDIR(mode)) return "a folder";
  if (S_ISBLK(mode)) return "a block device";
  if (S_ISSOCK(mode)) return "a socket";
  return "not a file, device or FIFO";
}

}  // namespace

void RemovePendingTemporaries() {
  for (PendingSlot& slot : g_pending) {
    if (slot.in_use.load(std::memory_order_acquire)) unlink(slot.path);
  }
}

OutputBatch::~OutputBatch() {
  if (committed_) return;
  for (const Item& item : items_) {
    if (item.temporary.empty()) continue;
    unlink(item.temporary.c_str());
    ReleaseTemporary(item.slot);
  }
}

void OutputBatch::Add(const std::string& path, const std::string& content) {
  SEVENFOLD_ASSERT(!committed_);
  if (path.empty()) throw Error("cannot write a file with an empty path");
  Item item;
  item.path = path;
  item.destination = path;
  struct stat link_info;
  struct stat existing;
  bool exists = false;
  // A path that cannot be inspected (a missing file, a parent that is no folder) is taken as a
  // new file: creating its temporary gives the precise reason.
  if (lstat(path.c_str(), &link_info) == 0) {
    existing = link_info;
    if (S_ISLNK(link_info.st_mode) && stat(path.c_str(), &existing) != 0) {
      throw Error(path + ": is a symbolic link to nothing that can be written (" + Reason(errno) +
                  "); expected a file, a character device or a FIFO");
    }
    if (S_ISCHR(existing.st_mode) || S_ISFIFO(existing.st_mode)) {
      item.content = content;  // written in place by Commit()
      items_.push_back(std::move(item));
      return;
    }
    if (S_ISDIR(existing.st_mode)) {
      throw Error(path + ": cannot replace: " + Reason(EISDIR));
    }
    if (!S_ISREG(existing.st_mode)) {
      throw Error(path + ": is " + KindOf(existing.st_mode) + ": refusing to write it");
    }
    exists = true;
    if (S_ISLNK(link_info.st_mode)) {
      // Keep the link: replace what it points to.
      char* resolved = realpath(path.c_str(), nullptr);
      if (resolved == nullptr) throw Error(path + ": cannot resolve the link: " + Reason(errno));
      item.destination = resolved;
      std::free(resolved);
    }
  }

  int fd = -1;
  {
    const TerminationSignalsHeld held;
    for (unsigned attempt = 0; fd < 0 && attempt < 100; ++attempt) {
      item.temporary = TemporaryPath(item.destination, attempt);
      // 0666: the kernel applies the umask to a new file.
      fd = open(item.temporary.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0666);
      if (fd < 0 && errno != EEXIST) break;
    }
    if (fd < 0) {
      throw Error(path + ": cannot create a temporary file beside it: " + Reason(errno));
    }
    item.slot = RegisterTemporary(item.temporary);
  }
  // Removes the temporary and throws; errno is read before anything can change it.
  const auto fail = [&](const std::string& what, int error_number, bool close_fd) {
    if (close_fd) close(fd);
    unlink(item.temporary.c_str());
    ReleaseTemporary(item.slot);
    throw Error(path + ": " + what + ": " + Reason(error_number));
  };
  if (item.slot < 0) fail("cannot track the temporary file", ENAMETOOLONG, true);
  if (exists) {
    // Owner and group as far as this process may set them (root: always; others: the group
    // when they belong to it). chown may clear set-id bits; they are dropped anyway.
    if (fchown(fd, existing.st_uid, existing.st_gid) != 0) {
      if (fchown(fd, static_cast<uid_t>(-1), existing.st_gid) != 0) {
        // Neither: the file becomes this user's, as with any program that rewrites it.
      }
    }
    if (fchmod(fd, existing.st_mode & 01777) != 0) fail("cannot set permissions", errno, true);
  }
  try {
    WriteAll(fd, content);
  } catch (int error_number) {
    fail("cannot write", error_number, true);
  }
  if (fsync(fd) != 0) fail("cannot flush to disk", errno, true);
  if (close(fd) != 0) fail("cannot close", errno, false);
  items_.push_back(std::move(item));
}

void OutputBatch::Commit() {
  SEVENFOLD_ASSERT(!committed_);
  // In place first: they cannot be staged, and a failure here still leaves every renamed file old.
  for (const Item& item : items_) {
    if (!item.temporary.empty()) continue;
    const int fd = open(item.path.c_str(), O_WRONLY | O_CLOEXEC | O_NOCTTY);
    if (fd < 0) throw Error(item.path + ": cannot open: " + Reason(errno));
    try {
      WriteAll(fd, item.content);
    } catch (int error_number) {
      close(fd);
      throw Error(item.path + ": cannot write: " + Reason(error_number));
    }
    close(fd);
  }
  std::set<std::string> folders;
  {
    const TerminationSignalsHeld held;
    for (Item& item : items_) {
      if (item.temporary.empty()) continue;
      if (rename(item.temporary.c_str(), item.destination.c_str()) != 0) {
        throw Error(item.path + ": cannot replace: " + Reason(errno));
      }
      ReleaseTemporary(item.slot);
      item.temporary.clear();
      folders.insert(FolderOf(item.destination));
    }
    committed_ = true;
  }
  // Make the renames durable. Best effort: some file systems refuse fsync on a folder.
  for (const std::string& folder : folders) {
    const int folder_fd = open(folder.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (folder_fd >= 0) {
      fsync(folder_fd);
      close(folder_fd);
    }
  }
}

void WriteFileAtomically(const std::string& path, const std::string& content) {
  OutputBatch batch;
  batch.Add(path, content);
  batch.Commit();
}

void RefuseOutputThatIsAnInput(const std::string& output, const std::vector<std::string>& inputs) {
  struct stat out;
  if (stat(output.c_str(), &out) != 0) return;  // does not exist (yet): cannot be an input
  for (const std::string& input : inputs) {
    struct stat in;
    if (input.empty() || stat(input.c_str(), &in) != 0) continue;
    if (in.st_dev == out.st_dev && in.st_ino == out.st_ino) {
      throw Error(output + ": is the same file as the input " + input +
                  "; refusing to write over an input");
    }
  }
}

void RefuseOutputThatIsAnInput(const std::string& output,
                               const std::vector<std::string>& inputs,
                               const std::string& another_input) {
  RefuseOutputThatIsAnInput(output, inputs);
  RefuseOutputThatIsAnInput(output, {another_input});
}

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// Replacing output files so that a reader never sees half a file, and a set of files (a report)
// so that either all of them are new or all are old. What each kind of path gets, and the limits
// (SIGKILL): docs/robustness.md, "Atomic writes".
#pragma once

#include <string>
#include <vector>

namespace sevenfold {

// Files written together. Add() checks each path and stages its content; Commit() makes them all
// visible at once; a batch destroyed without Commit() (an exception, say) removes what it staged
// and leaves every old file as it was.
//
// What a path gets, by what it is (symbolic links are followed):
// - missing, or a regular file: the content goes to a temporary file beside it (NAME.tmp-XXXXXX,
//   NAME shortened when the result would exceed the file system's name limit), which is
//   fsync'ed; Commit() renames every temporary over its path (signals SIGINT and SIGTERM blocked
//   meanwhile, so they cannot split the batch) and fsyncs the folders. A replaced file keeps its
//   owner and group (as far as the process may set them) and its permission bits without the
//   set-user-ID and set-group-ID bits; a new file gets 0666 minus the umask. A symbolic link to a
//   regular file stays a link: its target is replaced.
// - a character device (/dev/null, a terminal) or a FIFO, directly or through a link (such as
//   /proc/self/fd/1 on a pipe): written in place by Commit(), before the renames, never replaced.
// - anything else (a folder, a block device, a socket, a link to nothing): refused by Add().
// Errors throw Error naming the path and the system's reason (strerror), e.g.
//   "out/entries.txt: cannot write: No space left on device".
class OutputBatch {
 public:
  OutputBatch() = default;
  OutputBatch(const OutputBatch&) = delete;
  OutputBatch& operator=(const OutputBatch&) = delete;
  ~OutputBatch();

  // Checks `path` and stages `content` for it (writes the temporary file, when there is one).
  void Add(const std::string& path, const std::string& content);
  // Writes the in-place targets, then renames all temporaries. Call once.
  void Commit();

 private:
  struct Item {
    std::string path;         // as given
    std::string destination;  // what the temporary is renamed to (a link's target), or ""
    std::string temporary;    // "" for an in-place target
    std::string content;      // kept for in-place targets only
    int slot = -1;            // registry slot of the temporary
  };
  std::vector<Item> items_;
  bool committed_ = false;
};

// Writes one file as an OutputBatch of one.
void WriteFileAtomically(const std::string& path, const std::string& content);

// Throws Error (before any work is done) when `output` exists and is the same file (device and
// inode, links followed) as one of `inputs`, naming both: writing it would destroy an input.
void RefuseOutputThatIsAnInput(const std::string& output, const std::vector<std::string>& inputs);
// The same with one more input (check: the species files and the entries file).
void RefuseOutputThatIsAnInput(const std::string& output,
                               const std::vector<std::string>& inputs,
                               const std::string& another_input);

// Removes every temporary file an OutputBatch has created and not yet renamed or removed.
// Async-signal-safe (only unlink on preallocated paths): for signal handlers, which then end the
// process (cli/interrupt.cc).
void RemovePendingTemporaries();

}  // namespace sevenfold

// SPDX-License-Identifier: MIT
// A progress bar on stderr for long runs: species done / total, rate and time left. Silent when
// stderr is not a terminal, when asked to be quiet, and for runs shorter than half a second.
#pragma once

#include <chrono>
#include <functional>
#include <mutex>
#include <string>

namespace sevenfold::cli {

class ProgressBar {
 public:
  ProgressBar(std::string label, bool quiet);
  // A thread-safe callback for RegenerateOptions::progress.
  std::function<void(int, int)> Callback();
  // Clears the bar line if one was drawn.
  void Finish();

 private:
  void Update(int num_done, int num_total);

  std::string label_;
  bool enabled_ = false;
  bool drawn_ = false;
  std::chrono::steady_clock::time_point start_;
  std::chrono::steady_clock::time_point last_draw_;
  std::mutex mutex_;
};

}  // namespace sevenfold::cli

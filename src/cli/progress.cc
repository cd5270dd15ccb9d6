// SPDX-License-Identifier: MIT
#include "cli/progress.h"

#include <unistd.h>

#include <cstdio>

#include <fmt/format.h>

namespace sevenfold::cli {

namespace {
// Draw only after this long: short runs stay silent.
constexpr std::chrono::milliseconds kQuietStart{500};
// Redraw at most this often.
constexpr std::chrono::milliseconds kRedrawInterval{100};
constexpr int kBarWidth = 30;
}  // namespace

ProgressBar::ProgressBar(std::string label, bool quiet)
    : label_(std::move(label)),
      enabled_(!quiet && isatty(STDERR_FILENO) == 1),
      start_(std::chrono::steady_clock::now()),
      last_draw_(start_) {}

std::function<void(int, int)> ProgressBar::Callback() {
  return [this](int num_done, int num_total) { Update(num_done, num_total); };
}

void ProgressBar::Update(int num_done, int num_total) {
  if (!enabled_ || num_total <= 0) return;
  std::lock_guard<std::mutex> lock(mutex_);
  const auto now = std::chrono::steady_clock::now();
  if (now - start_ < kQuietStart) return;
  if (drawn_ && now - last_draw_ < kRedrawInterval && num_done < num_total) return;
  last_draw_ = now;
  drawn_ = true;
  const double elapsed_s = std::chrono::duration<double>(now - start_).count();
  const double rate = num_done / elapsed_s;
  const double left_s = rate > 0 ? (num_total - num_done) / rate : 0.0;
  const int filled = num_done * kBarWidth / num_total;
  std::fprintf(stderr, "\r%s [%s%s] %d/%d species  %.0f/s  %.0f s left ", label_.c_str(),
               std::string(filled, '#').c_str(), std::string(kBarWidth - filled, '.').c_str(),
               num_done, num_total, rate, left_s);
  std::fflush(stderr);
}

void ProgressBar::Finish() {
  std::lock_guard<std::mutex> lock(mutex_);
  if (drawn_) std::fprintf(stderr, "\r%*s\r", 80, "");
  drawn_ = false;
}

}  // namespace sevenfold::cli

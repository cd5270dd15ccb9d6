// SPDX-License-Identifier: MIT
#include "core/parallel.h"

#include <algorithm>
#include <atomic>
#include <thread>
#include <vector>

#include "core/error.h"

namespace sevenfold {

void ParallelFor(int count, int num_jobs, const std::function<void(int)>& body,
                 const std::function<void(int, int)>& progress) {
  std::atomic<int> next{0};
  std::atomic<int> num_done{0};
  const auto work = [&] {
    for (int i = next++; i < count; i = next++) {
      body(i);
      const int done = ++num_done;
      if (progress) progress(done, count);
    }
  };
  int num_threads = num_jobs > 0 ? num_jobs : static_cast<int>(std::thread::hardware_concurrency());
  num_threads = std::clamp(num_threads, 1, std::max(1, count));
  std::vector<std::thread> threads;
  for (int t = 1; t < num_threads; ++t) threads.emplace_back(work);
  work();
  for (std::thread& thread : threads) thread.join();
}

void ThrowJoinedErrors(const std::vector<std::string>& errors) {
  std::string message;
  for (const std::string& error : errors) {
    if (error.empty()) continue;
    if (!message.empty()) message += "\n";
    message += error;
  }
  if (!message.empty()) throw Error(message);
}

}  // namespace sevenfold

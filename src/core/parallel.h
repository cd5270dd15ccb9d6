// SPDX-License-Identifier: MIT
// Runs independent work items on a few threads. Callers store results by index, so output does
// not depend on the thread count or on scheduling.
#pragma once

#include <functional>

namespace sevenfold {

// Calls body(i) for every i in [0, count) on up to num_jobs threads (0: the machine's hardware
// threads), the calling thread included. After each item, progress(num_done, count) is called
// from the worker thread when given. body must not throw: catch per item and store the error.
void ParallelFor(int count, int num_jobs, const std::function<void(int)>& body,
                 const std::function<void(int, int)>& progress = {});

}  // namespace sevenfold

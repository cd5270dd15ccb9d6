// SPDX-License-Identifier: MIT
// Runs independent work items on a few threads. Callers store results by index, so output does
// not depend on the thread count or on scheduling.
#pragma once

#include <functional>
#include <string>
#include <vector>

namespace sevenfold {

// Calls body(i) for every i in [0, count) on up to num_jobs threads (0: the machine's hardware
// threads), the calling thread included. After each item, progress(num_done, count) is called
// from the worker thread when given. body must not throw: catch per item and store the error.
void ParallelFor(int count, int num_jobs, const std::function<void(int)>& body,
                 const std::function<void(int, int)>& progress = {});

// The usual end of a ParallelFor whose body stored one error text per item ("" for none): throws
// Error with the non-empty texts joined by newlines, in item order (so the message does not
// depend on scheduling); returns when there is none.
void ThrowJoinedErrors(const std::vector<std::string>& errors);

}  // namespace sevenfold

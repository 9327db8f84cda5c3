// SPDX-License-Identifier: MIT
// A plain thread pool of one work loop.
#include "gate/common/workers.hpp"

#include <thread>
#include <vector>

namespace tollgate {

void run_workers(unsigned threads, const std::function<void()>& work) {
    if (threads <= 1) {
        work();
        return;
    }
    std::vector<std::thread> pool;
    pool.reserve(threads);
    for (unsigned t = 0; t < threads; ++t) {
        pool.emplace_back(work);
    }
    for (auto& thread : pool) {
        thread.join();
    }
}

} // namespace tollgate

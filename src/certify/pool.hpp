#pragma once
// Runs fn(0..count-1) on up to `threads` threads (0 = all cores); rethrows the
// first exception. Results are written by index, so they do not depend on the
// thread count.
#include <algorithm>
#include <atomic>
#include <exception>
#include <functional>
#include <mutex>
#include <thread>
#include <vector>

namespace overshoot::detail {

inline void parallel_for(std::size_t count, int threads, const std::function<void(std::size_t)>& fn) {
    if (threads <= 0) threads = static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
    threads = static_cast<int>(std::min<std::size_t>(static_cast<std::size_t>(threads), std::max<std::size_t>(count, 1)));
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex mu;
    auto work = [&] {
        try {
            for (std::size_t i; (i = next.fetch_add(1)) < count;) fn(i);
        } catch (...) {
            std::lock_guard<std::mutex> lock(mu);
            if (!failure) failure = std::current_exception();
            next.store(count);
        }
    };
    std::vector<std::thread> pool;
    for (int t = 1; t < threads; ++t) pool.emplace_back(work);
    work();
    for (auto& t : pool) t.join();
    if (failure) std::rethrow_exception(failure);
}

}  // namespace overshoot::detail

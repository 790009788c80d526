#pragma once
// A minimal deterministic parallel loop: job k always writes its own slot, so
// the result is the same whatever the number of threads.
#include <sched.h>

#include <algorithm>
#include <atomic>
#include <cstddef>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace overshoot {

inline int default_threads() { return static_cast<int>(std::max(1u, std::thread::hardware_concurrency())); }

// Threads for one of `processes_here` processes sharing this machine (MPI
// ranks): one per core this process may run on when it is bound to some
// (mpirun binds ranks), else an even share of the machine's cores.
inline int threads_per_process(int processes_here) {
    const int hw = default_threads();
    cpu_set_t set;
    if (sched_getaffinity(0, sizeof set, &set) == 0) {
        const int allowed = CPU_COUNT(&set);
        if (allowed > 0 && allowed < hw) return allowed;
    }
    return std::max(1, hw / std::max(1, processes_here));
}

// Calls f(k) for k in [0, count) on `threads` threads (0 = all cores), jobs
// handed out in order. Once `stop` (may be null) is set no new job starts. The
// first exception thrown by any job is rethrown after every thread stopped.
template <class F>
void parallel_for(std::size_t count, int threads, F&& f, const std::atomic<bool>* stop = nullptr) {
    if (threads <= 0) threads = default_threads();
    threads = static_cast<int>(std::min<std::size_t>(static_cast<std::size_t>(threads), std::max<std::size_t>(count, 1)));
    std::atomic<std::size_t> next{0};
    std::exception_ptr failure;
    std::mutex failure_mutex;
    auto work = [&] {
        try {
            for (std::size_t k; !(stop && stop->load(std::memory_order_relaxed)) && (k = next.fetch_add(1)) < count;)
                f(k);
        } catch (...) {
            std::lock_guard<std::mutex> lock(failure_mutex);
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

}  // namespace overshoot

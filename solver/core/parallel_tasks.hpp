// Independent full runs side by side: task(i) for i in [first, last), each on its own thread (each
// run then uses its own OpenMP threads), all joined before returning. The first exception a task
// threw is rethrown after every thread has ended, so no thread outlives the data it uses.
#pragma once

#include <cstddef>
#include <exception>
#include <thread>
#include <vector>

namespace heatbead {

template <class Task>
void run_side_by_side(std::size_t first, std::size_t last, Task&& task) {
    std::vector<std::exception_ptr> errors(last - first);
    std::vector<std::thread> workers;
    for (std::size_t i = first; i < last; ++i) {
        workers.emplace_back([&, i] {
            try {
                task(i);
            } catch (...) {
                errors[i - first] = std::current_exception();
            }
        });
    }
    for (auto& w : workers) w.join();
    for (const auto& e : errors) {
        if (e) std::rethrow_exception(e);
    }
}

}  // namespace heatbead

// The lowest candidate that passes a test which, once passed, stays passed higher up the ladder
// (more preheat never makes a HAZ harder or cool faster). Each round evaluates a batch of
// candidates together, so a caller with P cores runs P full simulations at a time: a round
// shrinks the bracket by P + 1 instead of 2.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <vector>

namespace heatbead {

// Evenly spaced candidates lowest, lowest + step, …, the last one clipped to highest.
struct Ladder {
    double lowest = 0, highest = 0, step = 1;
    std::size_t size() const;
    double at(std::size_t k) const;
};

struct LadderSearch {
    std::optional<std::size_t> lowest_passing;  // none: even the highest candidate fails
    // False when a candidate failed above one that passed: the test was not monotone, and the
    // answer is the lowest pass above every failure seen.
    bool monotone = true;
    std::size_t evaluations = 0;
};

// Pass flags for the candidates given, in the same order.
using BatchTest = std::function<std::vector<bool>(const std::vector<double>& candidates)>;

// Tests the lowest candidate first (with batch 1, alone; else together with the highest): if it
// passes, that is the answer; if the highest fails, there is none. Then narrows the bracket
// (highest failure, lowest pass) with `batch` evenly spread candidates per round.
LadderSearch find_lowest_passing(const Ladder& ladder, std::size_t batch, const BatchTest& test);

}  // namespace heatbead

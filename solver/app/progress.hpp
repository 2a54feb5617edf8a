// Progress of a long run: one self-overwriting line on a terminal, plain lines otherwise.
#pragma once

#include <chrono>
#include <cstdio>

namespace heatbead {

class ProgressPrinter {
public:
    // `expected_time` is the simulated time the run is expected to take (for the ETA).
    ProgressPrinter(bool quiet, double expected_time);
    void update(double t, double arc_x, double dt, double max_temperature);
    void finish();

private:
    bool quiet_, terminal_;
    double expected_;
    std::chrono::steady_clock::time_point start_, last_;
};

}  // namespace heatbead

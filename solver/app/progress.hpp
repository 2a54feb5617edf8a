// Progress of a long run: one self-overwriting line on a terminal, plain lines otherwise.
#pragma once

#include <chrono>
#include <cstdio>
#include <optional>

namespace heatbead {

// What the time left is judged by: the simulated time the run is expected to take (the run
// estimate), and the stop rule it follows.
struct ProgressPlan {
    double expected_time = 0;      // s simulated
    double stop_temperature = 0;   // °C: the run ends once every solid cell is below this
    double base_temperature = 20;  // °C: the preheat the joint cools back toward
    double time_limit = 600;       // s simulated
};

class ProgressPrinter {
public:
    ProgressPrinter(bool quiet, const ProgressPlan& plan);
    void update(double t, double arc_x, double dt, double max_temperature);
    void finish();

private:
    double expected_end(double t, double max_temperature) const;

    bool quiet_, terminal_;
    ProgressPlan plan_;
    std::optional<double> arc_off_;  // s: when the arc last went off
    std::chrono::steady_clock::time_point start_, last_;
    double last_t_ = 0;  // simulated time at the last line
};

}  // namespace heatbead

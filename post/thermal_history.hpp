// What every cell went through, kept without storing time series: peak temperature, when it
// peaked, and the last downward crossing times of 800, 500, 300 and 100 °C. Cooling times then
// follow cell by cell: t8/5 = t(500) − t(800), t8/3 = t(300) − t(800), time to 100 °C.
#pragma once

#include <array>
#include <cstddef>
#include <span>
#include <vector>

namespace heatbead::post {

class ThermalHistory {
public:
    static constexpr std::array<double, 4> levels{800.0, 500.0, 300.0, 100.0};  // °C

    ThermalHistory(std::size_t cells, double initial_temperature);

    // One accepted step from (t0, T0) to (t1, T1), for cells [begin, end). Crossing times are
    // interpolated linearly in time within the step: t = t0 + (T0 − θ)/(T0 − T1)·(t1 − t0).
    void record(double t0, std::span<const double> T0, double t1, std::span<const double> T1, std::size_t begin,
                std::size_t end);

    // A cell that appears at temperature T at time t (weld metal born molten) has peaked at least there.
    void appear(std::size_t cell, double t, double T) {
        if (T > peak_[cell]) peak_[cell] = T, time_of_peak_[cell] = t;
    }

    const std::vector<double>& peak() const { return peak_; }
    const std::vector<double>& time_of_peak() const { return time_of_peak_; }
    // Last time the cell cooled through levels[n]; NaN if it never did.
    const std::vector<double>& last_below(std::size_t n) const { return last_below_[n]; }
    // t(500) − t(800) where the cell went above 800 °C and has cooled below 500 °C, else NaN.
    std::vector<double> cooling_time(std::size_t from_level, std::size_t to_level) const;

private:
    std::vector<double> peak_, time_of_peak_;
    std::array<std::vector<double>, 4> last_below_;
};

}  // namespace heatbead::post

#include "post/thermal_history.hpp"

#include "mesh/solid_cells.hpp"

#include <cmath>
#include <limits>

namespace heatbead::post {

ThermalHistory::ThermalHistory(std::size_t cells, double initial_temperature)
    : peak_(cells, initial_temperature), time_of_peak_(cells, 0.0) {
    for (auto& v : last_below_) v.assign(cells, std::numeric_limits<double>::quiet_NaN());
}

void ThermalHistory::record(double t0, std::span<const double> T0, double t1, std::span<const double> T1,
                            std::size_t begin, std::size_t end) {
    const double dt = t1 - t0;
#pragma omp parallel for schedule(static) if (end - begin >= mesh::parallel_min_cells)
    for (std::size_t c = begin; c < end; ++c) {
        const double a = T0[c], b = T1[c];
        if (b > peak_[c]) {
            peak_[c] = b;
            time_of_peak_[c] = t1;
        }
        if (b >= a) continue;
        for (std::size_t n = 0; n < levels.size(); ++n) {
            const double theta = levels[n];
            if (a >= theta && b < theta) last_below_[n][c] = t0 + (a - theta) / (a - b) * dt;
        }
    }
}

std::vector<double> ThermalHistory::cooling_time(std::size_t from_level, std::size_t to_level) const {
    std::vector<double> out(peak_.size(), std::numeric_limits<double>::quiet_NaN());
    const auto& from = last_below_[from_level];
    const auto& to = last_below_[to_level];
    for (std::size_t c = 0; c < out.size(); ++c) {
        if (!std::isnan(from[c]) && !std::isnan(to[c]) && to[c] >= from[c]) out[c] = to[c] - from[c];
    }
    return out;
}

}  // namespace heatbead::post

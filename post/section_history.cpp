#include "post/section_history.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>

namespace heatbead::post {

namespace {
constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// Index of the cell of `axis` containing v, or npos.
std::size_t cell_of(const mesh::Axis& axis, double v) {
    const auto& f = axis.faces;
    if (!(v >= f.front() && v <= f.back())) return static_cast<std::size_t>(-1);
    const auto it = std::upper_bound(f.begin(), f.end(), v);
    return std::min(static_cast<std::size_t>(it - f.begin()) - 1, axis.cells() - 1);
}

// Last time the cycle fell through `level`, interpolated; NaN if it never did.
double last_down_crossing(std::span<const double> t, std::span<const double> T, double level) {
    for (std::size_t n = T.size(); n-- > 1;) {
        if (T[n - 1] >= level && T[n] < level) return t[n - 1] + (T[n - 1] - level) / (T[n - 1] - T[n]) * (t[n] - t[n - 1]);
    }
    return nan;
}
}  // namespace

SectionHistory::SectionHistory(const mesh::SolidCells& cells, std::size_t slice, double initial_temperature)
    : cells_(cells), slice_(slice), times_{0.0}, values_(cells.ns, static_cast<float>(initial_temperature)) {}

void SectionHistory::record(double t, std::span<const double> T) {
    times_.push_back(t);
    const std::size_t base = cells_.index(slice_, 0);
    for (std::size_t s = 0; s < cells_.ns; ++s) values_.push_back(static_cast<float>(T[base + s]));
}

std::vector<double> SectionHistory::cycle_at(const mesh::Grid& grid, double y, double z) const {
    const std::size_t ny = grid.y.cells(), ns = cells_.ns;
    const std::size_t j = cell_of(grid.y, y), k = cell_of(grid.z, z);
    if (j >= ny || k >= grid.z.cells() || cells_.at(j, k, ny) == mesh::no_neighbour) return {};
    // The lower-left centre of the interpolation square, and the weights.
    const std::size_t j0 = y >= grid.y.centre(j) ? j : (j > 0 ? j - 1 : j);
    const std::size_t k0 = z >= grid.z.centre(k) ? k : (k > 0 ? k - 1 : k);
    std::array<std::uint32_t, 4> corner{};
    bool bilinear = j0 + 1 < ny && k0 + 1 < grid.z.cells();
    if (bilinear) {
        corner = {cells_.at(j0, k0, ny), cells_.at(j0 + 1, k0, ny), cells_.at(j0, k0 + 1, ny), cells_.at(j0 + 1, k0 + 1, ny)};
        bilinear = std::none_of(corner.begin(), corner.end(), [](std::uint32_t c) { return c == mesh::no_neighbour; });
    }
    const std::size_t steps = times_.size();
    std::vector<double> out(steps);
    if (!bilinear) {
        const std::uint32_t s = cells_.at(j, k, ny);
        for (std::size_t n = 0; n < steps; ++n) out[n] = values_[n * ns + s];
        return out;
    }
    const double u = std::clamp((y - grid.y.centre(j0)) / (grid.y.centre(j0 + 1) - grid.y.centre(j0)), 0.0, 1.0);
    const double w = std::clamp((z - grid.z.centre(k0)) / (grid.z.centre(k0 + 1) - grid.z.centre(k0)), 0.0, 1.0);
    const std::array<double, 4> weight{(1 - u) * (1 - w), u * (1 - w), (1 - u) * w, u * w};
    for (std::size_t n = 0; n < steps; ++n) {
        double v = 0;
        for (int c = 0; c < 4; ++c) v += weight[c] * values_[n * ns + corner[c]];
        out[n] = v;
    }
    return out;
}

namespace {
// Cooling rate at `level`: the slope of the step that crosses it last on the way down (NaN if none).
double cooling_rate_at(std::span<const double> time, std::span<const double> T, double level) {
    for (std::size_t n = T.size(); n-- > 1;) {
        if (T[n - 1] >= level && T[n] < level) return (T[n - 1] - T[n]) / (time[n] - time[n - 1]);
    }
    return nan;
}
}  // namespace

CycleFigures cycle_figures(std::span<const double> time, std::span<const double> T, double ac1) {
    CycleFigures f;
    const auto peak = std::max_element(T.begin(), T.end());
    f.peak = *peak;
    f.time_of_peak = time[static_cast<std::size_t>(peak - T.begin())];
    const double t800 = last_down_crossing(time, T, 800), t500 = last_down_crossing(time, T, 500);
    const double t300 = last_down_crossing(time, T, 300), t100 = last_down_crossing(time, T, 100);
    f.t8_5 = t500 - t800;
    f.t8_3 = t300 - t800;
    // Only a fall through 100 °C after the peak counts (a preheat of about 100 °C may dip below it first).
    f.time_to_100 = t100 > f.time_of_peak ? t100 - f.time_of_peak : nan;
    f.rate_540 = cooling_rate_at(time, T, 540);
    f.rate_700 = cooling_rate_at(time, T, 700);
    // Time above Ac1: the parts of each step above it, with linear interpolation at crossings.
    double above = 0;
    for (std::size_t n = 1; n < T.size(); ++n) {
        const double a = T[n - 1] - ac1, b = T[n] - ac1, dt = time[n] - time[n - 1];
        if (a >= 0 && b >= 0) above += dt;
        else if (a >= 0 || b >= 0) above += dt * std::max(a, b) / std::abs(a - b);
    }
    f.time_above_ac1 = above;
    return f;
}

}  // namespace heatbead::post

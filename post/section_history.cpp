#include "post/section_history.hpp"

#include "mesh/interpolation.hpp"
#include "post/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace heatbead::post {

namespace {
constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// Last time the cycle fell through `level`, interpolated; NaN if it never did.
double last_down_crossing(std::span<const double> t, std::span<const double> T, double level) {
    for (std::size_t n = T.size(); n-- > 1;) {
        if (T[n - 1] >= level && T[n] < level) return t[n - 1] + (T[n - 1] - level) / (T[n - 1] - T[n]) * (t[n] - t[n - 1]);
    }
    return nan;
}
}  // namespace

SectionHistory::SectionHistory(const mesh::SolidCells& cells, std::size_t slice, double initial_temperature)
    : cells_(cells),
      slice_(slice),
      initial_(initial_temperature),
      laid_(cells.ns, -std::numeric_limits<double>::infinity()),
      times_{0.0},
      values_(cells.ns, static_cast<float>(initial_temperature)) {
    for (std::size_t s = 0; s < cells.ns; ++s) {
        if (cells.tag[s] == mesh::Tag::weld) laid_[s] = std::numeric_limits<double>::infinity();
    }
}

void SectionHistory::appear(std::size_t cell, double t) {
    if (cell / cells_.ns == slice_) laid_[cell % cells_.ns] = t;
}

void SectionHistory::record(double t, std::span<const double> T) {
    times_.push_back(t);
    const std::size_t base = cells_.index(slice_, 0);
    for (std::size_t s = 0; s < cells_.ns; ++s) values_.push_back(static_cast<float>(T[base + s]));
}

std::vector<double> SectionHistory::cycle_at(const mesh::Grid& grid, double y, double z) const {
    const auto corners = mesh::section_corners(grid, cells_, y, z);
    if (std::all_of(corners.begin(), corners.end(), [](const mesh::Corner& c) { return c.s == mesh::no_neighbour; })) {
        return {};
    }
    const std::size_t steps = times_.size(), ns = cells_.ns;
    std::vector<double> out(steps);
    for (std::size_t n = 0; n < steps; ++n) {
        const auto laid = [&](const mesh::Corner& c) { return laid_[c.s] <= times_[n]; };
        const auto value = [&](const mesh::Corner& c) { return static_cast<double>(values_[n * ns + c.s]); };
        out[n] = mesh::interpolate(corners, laid, value).value_or(initial_);
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
    // A figure read as the cycle falls from `upper` through `lower` is missing when the peak stayed
    // below `upper`, or when the cycle had not fallen through `lower` when the run ended.
    const auto why = [&](double value, double upper, double lower) -> std::string {
        if (!std::isnan(value)) return "";
        if (f.peak < upper) return format_text("peak %.0f degC stays below %.0f degC", f.peak, upper);
        return format_text("did not cool below %.0f degC by the end of the run at %.1f s (still %.0f degC)", lower,
                           time.back(), T.back());
    };
    f.no_t8_5 = why(f.t8_5, 800, 500);
    f.no_t8_3 = why(f.t8_3, 800, 300);
    f.no_rate_540 = why(f.rate_540, 540, 540);
    f.no_rate_700 = why(f.rate_700, 700, 700);
    f.no_time_to_100 = why(f.time_to_100, 100, 100);
    return f;
}

}  // namespace heatbead::post

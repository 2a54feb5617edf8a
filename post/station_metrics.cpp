#include "post/station_metrics.hpp"

#include <algorithm>
#include <cmath>

namespace heatbead::post {

StationMetrics station_metrics(const mesh::Grid& grid, const mesh::SolidCells& cells, const ThermalHistory& history,
                               double station, double solidus) {
    StationMetrics m;
    const auto& xf = grid.x.faces;
    m.slice = static_cast<std::size_t>(std::upper_bound(xf.begin(), xf.end(), station) - xf.begin());
    m.slice = std::clamp<std::size_t>(m.slice, 1, grid.x.cells()) - 1;
    const auto& peak = history.peak();
    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();

    // Flange cells have z < 0; walk each column down from the top face.
    double deepest = -1;
    for (std::size_t j = 0; j < ny; ++j) {
        std::size_t k = nz;
        while (k > 0 && !(grid.z.centre(k - 1) < 0 && cells.at(j, k - 1, ny) != mesh::no_neighbour &&
                          cells.tag[cells.at(j, k - 1, ny)] == mesh::Tag::flange)) {
            --k;
        }
        if (k == 0) continue;
        --k;  // topmost flange cell of the column
        double previous_depth = -grid.z.centre(k), previous_peak = peak[cells.index(m.slice, cells.at(j, k, ny))];
        if (previous_peak < solidus) continue;
        double depth = previous_depth;
        for (std::size_t kk = k; kk-- > 0;) {
            const std::uint32_t s = cells.at(j, kk, ny);
            if (s == mesh::no_neighbour) break;
            const double d = -grid.z.centre(kk), p = peak[cells.index(m.slice, s)];
            if (p < solidus) {
                depth = previous_depth + (previous_peak - solidus) / (previous_peak - p) * (d - previous_depth);
                break;
            }
            previous_depth = d, previous_peak = p, depth = d;
        }
        deepest = std::max(deepest, depth);
    }
    if (deepest >= 0) m.penetration = deepest;

    const std::vector<double> t85 = history.cooling_time(0, 1);
    std::vector<double> values;
    for (std::size_t s = 0; s < cells.ns; ++s) {
        const std::size_t c = cells.index(m.slice, s);
        if (peak[c] > 900 && peak[c] < solidus && !std::isnan(t85[c])) values.push_back(t85[c]);
    }
    m.haz_cells = values.size();
    if (!values.empty()) {
        std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2), values.end());
        m.t8_5 = values[values.size() / 2];
    }
    return m;
}

}  // namespace heatbead::post

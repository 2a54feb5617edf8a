#include "post/haz_cooling.hpp"

#include <algorithm>
#include <cmath>

namespace heatbead::post {

HazCooling haz_cooling(const mesh::SolidCells& cells, const ThermalHistory& history, std::size_t slice, double solidus) {
    const auto& peak = history.peak();
    const std::vector<double> t85 = history.cooling_time(0, 1);
    std::vector<double> values;
    for (std::size_t s = 0; s < cells.ns; ++s) {
        const std::size_t c = cells.index(slice, s);
        if (peak[c] > 900 && peak[c] < solidus && !std::isnan(t85[c])) values.push_back(t85[c]);
    }
    HazCooling h;
    h.cells = values.size();
    if (!values.empty()) {
        std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(values.size() / 2), values.end());
        h.t8_5 = values[values.size() / 2];
    }
    return h;
}

}  // namespace heatbead::post

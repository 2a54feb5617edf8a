// One figure for a whole cross-section's HAZ: the median t8/5 over its cells. t8/5 is nearly
// the same wherever the peak exceeded about 900 °C (EN 1011-2 Annex D), so the median over those
// cells is a robust single value, used to compare grids (heatbead bench).
#pragma once

#include "mesh/solid_cells.hpp"
#include "post/thermal_history.hpp"

#include <optional>

namespace heatbead::post {

struct HazCooling {
    std::optional<double> t8_5;  // s, median over cells of the slice whose peak lay between 900 °C and solidus
    std::size_t cells = 0;       // how many cells that median is over
};

HazCooling haz_cooling(const mesh::SolidCells& cells, const ThermalHistory& history, std::size_t slice, double solidus);

}  // namespace heatbead::post

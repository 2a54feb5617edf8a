// Quick measures of one cross-section of a run, from the per-cell thermal history: how deep the
// fusion zone reaches below the flange top and the HAZ's t8/5. (The full macro-etch style
// measurement of the cross-section builds on these.)
#pragma once

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"
#include "post/thermal_history.hpp"

#include <optional>

namespace heatbead::post {

struct StationMetrics {
    std::size_t slice = 0;              // x index of the cross-section
    std::optional<double> penetration;  // m below the flange top reached by the solidus of peak temperature
    std::optional<double> t8_5;         // s, median over HAZ cells whose peak lay between 900 °C and solidus
    std::size_t haz_cells = 0;
};

// `station` is x along the weld [m]; `solidus` in °C. Penetration: in each flange column (j)
// of the slice, the depth where the peak temperature falls through the solidus, interpolated
// linearly between cell centres; the deepest column counts. t8/5 is nearly the same wherever the
// peak exceeded about 900 °C (EN 1011-2 Annex D), hence the median over those cells.
StationMetrics station_metrics(const mesh::Grid& grid, const mesh::SolidCells& cells, const ThermalHistory& history,
                               double station, double solidus);

}  // namespace heatbead::post

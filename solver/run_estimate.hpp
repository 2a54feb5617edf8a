// Size and cost of a run, known before it starts: memory, stable explicit step, rough run time.
#pragma once

#include "mesh/grid.hpp"
#include "solver/case.hpp"

namespace heatbead {

// Storage the solver plans per solid cell: temperature, enthalpy, rate, conductivity, peak
// temperature, time of peak and four crossing times (10 doubles), six neighbour indices
// (int32), three face conductances and two integrator work arrays (doubles).
inline constexpr double bytes_per_solid_cell = 10 * 8 + 6 * 4 + 3 * 8 + 2 * 8;

// Bytes a run on this grid needs: per solid cell as above, plus one tag byte per cell.
double run_memory_bytes(const mesh::Grid& grid);

// Forward-Euler stability limit of the finite-volume Laplacian on a rectilinear grid:
// dt ≤ 1 / (α · max_i Σ_axes (1/Δ_i)(1/d_i− + 1/d_i+)), d = distance between cell centres.
// Taken over all cells (the axes are independent, so the maximum is the sum of axis maxima).
double stable_explicit_step(const mesh::Grid& grid, double diffusivity);

struct RunEstimate {
    double simulated_time = 0;  // s: weld time L/v plus cooling to the stop temperature
    double explicit_step = 0;   // s
    double steps = 0;           // explicit steps
    double cell_updates = 0;    // steps × solid cells
    double seconds = 0;         // at the assumed rate below
};
// Assumed speed of the explicit reference update on one of these 2-core machines, until
// `heatbead bench` measures it: a figure for planning only.
inline constexpr double assumed_cell_updates_per_second = 1.5e8;
RunEstimate estimate_run(const Case& c, const mesh::Grid& grid);

}  // namespace heatbead

// Size and cost of a run, known before it starts: memory, stable explicit step, rough run time.
#pragma once

#include "mesh/grid.hpp"
#include "solver/physics/material.hpp"

#include <optional>

namespace heatbead {

// Storage per solid cell, counted from the arrays a run holds (doubles unless noted):
//   simulation: H, T and their copies at the step start                  4
//   operator:   k and three face conductances, surface loss conductance  5, plus fused (1 byte)
//   rkl2:       Y0, L(Y0), Y(j−1), Y(j−2), L(Y(j−1))                      5
//   history:    peak, time of peak, four crossing times                  6
//   active flag                                                          1 byte
inline constexpr double bytes_per_solid_cell = (4 + 5 + 5 + 6) * 8 + 2;

// Bytes a run on this grid needs: per solid cell as above, plus one tag byte per cell.
double run_memory_bytes(const mesh::Grid& grid);

// Forward-Euler stability limit of the finite-volume Laplacian on a rectilinear grid:
// dt ≤ 1 / (α · max_i Σ_axes (1/Δ_i)(1/d_i− + 1/d_i+)), d = distance between cell centres.
// Taken over all cells (the axes are independent, so the maximum is the sum of axis maxima).
double stable_explicit_step(const mesh::Grid& grid, double diffusivity);

struct RunEstimate {
    double simulated_time = 0;  // s: weld time L/v plus cooling to the stop temperature (or the hold)
    double explicit_step = 0;   // s
    double steps = 0;           // explicit steps
    double cell_updates = 0;    // steps × solid cells
    double seconds = 0;         // at the assumed rate below
};
// Assumed speed of the explicit reference update on one of these 2-core machines, until
// `heatbead bench` measures it: a figure for planning only.
inline constexpr double assumed_cell_updates_per_second = 1.5e8;
// What the estimate reads of a run: weld length [m], travel speed [m/s], heat input [J/m], the
// preheat and stop temperatures [°C] and the time limit [s]; the hold after the pass [s] when the
// stop rule has one (StopRule::Hold).
struct EstimateInputs {
    double weld_length = 0, travel_speed = 0, heat_input = 0;
    double preheat = 20, stop_temperature = 300, time_limit = 600;
    std::optional<double> hold;
};
RunEstimate estimate_run(const EstimateInputs& run, const mesh::Grid& grid, const Material& material);

}  // namespace heatbead

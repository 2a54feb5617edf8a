#include "solver/numerics/run_estimate.hpp"

#include <algorithm>
#include <limits>
#include <numbers>

namespace heatbead {

double run_memory_bytes(const mesh::Grid& grid) {
    return static_cast<double>(grid.solid_cells()) * bytes_per_solid_cell + static_cast<double>(grid.cells());
}

namespace {
// max_i (1/Δ_i)(1/d_i− + 1/d_i+) along one axis.
double axis_stiffness(const mesh::Axis& axis) {
    double worst = 0;
    const std::size_t n = axis.cells();
    for (std::size_t i = 0; i < n; ++i) {
        double sum = 0;
        if (i > 0) sum += 1.0 / (axis.centre(i) - axis.centre(i - 1));
        if (i + 1 < n) sum += 1.0 / (axis.centre(i + 1) - axis.centre(i));
        worst = std::max(worst, sum / axis.width(i));
    }
    return worst;
}
}  // namespace

double stable_explicit_step(const mesh::Grid& grid, double diffusivity) {
    return 1.0 / (diffusivity * (axis_stiffness(grid.x) + axis_stiffness(grid.y) + axis_stiffness(grid.z)));
}

RunEstimate estimate_run(const EstimateInputs& run, const mesh::Grid& grid, const Material& material) {
    RunEstimate e;
    // Cooling after the arc has passed, thick-plate line-source estimate (Rosenthal 1946):
    // T − T0 = (q/v) / (2πk·t)  ⇒  t = (q/v) / (2πk (T_stop − T0)), or the hold if sooner. A stop
    // at or below the preheat is never met by cooling: the run lasts to the time limit.
    const double k = material.conductivity(run.stop_temperature);
    double cooling = run.stop_temperature > run.preheat
                         ? run.heat_input / (2 * std::numbers::pi * k * (run.stop_temperature - run.preheat))
                         : std::numeric_limits<double>::infinity();
    if (run.hold) cooling = std::min(cooling, *run.hold);
    e.simulated_time = std::min(run.time_limit, run.weld_length / run.travel_speed + cooling);
    e.explicit_step = stable_explicit_step(grid, material.max_diffusivity());
    e.steps = e.simulated_time / e.explicit_step;
    e.cell_updates = e.steps * static_cast<double>(grid.solid_cells());
    e.seconds = e.cell_updates / assumed_cell_updates_per_second;
    return e;
}

}  // namespace heatbead

// From a validated case to the objects a run needs: grid, material, passes and settings.
#pragma once

#include "mesh/grid.hpp"
#include "post/section_history.hpp"
#include "solver/case.hpp"
#include "solver/material.hpp"
#include "solver/simulation.hpp"

#include <memory>
#include <vector>

namespace heatbead {

Material make_material(const MaterialSpec& base);
SurfaceLosses make_losses(const Case& c);
// One pass per side: side +1 first; side −1 after the interpass wait (or once the hottest cell
// has cooled to the interpass temperature).
std::vector<Pass> make_passes(const Case& c);
RunSettings make_settings(const Case& c);

// A run ready to start: the simulation with the case's probes, and the recorder of the station
// slice (thermal cycles for the probes and the cross-section) already observing it.
struct PreparedRun {
    std::unique_ptr<Simulation> sim;
    std::unique_ptr<post::SectionHistory> station;
};
PreparedRun prepare_run(const Case& c, const mesh::Grid& grid, const Material& material);

}  // namespace heatbead

#include "solver/studies/run_setup.hpp"

#include "solver/case/table_files.hpp"
#include "solver/numerics/integrators.hpp"
#include "solver/numerics/run_estimate.hpp"

#include "solver/physics/procedure.hpp"

#include <algorithm>

namespace heatbead {

SolverFacts solver_facts() { return {integrator_names, bytes_per_solid_cell, run_memory_bytes}; }

LoadedCase load_case(const std::string& path, const std::vector<Override>& overrides) {
    return read_case(path, overrides, solver_facts());
}

Material make_material(const MaterialSpec& base) {
    const MaterialParameters parameters{base.solidus, base.liquidus, base.latent_heat, base.liquid_conductivity_factor};
    if (base.properties_file.empty()) return make_en1993_steel(parameters);
    return read_property_table(base.properties_file, base.density, parameters);
}

SurfaceLosses make_losses(const Case& c) {
    return {c.surface.convection, c.surface.emissivity, c.temperatures.ambient, c.surface.contact_conductance};
}

std::vector<Pass> make_passes(const Case& c) {
    std::vector<Pass> passes;
    for (int side : {1, -1}) {
        if (side == -1 && c.joint.sides < 2) break;
        Pass p;
        const auto& proc = c.procedure;
        const SourceOrigin origin = c.source.origin_at_root ? SourceOrigin::root : SourceOrigin::face;
        p.path = [joint = c.joint, side, proc, origin](double start) {
            return torch_path(joint, side, proc.work_angle, proc.travel_angle, proc.travel_speed, start, origin);
        };
        p.shape = c.source;
        p.net_power = net_power(proc);
        p.side = side;
        p.web_centre = c.joint.web_offset;
        p.wait = proc.interpass_wait;
        p.interpass = c.temperatures.interpass;
        passes.push_back(p);
    }
    return passes;
}

namespace {

// The x-slice holding the station.
std::size_t station_slice(const mesh::Grid& grid, double station) {
    const auto& f = grid.x.faces;
    const auto i = static_cast<std::size_t>(std::upper_bound(f.begin(), f.end(), station) - f.begin());
    return std::clamp<std::size_t>(i, 1, grid.x.cells()) - 1;
}

}  // namespace

RunSettings make_settings(const Case& c) {
    RunSettings s;
    s.initial_temperature = c.temperatures.preheat;
    s.stop_temperature = c.solver.stop_temperature;
    s.time_limit = c.solver.time_limit;
    s.integrator = c.solver.integrator;
    s.control.max_change = c.solver.max_temperature_change;
    s.control.travel_fraction = c.solver.travel_per_step;
    return s;
}

PreparedRun prepare_run(const Case& c, const mesh::Grid& grid, const Material& material) {
    PreparedRun r;
    r.sim = std::make_unique<Simulation>(grid, material, make_losses(c), make_passes(c), make_settings(c));
    for (std::size_t i = 0; i < c.output.probes.size(); ++i) {
        r.sim->add_probe("user_" + std::to_string(i + 1), c.output.probes[i]);
    }
    r.cells = record_history(*r.sim, c.temperatures.preheat);
    r.station = std::make_unique<post::SectionHistory>(r.sim->cells(), station_slice(grid, c.output.station),
                                                       c.temperatures.preheat);
    r.station_recorder = std::make_unique<StationRecorder>(*r.station);
    r.sim->add_observer(*r.station_recorder);
    return r;
}

RecordedHistory record_history(Simulation& sim, double initial_temperature) {
    RecordedHistory h;
    h.history = std::make_unique<post::ThermalHistory>(sim.cells().size(), initial_temperature);
    h.recorder = std::make_unique<HistoryRecorder>(*h.history);
    sim.add_observer(*h.recorder);
    return h;
}

RunEstimate estimate_run(const Case& c, const mesh::Grid& grid, const Material& material) {
    const EstimateInputs run{c.joint.weld_length,      c.procedure.travel_speed,   heat_input(c.procedure),
                             c.temperatures.preheat,   c.solver.stop_temperature, c.solver.time_limit};
    return estimate_run(run, grid, material);
}

}  // namespace heatbead

#include "solver/run_setup.hpp"

#include "solver/procedure.hpp"

namespace heatbead {

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

}  // namespace heatbead

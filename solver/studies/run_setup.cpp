#include "solver/studies/run_setup.hpp"

#include "solver/case/table_files.hpp"
#include "solver/numerics/integrators.hpp"
#include "solver/numerics/run_estimate.hpp"

#include "solver/core/text.hpp"
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
        switch (c.solver.weld_metal) {
            case WeldMetalModel::as_droplets:
                p.birth_temperature = transfer_preset(proc.process, proc.transfer).droplet_temperature;
                break;
            case WeldMetalModel::at_liquidus: p.birth_temperature = c.base.liquidus; break;
            case WeldMetalModel::present_from_start: break;
        }
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

namespace {

struct StopLevel {
    double temperature;  // °C
    const char* answer;
};

std::string joined(const std::vector<std::string>& parts) {
    std::string out;
    for (const auto& p : parts) out += (out.empty() ? "" : "; ") + p;
    return out;
}

}  // namespace

StopPlan stop_plan(const Case& c) {
    StopPlan plan;
    const auto& t = c.temperatures;
    plan.base = c.joint.sides == 2 ? std::max(t.preheat, t.interpass) : t.preheat;
    const std::string base_words =
        format_text(c.joint.sides == 2 && t.interpass > t.preheat ? "the %.0f degC interpass" : "the %.0f degC preheat",
                    plan.base);
    if (c.solver.stop_temperature) {
        plan.automatic = false;
        plan.rule.temperature = *c.solver.stop_temperature;
        plan.rule.basis = "solver.stop_temperature given in the case";
        if (plan.rule.temperature <= plan.base) {
            plan.never = format_text("solver.stop_temperature %.0f degC is at or below %s: the pass's own cooling "
                                     "never takes the joint below it, so the run goes on to the time limit (%.0f s)",
                                     plan.rule.temperature, base_words.c_str(), c.solver.time_limit);
        }
        return plan;
    }
    std::vector<StopLevel> kept;
    for (const StopLevel level : {StopLevel{500, "t8/5"}, StopLevel{300, "t8/3"}}) {
        if (level.temperature > plan.base + stop_margin) {
            kept.push_back(level);
        } else {
            plan.dropped.push_back(format_text("%.0f degC for %s: within %.0f K of %s, which conduction approaches "
                                               "only slowly",
                                               level.temperature, level.answer, stop_margin, base_words.c_str()));
        }
    }
    const auto& need = c.preheat_search.min_time_to_100;
    const bool to_100 = need && plan.base < 100;
    if (need && !to_100) {
        plan.dropped.push_back(format_text("100 degC for the time to 100 degC: %s is at or above it, so the joint "
                                           "never cools to 100 degC in the run (a preheat of 100 degC or more meets "
                                           "preheat_search.min_time_to_100)",
                                           base_words.c_str()));
    }
    // The hold waits for every cell past the levels above 100 °C (or the fallback below).
    const double above_100 = kept.empty() ? plan.base + 2 * stop_margin : kept.back().temperature;
    if (to_100) {
        plan.rule.temperature = 100;
        plan.rule.hold = StopRule::Hold{*need + hold_margin, above_100};
        plan.rule.basis = format_text("the time to 100 degC needs 100 degC, or %.0f s after the last pass with every "
                                      "cell below %.0f degC (the %.0f s asked by preheat_search.min_time_to_100 + %.0f s)",
                                      *need + hold_margin, above_100, *need, hold_margin);
    } else if (!kept.empty()) {
        plan.rule.temperature = kept.back().temperature;
        plan.rule.basis = format_text("%s needs %.0f degC", kept.back().answer, kept.back().temperature);
    } else {
        plan.rule.temperature = above_100;
        plan.rule.basis = format_text("no cooling figure can be reached from %s; every peak is past within %.0f K of it",
                                      base_words.c_str(), 2 * stop_margin);
    }
    if (!plan.dropped.empty()) plan.rule.basis += "; not waited for: " + joined(plan.dropped);
    return plan;
}

RunSettings make_settings(const Case& c) {
    RunSettings s;
    s.initial_temperature = c.temperatures.preheat;
    s.stop = stop_plan(c).rule;
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
    const StopPlan plan = stop_plan(c);
    const std::optional<double> hold = plan.rule.hold ? std::optional(plan.rule.hold->time) : std::nullopt;
    const EstimateInputs run{c.joint.weld_length,   c.procedure.travel_speed, heat_input(c.procedure), plan.base,
                             plan.rule.temperature, c.solver.time_limit,      hold};
    return estimate_run(run, grid, material);
}

}  // namespace heatbead

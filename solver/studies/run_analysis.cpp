#include "solver/studies/run_analysis.hpp"

#include "solver/weldability/haz_hardness.hpp"
#include "solver/weldability/metallurgy.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/core/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace heatbead {

namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// Without a composition, HAZ boundaries come from a typical structural C–Mn steel
// (C 0.20, Mn 1.40, Si 0.30: invented for this purpose, within usual product limits).
Composition assumed_composition() {
    Composition c;
    c.C = 0.20, c.Mn = 1.40, c.Si = 0.30;
    return c;
}

// The fusion-line point deepest into the flange (lowest z below the top face) and the one
// deepest into the web (furthest beyond the web face, on the bead's side), in (y, z).
struct DeepestPoints {
    std::optional<std::array<double, 2>> flange, web;
};

DeepestPoints deepest_points(const std::vector<post::Polyline>& fusion, double web_face, int side) {
    DeepestPoints d;
    for (const auto& line : fusion) {
        for (const auto& p : line.points) {
            if (p[1] < 0 && (!d.flange || p[1] < (*d.flange)[1])) d.flange = p;
            const double into_web = side * (web_face - p[0]);
            if (p[1] > 0 && into_web > 0 && (!d.web || into_web > side * (web_face - (*d.web)[0]))) d.web = p;
        }
    }
    return d;
}

ProbeResult probe_from_cycle(std::string name, std::array<double, 3> at, std::vector<double> time,
                             std::vector<double> temperature, double ac1) {
    ProbeResult p;
    p.name = std::move(name), p.position = at, p.time = std::move(time), p.temperature = std::move(temperature);
    if (!p.temperature.empty()) p.figures = post::cycle_figures(p.time, p.temperature, ac1);
    return p;
}

}  // namespace

Composition haz_composition(const Case& c, bool& assumed) {
    assumed = !c.base.composition;
    return c.base.composition.value_or(assumed_composition());
}

post::SectionLevels section_levels(const Case& c) {
    bool assumed = false;
    const Composition comp = haz_composition(c, assumed);
    return {c.base.solidus, andrews_ac1(comp), andrews_ac3(comp)};
}

RunAnalysis analyse_run(const Case& c, const PreparedRun& run) {
    const Simulation& sim = *run.sim;
    const post::SectionHistory& station = *run.station;
    RunAnalysis a;
    haz_composition(c, a.composition_assumed);
    const post::SectionLevels levels = section_levels(c);
    a.ac1 = levels.ac1, a.ac3 = levels.ac3;
    const auto& grid = sim.grid();
    const auto& peak = run.history().peak();
    a.section = post::measure_cross_section(c.joint, grid, sim.cells(), peak, c.output.station, 1, levels);
    a.along = post::along_weld(c.joint, grid, sim.cells(), peak, 5e-3, 1, levels);
    a.t8_5 = run.history().cooling_time(0, 1);

    // Automatic probes at the station: on the fusion line where it reaches deepest into each
    // plate, then 0.5, 1 and 2 mm further into that plate (normal to it), and at the root.
    const double x = grid.x.centre(station.slice());
    const double web_face = c.joint.web_face(1);
    const auto deepest = deepest_points(a.section.fusion_line, web_face, 1);
    const auto add = [&](const std::string& name, double y, double z) {
        auto cycle = station.cycle_at(grid, y, z);
        if (!cycle.empty()) a.probes.push_back(probe_from_cycle(name, {x, y, z}, station.times(), std::move(cycle), a.ac1));
    };
    const auto mm = [](double v) { return format_text("%.1f", v * 1e3); };
    if (deepest.flange) {
        const auto [y, z] = *deepest.flange;
        add("fusion_flange", y, z);
        for (double d : haz_probe_offsets) add("haz_flange_" + mm(d) + "mm", y, z - d);
    }
    if (deepest.web) {
        const auto [y, z] = *deepest.web;
        add("fusion_web", y, z);
        for (double d : haz_probe_offsets) add("haz_web_" + mm(d) + "mm", y - d, z);
    }
    add("root", web_face, 0.0);
    for (const auto& p : sim.probes()) a.probes.push_back(probe_from_cycle(p.name, p.position, p.time, p.temperature, a.ac1));
    if (c.base.composition) {
        for (auto& p : a.probes) {
            const auto& f = p.figures;
            const bool in_haz = p.name.rfind("fusion_", 0) == 0 || p.name.rfind("haz_", 0) == 0;
            if (!in_haz || f.peak < a.ac3 || !std::isfinite(f.t8_5) || !std::isfinite(f.rate_700)) continue;
            const HardnessEstimate h = haz_hardness(*c.base.composition, f.t8_5, f.rate_700);
            p.hardness = h.hv;
            p.hardness_bound = h.bound;
        }
    }
    return a;
}

const ProbeResult* RunAnalysis::hardest() const {
    const ProbeResult* best = nullptr;
    for (const auto& p : probes) {
        if (!std::isnan(p.hardness) && (!best || p.hardness > best->hardness)) best = &p;
    }
    return best;
}

namespace {
std::string csv_number(double v, int decimals) {
    if (std::isnan(v)) return "";
    return format_text("%.*f", decimals, v);
}
}  // namespace

std::string along_weld_csv(const RunAnalysis& a) {
    std::string out =
        "x [mm],penetration_flange [mm],penetration_web [mm],fused_leg_flange [mm],fused_leg_web [mm],"
        "actual_throat [mm],fused_area [mm2],dilution [%],root_fused,haz_width_flange [mm],haz_width_web [mm]\n";
    for (const auto& x : a.along) {
        out += csv_number(x.station * 1e3, 1) + "," + csv_number(x.penetration_flange * 1e3, 3) + "," +
               csv_number(x.penetration_web * 1e3, 3) + "," + csv_number(x.fused_leg_flange * 1e3, 3) + "," +
               csv_number(x.fused_leg_web * 1e3, 3) + "," + csv_number(x.actual_throat * 1e3, 3) + "," +
               csv_number(x.fused_area * 1e6, 2) + "," + csv_number(x.dilution * 100, 1) + "," +
               (x.root_fused ? "yes" : "no") + "," + csv_number(x.haz_width_flange * 1e3, 3) + "," +
               csv_number(x.haz_width_web * 1e3, 3) + "\n";
    }
    return out;
}

std::string section_lines_csv(const RunAnalysis& a) {
    std::string out = "line,part,y [mm],z [mm]\n";
    const auto& x = a.section;
    for (const auto& [name, lines] : {std::pair{"fusion", &x.fusion_line}, std::pair{"ac3", &x.ac3_line},
                                      std::pair{"ac1", &x.ac1_line}}) {
        for (std::size_t part = 0; part < lines->size(); ++part) {
            for (const auto& [y, z] : (*lines)[part].points) {
                out += std::string(name) + "," + std::to_string(part) + "," + csv_number(y * 1e3, 4) + "," +
                       csv_number(z * 1e3, 4) + "\n";
            }
        }
    }
    return out;
}

std::string probes_csv(const RunAnalysis& a) {
    std::string out = "probe,x [mm],y [mm],z [mm],peak [degC],t8/5 [s],t8/3 [s],cooling rate at 540 degC [K/s],"
                      "cooling rate at 700 degC [K/s],time above Ac1 [s],time to 100 degC [s],HAZ hardness [HV]\n";
    for (const auto& p : a.probes) {
        const auto& f = p.figures;
        out += p.name + "," + csv_number(p.position[0] * 1e3, 2) + "," + csv_number(p.position[1] * 1e3, 2) + "," +
               csv_number(p.position[2] * 1e3, 2) + "," + csv_number(f.peak, 1) + "," + csv_number(f.t8_5, 3) + "," +
               csv_number(f.t8_3, 3) + "," + csv_number(f.rate_540, 1) + "," + csv_number(f.rate_700, 1) + "," +
               csv_number(f.time_above_ac1, 3) + "," + csv_number(f.time_to_100, 2) + "," + csv_number(p.hardness, 0) +
               "\n";
    }
    return out;
}

post::Summary make_summary(const Case& c, const RunResult& result, const RunAnalysis& a, double wall) {
    post::Summary s;
    const auto& x = a.section;
    const auto num = [&](std::string group, std::string key, std::string label, double value, std::string unit,
                         int decimals = 2) {
        s.add({std::move(group), std::move(key), std::move(label), value, std::move(unit), decimals, ""});
    };
    const auto word = [&](std::string group, std::string key, std::string label, std::string text) {
        s.add({std::move(group), std::move(key), std::move(label), std::nullopt, "", 0, std::move(text)});
    };
    num("Heat input", "heat_input", "heat input", heat_input(c.procedure) * 1e-6, "kJ/mm", 3);
    num("Heat input", "net_power", "net power", net_power(c.procedure), "W", 0);
    num("Fusion", "penetration_flange", "penetration flange", x.penetration_flange * 1e3, "mm");
    num("Fusion", "penetration_web", "web", x.penetration_web * 1e3, "mm");
    num("Fusion", "fused_leg_flange", "legs flange", x.fused_leg_flange * 1e3, "mm", 1);
    num("Fusion", "fused_leg_web", "web", x.fused_leg_web * 1e3, "mm", 1);
    num("Throat", "design_throat", "design", x.design_throat * 1e3, "mm");
    num("Throat", "actual_throat", "actual", x.actual_throat * 1e3, "mm");
    word("Throat", "root_fused", "root fused", x.root_fused ? "yes" : "NO");
    num("Areas", "fused_area", "fused", x.fused_area * 1e6, "mm2", 1);
    num("Areas", "deposited_area", "deposited", x.deposited_area * 1e6, "mm2", 1);
    num("Areas", "melted_base_area", "melted base", x.melted_base_area * 1e6, "mm2", 1);
    num("Areas", "dilution", "dilution", x.dilution * 100, "%", 0);
    num("HAZ", "haz_width_flange", "width flange", x.haz_width_flange * 1e3, "mm");
    num("HAZ", "haz_width_web", "web", x.haz_width_web * 1e3, "mm");
    num("HAZ", "ac1", "Ac1", a.ac1, "degC", 0);
    num("HAZ", "ac3", "Ac3", a.ac3, "degC", 0);
    // t8/5 and cooling rate over the HAZ probes (not the fusion-line ones beyond the HAZ).
    double lo = nan, hi = nan, rate = nan;
    for (const auto& p : a.probes) {
        if (p.name.rfind("haz_", 0) != 0 || std::isnan(p.figures.t8_5)) continue;
        lo = std::isnan(lo) ? p.figures.t8_5 : std::min(lo, p.figures.t8_5);
        hi = std::isnan(hi) ? p.figures.t8_5 : std::max(hi, p.figures.t8_5);
        rate = std::isnan(rate) ? p.figures.rate_540 : std::max(rate, p.figures.rate_540);
    }
    num("Cooling", "t8_5_min", "t8/5 from", lo, "s");
    num("Cooling", "t8_5_max", "to", hi, "s");
    num("Cooling", "cooling_rate_540", "fastest rate at 540 degC", rate, "K/s", 0);
    if (const ProbeResult* h = a.hardest()) {
        const auto& limits = c.preheat_search;
        num("Hardness", "haz_hardness_max", "HAZ max", h->hardness, "HV", 0);
        word("Hardness", "haz_hardness_probe", "at", h->name);
        num("Hardness", "hardness_limit", "limit", limits.hardness_limit, "HV", 0);
        num("Hardness", "critical_t8_5", "t8/5 needed", critical_t8_5(*c.base.composition, limits.hardness_limit,
                                                                       c.temperatures.preheat), "s", 1);
        if (h->hardness > limits.hardness_limit) {
            s.add_note("Hardness", "ABOVE THE LIMIT: consider preheat (heatbead preheat) or a higher heat input");
        }
        for (const auto& w : hardness_validity(*c.base.composition)) s.add_note("Hardness", w);
    }
    num("Energy", "energy_balance_error", "balance error", result.energy.error() * 100, "%", 3);
    num("Energy", "end_time", "stopped at", result.end_time, "s", 1);
    num("Energy", "run_time", "run time", wall, "s", 1);
    if (x.lack_of_fusion_flange) s.add_note("Fusion", "LACK OF FUSION into the flange predicted");
    // Short-circuit transfer on thick plate is known for cold lap (common practice, no source): say
    // so when this run's own fusion into the flange is shallow.
    if (c.procedure.transfer == Transfer::short_circuit && x.penetration_flange < shallow_fusion) {
        s.add_note("Fusion", x.penetration_flange > 0
                                 ? format_text("short-circuit transfer fuses only %.2f mm into the flange: risk of "
                                               "cold lap (incomplete fusion); confirm by a macro-etch",
                                               x.penetration_flange * 1e3)
                                 : format_text("short-circuit transfer does not fuse the flange (the fusion line stays "
                                               "%.2f mm above it): cold lap (incomplete fusion) expected",
                                               -x.penetration_flange * 1e3));
    }
    if (x.lack_of_fusion_web) s.add_note("Fusion", "LACK OF FUSION into the web predicted");
    if (a.composition_assumed) {
        s.add_note("HAZ", "no composition in the case: Ac1/Ac3 from a typical C-Mn steel (C 0.20, Mn 1.40, Si 0.30)");
    }
    return s;
}

}  // namespace heatbead

#include "solver/studies/run_analysis.hpp"
#include "solver/studies/bead_summary.hpp"

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

// The probe lines of the station's section (post/cross_section.hpp), by the names their probes carry.
struct NamedLine {
    const char* name;
    const post::NormalLine* line;
};
std::array<NamedLine, 4> probe_lines(const post::CrossSection& x) {
    return {{{"flange_mid", &x.flange_mid}, {"flange_toe", &x.flange_toe}, {"web_mid", &x.web_mid}, {"web_toe", &x.web_toe}}};
}

ProbeResult probe_from_cycle(std::string name, ProbeKind kind, std::array<double, 3> at, std::vector<double> time,
                             std::vector<double> temperature, double ac1) {
    ProbeResult p;
    p.name = std::move(name), p.kind = kind, p.position = at, p.time = std::move(time), p.temperature = std::move(temperature);
    if (!p.temperature.empty()) p.figures = post::cycle_figures(p.time, p.temperature, ac1);
    return p;
}

// Sets the probe's HAZ hardness estimate; returns why there is none, or "".
std::string estimate_hardness(const Case& c, double ac3, ProbeResult& p) {
    const auto& f = p.figures;
    if (!c.base.composition) return "no composition in the case";
    if (f.peak < ac3) return format_text("peak %.0f degC stays below Ac3 %.0f degC (not austenitised)", f.peak, ac3);
    if (std::isnan(f.t8_5)) return "no t8/5: " + f.no_t8_5;
    if (std::isnan(f.rate_700)) return "no cooling rate at 700 degC: " + f.no_rate_700;
    const HardnessEstimate h = haz_hardness(*c.base.composition, f.t8_5, f.rate_700);
    p.hardness = h.hv;
    p.hardness_duren = h.duren, p.hardness_yurioka = h.yurioka;
    p.hardness_bound = h.bound;
    return "";
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

    // Automatic probes at the station, on the section's probe lines (the same lines on every grid):
    // where the fusion line crosses the line, or where it does not reach the plate the plate's surface
    // point, then 0.5, 1 and 2 mm further along it into the plate; and the root corner.
    const double x = grid.x.centre(station.slice());
    const auto add = [&](const std::string& name, ProbeKind kind, double y, double z) {
        if (mesh::material_at(c.joint, y, z) == mesh::Tag::empty) return;  // beyond a thin plate
        auto cycle = station.cycle_at(grid, y, z);
        if (!cycle.empty())
            a.probes.push_back(probe_from_cycle(name, kind, {x, y, z}, station.times(), std::move(cycle), a.ac1));
    };
    const auto mm = [](double v) { return format_text("%.1f", v * 1e3); };
    for (const auto& [name, line] : probe_lines(a.section)) {
        const auto along = [&](double d) {
            return std::array{line->surface[0] + d * line->inward[0], line->surface[1] + d * line->inward[1]};
        };
        const auto start = along(line->fusion_depth);
        add(std::string(line->fused ? "fusion_" : "surface_") + name, ProbeKind::line_start, start[0], start[1]);
        for (double d : haz_probe_offsets) {
            const auto at = along(line->fusion_depth + d);
            add("haz_" + std::string(name) + "_" + mm(d) + "mm", ProbeKind::haz, at[0], at[1]);
        }
    }
    add("root", ProbeKind::root, c.joint.web_face(1), 0.0);
    for (const auto& p : sim.probes())
        a.probes.push_back(probe_from_cycle(p.name, ProbeKind::user, p.position, p.time, p.temperature, a.ac1));
    for (auto& p : a.probes) {
        if (p.kind == ProbeKind::line_start || p.kind == ProbeKind::haz) p.no_hardness = estimate_hardness(c, a.ac3, p);
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

namespace {
// Why the probe's empty cells are empty: "t8/5: peak 743 degC stays below 800 degC; ...".
std::string why_missing(const ProbeResult& p) {
    const auto& f = p.figures;
    std::string out;
    for (const auto& [what, why] : {std::pair{"t8/5", &f.no_t8_5}, std::pair{"t8/3", &f.no_t8_3},
                                    std::pair{"cooling rate at 540 degC", &f.no_rate_540},
                                    std::pair{"cooling rate at 700 degC", &f.no_rate_700},
                                    std::pair{"time to 100 degC", &f.no_time_to_100},
                                    std::pair{"HAZ hardness", &p.no_hardness}}) {
        if (!why->empty()) out += (out.empty() ? "" : "; ") + std::string(what) + ": " + *why;
    }
    return out;
}
}  // namespace

std::string probes_csv(const RunAnalysis& a) {
    std::string out = "probe,x [mm],y [mm],z [mm],peak [degC],t8/5 [s],t8/3 [s],cooling rate at 540 degC [K/s],"
                      "cooling rate at 700 degC [K/s],time above Ac1 [s],time to 100 degC [s],HAZ hardness [HV],"
                      "Duren [HV],Yurioka [HV],why missing\n";
    for (const auto& p : a.probes) {
        const auto& f = p.figures;
        out += p.name + "," + csv_number(p.position[0] * 1e3, 2) + "," + csv_number(p.position[1] * 1e3, 2) + "," +
               csv_number(p.position[2] * 1e3, 2) + "," + csv_number(f.peak, 1) + "," + csv_number(f.t8_5, 3) + "," +
               csv_number(f.t8_3, 3) + "," + csv_number(f.rate_540, 1) + "," + csv_number(f.rate_700, 1) + "," +
               csv_number(f.time_above_ac1, 3) + "," + csv_number(f.time_to_100, 2) + "," + csv_number(p.hardness, 0) +
               "," + csv_number(p.hardness_duren, 0) + "," + csv_number(p.hardness_yurioka, 0) + "," + why_missing(p) + "\n";
    }
    return out;
}

namespace {

// One cooling figure over the station's HAZ probes: its lowest and highest value and the probes that
// give them, or why no HAZ probe has one.
struct Spread {
    double lo = nan, hi = nan;
    std::string lo_probe, hi_probe, reason;
};

// `upper` and `lower`: the figure is read as the cycle falls from `upper` through `lower` (800 and
// 500 °C for t8/5). When no HAZ probe has it, the reason is that of the hottest one; where that one
// was hot enough but had not cooled far enough, the reason adds why the run ended there.
Spread spread(const Case& c, const RunResult& result, const RunAnalysis& a, double post::CycleFigures::*figure,
              std::string post::CycleFigures::*why, const char* what, double upper, double lower) {
    Spread s;
    const ProbeResult* hottest = nullptr;
    for (const auto& p : a.probes) {
        if (p.kind != ProbeKind::haz) continue;
        if (!hottest || p.figures.peak > hottest->figures.peak) hottest = &p;
        const double v = p.figures.*figure;
        if (std::isnan(v)) continue;
        if (std::isnan(s.lo) || v < s.lo) s.lo = v, s.lo_probe = p.name;
        if (std::isnan(s.hi) || v > s.hi) s.hi = v, s.hi_probe = p.name;
    }
    if (!hottest) s.reason = "no HAZ probe at the station";
    if (!hottest || !std::isnan(s.lo)) return s;
    s.reason = format_text("no HAZ probe has %s; at the hottest, %s, %s", what, hottest->name.c_str(),
                           (hottest->figures.*why).c_str());
    if (hottest->figures.peak >= upper) {
        s.reason += format_text("; the run stopped at %.1f s: %s", result.end_time, result.stop_reason.c_str());
        const auto& t = c.temperatures;
        if (t.preheat >= lower) s.reason += format_text(" (preheat %.0f degC is above %.0f degC)", t.preheat, lower);
        else if (t.interpass >= lower) s.reason += format_text(" (interpass %.0f degC is above %.0f degC)", t.interpass, lower);
    }
    return s;
}

// Where the fusion line does not reach a plate on its probe lines, the notes say that the probes there
// start from the plate's surface.
void note_unfused_lines(post::Summary& s, const post::NormalLine& mid, const post::NormalLine& toe, const char* plate) {
    if (mid.fused && toe.fused) return;
    const char* where = !mid.fused && !toe.fused ? "at mid-leg or at the toe" : !mid.fused ? "at mid-leg" : "at the toe";
    s.add_note("Fusion", format_text("no fusion into the %s %s: HAZ probes there from the %s surface", plate, where, plate));
}

}  // namespace

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
    add_bead_items(s, bead_report(c));
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
    // Figures that may have no value carry the reason in its place.
    const auto may_miss = [&](std::string group, std::string key, std::string label, double value, std::string unit,
                              int decimals, const std::string& reason) {
        s.add({std::move(group), std::move(key), std::move(label), value, std::move(unit), decimals, "",
               std::isfinite(value) ? "" : reason});
    };
    const auto probe_name = [&](std::string group, std::string key, const std::string& name, const std::string& reason) {
        s.add({std::move(group), std::move(key), "at", std::nullopt, "", 0, name, name.empty() ? reason : ""});
    };
    // The cooling figures come from the HAZ probes (0.5, 1 and 2 mm beyond each probe line's start).
    using F = post::CycleFigures;
    // Every cycle has a peak: its reason field is never read (only without any HAZ probe at all).
    const Spread peak = spread(c, result, a, &F::peak, &F::no_t8_5, "a peak", 0, 0);
    may_miss("HAZ", "haz_peak_min", "peak at the HAZ probes from", peak.lo, "degC", 0, peak.reason);
    may_miss("HAZ", "haz_peak_max", "to", peak.hi, "degC", 0, peak.reason);
    const Spread t85 = spread(c, result, a, &F::t8_5, &F::no_t8_5, "a t8/5", 800, 500);
    may_miss("Cooling", "t8_5_min", "t8/5 shortest", t85.lo, "s", 2, t85.reason);
    probe_name("Cooling", "t8_5_min_probe", t85.lo_probe, t85.reason);
    may_miss("Cooling", "t8_5_max", "longest", t85.hi, "s", 2, t85.reason);
    probe_name("Cooling", "t8_5_max_probe", t85.hi_probe, t85.reason);
    const Spread rate540 = spread(c, result, a, &F::rate_540, &F::no_rate_540, "a cooling rate at 540 degC", 540, 540);
    may_miss("Cooling", "cooling_rate_540", "fastest rate at 540 degC", rate540.hi, "K/s", 0, rate540.reason);
    const Spread rate700 = spread(c, result, a, &F::rate_700, &F::no_rate_700, "a cooling rate at 700 degC", 700, 700);
    may_miss("Cooling", "cooling_rate_700", "at 700 degC", rate700.hi, "K/s", 0, rate700.reason);
    const Spread t83 = spread(c, result, a, &F::t8_3, &F::no_t8_3, "a t8/3", 800, 300);
    may_miss("t8/3", "t8_3_min", "shortest", t83.lo, "s", 2, t83.reason);
    may_miss("t8/3", "t8_3_max", "longest", t83.hi, "s", 2, t83.reason);
    if (c.base.composition) {
        const auto& limits = c.preheat_search;
        const ProbeResult* h = a.hardest();
        // No estimate anywhere: the reason of the hottest line-start or HAZ probe says why.
        std::string none = "no probe at the station";
        const ProbeResult* hottest = nullptr;
        for (const auto& p : a.probes) {
            const bool judged = p.kind == ProbeKind::line_start || p.kind == ProbeKind::haz;
            if (judged && (!hottest || p.figures.peak > hottest->figures.peak)) hottest = &p;
        }
        if (hottest) none = "no estimate at any probe; at the hottest, " + hottest->name + ", " + hottest->no_hardness;
        may_miss("Hardness", "haz_hardness_max", "HAZ max", h ? h->hardness : nan, "HV", 0, none);
        probe_name("Hardness", "haz_hardness_probe", h ? h->name : "", none);
        may_miss("Hardness", "haz_hardness_duren", "there Düren", h ? h->hardness_duren : nan, "HV", 0, none);
        may_miss("Hardness", "haz_hardness_yurioka", "Yurioka", h ? h->hardness_yurioka : nan, "HV", 0, none);
        num("Hardness", "hardness_limit", "limit", limits.hardness_limit, "HV", 0);
        s.add({"Hardness", "hardness_limit_source", "from", std::nullopt, "", 0, limits.hardness_limit_source});
        may_miss("Hardness", "critical_t8_5", "t8/5 needed",
                 critical_t8_5(*c.base.composition, limits.hardness_limit, c.temperatures.preheat), "s", 1,
                 "no t8/5 up to 1000 s keeps the estimate within the limit");
        if (h && h->hardness > limits.hardness_limit) {
            s.add_note("Hardness", "ABOVE THE LIMIT: consider preheat (heatbead preheat) or a higher heat input");
        }
        if (h) {
            const auto gap = hardness_disagreement(h->hardness_duren, h->hardness_yurioka);
            if (!gap.empty()) s.add_note("Hardness", "at " + h->name + ", " + gap);
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
    note_unfused_lines(s, x.flange_mid, x.flange_toe, "flange");
    note_unfused_lines(s, x.web_mid, x.web_toe, "web");
    if (a.composition_assumed) {
        s.add_note("HAZ", "no composition in the case: Ac1/Ac3 from a typical C-Mn steel (C 0.20, Mn 1.40, Si 0.30)");
    }
    return s;
}

}  // namespace heatbead

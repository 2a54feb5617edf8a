#include "solver/studies/answer_bands.hpp"
#include "solver/app/check.hpp"

#include "mesh/grid.hpp"
#include "post/cautions.hpp"
#include "solver/core/text.hpp"
#include "solver/studies/preheat_search.hpp"
#include "solver/studies/run_setup.hpp"

#include <algorithm>
#include <cmath>

namespace heatbead {

namespace {

// One line of the report: format_text() plus the newline.
template <class... Args>
std::string line(const char* format, Args... args) {
    return format_text(format, args...) + "\n";
}

std::string human_bytes(double b) {
    return b >= 1e9 ? format_text("%.2f GB", b / 1e9) : format_text("%.0f MB", b / 1e6);
}

std::string human_seconds(double s) {
    if (s < 120) return format_text("%.0f s", s);
    if (s < 7200) return format_text("%.0f min", s / 60);
    return format_text("%.1f h", s / 3600);
}

std::string_view face_word(mesh::FaceShape f) {
    return f == mesh::FaceShape::convex ? "convex" : f == mesh::FaceShape::concave ? "concave" : "flat";
}

nlohmann::json q(double value, const char* unit) { return {{"value", value}, {"unit", unit}}; }

// "legs 9.5 mm (flange) x 9.5 mm (web), convex face 0.8 mm; area 45.4 mm2, design throat 6.72 mm"
std::string fillet_text(const mesh::Fillet& f, double area, double throat) {
    const std::string face = f.face == mesh::FaceShape::flat
                                 ? std::string("flat face")
                                 : format_text("%s face %.1f mm", std::string(face_word(f.face)).c_str(), f.convexity * 1e3);
    return format_text("legs %.1f mm (flange) x %.1f mm (web), %s; area %.1f mm2, design throat %.2f mm",
                       f.leg_flange * 1e3, f.leg_web * 1e3, face.c_str(), area * 1e6, throat * 1e3);
}

nlohmann::json fillet_json(const mesh::Fillet& f, double area, double throat) {
    return {{"leg_flange", q(f.leg_flange * 1e3, "mm")},
            {"leg_web", q(f.leg_web * 1e3, "mm")},
            {"face", face_word(f.face)},
            {"convexity", q(f.convexity * 1e3, "mm")},
            {"area", q(area * 1e6, "mm2")},
            {"design_throat", q(throat * 1e3, "mm")}};
}

// The case's warnings and the bead's.
std::vector<std::string> check_warnings(const CheckReport& r) {
    std::vector<std::string> w = r.c->warnings;
    if (!r.bead.warning.empty()) w.push_back(r.bead.warning);
    return w;
}

}  // namespace

CheckReport make_check_report(const Case& c) {
    CheckReport r;
    r.c = &c;
    const auto& p = c.procedure;
    const auto& j = c.joint;
    r.arc_energy = arc_energy(p);
    r.heat_input = heat_input(p);
    r.net_power = net_power(p);
    r.bead = bead_report(c);
    const mesh::Grid grid = mesh::build_grid(j, c.grid);
    r.nx = grid.x.cells(), r.ny = grid.y.cells(), r.nz = grid.z.cells();
    r.cells = grid.cells(), r.solid_cells = grid.solid_cells(), r.weld_cells = grid.weld_cells();
    r.h_min = std::min({grid.x.min_width(), grid.y.min_width(), grid.z.min_width()});
    r.h_max = std::max({grid.x.max_width(), grid.y.max_width(), grid.z.max_width()});
    r.max_ratio = std::max({grid.x.max_ratio(), grid.y.max_ratio(), grid.z.max_ratio()});
    r.memory = run_memory_bytes(grid);
    r.estimate = estimate_run(c, grid, make_material(c.base));
    r.stop = stop_plan(c);
    if (c.base.composition) r.carbon_equivalents = carbon_equivalents(*c.base.composition);
    if (c.base.composition && c.filler.diffusible_hydrogen) r.standard_preheat = en1011_method_b(standard_preheat_input(c));
    return r;
}

std::string to_text(const CheckReport& r) {
    const Case& c = *r.c;
    const auto& j = c.joint;
    const auto& p = c.procedure;
    std::string out = line("heatbead check  %s", c.file.c_str());
    out += line("Joint       tee: flange %.1f x %.0f mm, web %.1f x %.0f mm, weld %.0f mm, %s, root gap %.1f mm",
                j.flange_thickness * 1e3, j.flange_width * 1e3, j.web_thickness * 1e3, j.web_height * 1e3,
                j.weld_length * 1e3, j.sides == 2 ? "both sides" : "one side", j.root_gap * 1e3);
    const auto& b = r.bead;
    out += "Bead asked  " + fillet_text(b.asked, b.asked_area, b.asked_throat) + "\n";
    out += "Bead laid   " + fillet_text(b.laid, b.laid_area, b.laid_throat) + "\n";
    out += "            " + b.basis + "\n";
    std::string wire = p.wire_diameter > 0 ? format_text("%.1f mm wire", p.wire_diameter * 1e3) : "no wire data";
    if (p.wire_feed_speed) wire += format_text(" at %.1f m/min", *p.wire_feed_speed * 60);
    out += line("Procedure   %s %s, %s, %.0f A, %.1f V, %.2f mm/s, %s", std::string(to_string(p.process)).c_str(),
                std::string(to_string(p.transfer)).c_str(), wire.c_str(), p.current,
                p.voltage, p.travel_speed * 1e3, std::string(to_string(p.position)).c_str());
    out += line("Heat input  %.3f kJ/mm = efficiency %.2f x arc energy %.3f kJ/mm (EN 1011-1); net power %.0f W",
                r.heat_input * 1e-6, r.net_power / electrical_power(p), r.arc_energy * 1e-6, r.net_power);
    out += line("            efficiency: %s; power: %s", p.arc_efficiency_source.c_str(), p.power_basis.c_str());
    if (const auto& d = b.deposit) {
        out += line("Deposition  %.1f mm2 per pass = deposition efficiency %.2f x wire fed %.1f mm2 per length; "
                    "the wire's legs %+.0f %% of the asked",
                    d->area * 1e6, d->efficiency, d->wire_area * 1e6, (b.size_ratio - 1) * 100);
        out += line("            deposition efficiency: %s", p.deposition_efficiency_source.c_str());
    } else {
        out += "Deposition  not computed: " + b.no_deposit + "\n";
    }
    out += line("Source      Goldak a %.1f, b %.1f, c_f %.1f, c_r %.1f mm (%s)", c.source.half_width * 1e3,
                c.source.depth * 1e3, c.source.front_length * 1e3, c.source.rear_length * 1e3, c.source.rule.c_str());
    out += line("Grid        %zu x %zu x %zu = %.2f M cells, %.2f M solid (%.0f k weld); spacing %.2f-%.2f mm, "
                "growth <= %.3f",
                r.nx, r.ny, r.nz, r.cells / 1e6, r.solid_cells / 1e6, r.weld_cells / 1e3, r.h_min * 1e3,
                r.h_max * 1e3, r.max_ratio);
    out += line("Memory      about %s (limit %s)", human_bytes(r.memory).c_str(), human_bytes(c.memory_limit).c_str());
    out += line("Run (rough) %.0f s simulated; explicit step %.2f ms -> %.3g steps; about %s at an assumed %.1e "
                "cell updates/s",
                r.estimate.simulated_time, r.estimate.explicit_step * 1e3, r.estimate.steps,
                human_seconds(r.estimate.seconds).c_str(), assumed_cell_updates_per_second);
    out += line("Temperatures preheat %.0f degC, interpass %.0f degC, ambient %.0f degC", c.temperatures.preheat,
                c.temperatures.interpass, c.temperatures.ambient);
    out += line("Stop        %s: every solid cell below %.0f degC after the last pass (%s)",
                r.stop.automatic ? "by the answers the run gives" : "as given", r.stop.rule.temperature,
                r.stop.rule.basis.c_str());
    if (const auto& hold = r.stop.rule.hold; hold && j.weld_length / p.travel_speed + hold->time > c.solver.time_limit) {
        out += line("            the time limit (%.0f s) comes before the %.0f s after the pass that the time to 100 "
                    "degC asks for: raise solver.time_limit",
                    c.solver.time_limit, hold->time);
    }
    if (r.stop.never) out += line("            ** CAN NEVER BE MET ** %s", r.stop.never->c_str());
    out += c.bands.enabled
               ? line("Bands       %zu extra full runs after the run (arc efficiency +-%.2f, source +-%.0f %%, a grid of "
                      "twice the spacing); bands.enabled = false or --no-bands turns them off",
                      band_variants(c).size(), c.bands.arc_efficiency_spread, c.bands.source_spread * 100)
               : line("Bands       none (bands.enabled = false)");
    if (const auto& ce = r.carbon_equivalents) {
        out += line("Steel       CE(IIW) %.3f, Pcm %.3f, CEN %.3f, CET %.3f", ce->iiw, ce->pcm, ce->cen, ce->cet);
    }
    if (const auto& sp = r.standard_preheat) {
        out += line("Preheat     EN 1011-2 method B: %.0f degC%s (heatbead preheat finds it from the HAZ)", sp->formula,
                    sp->outside_validity.empty() ? "" : ", inputs outside its validity");
    }
    if (r.carbon_equivalents) {
        const auto& ps = c.preheat_search;
        out += line("HAZ limit   %.0f HV: %s", ps.hardness_limit, ps.hardness_limit_source.c_str());
        out += line("            heatbead preheat searches up to %.0f degC: %s", ps.highest, ps.highest_reason.c_str());
    }
    if (const auto warnings = check_warnings(r); !warnings.empty()) {
        out += "Warnings\n";
        for (const auto& w : warnings) out += "  - " + w + "\n";
    }
    out += line("Caution     %s", post::planning_caution);
    return out;
}

nlohmann::json to_json(const CheckReport& r) {
    const Case& c = *r.c;
    const auto& p = c.procedure;
    nlohmann::json out;
    out["case"] = c.file;
    out["heat_input"] = q(r.heat_input * 1e-6, "kJ/mm");
    out["arc_energy"] = q(r.arc_energy * 1e-6, "kJ/mm");
    out["net_power"] = q(r.net_power, "W");
    out["bands"] = {{"enabled", c.bands.enabled},
                    {"extra_runs", c.bands.enabled ? band_variants(c).size() : 0},
                    {"arc_efficiency_spread", {{"value", c.bands.arc_efficiency_spread}, {"source", c.bands.arc_efficiency_spread_source}}},
                    {"source_spread", {{"value", c.bands.source_spread}, {"source", c.bands.source_spread_source}}}};
    out["arc_efficiency"] = {{"value", r.net_power / electrical_power(p)}, {"source", p.arc_efficiency_source}};
    out["electrical_power"] = {{"value", electrical_power(p)}, {"unit", "W"}, {"basis", p.power_basis}};
    const auto& b = r.bead;
    out["bead"] = {{"asked", fillet_json(b.asked, b.asked_area, b.asked_throat)},
                   {"laid", fillet_json(b.laid, b.laid_area, b.laid_throat)},
                   {"laid_from_wire", c.bead.from_wire},
                   {"basis", b.basis}};
    if (const auto& d = b.deposit) {
        out["deposition"] = {{"area", q(d->area * 1e6, "mm2")},
                             {"wire_area", q(d->wire_area * 1e6, "mm2")},
                             {"efficiency", {{"value", d->efficiency}, {"source", p.deposition_efficiency_source}}},
                             {"legs_against_asked", q((b.size_ratio - 1) * 100, "%")}};
    } else {
        out["deposition"] = {{"not_computed", b.no_deposit}};
    }
    out["source"] = {{"half_width", q(c.source.half_width * 1e3, "mm")},
                     {"depth", q(c.source.depth * 1e3, "mm")},
                     {"front_length", q(c.source.front_length * 1e3, "mm")},
                     {"rear_length", q(c.source.rear_length * 1e3, "mm")},
                     {"rule", c.source.rule}};
    out["grid"] = {{"cells_x", r.nx},
                   {"cells_y", r.ny},
                   {"cells_z", r.nz},
                   {"cells", r.cells},
                   {"solid_cells", r.solid_cells},
                   {"weld_cells", r.weld_cells},
                   {"finest", q(r.h_min * 1e3, "mm")},
                   {"coarsest", q(r.h_max * 1e3, "mm")},
                   {"max_growth", r.max_ratio},
                   {"memory", q(r.memory, "B")},
                   {"memory_limit", q(c.memory_limit, "B")}};
    out["estimate"] = {{"simulated_time", q(r.estimate.simulated_time, "s")},
                       {"explicit_step", q(r.estimate.explicit_step, "s")},
                       {"explicit_steps", r.estimate.steps},
                       {"run_time", q(r.estimate.seconds, "s")},
                       {"assumed_cell_updates_per_second", assumed_cell_updates_per_second}};
    out["stop"] = {{"temperature", q(r.stop.rule.temperature, "degC")},
                   {"automatic", r.stop.automatic},
                   {"basis", r.stop.rule.basis},
                   {"not_waited_for", r.stop.dropped},
                   {"never_met", r.stop.never.value_or("")}};
    if (const auto& hold = r.stop.rule.hold) {
        out["stop"]["hold"] = {{"after_last_pass", q(hold->time, "s")}, {"below", q(hold->temperature, "degC")}};
    }
    if (const auto& ce = r.carbon_equivalents) {
        out["carbon_equivalents"] = {{"CE_IIW", ce->iiw}, {"Pcm", ce->pcm}, {"CEN", ce->cen}, {"CET", ce->cet}};
    }
    if (const auto& sp = r.standard_preheat) {
        out["standard_preheat"] = {{"method", "EN 1011-2:2001 Annex C.3 method B"},
                                   {"preheat", q(sp->formula, "degC")},
                                   {"outside_validity", sp->outside_validity}};
    }
    out["warnings"] = check_warnings(r);
    out["caution"] = post::planning_caution;
    return out;
}

}  // namespace heatbead

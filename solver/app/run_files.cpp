#include "solver/app/run_files.hpp"

#include "post/cautions.hpp"
#include "post/vtk_output.hpp"
#include "solver/core/text.hpp"
#include "solver/physics/procedure.hpp"

#include <chrono>
#include <cmath>
#include <ctime>

namespace heatbead {

namespace {
using Point = std::array<double, 2>;
}  // namespace

std::vector<post::Curve> curves(const std::vector<post::Polyline>& lines) {
    std::vector<post::Curve> out;
    for (const auto& l : lines) out.push_back({l.points});
    return out;
}

post::Outline bead_outline(const mesh::JointGeometry& j) {
    const double yw = j.web_face(1);
    post::Outline o;
    o.points.push_back({yw, 0.0});
    const Point toe_f{yw + j.leg_flange, 0.0}, toe_w{yw, j.leg_web};
    const double chord = std::hypot(j.leg_flange, j.leg_web);
    const Point normal{j.leg_web / chord, j.leg_flange / chord};  // outward, away from the root
    const double bulge = mesh::face_sign(j.face) * 4 * j.convexity;
    for (int n = 0; n <= 40; ++n) {
        const double u = n / 40.0;
        const double off = bulge * u * (1 - u);
        o.points.push_back({toe_f[0] + u * (toe_w[0] - toe_f[0]) + off * normal[0],
                            toe_f[1] + u * (toe_w[1] - toe_f[1]) + off * normal[1]});
    }
    return o;
}

std::string now_utc() {
    const std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
    char buf[32];
    std::strftime(buf, sizeof buf, "%Y-%m-%d %H:%M UTC", std::gmtime(&t));
    return buf;
}

std::vector<post::Outline> plate_outlines(const mesh::JointGeometry& j) {
    const double half = j.flange_width / 2, y0 = j.web_offset, tw = j.web_thickness / 2;
    return {{{{-half, -j.flange_thickness}, {half, -j.flange_thickness}, {half, 0}, {-half, 0}}},
            {{{y0 - tw, j.root_gap}, {y0 + tw, j.root_gap}, {y0 + tw, j.root_gap + j.web_height},
              {y0 - tw, j.root_gap + j.web_height}}}};
}

post::ReportInput make_report_input(const Case& c, const PreparedRun& run, const RunAnalysis& a,
                                    const post::Summary& summary, const std::vector<std::string>& notes) {
    const Simulation& sim = *run.sim;
    post::ReportInput r;
    const auto& j = c.joint;
    const auto& p = c.procedure;
    r.title = "Fillet pass on a tee: " + std::filesystem::path(c.file).stem().string();
    r.case_file = c.file;
    r.created = now_utc();
    const auto row = [&](const char* name, const char* format, double v) {
        r.procedure.emplace_back(name, format_text(format, v));
    };
    r.procedure.emplace_back("process", std::string(to_string(p.process)) + " " + std::string(to_string(p.transfer)));
    row("current", "%.0f A", p.current);
    row("voltage", "%.1f V", p.voltage);
    row("travel speed", "%.2f mm/s", p.travel_speed * 1e3);
    row("heat input", "%.3f kJ/mm", heat_input(p) * 1e-6);
    row("arc efficiency", "%.2f", net_power(p) / electrical_power(p));
    row("preheat", "%.0f degC", c.temperatures.preheat);
    row("flange thickness", "%.1f mm", j.flange_thickness * 1e3);
    row("web thickness", "%.1f mm", j.web_thickness * 1e3);
    row("legs asked (flange)", "%.1f mm", c.bead.asked.leg_flange * 1e3);
    row("legs asked (web)", "%.1f mm", c.bead.asked.leg_web * 1e3);
    for (const auto& item : summary.items()) r.results.emplace_back(item.group + ": " + item.label, post::display(item));

    r.plates = plate_outlines(j);
    r.bead = bead_outline(j);
    r.fusion_line = curves(a.section.fusion_line);
    r.haz_ac1_line = curves(a.section.ac1_line);
    r.haz_ac3_line = curves(a.section.ac3_line);

    // Dimension lines as a gauge and an etch would show them (side +1).
    const double yw = j.web_face(1);
    const auto& x = a.section;
    r.dimensions.push_back({"flange penetration", {yw + 0.5 * j.leg_flange, 0}, {yw + 0.5 * j.leg_flange, -x.penetration_flange},
                            x.penetration_flange * 1e3, "mm"});
    r.dimensions.push_back({"web penetration", {yw, 0.5 * j.leg_web}, {yw - x.penetration_web, 0.5 * j.leg_web},
                            x.penetration_web * 1e3, "mm"});
    r.dimensions.push_back({"flange leg", {yw, -0.3e-3}, {yw + x.fused_leg_flange, -0.3e-3}, x.fused_leg_flange * 1e3, "mm"});
    r.dimensions.push_back({"web leg", {yw - 0.3e-3, 0}, {yw - 0.3e-3, x.fused_leg_web}, x.fused_leg_web * 1e3, "mm"});
    const double diag = x.design_throat / std::sqrt(2.0);
    r.dimensions.push_back({"design throat", {yw, 0}, {yw + diag, diag}, x.design_throat * 1e3, "mm"});

    for (const auto& probe : a.probes) r.cycles.push_back({probe.name, probe.time, probe.temperature});

    // Peak temperature on the station's cross-section; void left blank.
    const auto& grid = sim.grid();
    const auto& cells = sim.cells();
    const std::size_t ny = grid.y.cells(), nz = grid.z.cells();
    r.peak_map.y_faces = grid.y.faces;
    r.peak_map.z_faces = grid.z.faces;
    r.peak_map.unit = "degC";
    r.peak_map.values.assign(ny * nz, std::nan(""));
    const auto& peak = run.history().peak();
    for (std::size_t s = 0; s < cells.ns; ++s) {
        r.peak_map.values[cells.j[s] + ny * cells.k[s]] = peak[cells.index(x.slice, s)];
    }
    r.warnings = c.warnings;
    r.warnings.insert(r.warnings.end(), notes.begin(), notes.end());
    r.caution = post::planning_caution;
    return r;
}

void write_vtk_results(const std::filesystem::path& folder, const Case& c, const PreparedRun& run, const RunAnalysis& a) {
    const Simulation& sim = *run.sim;
    const auto& h = run.history();
    post::write_vtk_cells(folder / "fields.vtu", sim.grid(), sim.cells(), sim.active(),
                          {{"peak_temperature", h.peak()},
                           {"time_of_peak", h.time_of_peak()},
                           {"t8_5", a.t8_5},
                           {"final_temperature", sim.temperature()}});
    std::vector<post::VtkLine> lines;
    const auto add = [&](const std::string& kind, const std::vector<post::Polyline>& polylines) {
        for (const auto& l : polylines) {
            if (l.points.size() >= 2) lines.push_back({kind, l.points});
        }
    };
    add("fusion", a.section.fusion_line);
    add("ac3", a.section.ac3_line);
    add("ac1", a.section.ac1_line);
    post::write_vtk_lines(folder / "section_lines.vtp", c.output.station, lines);
}

}  // namespace heatbead

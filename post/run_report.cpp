#include "post/run_report.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/html_page.hpp"
#include "post/report_figures.hpp"
#include "post/svg_plot.hpp"
#include "post/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace heatbead::post {

namespace {

// Section lines: the fusion line is the strongest mark; the two HAZ lines differ in dash and colour so
// they stay apart in grey print too.
const Stroke bead_edge{"#9a7b3c", 1.0, ""};
const Stroke fusion_stroke{"#8b1a1a", 2.6, ""};
const Stroke ac3_stroke{"#c8641a", 1.8, "8 4"};
const Stroke ac1_stroke{"#2f5f8a", 1.8, "2 3"};
const Stroke dimension_stroke{"#111111", 1.0, ""};
constexpr const char* bead_fill = "#f3e2bd";

// Probe colours, far apart in hue; past the last one the dash changes so lines stay distinguishable.
constexpr const char* probe_colours[] = {"#1f4e79", "#b8322a", "#2e7d4f", "#7b3f98", "#c77c12", "#17808a", "#6b4f2a", "#b03a78"};

// The view of both section figures, in m: the weld and its heat-affected zone with a margin, kept
// within the plates, so a leg of a few millimetres is not lost on a flange many times wider. The same
// view for both lets the reader lay the peak map over the section.
Box section_view(const ReportInput& in) {
    Box weld;
    weld.add(in.bead.points);
    for (const auto* lines : {&in.fusion_line, &in.haz_ac1_line, &in.haz_ac3_line})
        for (const auto& c : *lines) weld.add(c.points);
    for (const auto& d : in.dimensions) weld.add(d.from), weld.add(d.to);
    const Box plates = bounds(in.plates);
    // With neither weld nor plates, the peak map's extent is all there is to show.
    if (weld.empty() && plates.empty() && in.peak_map.y_faces.size() >= 2 && in.peak_map.z_faces.size() >= 2) {
        weld.add({in.peak_map.y_faces.front(), in.peak_map.z_faces.front()});
        weld.add({in.peak_map.y_faces.back(), in.peak_map.z_faces.back()});
    }
    return weld_view(weld, plates);
}

// Both section figures share size and side panel (legend or colour bar), so equal scaling gives
// them the same millimetre ranges and the two can be compared point by point.
constexpr int section_panel = 170;

std::string section_figure(const ReportInput& in, const Box& view) {
    SvgPlot plot = section_plot("figure-section-plot", "Weld cross-section to scale", view, section_panel);
    std::vector<LegendEntry> legend;
    draw_plates(plot, in.plates, legend);
    plot.polygon(in_mm(in.bead.points), bead_edge, bead_fill);
    draw_curves(plot, in.haz_ac1_line, ac1_stroke);
    draw_curves(plot, in.haz_ac3_line, ac3_stroke);
    draw_curves(plot, in.fusion_line, fusion_stroke);
    for (const auto& d : in.dimensions)
        plot.dimension({d.from[0] * 1e3, d.from[1] * 1e3}, {d.to[0] * 1e3, d.to[1] * 1e3},
                       d.label + ' ' + format_fixed(d.value, 2) + (d.unit.empty() ? "" : ' ' + d.unit), dimension_stroke);
    if (!in.bead.points.empty()) legend.push_back({"bead asked for", bead_edge, bead_fill});
    if (!in.fusion_line.empty()) legend.push_back({"fusion line", fusion_stroke, ""});
    if (!in.haz_ac3_line.empty()) legend.push_back({"HAZ: Ac3 reached", ac3_stroke, ""});
    if (!in.haz_ac1_line.empty()) legend.push_back({"HAZ: Ac1 reached", ac1_stroke, ""});
    if (!in.dimensions.empty()) legend.push_back({"dimension", dimension_stroke, ""});
    plot.legend(legend);
    if (in.plates.empty() && in.bead.points.empty() && in.fusion_line.empty()) note_in_middle(plot, "no section recorded");
    return plot.svg();
}

std::string cycles_figure(const ReportInput& in) {
    std::vector<LegendEntry> lines;
    for (std::size_t i = 0; i < in.cycles.size(); ++i)
        lines.push_back({in.cycles[i].name,
                         {probe_colours[i % std::size(probe_colours)], 1.8, i < std::size(probe_colours) ? "" : "7 3"},
                         ""});
    return cycles_svg("figure-cycles-plot", "Thermal cycles at the probes", in.cycles, lines, 190, "no probe cycles recorded");
}

std::string peak_map_figure(const ReportInput& in, const Box& view) {
    const SectionImage& map = in.peak_map;
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    for (const double v : map.values)
        if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
    const bool any = hi >= lo;
    if (!any) lo = 0, hi = 1;
    SvgPlot plot = section_plot("figure-peak-map-plot", "Peak temperature on the cross-section", view, section_panel);
    const auto mm = [](const std::vector<double>& faces) {
        std::vector<double> out(faces.size());
        std::transform(faces.begin(), faces.end(), out.begin(), [](double f) { return f * 1e3; });
        return out;
    };
    plot.cell_image(mm(map.y_faces), mm(map.z_faces), map.values, lo, hi);
    // Plate edges and the fusion line in black, thin, so they read over every colour of the scale.
    for (const auto& p : in.plates) plot.polygon(in_mm(p.points), {"#333333", 0.8, ""}, "");
    draw_curves(plot, in.fusion_line, {"#000000", 1.6, ""});
    plot.colour_bar(lo, hi, "peak temperature", map.unit.empty() ? "°C" : map.unit);
    if (!any) note_in_middle(plot, "no peak temperatures recorded");
    return plot.svg();
}

void validate(const ReportInput& in) {
    for (const auto& c : in.cycles) check_cycle(c, "report");
    const auto& m = in.peak_map;
    const std::size_t cells = m.y_faces.size() >= 2 && m.z_faces.size() >= 2 ? (m.y_faces.size() - 1) * (m.z_faces.size() - 1) : 0;
    if (m.values.size() != cells)
        throw std::invalid_argument("report: peak map has " + std::to_string(m.values.size()) + " values for " +
                                    std::to_string(cells) + " cells");
}

}  // namespace

std::string render_report(const ReportInput& in) {
    validate(in);
    const Box view = section_view(in);
    std::string page = page_start({.title = in.title,
                                   .case_file = in.case_file,
                                   .created = in.created,
                                   .caution = in.caution.empty() ? run_page_caution : in.caution,
                                   .how_computed = in.how_computed,
                                   .warnings = in.warnings});
    page += "<div class=\"tables\">" + table("Procedure", in.procedure) + table("Results", in.results) + "</div>\n";
    page += bands_section(in.bands);
    page += "<div class=\"figures\">\n";
    page += figure("figure-section", section_figure(in, view),
                   "Cross-section to scale, cropped to the weld and its heat-affected zone (the plates go on "
                   "beyond). The fusion line bounds the metal that melted; the HAZ lines bound the metal heated "
                   "above Ac3 and above Ac1.") + "\n";
    page += figure("figure-cycles", cycles_figure(in),
                   "Temperature against time at each probe. The shaded band is 800 to 500 °C: the time a cycle "
                   "spends crossing it on cooling is its t8/5.") + "\n";
    page += figure("figure-peak-map", peak_map_figure(in, view),
                   "Highest temperature each point of the cross-section reached during the pass, same view as the "
                   "section; black: plate edges and the fusion line; blank: no metal (void).") + "\n";
    return page + "</div>\n" + page_end();
}

void write_report(const std::filesystem::path& path, const ReportInput& input) {
    write_file_atomically(path, render_report(input));
}

}  // namespace heatbead::post

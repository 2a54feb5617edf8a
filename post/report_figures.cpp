#include "post/report_figures.hpp"

#include <stdexcept>

namespace heatbead::post {

namespace {

const Stroke plate_edge{"#6b6b6b", 1.0, ""};
constexpr const char* plate_fill = "#d9d9d9";
constexpr const char* band_fill = "#f4e4bc";

}  // namespace

std::vector<Point> in_mm(const std::vector<std::array<double, 2>>& points) {
    std::vector<Point> out;
    out.reserve(points.size());
    for (const auto& p : points) out.push_back({p[0] * 1e3, p[1] * 1e3});
    return out;
}

Box bounds(const std::vector<Outline>& outlines) {
    Box box;
    for (const auto& o : outlines) box.add(o.points);
    return box;
}

Box weld_view(const Box& weld, const Box& plates) {
    const Box seen = weld.empty() ? plates : weld;
    if (seen.empty()) return {0, 10e-3, 0, 10e-3};
    const double pad = 0.25 * std::max(seen.y1 - seen.y0, seen.z1 - seen.z0) + 1.5e-3;
    Box view{seen.y0 - pad, seen.y1 + pad, seen.z0 - pad, seen.z1 + pad};
    if (!plates.empty()) {
        const Box within{std::max(view.y0, plates.y0), std::min(view.y1, plates.y1), std::max(view.z0, plates.z0),
                         std::min(view.z1, plates.z1)};
        if (!within.empty()) view = within;
    }
    return view;
}

SvgPlot section_plot(const std::string& id, const std::string& title, const Box& view, int side_panel) {
    return SvgPlot(id, title, 660, 540, Axis{"y, across the flange", "mm", view.y0 * 1e3, view.y1 * 1e3},
                   Axis{"z, up the web", "mm", view.z0 * 1e3, view.z1 * 1e3}, true, side_panel);
}

void draw_plates(SvgPlot& plot, const std::vector<Outline>& plates, std::vector<LegendEntry>& legend) {
    for (const auto& p : plates) plot.polygon(in_mm(p.points), plate_edge, plate_fill);
    if (!plates.empty()) legend.push_back({"plates", plate_edge, plate_fill});
}

void draw_curves(SvgPlot& plot, const std::vector<Curve>& curves, const Stroke& stroke) {
    for (const auto& c : curves) plot.polyline(in_mm(c.points), stroke);
}

void note_in_middle(SvgPlot& plot, const std::string& note) {
    plot.text({(plot.x_axis().lo + plot.x_axis().hi) / 2, (plot.y_axis().lo + plot.y_axis().hi) / 2}, note, Anchor::middle);
}

void check_cycle(const Cycle& c, const std::string& part) {
    if (c.time.size() != c.temperature.size())
        throw std::invalid_argument(part + ": cycle \"" + c.name + "\" has " + std::to_string(c.time.size()) +
                                    " times but " + std::to_string(c.temperature.size()) + " temperatures");
}

std::string cycles_svg(const std::string& id, const std::string& title, const std::vector<Cycle>& cycles,
                       const std::vector<LegendEntry>& lines, int side_panel, const std::string& empty_note) {
    if (lines.size() != cycles.size())
        throw std::invalid_argument("cycles figure: " + std::to_string(lines.size()) + " line styles for " +
                                    std::to_string(cycles.size()) + " cycles");
    double t_max = 0, T_min = 0, T_max = 0;
    for (const auto& c : cycles) {
        for (const double t : c.time)
            if (std::isfinite(t)) t_max = std::max(t_max, t);
        for (const double T : c.temperature)
            if (std::isfinite(T)) T_min = std::min(T_min, T), T_max = std::max(T_max, T);
    }
    // Without data the axes still show the range a reader expects (the 800–500 °C band included).
    if (!(t_max > 0)) t_max = 10;
    T_max = std::max(T_max * 1.05, 1000.0);
    SvgPlot plot(id, title, 660, 420, Axis{"time", "s", 0, t_max}, Axis{"temperature", "°C", T_min, T_max}, false,
                 side_panel);
    plot.band_y(500, 800, band_fill);
    plot.text({t_max, 650}, "800–500 °C", Anchor::end, -6, 4);
    for (std::size_t i = 0; i < cycles.size(); ++i) {
        std::vector<Point> points;
        points.reserve(cycles[i].time.size());
        for (std::size_t k = 0; k < cycles[i].time.size(); ++k) points.push_back({cycles[i].time[k], cycles[i].temperature[k]});
        plot.polyline(points, lines[i].stroke);
    }
    plot.legend(lines);
    if (cycles.empty()) note_in_middle(plot, empty_note);
    return plot.svg();
}

}  // namespace heatbead::post

// What the run report and the comparison report draw alike: the cross-section view (cropped to the
// weld, to scale), the plates in grey, section lines, and the thermal cycles over the 800–500 °C band.
// Kept in one place so the two pages show a section and a cycle the same way. Lengths come in metres
// and are drawn in millimetres.
#pragma once

#include "post/run_report.hpp"
#include "post/svg_plot.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <string>
#include <vector>

namespace heatbead::post {

// (y, z) in m to (y, z) in mm, the unit every section figure is drawn in.
std::vector<Point> in_mm(const std::vector<std::array<double, 2>>& points);

// The bounding box of what is added, (y, z) in m; points that are not finite are left out.
struct Box {
    double y0 = std::numeric_limits<double>::infinity(), y1 = -y0, z0 = y0, z1 = -y0;
    void add(const std::array<double, 2>& p) {
        if (!std::isfinite(p[0]) || !std::isfinite(p[1])) return;
        y0 = std::min(y0, p[0]), y1 = std::max(y1, p[0]), z0 = std::min(z0, p[1]), z1 = std::max(z1, p[1]);
    }
    void add(const std::vector<std::array<double, 2>>& points) {
        for (const auto& p : points) add(p);
    }
    bool empty() const { return !(y1 >= y0 && z1 >= z0); }
};

Box bounds(const std::vector<Outline>& outlines);

// The view of a section figure, in m: `weld` (the bead and its lines) with a margin, kept within
// `plates`, so a leg of a few millimetres is not lost on a flange many times wider. An empty weld
// shows the plates whole; with neither, a 10 mm square.
Box weld_view(const Box& weld, const Box& plates);

// A section plot of `view` to scale (660 × 540 px), the legend or colour bar in a side panel of
// `side_panel` px: figures of one size and panel show the same millimetre ranges for the same view.
SvgPlot section_plot(const std::string& id, const std::string& title, const Box& view, int side_panel);

// The plates in grey, under everything else; their legend entry is added when there are any.
void draw_plates(SvgPlot& plot, const std::vector<Outline>& plates, std::vector<LegendEntry>& legend);
void draw_curves(SvgPlot& plot, const std::vector<Curve>& curves, const Stroke& stroke);

// A note in the middle of an empty plot, so a missing figure reads as missing data, not as a fault.
void note_in_middle(SvgPlot& plot, const std::string& note);

// Throws std::invalid_argument "`part`: cycle "name" has N times but M temperatures" when the counts differ.
void check_cycle(const Cycle& cycle, const std::string& part);

// Temperature against time (660 × 420 px), one line a cycle: cycles[i] drawn in lines[i].stroke and
// named lines[i].label in the legend (side panel of `side_panel` px), over the shaded 800–500 °C
// band. Without cycles the axes keep the range a reader expects and `empty_note` says why. Each cycle
// must have passed check_cycle.
std::string cycles_svg(const std::string& id, const std::string& title, const std::vector<Cycle>& cycles,
                       const std::vector<LegendEntry>& lines, int side_panel, const std::string& empty_note);

}  // namespace heatbead::post

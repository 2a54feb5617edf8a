// The one place that draws SVG. A plot maps data coordinates to a plot area inside fixed margins,
// draws the axes (ticks, tick labels, a title with the unit) and clips what is drawn in data
// coordinates to the plot area. A side panel right of the plot area holds a legend or a colour bar.
// The SVG is meant to be inlined into an HTML page, so it carries no namespace URL and every text
// is escaped.
#pragma once

#include "post/text.hpp"  // format_fixed: the numbers of the axes and of the pages around the figures

#include <array>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead::post {

using Point = std::array<double, 2>;

// Escapes & < > " ' so that any text is safe as element content or as an attribute value.
std::string escape_html(std::string_view text);

// Colour of the heat scale at fraction t in [0, 1] (clamped): dark slate at the cold end through
// blue, sage and straw to deep red at the hot end, as "#rrggbb". Lightness rises to straw and falls
// again, so the hot end stays distinct from the white of voids and background.
std::string heat_colour(double t);

struct Axis {
    std::string label, unit;  // drawn as "label (unit)", or "label" alone on an axis of names
    double lo, hi;            // data range; an empty or non-finite range is widened to one unit
    // An axis of names (procedures, runs): name i sits at 1 + i, with a tick of its own, in place of
    // the numbered ticks; lo and hi should then span 0.5 to names + 0.5.
    std::vector<std::string> names = {};
};

struct Stroke {
    std::string colour = "#000000";
    double width = 1.5;  // px
    std::string dash;    // SVG dash pattern in px, e.g. "6 3"; empty for a solid line
};

struct LegendEntry {
    std::string label;
    Stroke stroke;
    std::string fill;  // not empty: drawn as a filled swatch; empty: drawn as a line sample
};

enum class Anchor { start, middle, end };

class SvgPlot {
public:
    // `id` must be unique on the page (it names the clip path). With `equal_scale` one data unit is
    // as long on both axes and the ranges are widened, centred, to fill the plot area.
    SvgPlot(std::string id, std::string title, int width, int height, Axis x, Axis y, bool equal_scale,
            int side_panel);

    const Axis& x_axis() const { return x_; }
    const Axis& y_axis() const { return y_; }

    // Non-finite points break a polyline and are left out of a polygon.
    void polyline(std::span<const Point> points, const Stroke& stroke);
    void polygon(std::span<const Point> points, const Stroke& stroke, const std::string& fill);
    // A horizontal band across the plot area between y = lo and y = hi.
    void band_y(double lo, double hi, const std::string& fill);
    // An error bar at x: a vertical line from lo to hi with short caps, and a round marker at `value`.
    // Ends that are not finite leave the bar out; a value that is not finite leaves the marker out.
    void error_bar(double x, double lo, double value, double hi, const Stroke& stroke);
    // A dimension line between a and b with arrowheads; `text` sits beside its middle, unclipped.
    void dimension(Point a, Point b, const std::string& text, const Stroke& stroke);
    // Text at a data point, shifted by (dx, dy) px, on a white halo so it reads over lines.
    void text(Point at, const std::string& text, Anchor anchor, double dx = 0, double dy = 0);
    // Cells between faces, coloured by heat_colour((v - lo)/(hi - lo)) in 64 steps; non-finite
    // values are left blank. values has (y_faces.size() - 1) rows of (x_faces.size() - 1), row-major.
    // Throws std::invalid_argument if the sizes do not agree.
    void cell_image(std::span<const double> x_faces, std::span<const double> y_faces,
                    std::span<const double> values, double lo, double hi);
    // In the side panel, one or the other.
    void legend(std::span<const LegendEntry> entries);
    void colour_bar(double lo, double hi, const std::string& label, const std::string& unit);

    std::string svg() const;  // the complete <svg> element

private:
    double px(double x) const;
    double py(double y) const;

    std::string id_, title_;
    int width_, height_;
    Axis x_, y_;
    double left_, top_, plot_w_, plot_h_;
    std::string data_;     // clipped to the plot area
    std::string overlay_;  // on top, not clipped: dimension texts, legend, colour bar
    std::vector<std::array<double, 4>> label_boxes_;  // px boxes (x0, y0, x1, y1) of dimension texts so far
};

}  // namespace heatbead::post

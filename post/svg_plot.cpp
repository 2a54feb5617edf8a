#include "post/svg_plot.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <utility>

namespace heatbead::post {

namespace {

// Margins of the plot area, px: room for tick labels and the rotated y title on the left, tick
// labels and the x title below.
constexpr double margin_left = 66, margin_bottom = 46, margin_top = 12, margin_right = 14;
constexpr int colour_steps = 64;

// Pixel coordinates to a tenth of a pixel: finer is invisible and only makes the file larger.
std::string n(double v) { return format_fixed(v, 1); }

std::string stroke_attributes(const Stroke& s) {
    std::string a = " stroke=\"" + escape_html(s.colour) + "\" stroke-width=\"" + format_fixed(s.width, 2) + '"';
    if (!s.dash.empty()) a += " stroke-dasharray=\"" + escape_html(s.dash) + '"';
    return a;
}

std::string anchor_name(Anchor a) {
    switch (a) {
        case Anchor::start: return "start";
        case Anchor::middle: return "middle";
        case Anchor::end: return "end";
    }
    return "start";
}

// Text element in pixel coordinates; the halo is painted under the glyphs so labels read over lines.
std::string text_element(double x, double y, const std::string& text, Anchor anchor, const std::string& extra = {}) {
    return "<text x=\"" + n(x) + "\" y=\"" + n(y) + "\" text-anchor=\"" + anchor_name(anchor) + '"' + extra +
           " paint-order=\"stroke\" stroke=\"#ffffff\" stroke-width=\"3\" stroke-linejoin=\"round\">" +
           escape_html(text) + "</text>";
}

void widen_if_empty(Axis& a) {
    if (!std::isfinite(a.lo) || !std::isfinite(a.hi)) a.lo = 0, a.hi = 1;
    if (a.hi < a.lo) std::swap(a.lo, a.hi);
    if (a.hi - a.lo <= 1e-12 * std::max(1.0, std::abs(a.lo))) a.lo -= 0.5, a.hi += 0.5;
}

// Ticks at 1, 2 or 5 × 10^k, about one per `spacing_px` of axis length.
struct Ticks {
    int decimals;  // enough to tell neighbouring ticks apart
    std::vector<double> values;
};
Ticks ticks(double lo, double hi, double length_px, double spacing_px = 70) {
    const double target = std::max(2.0, length_px / spacing_px);
    const double raw = (hi - lo) / target;
    const double magnitude = std::pow(10.0, std::floor(std::log10(raw)));
    const double f = raw / magnitude;
    const double step = (f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10) * magnitude;
    Ticks t{std::max(0, static_cast<int>(-std::floor(std::log10(step) + 1e-9))), {}};
    // Counting from an integer index keeps tick values free of accumulated rounding.
    const auto first = static_cast<long>(std::ceil(lo / step - 1e-9));
    for (long i = first; i * step <= hi + 1e-9 * step; ++i) t.values.push_back(static_cast<double>(i) * step);
    return t;
}

// The ticks of an axis: numbered ones, or one per name at 1, 2, ... on an axis of names.
struct AxisTicks {
    std::vector<double> values;
    std::vector<std::string> labels;
};
AxisTicks axis_ticks(const Axis& a, double length_px, double spacing_px) {
    AxisTicks out;
    if (!a.names.empty()) {
        for (std::size_t i = 0; i < a.names.size(); ++i) out.values.push_back(1.0 + static_cast<double>(i));
        out.labels = a.names;
        return out;
    }
    const Ticks t = ticks(a.lo, a.hi, length_px, spacing_px);
    out.values = t.values;
    for (const double v : t.values) out.labels.push_back(format_fixed(v, t.decimals));
    return out;
}

std::string axis_title(const Axis& a) { return a.names.empty() || !a.unit.empty() ? a.label + " (" + a.unit + ")" : a.label; }

std::string points_attribute(const std::vector<std::array<double, 2>>& pixels) {
    std::string s;
    for (const auto& p : pixels) {
        if (!s.empty()) s += ' ';
        s += n(p[0]) + ',' + n(p[1]);
    }
    return s;
}

}  // namespace

std::string escape_html(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (const char c : text) {
        switch (c) {
            case '&': out += "&amp;"; break;
            case '<': out += "&lt;"; break;
            case '>': out += "&gt;"; break;
            case '"': out += "&quot;"; break;
            case '\'': out += "&#39;"; break;
            default: out += c;
        }
    }
    return out;
}

std::string heat_colour(double t) {
    struct Stop {
        double at;
        double r, g, b;
    };
    static constexpr Stop stops[] = {{0.00, 0x24, 0x32, 0x4f}, {0.25, 0x3d, 0x6e, 0x8c}, {0.50, 0x7f, 0xb0, 0x9a},
                                     {0.72, 0xe8, 0xc8, 0x72}, {0.87, 0xe0, 0x7b, 0x39}, {1.00, 0xa8, 0x20, 0x1a}};
    t = std::isfinite(t) ? std::clamp(t, 0.0, 1.0) : 0.0;
    std::size_t i = 1;
    while (i + 1 < std::size(stops) && t > stops[i].at) ++i;
    const Stop& a = stops[i - 1];
    const Stop& b = stops[i];
    const double u = (t - a.at) / (b.at - a.at);
    return format_text("#%02x%02x%02x", static_cast<int>(std::lround(a.r + u * (b.r - a.r))),
                       static_cast<int>(std::lround(a.g + u * (b.g - a.g))), static_cast<int>(std::lround(a.b + u * (b.b - a.b))));
}

SvgPlot::SvgPlot(std::string id, std::string title, int width, int height, Axis x, Axis y, bool equal_scale,
                 int side_panel)
    : id_(std::move(id)), title_(std::move(title)), width_(width), height_(height), x_(std::move(x)), y_(std::move(y)),
      left_(margin_left), top_(margin_top), plot_w_(width - margin_left - margin_right - side_panel),
      plot_h_(height - margin_top - margin_bottom) {
    if (plot_w_ < 40 || plot_h_ < 40) throw std::invalid_argument("plot " + id_ + ": figure too small for its margins");
    widen_if_empty(x_);
    widen_if_empty(y_);
    if (equal_scale) {
        const double scale = std::min(plot_w_ / (x_.hi - x_.lo), plot_h_ / (y_.hi - y_.lo));  // px per data unit
        const auto fill = [](Axis& a, double length_px, double s) {
            const double centre = (a.lo + a.hi) / 2, half = length_px / s / 2;
            a.lo = centre - half, a.hi = centre + half;
        };
        fill(x_, plot_w_, scale);
        fill(y_, plot_h_, scale);
    }
}

double SvgPlot::px(double x) const { return left_ + (x - x_.lo) / (x_.hi - x_.lo) * plot_w_; }
double SvgPlot::py(double y) const { return top_ + (y_.hi - y) / (y_.hi - y_.lo) * plot_h_; }

void SvgPlot::polyline(std::span<const Point> points, const Stroke& stroke) {
    std::vector<std::array<double, 2>> run;
    const auto flush = [&] {
        if (run.size() >= 2)
            data_ += "<polyline fill=\"none\" stroke-linejoin=\"round\"" + stroke_attributes(stroke) + " points=\"" +
                     points_attribute(run) + "\"/>";
        run.clear();
    };
    for (const auto& p : points) {
        if (std::isfinite(p[0]) && std::isfinite(p[1])) run.push_back({px(p[0]), py(p[1])});
        else flush();
    }
    flush();
}

void SvgPlot::polygon(std::span<const Point> points, const Stroke& stroke, const std::string& fill) {
    std::vector<std::array<double, 2>> pixels;
    for (const auto& p : points)
        if (std::isfinite(p[0]) && std::isfinite(p[1])) pixels.push_back({px(p[0]), py(p[1])});
    if (pixels.size() < 3) return;
    data_ += "<polygon fill=\"" + escape_html(fill.empty() ? "none" : fill) + "\" stroke-linejoin=\"round\"" +
             stroke_attributes(stroke) + " points=\"" + points_attribute(pixels) + "\"/>";
}

void SvgPlot::band_y(double lo, double hi, const std::string& fill) {
    const double y0 = py(std::max(lo, hi)), y1 = py(std::min(lo, hi));
    data_ += "<rect x=\"" + n(left_) + "\" y=\"" + n(y0) + "\" width=\"" + n(plot_w_) + "\" height=\"" + n(y1 - y0) +
             "\" fill=\"" + escape_html(fill) + "\"/>";
}

void SvgPlot::error_bar(double x, double lo, double value, double hi, const Stroke& stroke) {
    if (!std::isfinite(x)) return;
    const double cx = px(x), cap = 5;
    if (std::isfinite(lo) && std::isfinite(hi)) {
        const double y0 = py(lo), y1 = py(hi);
        data_ += "<path fill=\"none\"" + stroke_attributes(stroke) + " d=\"M" + n(cx) + ' ' + n(y0) + "V" + n(y1) + "M" +
                 n(cx - cap) + ' ' + n(y0) + "H" + n(cx + cap) + "M" + n(cx - cap) + ' ' + n(y1) + "H" + n(cx + cap) + "\"/>";
    }
    if (std::isfinite(value))
        data_ += "<circle cx=\"" + n(cx) + "\" cy=\"" + n(py(value)) + "\" r=\"4\" fill=\"" + escape_html(stroke.colour) + "\"/>";
}

void SvgPlot::dimension(Point a, Point b, const std::string& text, const Stroke& stroke) {
    const double ax = px(a[0]), ay = py(a[1]), bx = px(b[0]), by = py(b[1]);
    const double length = std::hypot(bx - ax, by - ay);
    if (!std::isfinite(length)) return;
    data_ += "<line x1=\"" + n(ax) + "\" y1=\"" + n(ay) + "\" x2=\"" + n(bx) + "\" y2=\"" + n(by) + '"' +
             stroke_attributes(stroke) + "/>";
    // Unit vector along the line and its normal, in pixels; a zero-length line gets no arrowheads.
    const double ux = length > 0 ? (bx - ax) / length : 1, uy = length > 0 ? (by - ay) / length : 0;
    double nx = -uy, ny = ux;
    if (length > 0) {
        // Arrowheads point outward at both ends; on a line too short for two heads they shrink with it.
        const double head = std::min(8.0, length / 2.5), half = head * 0.4;
        for (const auto& [tx, ty, dir] : {std::array{ax, ay, -1.0}, std::array{bx, by, 1.0}}) {
            const double bx0 = tx - dir * head * ux, by0 = ty - dir * head * uy;
            const std::vector<std::array<double, 2>> head_points{
                {tx, ty}, {bx0 + half * nx, by0 + half * ny}, {bx0 - half * nx, by0 - half * ny}};
            data_ += "<polygon fill=\"" + escape_html(stroke.colour) + "\" points=\"" + points_attribute(head_points) + "\"/>";
        }
    }
    // The text goes on the right of the line, or above a line that is nearly horizontal, stepped
    // further out while it would cover the text of an earlier dimension (short penetration lines sit
    // close together). Text boxes are estimated from the character count: there is no font metric here.
    if (std::abs(nx) < 0.3) nx = 0, ny = -1;
    else if (nx < 0) nx = -nx, ny = -ny;
    const Anchor anchor = nx > 0.3 ? Anchor::start : Anchor::middle;
    const double text_w = 7.0 * static_cast<double>(text.size()), text_h = 14;
    std::array<double, 4> box{};
    double mx = 0, my = 0;
    for (int attempt = 0; attempt < 8; ++attempt) {
        const double offset = 8 + 14.0 * attempt;
        mx = (ax + bx) / 2 + offset * nx, my = (ay + by) / 2 + offset * ny + (ny < -0.5 ? -2 : 4);
        const double x0 = anchor == Anchor::start ? mx : mx - text_w / 2;
        box = {x0, my - text_h + 3, x0 + text_w, my + 3};
        const bool clear = std::none_of(label_boxes_.begin(), label_boxes_.end(), [&](const auto& placed) {
            return box[0] < placed[2] && placed[0] < box[2] && box[1] < placed[3] && placed[1] < box[3];
        });
        if (clear) break;
    }
    label_boxes_.push_back(box);
    overlay_ += text_element(mx, my, text, anchor, " fill=\"" + escape_html(stroke.colour) + "\" font-weight=\"bold\"");
}

void SvgPlot::text(Point at, const std::string& text, Anchor anchor, double dx, double dy) {
    if (!std::isfinite(at[0]) || !std::isfinite(at[1])) return;
    data_ += text_element(px(at[0]) + dx, py(at[1]) + dy, text, anchor, " fill=\"#222222\"");
}

void SvgPlot::cell_image(std::span<const double> x_faces, std::span<const double> y_faces,
                         std::span<const double> values, double lo, double hi) {
    if (x_faces.size() < 2 || y_faces.size() < 2) {
        if (values.empty()) return;
        throw std::invalid_argument("cell image: values given without at least two faces on each axis");
    }
    const std::size_t nx = x_faces.size() - 1, ny = y_faces.size() - 1;
    if (values.size() != nx * ny)
        throw std::invalid_argument("cell image: " + std::to_string(values.size()) + " values for " + std::to_string(ny) +
                                    " × " + std::to_string(nx) + " cells");
    const double span = hi > lo ? hi - lo : 1;
    const auto level = [&](double v) { return std::clamp(static_cast<int>((v - lo) / span * colour_steps), 0, colour_steps - 1); };
    // crispEdges keeps hairline seams from showing between neighbouring cells.
    data_ += "<g shape-rendering=\"crispEdges\">";
    for (std::size_t j = 0; j < ny; ++j) {
        if (std::max(y_faces[j], y_faces[j + 1]) < y_.lo || std::min(y_faces[j], y_faces[j + 1]) > y_.hi) continue;
        // Neighbouring cells of one colour step become one rectangle: the same picture, a far smaller file.
        for (std::size_t i = 0; i < nx;) {
            const double v = values[j * nx + i];
            if (!std::isfinite(v)) {
                ++i;
                continue;
            }
            const int l = level(v);
            std::size_t k = i + 1;
            while (k < nx && std::isfinite(values[j * nx + k]) && level(values[j * nx + k]) == l) ++k;
            const double x0 = px(x_faces[i]), x1 = px(x_faces[k]), y0 = py(y_faces[j]), y1 = py(y_faces[j + 1]);
            if (std::max(x0, x1) >= left_ && std::min(x0, x1) <= left_ + plot_w_)
                data_ += "<rect x=\"" + n(std::min(x0, x1)) + "\" y=\"" + n(std::min(y0, y1)) + "\" width=\"" +
                         n(std::abs(x1 - x0)) + "\" height=\"" + n(std::abs(y1 - y0)) + "\" fill=\"" +
                         heat_colour((l + 0.5) / colour_steps) + "\"/>";
            i = k;
        }
    }
    data_ += "</g>";
}

void SvgPlot::legend(std::span<const LegendEntry> entries) {
    const double x = left_ + plot_w_ + 18;
    double y = top_ + 8;
    for (const auto& e : entries) {
        if (e.fill.empty())
            overlay_ += "<line x1=\"" + n(x) + "\" y1=\"" + n(y) + "\" x2=\"" + n(x + 28) + "\" y2=\"" + n(y) + '"' +
                        stroke_attributes(e.stroke) + "/>";
        else
            overlay_ += "<rect x=\"" + n(x) + "\" y=\"" + n(y - 6) + "\" width=\"28\" height=\"12\" fill=\"" +
                        escape_html(e.fill) + '"' + stroke_attributes(e.stroke) + "/>";
        overlay_ += text_element(x + 34, y + 4, e.label, Anchor::start, " fill=\"#222222\"");
        y += 20;
    }
}

void SvgPlot::colour_bar(double lo, double hi, const std::string& label, const std::string& unit) {
    if (!(hi > lo)) hi = lo + 1;
    const double x = left_ + plot_w_ + 16, w = 16, step_h = plot_h_ / colour_steps;
    overlay_ += "<g shape-rendering=\"crispEdges\">";
    for (int s = 0; s < colour_steps; ++s)
        overlay_ += "<rect x=\"" + n(x) + "\" y=\"" + n(top_ + plot_h_ - (s + 1) * step_h) + "\" width=\"" + n(w) +
                    "\" height=\"" + n(step_h + 0.2) + "\" fill=\"" + heat_colour((s + 0.5) / colour_steps) + "\"/>";
    overlay_ += "</g><rect x=\"" + n(x) + "\" y=\"" + n(top_) + "\" width=\"" + n(w) + "\" height=\"" + n(plot_h_) +
                "\" fill=\"none\" stroke=\"#444444\"/>";
    const Ticks t = ticks(lo, hi, plot_h_, 50);
    for (const double v : t.values) {
        const double y = top_ + (hi - v) / (hi - lo) * plot_h_;
        overlay_ += "<line x1=\"" + n(x + w) + "\" y1=\"" + n(y) + "\" x2=\"" + n(x + w + 4) + "\" y2=\"" + n(y) +
                    "\" stroke=\"#444444\"/>";
        overlay_ += text_element(x + w + 7, y + 4, format_fixed(v, t.decimals), Anchor::start, " fill=\"#222222\"");
    }
    const double title_x = x + w + 58, title_y = top_ + plot_h_ / 2;
    overlay_ += text_element(title_x, title_y, label + " (" + unit + ")", Anchor::middle,
                             " fill=\"#222222\" transform=\"rotate(-90 " + n(title_x) + ' ' + n(title_y) + ")\"");
}

std::string SvgPlot::svg() const {
    const std::string clip = escape_html(id_ + "-clip");
    std::string s = "<svg id=\"" + escape_html(id_) + "\" viewBox=\"0 0 " + std::to_string(width_) + ' ' +
                    std::to_string(height_) + "\" width=\"" + std::to_string(width_) + "\" height=\"" +
                    std::to_string(height_) + "\" role=\"img\" font-family=\"sans-serif\" font-size=\"12\"><title>" +
                    escape_html(title_) + "</title><defs><clipPath id=\"" + clip + "\"><rect x=\"" + n(left_) + "\" y=\"" +
                    n(top_) + "\" width=\"" + n(plot_w_) + "\" height=\"" + n(plot_h_) + "\"/></clipPath></defs>";
    // Grid first, data over it, then the frame, ticks and titles, then the overlay on top.
    const AxisTicks tx = axis_ticks(x_, plot_w_, 70), ty = axis_ticks(y_, plot_h_, 50);
    const double bottom = top_ + plot_h_, right = left_ + plot_w_;
    s += "<g stroke=\"#e3e3e3\" stroke-width=\"1\">";
    for (const double v : tx.values)
        s += "<line x1=\"" + n(px(v)) + "\" y1=\"" + n(top_) + "\" x2=\"" + n(px(v)) + "\" y2=\"" + n(bottom) + "\"/>";
    for (const double v : ty.values)
        s += "<line x1=\"" + n(left_) + "\" y1=\"" + n(py(v)) + "\" x2=\"" + n(right) + "\" y2=\"" + n(py(v)) + "\"/>";
    s += "</g><g clip-path=\"url(#" + clip + ")\">" + data_ + "</g>";
    s += "<rect x=\"" + n(left_) + "\" y=\"" + n(top_) + "\" width=\"" + n(plot_w_) + "\" height=\"" + n(plot_h_) +
         "\" fill=\"none\" stroke=\"#444444\"/><g fill=\"#222222\">";
    for (std::size_t i = 0; i < tx.values.size(); ++i) {
        const double v = tx.values[i];
        s += "<line x1=\"" + n(px(v)) + "\" y1=\"" + n(bottom) + "\" x2=\"" + n(px(v)) + "\" y2=\"" + n(bottom + 5) +
             "\" stroke=\"#444444\"/>";
        s += "<text x=\"" + n(px(v)) + "\" y=\"" + n(bottom + 18) + "\" text-anchor=\"middle\">" + escape_html(tx.labels[i]) +
             "</text>";
    }
    for (std::size_t i = 0; i < ty.values.size(); ++i) {
        const double v = ty.values[i];
        s += "<line x1=\"" + n(left_ - 5) + "\" y1=\"" + n(py(v)) + "\" x2=\"" + n(left_) + "\" y2=\"" + n(py(v)) +
             "\" stroke=\"#444444\"/>";
        s += "<text x=\"" + n(left_ - 8) + "\" y=\"" + n(py(v) + 4) + "\" text-anchor=\"end\">" + escape_html(ty.labels[i]) +
             "</text>";
    }
    const double title_x = 16, title_y = top_ + plot_h_ / 2;
    s += "<text x=\"" + n(left_ + plot_w_ / 2) + "\" y=\"" + n(bottom + 38) + "\" text-anchor=\"middle\">" +
         escape_html(axis_title(x_)) + "</text>";
    s += "<text x=\"" + n(title_x) + "\" y=\"" + n(title_y) + "\" text-anchor=\"middle\" transform=\"rotate(-90 " +
         n(title_x) + ' ' + n(title_y) + ")\">" + escape_html(axis_title(y_)) + "</text></g>";
    return s + overlay_ + "</svg>";
}

}  // namespace heatbead::post

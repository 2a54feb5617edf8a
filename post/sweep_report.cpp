#include "post/sweep_report.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/html_page.hpp"
#include "post/report_figures.hpp"
#include "post/svg_plot.hpp"
#include "post/text.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <iterator>
#include <limits>
#include <map>
#include <set>
#include <stdexcept>

namespace heatbead::post {

namespace {

// An output's figures take the width of their own SVG (most are narrower than the shared 660 px, so
// two or three fit side by side); the caption wraps within it rather than widening the figure to its
// one-line length (width 0, stretched back by min-width).
constexpr const char* page_style = R"(
.summary{font-weight:bold}
.note{color:#555;max-width:60em}
.responses figure{flex-basis:auto}.responses figcaption{width:0;min-width:100%}
)";

// 6 outputs × 4 axes is 24 response plots and 6 maps: past that a page is too long to read and slow to open.
constexpr std::size_t max_outputs = 6, max_axes = 4;

// Lines of a response plot differ in colour and in dash, so they stay apart in grey print and for
// readers who do not see the hues. Past these eight the legend would be longer than the plot, so it is
// left out and the styles repeat.
constexpr const char* group_colours[] = {"#1b5e8a", "#b04a1e", "#3d7d3a", "#7a3d8f",
                                         "#8a6d12", "#1e7f7a", "#a3324f", "#4a4a4a"};
constexpr const char* group_dashes[] = {"", "7 3", "2 3", "10 3 2 3", "4 4", "12 4", "1.5 2.5", "6 2 2 2"};
static_assert(std::size(group_colours) == std::size(group_dashes));
constexpr std::size_t max_named_groups = std::size(group_colours);

// The bands of the points, where they ran with bands on: thin and dark, over every line's colour.
const Stroke band_stroke{"#333333", 1.0, ""};

Stroke group_stroke(std::size_t i) {
    return {group_colours[i % max_named_groups], 1.6, group_dashes[i % max_named_groups]};
}

std::string with_unit(const SweepColumn& c) { return c.unit.empty() ? c.name : c.name + " (" + c.unit + ")"; }

// SvgPlot titles an axis "label (unit)"; a quantity without a unit is marked as such by a dash.
Axis axis_of(const SweepColumn& c, std::array<double, 2> range) {
    return {c.name, c.unit.empty() ? "-" : c.unit, range[0], range[1]};
}

// Ids carry the column names with every character but letters and digits made '-', and get a
// number appended where names that differ only in punctuation would give one id twice (each SVG's
// clip path is named after its id, so a repeat would clip the wrong plot).
std::string unique_id(std::set<std::string>& used, std::string id) {
    std::replace_if(id.begin(), id.end(), [](char c) { return !std::isalnum(static_cast<unsigned char>(c)); }, '-');
    std::string candidate = id;
    for (int k = 2; !used.insert(candidate).second; ++k) candidate = id + '-' + std::to_string(k);
    return candidate;
}

void validate(const SweepReportInput& in) {
    const std::size_t width = in.axes.size() + in.outputs.size();
    for (std::size_t r = 0; r < in.rows.size(); ++r)
        if (in.rows[r].size() != width)
            throw std::invalid_argument("sweep report: row " + std::to_string(r + 1) + " has " +
                                        std::to_string(in.rows[r].size()) + " values for " +
                                        std::to_string(in.axes.size()) + " axes and " +
                                        std::to_string(in.outputs.size()) + " outputs");
    for (std::size_t f = 0; f < in.incomplete.size(); ++f)
        if (in.incomplete[f].axis_values.size() != in.axes.size())
            throw std::invalid_argument("sweep report: point " + std::to_string(f + 1) + " with missing outputs has " +
                                        std::to_string(in.incomplete[f].axis_values.size()) + " axis values for " +
                                        std::to_string(in.axes.size()) + " axes");
    for (std::size_t f = 0; f < in.failures.size(); ++f)
        if (in.failures[f].axis_values.size() != in.axes.size())
            throw std::invalid_argument("sweep report: failed point " + std::to_string(f + 1) + " has " +
                                        std::to_string(in.failures[f].axis_values.size()) + " axis values for " +
                                        std::to_string(in.axes.size()) + " axes");
    for (const auto* ends : {&in.lows, &in.highs}) {
        if (ends->empty()) continue;
        if (ends->size() != in.rows.size())
            throw std::invalid_argument("sweep report: bands for " + std::to_string(ends->size()) + " rows of " +
                                        std::to_string(in.rows.size()));
        for (const auto& e : *ends)
            if (e.size() != in.outputs.size())
                throw std::invalid_argument("sweep report: a row's band has " + std::to_string(e.size()) + " ends for " +
                                            std::to_string(in.outputs.size()) + " outputs");
    }
    const std::size_t finished = in.rows.size() + in.failures.size();
    if (in.points_total < finished)
        throw std::invalid_argument("sweep report: " + std::to_string(in.points_total) + " points in all, but " +
                                    std::to_string(finished) + " done or failed");
}

// The lowest and highest finite value; {+inf, -inf} when there is none.
struct Extent {
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    void add(double v) {
        if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
    }
    bool empty() const { return !(hi >= lo); }
    // Widened by 6 % each way so markers on the extremes clear the frame. One value is left as it is
    // (SvgPlot widens it to a unit range around it) and none as NaN (SvgPlot shows 0 to 1).
    std::array<double, 2> padded() const {
        if (empty()) return {std::nan(""), std::nan("")};
        const double pad = 0.06 * (hi - lo);
        return {lo - pad, hi + pad};
    }
};

// A square marker `half` px from its centre each way, in data units of `plot`. The plot area is the
// figure less svg_plot's margins (80 px across, 58 px down) and the side panel.
std::array<Point, 4> square(const SvgPlot& plot, int width, int height, int panel, Point c, double half) {
    const double hx = half * (plot.x_axis().hi - plot.x_axis().lo) / (width - panel - 80);
    const double hy = half * (plot.y_axis().hi - plot.y_axis().lo) / (height - 58);
    return {Point{c[0] - hx, c[1] - hy}, Point{c[0] + hx, c[1] - hy}, Point{c[0] + hx, c[1] + hy}, Point{c[0] - hx, c[1] + hy}};
}

// The page draws the rows whose axis values are all finite: only they have a place on every axis
// (and only they can be grouped by value).
std::vector<const std::vector<double>*> placed_rows(const SweepReportInput& in) {
    std::vector<const std::vector<double>*> placed;
    for (const auto& row : in.rows)
        if (std::all_of(row.begin(), row.begin() + static_cast<std::ptrdiff_t>(in.axes.size()),
                        [](double v) { return std::isfinite(v); }))
            placed.push_back(&row);
    return placed;
}

// "procedure.voltage = 24 V, procedure.wire_feed = 9 m/min": the other axes' values a line holds fixed.
std::string group_label(const SweepReportInput& in, std::size_t axis, const std::vector<double>& key) {
    std::string label;
    for (std::size_t b = 0, k = 0; b < in.axes.size(); ++b) {
        if (b == axis) continue;
        const SweepColumn& c = in.axes[b];
        label += (label.empty() ? "" : ", ") + c.name + " = " + number_text(key[k++]) + (c.unit.empty() ? "" : ' ' + c.unit);
    }
    return label;
}

// The side panel fits the longest legend label: svg_plot starts labels 38 px into the panel, and a
// character takes about 7 px at the 12 px font (its estimate for dimension texts too), with 12 px to
// spare; capped so the plot area keeps 320 px. Longer labels are cut at the figure's edge.
int legend_width(const std::vector<LegendEntry>& legend) {
    std::size_t longest = 0;
    for (const auto& e : legend) longest = std::max(longest, e.label.size());
    return std::min(static_cast<int>(50 + 7 * longest), 340);
}

std::string response_figure(const SweepReportInput& in, const std::vector<const std::vector<double>*>& placed,
                            std::size_t output, std::size_t axis, const std::string& id) {
    const SweepColumn& out = in.outputs[output];
    const SweepColumn& ax = in.axes[axis];
    const std::size_t column = in.axes.size() + output;
    // The lines: points keyed by the values of every other axis (all of them, not only the plotted ones).
    std::map<std::vector<double>, std::vector<Point>> groups;
    // The band of a placed row's output, {NaN, NaN} where it has none.
    const auto band = [&](const std::vector<double>* row) {
        const auto r = static_cast<std::size_t>(row - in.rows.data());
        return in.lows.empty() ? std::array<double, 2>{std::nan(""), std::nan("")}
                               : std::array<double, 2>{in.lows[r][output], in.highs[r][output]};
    };
    Extent xs, ys;
    for (const auto* row : placed) {
        const std::vector<double>& r = *row;
        xs.add(r[axis]);  // from every placed point, so one axis spans alike for every output
        if (!std::isfinite(r[column])) continue;
        ys.add(r[column]);
        for (const double end : band(row)) ys.add(end);
        std::vector<double> key;
        for (std::size_t b = 0; b < in.axes.size(); ++b)
            if (b != axis) key.push_back(r[b]);
        groups[key].push_back({r[axis], r[column]});
    }
    const bool named = groups.size() >= 2 && groups.size() <= max_named_groups;
    std::vector<LegendEntry> legend;
    if (named)
        for (const auto& [key, points] : groups) legend.push_back({group_label(in, axis, key), group_stroke(legend.size()), ""});
    const int panel = legend.empty() ? 0 : legend_width(legend), width = 400 + panel, height = 320;

    SvgPlot plot(id + "-plot", out.name + " against " + ax.name, width, height, axis_of(ax, xs.padded()),
                 axis_of(out, ys.padded()), false, panel);
    std::size_t g = 0;
    for (auto& [key, points] : groups) {
        const Stroke stroke = group_stroke(g++);
        std::stable_sort(points.begin(), points.end(), [](const Point& a, const Point& b) { return a[0] < b[0]; });
        plot.polyline(points, stroke);
        for (const Point& p : points) plot.polygon(square(plot, width, height, panel, p, 3.5), {stroke.colour, 1.0, ""}, stroke.colour);
    }
    bool banded = false;
    for (const auto* row : placed) {
        const auto [lo, hi] = band(row);
        if (!std::isfinite(lo) || !std::isfinite(hi) || !std::isfinite((*row)[column])) continue;
        plot.error_bar((*row)[axis], lo, (*row)[column], hi, band_stroke);
        banded = true;
    }
    plot.legend(legend);
    if (groups.empty()) note_in_middle(plot, "no value at any point");

    std::string caption = with_unit(out) + " against " + with_unit(ax) + " at each point that succeeded" +
                          (banded ? " (bars: each point's band)" : "");
    if (in.axes.size() == 1) caption += ", joined in order of " + ax.name + ".";
    else if (named) caption += "; points that share the other axes' values are joined, one line for each combination (legend).";
    else if (groups.size() > max_named_groups)
        caption += "; points that share the other axes' values are joined, one line for each of the " +
                   std::to_string(groups.size()) + " combinations, too many to name.";
    else caption += "; the other axes keep one value, so all points are joined.";
    return figure(id, plot.svg(), caption + " Points with no value are left out.");
}

std::string map_figure(const SweepReportInput& in, const std::vector<const std::vector<double>*>& placed,
                       std::size_t output, const std::string& id) {
    const SweepColumn& out = in.outputs[output];
    const std::size_t column = in.axes.size() + output;
    Extent xs, ys, values;
    for (const auto* row : placed) xs.add((*row)[0]), ys.add((*row)[1]), values.add((*row)[column]);
    const bool any = !values.empty();
    // The bar's own rule for a single value (a range of one unit above it), so squares and bar agree.
    const double lo = any ? values.lo : 0, hi = any && values.hi > values.lo ? values.hi : lo + 1;

    constexpr int width = 560, height = 440, panel = 110;
    SvgPlot plot(id + "-plot", out.name + " over " + in.axes[0].name + " and " + in.axes[1].name, width, height,
                 axis_of(in.axes[0], xs.padded()), axis_of(in.axes[1], ys.padded()), false, panel);
    // A thin dark edge keeps the lightest colours of the scale visible on the white background.
    const Stroke edge{"#333333", 0.6, ""};
    for (const auto* row : placed) {
        const std::vector<double>& r = *row;
        if (std::isfinite(r[column]))
            plot.polygon(square(plot, width, height, panel, {r[0], r[1]}, 7), edge, heat_colour((r[column] - lo) / (hi - lo)));
    }
    plot.colour_bar(lo, hi, out.name, out.unit.empty() ? "-" : out.unit);
    if (!any) note_in_middle(plot, "no value at any point");

    std::string caption = with_unit(out) + " at each point that succeeded, by " + in.axes[0].name + " across and " +
                          in.axes[1].name + " up, coloured on the bar from the lowest value (dark) to the highest (deep "
                          "red). Points with no value are left out.";
    if (in.axes.size() > 2)
        caption += " Points that differ only in the other axes fall on one square; the last of them in the table is the one seen.";
    return figure(id, plot.svg(), caption);
}

// A table of points, their axis values then one column of words (`column`); `none` when there is none.
template <typename Point>
std::string points_section(const SweepReportInput& in, const char* title, const char* none, const char* column,
                           const std::vector<Point>& points, std::string Point::*words) {
    if (points.empty()) return std::string("<section class=\"table\"><h2>") + title + "</h2><p>" + none + "</p></section>\n";
    std::vector<std::string> columns;
    for (const auto& a : in.axes) columns.push_back(with_unit(a));
    columns.push_back(column);
    std::vector<TableRow> rows;
    rows.reserve(points.size());
    for (const auto& p : points) {
        TableRow row{p.axis_values, ""};
        row.cells.push_back(p.*words);
        rows.push_back(std::move(row));
    }
    return column_table(title, columns, rows) + "\n";
}

}  // namespace

std::string render_sweep_report(const SweepReportInput& in) {
    validate(in);
    std::string page = page_start({.title = in.title,
                                   .case_file = in.sweep_file,
                                   .created = in.created,
                                   .caution = in.caution.empty() ? sweep_page_caution : in.caution,
                                   .how_computed = in.how_computed,
                                   .warnings = {},
                                   .extra_style = page_style});
    const std::size_t done = in.rows.size(), failed = in.failures.size(), waiting = in.points_total - done - failed;
    const std::string incomplete = in.incomplete.empty() ? "" : " (" + std::to_string(in.incomplete.size()) + " with outputs missing)";
    page += "<p class=\"summary\">Points: " + std::to_string(done) + " done" + incomplete + ", " + std::to_string(failed) + " failed, " +
            std::to_string(in.points_total) + " in all" + (waiting ? " (" + std::to_string(waiting) + " not yet run)" : "") +
            ".</p>\n";

    const std::size_t outputs = std::min(in.outputs.size(), max_outputs), axes = std::min(in.axes.size(), max_axes);
    if (outputs < in.outputs.size() || axes < in.axes.size())
        page += "<p class=\"note\">The sweep has " + std::to_string(in.outputs.size()) + " outputs and " +
                std::to_string(in.axes.size()) + " axes; the figures show the first " + std::to_string(outputs) +
                " outputs against the first " + std::to_string(axes) + " axes.</p>\n";

    const auto placed = placed_rows(in);
    std::set<std::string> ids;
    for (std::size_t o = 0; o < outputs && axes > 0; ++o) {
        const std::string& name = in.outputs[o].name;
        page += "<section class=\"output\"><h2>" + escape_html(with_unit(in.outputs[o])) +
                "</h2><div class=\"figures responses\">\n";
        for (std::size_t a = 0; a < axes; ++a)
            page += response_figure(in, placed, o, a, unique_id(ids, "figure-response-" + name + '-' + in.axes[a].name)) + "\n";
        if (in.axes.size() >= 2) page += map_figure(in, placed, o, unique_id(ids, "figure-map-" + name)) + "\n";
        page += "</div></section>\n";
    }
    page += points_section(in, "Failed points", "No failures.", "error", in.failures, &SweepReportInput::Failure::error);
    page += points_section(in, "Points with missing outputs", "Every point that ran has every output.", "status",
                           in.incomplete, &SweepReportInput::Incomplete::status);
    return page + page_end();
}

void write_sweep_report(const std::filesystem::path& path, const SweepReportInput& input) {
    write_file_atomically(path, render_sweep_report(input));
}

}  // namespace heatbead::post

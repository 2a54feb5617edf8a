#include "post/preheat_report.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/html_page.hpp"
#include "post/svg_plot.hpp"
#include "post/text.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <tuple>

namespace heatbead::post {

namespace {

// The page's own rules: the header row of the runs table, and the runs that meet every limit, marked
// by weight as well as by colour so they still stand out in grey print.
constexpr const char* page_style = R"(
tr.passes td{background:#e2f0e2;font-weight:bold}
.explanation{max-width:60em}
)";

// The runs, the limit and the two answers each have a colour; the answers differ in dash too, so the
// simulation's and the standard's preheat stay apart in grey print and where they coincide.
const Stroke run_stroke{"#1f4e79", 1.6, ""};
const Stroke limit_stroke{"#b8322a", 1.6, ""};
const Stroke found_stroke{"#2e7d4f", 2.0, "9 4"};
const Stroke standard_stroke{"#7b3f98", 2.0, "2 3"};
const Stroke reference_stroke{"#7a7a7a", 1.4, "5 3"};
const Stroke across_stroke{"#c77c12", 2.0, "12 3 2 3"};
const Stroke band_stroke{"#1f4e79", 1.4, ""};
constexpr const char* miss_fill = "#ffffff";  // hollow marker: the run misses a limit

// Preheats and limits with the one decimal they may carry, and none when it is zero: "75", "62.5".
std::string short_number(double v) {
    std::string s = format_fixed(v, 1);
    if (s.ends_with(".0")) s.resize(s.size() - 2);
    return s;
}

struct Range {
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    void add(double v) {
        if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
    }
    void add(const std::optional<double>& v) {
        if (v) add(*v);
    }
    // Widened by a margin so markers on the extremes are not cut by the frame; a range of values that
    // cannot be negative (preheat in practice, hardness, times) is not widened below zero.
    Range padded() const {
        if (!(hi >= lo)) return {0, 1};
        const double pad = hi > lo ? 0.08 * (hi - lo) : std::max(0.08 * std::abs(lo), 1.0);
        return {lo >= 0 ? std::max(0.0, lo - pad) : lo - pad, hi + pad};
    }
};

// One quantity of the runs drawn against preheat.
struct Series {
    std::string id, title, label, unit;
    double PreheatRun::*value;
    double PreheatRun::*low;  // the band's ends, drawn as error bars where a run has them
    double PreheatRun::*high;
    std::optional<double> limit;
    std::string limit_word;  // how the limit binds: "at most", "at least"
    std::string none_note;   // in the middle of the plot when no run has a value
    std::optional<double> reference;  // a horizontal guide that is not a limit, e.g. the t8/5 the hardness needs
    std::string reference_label;
};

void segment(SvgPlot& plot, Point a, Point b, const Stroke& stroke) {
    const std::array<Point, 2> points{a, b};
    plot.polyline(points, stroke);
}

// Markers (a diamond a run, filled when it meets every limit, hollow when not) and a line through
// them in order of preheat; the limit as a labelled horizontal line; the simulation's and the
// standard's preheat as vertical lines. `runs` are sorted by preheat.
std::string against_preheat(const PreheatReportInput& in, const std::vector<PreheatRun>& runs, const Series& s) {
    Range x, y;
    for (const auto& r : runs) {
        x.add(r.preheat);
        y.add(r.*s.value), y.add(r.*s.low), y.add(r.*s.high);
    }
    x.add(in.found), x.add(in.standard), x.add(in.across), y.add(s.limit), y.add(s.reference);
    const Range xr = x.padded(), yr = y.padded();
    SvgPlot plot(s.id + "-plot", s.title, 660, 400, Axis{"preheat", "°C", xr.lo, xr.hi}, Axis{s.label, s.unit, yr.lo, yr.hi},
                 false, 200);
    const double x0 = plot.x_axis().lo, x1 = plot.x_axis().hi, y0 = plot.y_axis().lo, y1 = plot.y_axis().hi;
    std::vector<LegendEntry> legend;
    if (s.limit) {
        segment(plot, {x0, *s.limit}, {x1, *s.limit}, limit_stroke);
        plot.text({x1, *s.limit}, "limit: " + s.limit_word + ' ' + short_number(*s.limit) + ' ' + s.unit, Anchor::end, -6, -6);
        legend.push_back({"limit " + short_number(*s.limit) + ' ' + s.unit, limit_stroke, ""});
    }
    if (s.reference) {
        segment(plot, {x0, *s.reference}, {x1, *s.reference}, reference_stroke);
        legend.push_back({s.reference_label + ": " + short_number(*s.reference) + ' ' + s.unit, reference_stroke, ""});
    }
    for (const auto& [at, stroke, name] : {std::tuple{in.found, found_stroke, "simulation"},
                                           std::tuple{in.across, across_stroke, "across the band"},
                                           std::tuple{in.standard, standard_stroke, "standard"}})
        if (at) {
            segment(plot, {*at, y0}, {*at, y1}, stroke);
            legend.push_back({std::string(name) + ": " + short_number(*at) + " °C", stroke, ""});
        }
    // The markers are sized as a share of the axis spans: about 4 px on the plot area this figure has.
    const double half_w = 0.011 * (x1 - x0), half_h = 0.016 * (y1 - y0);
    std::vector<Point> line;
    bool any_pass = false, any_miss = false;
    for (const auto& r : runs) {
        const double v = r.*s.value;
        if (!std::isfinite(r.preheat) || !std::isfinite(v)) continue;
        line.push_back({r.preheat, v});
        const std::array<Point, 4> diamond{
            Point{r.preheat - half_w, v}, Point{r.preheat, v + half_h}, Point{r.preheat + half_w, v}, Point{r.preheat, v - half_h}};
        plot.polygon(diamond, run_stroke, r.passes ? run_stroke.colour : miss_fill);
        (r.passes ? any_pass : any_miss) = true;
    }
    plot.polyline(line, run_stroke);
    bool any_band = false;
    for (const auto& r : runs) {
        if (!std::isfinite(r.*s.low) || !std::isfinite(r.*s.high)) continue;
        plot.error_bar(r.preheat, r.*s.low, r.*s.value, r.*s.high, band_stroke);
        any_band = true;
    }
    if (any_band) legend.push_back({"band where computed", band_stroke, ""});
    if (any_pass) legend.push_back({"passes every limit", run_stroke, run_stroke.colour});
    if (any_miss) legend.push_back({"misses a limit", run_stroke, miss_fill});
    plot.legend(legend);
    if (line.empty()) plot.text({(x0 + x1) / 2, (y0 + y1) / 2}, s.none_note, Anchor::middle);
    return plot.svg();
}

// " (300–390)" where a band was computed, else "".
std::string band(double lo, double hi, int decimals) {
    return std::isfinite(lo) && std::isfinite(hi) ? " (" + format_fixed(lo, decimals) + "–" + format_fixed(hi, decimals) + ")" : "";
}

std::string runs_table(const std::vector<PreheatRun>& runs) {
    std::vector<TableRow> rows;
    rows.reserve(runs.size());
    for (const auto& r : runs)
        rows.push_back({{short_number(r.preheat), format_fixed(r.hardness, 0) + band(r.hardness_low, r.hardness_high, 0),
                         r.hardest_probe.empty() ? "n/a" : r.hardest_probe, format_fixed(r.hardness_duren, 0),
                         format_fixed(r.hardness_yurioka, 0), format_fixed(r.t8_5, 1) + band(r.t8_5_low, r.t8_5_high, 1),
                         std::isfinite(r.time_to_100) ? format_fixed(r.time_to_100, 0) : "not below 100 °C in the run",
                         r.verdict},
                        r.passes ? "passes" : ""});
    return column_table("Runs of the search",
                        {"preheat (°C)", "highest HAZ hardness (HV)", "at probe", "there by Düren (HV)",
                         "by Yurioka (HV)", "shortest t8/5 (s)",
                         "shortest time to 100 °C (s)", "verdict"},
                        rows);
}

}  // namespace

std::string render_preheat_report(const PreheatReportInput& in) {
    if (in.runs.empty()) throw std::invalid_argument("preheat report: no runs of the search to show");
    std::vector<PreheatRun> runs = in.runs;
    std::stable_sort(runs.begin(), runs.end(), [](const PreheatRun& a, const PreheatRun& b) { return a.preheat < b.preheat; });

    std::string page = page_start({.title = in.title,
                                   .case_file = in.case_file,
                                   .created = in.created,
                                   .caution = in.caution.empty() ? preheat_page_caution : in.caution,
                                   .how_computed = in.how_computed,
                                   .warnings = in.warnings,
                                   .extra_style = page_style});
    page += table("Answer", in.answer) + "\n";
    if (!in.explanation.empty()) page += "<p class=\"explanation\">" + escape_html(in.explanation) + "</p>\n";
    page += table("Inputs", in.inputs) + "\n";

    const std::string answers =
        " Vertical lines, where given: the lowest preheat of the search that meets every limit (simulation), the "
        "lowest that meets them across the band of its answers (across the band) and the standard method's value "
        "(standard); bars: the band of a run's figure where one was computed.";
    page += "<div class=\"figures\">\n";
    page += figure("figure-preheat-hardness",
                   against_preheat(in, runs,
                                   {"figure-preheat-hardness", "Highest HAZ hardness against preheat", "highest HAZ hardness",
                                    "HV", &PreheatRun::hardness, &PreheatRun::hardness_low, &PreheatRun::hardness_high, in.hardness_limit, "at most",
                                    "no hardness estimate in any run", std::nullopt, ""}),
                   "Highest estimated HAZ hardness of each run against its preheat (filled: the run meets every "
                   "limit; hollow: it misses one), with the hardness limit. Runs without an estimate are left out." +
                       answers) + "\n";
    page += figure("figure-preheat-cooling",
                   against_preheat(in, runs,
                                   {"figure-preheat-cooling", "Shortest t8/5 against preheat", "shortest t8/5", "s",
                                    &PreheatRun::t8_5, &PreheatRun::t8_5_low, &PreheatRun::t8_5_high, in.min_t8_5, "at least", "no t8/5 in any run",
                                    in.critical_t8_5, "needed for " + short_number(in.hardness_limit) + " HV"}),
                   "Shortest cooling time from 800 to 500 °C over the hardened HAZ probes of each run against its "
                   "preheat" + std::string(in.min_t8_5 ? ", with the shortest allowed" : "") +
                       std::string(in.critical_t8_5 ? "; the grey line is the t8/5 the hardness formulas need for the "
                                                      "hardness limit." : ".") + answers) + "\n";
    if (std::any_of(runs.begin(), runs.end(), [](const PreheatRun& r) { return std::isfinite(r.time_to_100); }))
        page += figure("figure-preheat-hydrogen",
                       against_preheat(in, runs,
                                       {"figure-preheat-hydrogen", "Time to 100 °C against preheat", "shortest time to 100 °C",
                                        "s", &PreheatRun::time_to_100, &PreheatRun::time_to_100_low, &PreheatRun::time_to_100_high, in.min_time_to_100, "at least", "", std::nullopt, ""}),
                       "Shortest time to cool to 100 °C over those probes against preheat: the longer, the more "
                       "hydrogen leaves the weld before it is cold. Runs that did not cool below 100 °C are left out" +
                           std::string(in.min_time_to_100 ? "; the horizontal line is the shortest allowed." : ".") +
                           answers) + "\n";
    page += "</div>\n" + runs_table(runs) + "\n";
    page += bands_section(in.bands);
    return page + page_end();
}

void write_preheat_report(const std::filesystem::path& path, const PreheatReportInput& input) {
    write_file_atomically(path, render_preheat_report(input));
}

}  // namespace heatbead::post

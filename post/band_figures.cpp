#include "post/band_figures.hpp"

#include "post/html_page.hpp"
#include "post/svg_plot.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace heatbead::post {

namespace {

const Stroke bar_stroke{"#1f4e79", 1.8, ""};

constexpr const char* bands_lead =
    "Each band comes from the extra runs described under \"how sure\" in How this was computed, at the top of the "
    "page. The table gives the shift of each answer when one input is moved by its spread, and the grid "
    "convergence index.";

std::string id_of(const std::string& key) {
    std::string id = key;
    std::replace_if(id.begin(), id.end(), [](char c) { return !std::isalnum(static_cast<unsigned char>(c)); }, '-');
    return "figure-band-" + id;
}

}  // namespace

std::string band_svg(const BandedAnswer& a) {
    const std::size_t n = a.runs.size();
    if (a.value.size() != n || a.low.size() != n || a.high.size() != n)
        throw std::invalid_argument("band figure " + a.key + ": " + std::to_string(n) + " runs but " +
                                    std::to_string(a.value.size()) + " values, " + std::to_string(a.low.size()) +
                                    " low and " + std::to_string(a.high.size()) + " high ends");
    double lo = std::numeric_limits<double>::infinity(), hi = -lo;
    for (const auto* v : {&a.value, &a.low, &a.high})
        for (const double x : *v)
            if (std::isfinite(x)) lo = std::min(lo, x), hi = std::max(hi, x);
    // 8 % of the span each way, so caps on the extremes clear the frame.
    const double pad = hi > lo ? 0.08 * (hi - lo) : std::max(0.08 * std::abs(lo), 0.5);
    if (!(hi >= lo)) lo = 0, hi = 1;
    SvgPlot plot(id_of(a.key) + "-plot", a.name, 300, 300, Axis{"", "", 0.5, static_cast<double>(n) + 0.5, a.runs},
                 Axis{a.name, a.unit.empty() ? "-" : a.unit, lo - pad, hi + pad}, false, 0);
    for (std::size_t i = 0; i < n; ++i) plot.error_bar(1.0 + static_cast<double>(i), a.low[i], a.value[i], a.high[i], bar_stroke);
    if (std::none_of(a.value.begin(), a.value.end(), [](double v) { return std::isfinite(v); }))
        plot.text({(plot.x_axis().lo + plot.x_axis().hi) / 2, (plot.y_axis().lo + plot.y_axis().hi) / 2}, "no value",
                  Anchor::middle);
    return plot.svg();
}

std::string bands_section(const BandsView& b) {
    if (b.answers.empty()) return "";
    std::string s = "<section class=\"bands\"><h2>How sure</h2><p class=\"note\">" +
                    escape_html((b.note.empty() ? "" : b.note + " ") + bands_lead) + "</p>\n";
    s += "<div class=\"figures\">\n";
    for (const auto& a : b.answers)
        s += figure(id_of(a.key), band_svg(a),
                    a.name + ": the answer (dot) and its band (bar) for each " +
                        (a.runs.size() > 1 ? std::string("run named along the axis.") : std::string("run.")) +
                        " A run without a band shows its dot alone.") +
             "\n";
    s += "</div>\n";
    std::vector<TableRow> rows;
    for (const auto& r : b.rows) rows.push_back({r, ""});
    return s + column_table("What moves each answer", b.columns, rows) + "</section>\n";
}

}  // namespace heatbead::post

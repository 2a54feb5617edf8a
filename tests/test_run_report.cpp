// The HTML run report: complete and self-contained, its text escaped, its figures findable, and the
// numbers it is given shown. A synthetic tee joint stands in for a run: flange 20 mm, web 10 mm centred
// on y = 0, one 6 mm fillet on the +y side, peak temperatures falling off with distance from the root.
//
// The hidden test "[.sample]" writes that page for tests/render_report.sh (path from the environment
// variable HEATBEAD_SAMPLE_REPORT, else heatbead_sample_report.html in the temporary folder).
#include "post/run_report.hpp"
#include "post/svg_plot.hpp"
#include "page_checks.hpp"
#include "temp_folder.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <limits>
#include <numbers>

using namespace heatbead::post;
using heatbead::testing::count;
using heatbead::testing::read_file;
using heatbead::testing::sample_path;

namespace {

constexpr double mm = 1e-3;
constexpr double void_value = std::numeric_limits<double>::quiet_NaN();  // NaN marks a void cell

bool solid(double y, double z) {
    const bool flange = z >= -20 * mm && z <= 0 && std::abs(y) <= 50 * mm;
    const bool web = z >= 0 && z <= 60 * mm && std::abs(y) <= 5 * mm;
    const bool bead = z >= 0 && y >= 5 * mm && (y - 5 * mm) + z <= 6 * mm;
    return flange || web || bead;
}

// Points on a quarter-ish arc of radius r about the root corner (5 mm, 0), from up the web face
// round into the flange: the shape of a fusion or HAZ boundary of a fillet.
Curve arc(double r) {
    Curve c;
    for (int i = 0; i <= 24; ++i) {
        const double a = std::numbers::pi * (0.5 - 0.75 * i / 24.0);
        c.points.push_back({5 * mm + r * std::cos(a) - 0.4 * r, r * std::sin(a)});
    }
    return c;
}

ReportInput sample_input() {
    ReportInput in;
    in.title = "Tee joint, 6 mm fillet, one pass";
    in.case_file = "cases/demo_tee_15mm.toml";
    in.created = "2024-01-01 12:00";
    in.procedure = {{"heat input", "0.86 kJ/mm"}, {"current", "240 A"}, {"voltage", "24 V"},
                    {"travel speed", "6.0 mm/s"}, {"preheat", "20 °C"}};
    in.results = {{"penetration, flange", "1.23 mm"}, {"penetration, web", "1.10 mm"}, {"leg, flange", "6.20 mm"},
                  {"leg, web", "6.05 mm"}, {"throat", "4.31 mm"}, {"root fused", "yes"},
                  {"HAZ width", "2.4 mm"}, {"t8/5", "5.1 to 7.8 s"}, {"energy balance", "0.4 %"}};
    in.plates = {Outline{{{-50 * mm, -20 * mm}, {50 * mm, -20 * mm}, {50 * mm, 0}, {-50 * mm, 0}}},
                 Outline{{{-5 * mm, 0}, {5 * mm, 0}, {5 * mm, 60 * mm}, {-5 * mm, 60 * mm}}}};
    in.bead = Outline{{{5 * mm, 0}, {11 * mm, 0}, {5 * mm, 6 * mm}}};
    in.fusion_line = {arc(7.8 * mm)};
    in.haz_ac3_line = {arc(9.6 * mm)};
    in.haz_ac1_line = {arc(10.6 * mm)};
    in.dimensions = {{"flange leg", {5 * mm, -1.5 * mm}, {11.2 * mm, -1.5 * mm}, 6.2, "mm"},
                     {"web leg", {3.5 * mm, 0}, {3.5 * mm, 6.05 * mm}, 6.05, "mm"},
                     {"throat", {5 * mm, 0}, {8.05 * mm, 3.05 * mm}, 4.3125, "mm"},
                     {"flange penetration", {12.5 * mm, 0}, {12.5 * mm, -1.23 * mm}, 1.23, "mm"}};
    // Cooling cycles of the thick-plate kind: a quick rise, then T − T0 falling as 1/t.
    const std::vector<std::pair<std::string, double>> probes{
        {"root", 1650}, {"flange toe", 1450}, {"web toe", 1300}, {"HAZ, flange <&> \"web\"", 950}};
    for (const auto& [name, peak] : probes) {
        Cycle c{name, {}, {}};
        for (double t = 0; t <= 60; t += 0.25) {
            c.time.push_back(t);
            c.temperature.push_back(20 + (peak - 20) * (t <= 1.5 ? t / 1.5 : 1.5 / t));
        }
        in.cycles.push_back(std::move(c));
    }
    SectionImage& map = in.peak_map;
    for (double y = -25 * mm; y <= 35 * mm + 1e-9; y += 0.5 * mm) map.y_faces.push_back(y);
    for (double z = -20 * mm; z <= 40 * mm + 1e-9; z += 0.5 * mm) map.z_faces.push_back(z);
    for (std::size_t j = 0; j + 1 < map.z_faces.size(); ++j)
        for (std::size_t i = 0; i + 1 < map.y_faces.size(); ++i) {
            const double y = (map.y_faces[i] + map.y_faces[i + 1]) / 2, z = (map.z_faces[j] + map.z_faces[j + 1]) / 2;
            const double r2 = std::pow(y - 7 * mm, 2) + std::pow(z - 1.5 * mm, 2);
            map.values.push_back(solid(y, z) ? 20 + 2400 / (1 + r2 / std::pow(5 * mm, 2)) : void_value);
        }
    map.unit = "°C";
    in.warnings = {"travel speed is near the upper end for this current"};
    return in;
}

// Every element is closed in order (void elements and self-closed ones aside), and no attribute
// value or text holds a raw '<': what a browser or an XML reader of the SVG would choke on.
std::string nesting_fault(const std::string& html) {
    std::vector<std::string> open;
    std::size_t at = 0;
    while ((at = html.find('<', at)) != std::string::npos) {
        const auto end = html.find('>', at);
        if (end == std::string::npos) return "unclosed tag at " + std::to_string(at);
        const std::string tag = html.substr(at + 1, end - at - 1);
        if (tag.find('<') != std::string::npos) return "raw '<' inside a tag at " + std::to_string(at);
        at = end + 1;
        if (tag.starts_with('!')) continue;
        if (tag == "style") {  // CSS is not markup: step over it with its closing tag
            at = html.find("</style>", at);
            if (at == std::string::npos) return "<style> never closed";
            at += 8;
            continue;
        }
        const bool closing = tag.starts_with('/');
        const std::string name = tag.substr(closing ? 1 : 0, tag.find_first_of(" />", closing ? 1 : 0) - (closing ? 1 : 0));
        if (closing) {
            if (open.empty() || open.back() != name) return "</" + name + "> closes <" + (open.empty() ? "" : open.back()) + ">";
            open.pop_back();
        } else if (!tag.ends_with('/') && name != "meta") {
            open.push_back(name);
        }
    }
    return open.empty() ? "" : "<" + open.back() + "> never closed";
}

// The text of one figure element, for checks that must look inside that figure only.
std::string figure_text(const std::string& html, const std::string& id) {
    const auto from = html.find("<figure id=\"" + id + "\"");
    REQUIRE(from != std::string::npos);
    return html.substr(from, html.find("</figure>", from) - from);
}

}  // namespace

TEST_CASE("the report is well formed and holds the three figures", "[report]") {
    const std::string html = render_report(sample_input());
    CHECK(html.starts_with("<!DOCTYPE html>"));
    CHECK(nesting_fault(html) == "");
    CHECK(count(html, "<svg") == 3);
    CHECK(count(html, "</svg>") == 3);
    for (const char* id : {"figure-section", "figure-cycles", "figure-peak-map"})
        CHECK(count(html, "id=\"" + std::string(id) + "\"") == 1);
    // Axis titles carry their units; the colour bar is labelled.
    CHECK(count(figure_text(html, "figure-section"), "y, across the flange (mm)") == 1);
    CHECK(count(figure_text(html, "figure-section"), "z, up the web (mm)") == 1);
    CHECK(count(figure_text(html, "figure-cycles"), "time (s)") == 1);
    CHECK(count(figure_text(html, "figure-cycles"), "temperature (°C)") == 1);
    CHECK(count(figure_text(html, "figure-peak-map"), "peak temperature (°C)") == 1);
    CHECK(count(figure_text(html, "figure-peak-map"), "y, across the flange (mm)") == 1);
}

TEST_CASE("the report needs nothing from outside and shows the caution", "[report]") {
    const std::string html = render_report(sample_input());
    CHECK(count(html, "http") == 0);
    CHECK(count(html, "src=") == 0);
    CHECK(count(html, "<script") == 0);
    CHECK(count(html, "@import") == 0);
    CHECK(count(html, "url(") == count(html, "url(#"));  // only references to clip paths on the page
    CHECK(count(html, "class=\"caution\"") == 1);
    CHECK(count(html, "proven by procedure qualification") == 1);
    ReportInput own = sample_input();
    own.caution = "Estimates only; qualify the procedure.";
    const std::string mine = render_report(own);
    CHECK(count(mine, "Estimates only; qualify the procedure.") == 1);
    CHECK(count(mine, "class=\"caution\"") == 1);
}

TEST_CASE("the report escapes every text it is given", "[report]") {
    ReportInput in = sample_input();
    in.title = "A <b>bold</b> & 'odd' title";
    in.warnings.push_back("leg < 3 mm & throat > 2 mm");
    const std::string html = render_report(in);
    CHECK(count(html, "HAZ, flange &lt;&amp;&gt; &quot;web&quot;") == 1);  // in the legend
    CHECK(count(html, "<&>") == 0);
    CHECK(count(html, "<b>") == 0);
    CHECK(count(html, "A &lt;b&gt;bold&lt;/b&gt; &amp; &#39;odd&#39; title") == 2);  // <title> and <h1>
    CHECK(count(html, "leg &lt; 3 mm &amp; throat &gt; 2 mm") == 1);
    CHECK(nesting_fault(html) == "");
}

TEST_CASE("dimension values appear on the section with their units", "[report]") {
    const std::string section = figure_text(render_report(sample_input()), "figure-section");
    CHECK(count(section, "flange leg 6.20 mm") == 1);
    CHECK(count(section, "web leg 6.05 mm") == 1);
    CHECK(count(section, "throat 4.31 mm") == 1);
    CHECK(count(section, "flange penetration 1.23 mm") == 1);
    // Legend entries for what is drawn, and tables for the numbers.
    for (const char* entry : {"plates", "bead asked for", "fusion line", "HAZ: Ac3 reached", "HAZ: Ac1 reached"})
        CHECK(count(section, std::string(">") + entry + "<") == 1);
}

TEST_CASE("tables, warnings and the probe legend are on the page", "[report]") {
    const ReportInput in = sample_input();
    const std::string html = render_report(in);
    for (const auto& [name, value] : in.procedure) CHECK(count(html, "<th scope=\"row\">" + name + "</th><td>" + value + "</td>") == 1);
    CHECK(count(html, "<th scope=\"row\">root fused</th><td>yes</td>") == 1);
    CHECK(count(html, "travel speed is near the upper end") == 1);
    const std::string cycles = figure_text(html, "figure-cycles");
    CHECK(count(cycles, "<polyline") == in.cycles.size());
    for (const char* name : {">root<", ">flange toe<", ">web toe<"}) CHECK(count(cycles, name) == 1);
    CHECK(count(cycles, "800–500 °C") == 1);
}

TEST_CASE("the section and the peak map show the same view", "[report]") {
    const std::string html = render_report(sample_input());
    // Same view and size: the axes (frame, ticks and their labels) come out identical.
    const auto axes = [&](const std::string& id) {
        const std::string fig = figure_text(html, id);
        const auto from = fig.find("<g fill=\"#222222\">");
        REQUIRE(from != std::string::npos);
        return fig.substr(from, fig.find("y, across the flange", from) - from);
    };
    CHECK(axes("figure-section") == axes("figure-peak-map"));
}

TEST_CASE("an empty run still gives a complete page with notes in place of data", "[report]") {
    ReportInput in;
    in.title = "empty";
    const std::string html = render_report(in);
    CHECK(nesting_fault(html) == "");
    CHECK(count(html, "<svg") == 3);
    CHECK(count(html, "no section recorded") == 1);
    CHECK(count(html, "no probe cycles recorded") == 1);
    CHECK(count(html, "no peak temperatures recorded") == 1);
    CHECK(count(html, "proven by procedure qualification") == 1);
    CHECK(count(html, "class=\"warnings\"") == 0);
    CHECK(count(html, "nan") == 0);
    CHECK(count(html, "inf") == 0);
}

TEST_CASE("inconsistent input is refused with the part named", "[report]") {
    ReportInput in = sample_input();
    in.cycles[1].temperature.pop_back();
    CHECK_THROWS_WITH(render_report(in), Catch::Contains("flange toe"));
    in = sample_input();
    in.peak_map.values.pop_back();
    CHECK_THROWS_WITH(render_report(in), Catch::Contains("peak map"));
}

TEST_CASE("write_report writes the rendered page", "[report]") {
    heatbead::testing::TempFolder folder("report");
    const auto path = folder.path / "sub" / "report.html";
    write_report(path, sample_input());
    CHECK(read_file(path) == render_report(sample_input()));
}

TEST_CASE("svg plot: voids stay blank and equal cells merge", "[report]") {
    const Axis x{"y", "mm", 0, 4}, y{"z", "mm", 0, 1};
    const std::vector<double> x_faces{0, 1, 2, 3, 4}, y_faces{0, 1};
    SvgPlot blank("a", "t", 300, 200, x, y, false, 0);
    blank.cell_image(x_faces, y_faces, std::vector<double>{void_value, void_value, void_value, void_value}, 0, 1);
    CHECK(count(blank.svg(), "<rect") == 2);  // clip rectangle and frame only
    SvgPlot merged("b", "t", 300, 200, x, y, false, 0);
    merged.cell_image(x_faces, y_faces, std::vector<double>{0.5, 0.5, void_value, 1.0}, 0, 1);
    CHECK(count(merged.svg(), "<rect") == 2 + 2);  // one run of two equal cells, one single cell
    CHECK_THROWS_AS(merged.cell_image(x_faces, y_faces, std::vector<double>{1, 2, 3}, 0, 1), std::invalid_argument);
}

TEST_CASE("svg plot: equal scale keeps a millimetre the same length on both axes", "[report]") {
    SvgPlot plot("p", "t", 500, 300, Axis{"y", "mm", 0, 10}, Axis{"z", "mm", 0, 10}, true, 0);
    // Plot area 420 × 242 px: 24.2 px per mm on both axes, so y spans 420 / 24.2 mm about its centre.
    CHECK(plot.y_axis().hi - plot.y_axis().lo == Approx(10));
    CHECK(plot.x_axis().hi - plot.x_axis().lo == Approx(10 * 420.0 / 242.0));
    CHECK((plot.x_axis().lo + plot.x_axis().hi) / 2 == Approx(5));
}

TEST_CASE("svg helpers: escaping, numbers and the heat scale", "[report]") {
    CHECK(escape_html("a<&>\"'b") == "a&lt;&amp;&gt;&quot;&#39;b");
    CHECK(format_fixed(6.2, 2) == "6.20");
    CHECK(format_fixed(-0.001, 2) == "0.00");
    CHECK(format_fixed(-1.5, 1) == "-1.5");
    CHECK(format_fixed(void_value, 2) == "n/a");
    CHECK(heat_colour(0) == "#24324f");
    CHECK(heat_colour(1) == "#a8201a");
    CHECK(heat_colour(-3) == heat_colour(0));
    CHECK(heat_colour(void_value) == heat_colour(0));
    CHECK(heat_colour(0.6).size() == 7);
}

TEST_CASE("write the sample report for the browser check", "[.sample]") {
    const auto path = sample_path("HEATBEAD_SAMPLE_REPORT", "heatbead_sample_report.html");
    write_report(path, sample_input());
    CHECK(std::filesystem::file_size(path) > 0);
}

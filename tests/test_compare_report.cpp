// The HTML comparison report: self-contained, its text escaped, both figures findable once, every
// procedure named in the legends and the table header, and everything it is given shown. Two invented
// procedures on one synthetic tee (flange 20 mm, web 10 mm centred on y = 0, fillet on the +y side):
// "cool" with a small arc and a short cycle, and a hotter one, named with markup characters, whose
// fusion and HAZ lines reach further and whose cycle cools more slowly.
//
// The hidden test "[.sample]" writes that page for tests/render_report.sh (path from the environment
// variable HEATBEAD_SAMPLE_COMPARE_REPORT, else heatbead_sample_compare_report.html in the temporary
// folder).
#include "post/compare_report.hpp"
#include "page_checks.hpp"
#include "temp_folder.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <numbers>
#include <set>
#include <stdexcept>

using namespace heatbead::post;
using heatbead::testing::check_self_contained;
using heatbead::testing::count;
using heatbead::testing::figure_of;
using heatbead::testing::part;
using heatbead::testing::polyline_strokes;
using heatbead::testing::read_file;
using heatbead::testing::sample_path;

namespace {

constexpr double mm = 1e-3;
const std::string hot_name = "hot <&> \"slow\"";
const std::string hot_escaped = "hot &lt;&amp;&gt; &quot;slow&quot;";

// A boundary of the fillet's melt or heated zone: a smooth arc round the root corner (5 mm, 0), from
// `up` mm up the web face to `down` mm into the flange, `up` + 2 mm out along it.
Curve boundary(double up, double down) {
    Curve c;
    for (int i = 0; i <= 20; ++i) {
        const double a = std::numbers::pi / 2 * i / 20.0;
        c.points.push_back({5 * mm + (up + 2) * mm * std::sin(a), up * mm * std::cos(a) - down * mm * std::sin(a)});
    }
    return c;
}

// A HAZ cycle: linear heating to `peak` in 2 s, then exponential cooling towards 20 °C with time
// constant `tau` (s).
Cycle cycle(const std::string& name, double peak, double tau) {
    Cycle c{name, {}, {}};
    for (double t = 0; t <= 40; t += 0.5) {
        c.time.push_back(t);
        c.temperature.push_back(t <= 2 ? 20 + (peak - 20) * t / 2 : 20 + (peak - 20) * std::exp(-(t - 2) / tau));
    }
    return c;
}

ComparedProcedure procedure(const std::string& name, double leg, double reach, double peak, double tau) {
    return {name, "cases/" + name + ".toml", Outline{{{5 * mm, 0}, {(5 + leg) * mm, 0}, {5 * mm, leg * mm}}},
            {boundary(leg + reach, reach)}, {boundary(leg + 2 * reach, 2.5 * reach)},
            cycle("HAZ, flange 0.5 mm", peak, tau)};
}

CompareReportInput sample_input() {
    CompareReportInput in;
    in.title = "Two procedures for a 6 mm fillet";
    in.created = "2024-01-01 12:00";
    in.plates = {Outline{{{-50 * mm, -20 * mm}, {50 * mm, -20 * mm}, {50 * mm, 0}, {-50 * mm, 0}}},
                 Outline{{{-5 * mm, 0}, {5 * mm, 0}, {5 * mm, 60 * mm}, {-5 * mm, 60 * mm}}}};
    in.procedures = {procedure("cool", 5, 1.1, 1180, 6), procedure(hot_name, 6.5, 2.0, 1320, 11)};
    in.rows = {{"heat input", {"0.62 kJ/mm", "1.05 kJ/mm"}},
               {"penetration, flange", {"1.10 mm", "2.00 mm"}},
               {"t8/5 at the probe", {"4.3 s", "8.9 s"}},
               {"root fused", {"no", "yes <ok>"}}};
    in.differences = {hot_name + " fuses 0.9 mm deeper into the flange",
                      "cool reaches t8/5 4.6 s sooner at its probe"};
    in.warnings = {"cool: the root is not fused", hot_name + ": travel speed is near the lower end"};
    return in;
}

}  // namespace

TEST_CASE("the comparison report needs nothing from outside and holds its two figures", "[compare report]") {
    const std::string html = render_compare_report(sample_input());
    check_self_contained(html);
    for (const char* id : {"figure-compare-section", "figure-compare-cycles"})
        CHECK(count(html, "id=\"" + std::string(id) + "\"") == 1);
    CHECK(count(html, "<svg") == 2);
    CHECK(count(html, "</svg>") == 2);
}

TEST_CASE("the comparison report keeps its order: caution, warnings, differences, table, figures", "[compare report]") {
    const std::string html = render_compare_report(sample_input());
    const auto caution = html.find("class=\"caution\""), warnings = html.find("class=\"warnings\""),
               differences = html.find("<h2>Differences</h2>"), table = html.find("<table>"),
               section = html.find("id=\"figure-compare-section\""), cycles = html.find("id=\"figure-compare-cycles\"");
    CHECK(caution < warnings);
    CHECK(warnings < differences);
    CHECK(differences < table);
    CHECK(table < section);
    CHECK(section < cycles);
    CHECK(cycles != std::string::npos);
    // No caution given: the page's own, which defers to the code and qualified procedures.
    CHECK(count(html, "governing welding code") == 1);
    CHECK(count(html, "cases/cool.toml, cases/" + hot_escaped + ".toml") == 1);
}

TEST_CASE("each procedure is named in both legends and in the table header", "[compare report]") {
    const CompareReportInput in = sample_input();
    const std::string html = render_compare_report(in);
    const std::string section = figure_of(html, "figure-compare-section"), cycles = figure_of(html, "figure-compare-cycles");
    const std::string header = part(html, "<thead>", "</thead>");
    CHECK(count(header, "<th scope=\"col\">quantity</th>") == 1);
    for (const std::string& name : {std::string("cool"), hot_escaped}) {
        for (const char* kind : {": fusion line<", ": HAZ (Ac1)<", ": bead asked for<"}) CHECK(count(section, name + kind) == 1);
        CHECK(count(cycles, ">" + name + ": HAZ, flange 0.5 mm<") == 1);
        CHECK(count(header, "<th scope=\"col\">" + name + "</th>") == 1);
    }
    CHECK(count(section, ">plates<") == 1);
    CHECK(count(section, "<polygon") == 2 + 2);  // the plates once, one bead a procedure
    CHECK(count(cycles, "800–500 °C") == 1);
}

TEST_CASE("procedures differ in stroke on both figures", "[compare report]") {
    const std::string html = render_compare_report(sample_input());
    // Section: a fusion and a HAZ line a procedure, each in a stroke of its own.
    const auto section = polyline_strokes(figure_of(html, "figure-compare-section"));
    CHECK(section.size() == 4);
    CHECK(std::set<std::string>(section.begin(), section.end()).size() == 4);
    const auto cycles = polyline_strokes(figure_of(html, "figure-compare-cycles"));
    REQUIRE(cycles.size() == 2);
    CHECK(cycles[0] != cycles[1]);
    // The second procedure is dashed as well as coloured apart, so grey print still tells them apart.
    CHECK(count(cycles[1], "stroke-dasharray") == 1);
}

TEST_CASE("the differences, warnings and every table cell are shown, escaped", "[compare report]") {
    const CompareReportInput in = sample_input();
    const std::string html = render_compare_report(in);
    const std::string differences = part(html, "<h2>Differences</h2>", "</section>");
    CHECK(count(differences, "<li>" + hot_escaped + " fuses 0.9 mm deeper into the flange</li>") == 1);
    CHECK(count(differences, "<li>cool reaches t8/5 4.6 s sooner at its probe</li>") == 1);
    CHECK(count(html, "<li>cool: the root is not fused</li>") == 1);
    CHECK(count(html, "<li>" + hot_escaped + ": travel speed is near the lower end</li>") == 1);
    const std::string body = part(html, "<tbody>", "</tbody>");
    for (const auto& [quantity, cells] : in.rows) {
        CHECK(count(body, "<td>" + quantity + "</td>") == 1);
        for (const auto& cell : cells)
            if (cell != "yes <ok>") CHECK(count(body, "<td>" + cell + "</td>") == 1);
    }
    CHECK(count(body, "<td>yes &lt;ok&gt;</td>") == 1);
    CHECK(count(body, "<tr>") == in.rows.size());
    CHECK(count(html, "<&>") == 0);
    CHECK(count(html, "<ok>") == 0);
}

TEST_CASE("the caller's caution replaces the page's own", "[compare report]") {
    CompareReportInput in = sample_input();
    in.caution = "Planning only; qualify <the one> chosen.";
    in.differences.clear();
    const std::string html = render_compare_report(in);
    CHECK(count(html, "Planning only; qualify &lt;the one&gt; chosen.") == 1);
    CHECK(count(html, "governing welding code") == 0);
    CHECK(count(part(html, "<h2>Differences</h2>", "</section>"), "None recorded.") == 1);
}

TEST_CASE("inconsistent comparisons are refused with the part named", "[compare report]") {
    CompareReportInput in = sample_input();
    in.procedures.pop_back();
    CHECK_THROWS_AS(render_compare_report(in), std::invalid_argument);
    CHECK_THROWS_WITH(render_compare_report(in), Catch::Contains("at least two"));
    in = sample_input();
    in.rows[2].second.push_back("3.1 s");
    CHECK_THROWS_AS(render_compare_report(in), std::invalid_argument);
    CHECK_THROWS_WITH(render_compare_report(in), Catch::Contains("t8/5 at the probe"));
    in = sample_input();
    in.procedures[0].cycle.time.pop_back();
    CHECK_THROWS_AS(render_compare_report(in), std::invalid_argument);
    CHECK_THROWS_WITH(render_compare_report(in), Catch::Contains("\"cool\"") && Catch::Contains("HAZ, flange 0.5 mm"));
}

TEST_CASE("write_compare_report writes the rendered page", "[compare report]") {
    heatbead::testing::TempFolder folder("compare_report");
    const auto path = folder.path / "sub" / "compare.html";
    write_compare_report(path, sample_input());
    CHECK(read_file(path) == render_compare_report(sample_input()));
}

TEST_CASE("write the sample comparison report for the browser check", "[.sample]") {
    const auto path = sample_path("HEATBEAD_SAMPLE_COMPARE_REPORT", "heatbead_sample_compare_report.html");
    write_compare_report(path, sample_input());
    CHECK(std::filesystem::file_size(path) > 0);
}

// The HTML sweep report: self-contained, its text escaped, one response plot per output and axis and a
// map per output when two or more axes vary, lines grouped by the other axes' values, failures listed
// with their errors, and values that are not numbers left out. The sweep below is invented: a 3 × 3
// grid of current and travel speed on which penetration and t8/5 follow made-up linear trends; the
// point at 280 A and 6 mm/s failed, and the one at 240 A and 5 mm/s has no t8/5.
//
// The hidden test "[.sample]" writes that page for tests/render_report.sh (path from the environment
// variable HEATBEAD_SAMPLE_SWEEP_REPORT, else heatbead_sample_sweep_report.html in the temporary
// folder).
#include "post/sweep_report.hpp"
#include "post/svg_plot.hpp"
#include "page_checks.hpp"
#include "temp_folder.hpp"

#include <catch2/catch.hpp>

#include <limits>
#include <set>
#include <stdexcept>

using namespace heatbead::post;
using namespace heatbead::testing;

namespace {

constexpr double none = std::numeric_limits<double>::quiet_NaN();
const std::string failure_error = "solver: step below 1e-9 s <stalled> & stopped";
const std::string failure_escaped = "solver: step below 1e-9 s &lt;stalled&gt; &amp; stopped";

const std::vector<std::string> sample_ids{
    "figure-response-penetration-flange-procedure-current", "figure-response-penetration-flange-procedure-travel-speed",
    "figure-response-t8-5-procedure-current", "figure-response-t8-5-procedure-travel-speed",
    "figure-map-penetration-flange", "figure-map-t8-5"};

SweepReportInput sample_input() {
    SweepReportInput in;
    in.title = "Current and travel speed on a 6 mm fillet";
    in.sweep_file = "sweeps/current_speed.toml";
    in.created = "2024-01-01 12:00";
    in.axes = {{"procedure.current", "A"}, {"procedure.travel_speed", "mm/s"}};
    in.outputs = {{"penetration_flange", "mm"}, {"t8_5", "s"}};
    for (const double current : {200.0, 240.0, 280.0})
        for (const double speed : {4.0, 5.0, 6.0}) {
            if (current == 280 && speed == 6) continue;
            const double t8_5 = current == 240 && speed == 5 ? none : 2 + 0.02 * current - 0.5 * speed;
            in.rows.push_back({current, speed, 0.5 + 0.01 * (current - 200) - 0.15 * (speed - 4), t8_5});
        }
    in.failures = {{{"280", "6"}, failure_error}};
    in.points_total = 9;
    return in;
}

}  // namespace

TEST_CASE("the sweep report needs nothing from outside and holds a figure per output and axis and a map per output",
          "[sweep report]") {
    const std::string html = render_sweep_report(sample_input());
    check_self_contained(html);
    for (const auto& id : sample_ids) CHECK(count(html, "id=\"" + id + "\"") == 1);
    CHECK(count(html, "<figure id=\"figure-response-") == 4);
    CHECK(count(html, "<figure id=\"figure-map-") == 2);
    CHECK(count(html, "<svg") == 6);
    CHECK(count(html, "</svg>") == 6);
    // Caution first, then the summary, the figures and the failures.
    const auto caution = html.find("class=\"caution\""), summary = html.find("class=\"summary\""),
               first = html.find("<figure"), failures = html.find("<h2>Failed points</h2>");
    CHECK(caution < summary);
    CHECK(summary < first);
    CHECK(first < failures);
    CHECK(failures != std::string::npos);
}

TEST_CASE("the summary counts the points, and the caution defers to the code", "[sweep report]") {
    SweepReportInput in = sample_input();
    std::string html = render_sweep_report(in);
    CHECK(count(html, "<p class=\"summary\">Points: 8 done, 1 failed, 9 in all.</p>") == 1);
    CHECK(count(html, "governing welding code") == 1);
    CHECK(count(html, "Case file: sweeps/current_speed.toml") == 1);
    in.points_total = 12;
    in.caution = "Planning only; qualify <the point> chosen.";
    html = render_sweep_report(in);
    CHECK(count(html, "Points: 8 done, 1 failed, 12 in all (3 not yet run).") == 1);
    CHECK(count(html, "Planning only; qualify &lt;the point&gt; chosen.") == 1);
    CHECK(count(html, "governing welding code") == 0);
}

TEST_CASE("points sharing the other axes' values are joined, one line and legend entry a group", "[sweep report]") {
    const std::string html = render_sweep_report(sample_input());
    const std::string by_current = figure_of(html, "figure-response-penetration-flange-procedure-current");
    // Three travel speeds: three lines in strokes of their own, named in the legend.
    const auto strokes = polyline_strokes(by_current);
    CHECK(strokes.size() == 3);
    CHECK(std::set<std::string>(strokes.begin(), strokes.end()).size() == 3);
    for (const char* speed : {"4", "5", "6"})
        CHECK(count(by_current, ">procedure.travel_speed = " + std::string(speed) + " mm/s<") == 1);
    CHECK(count(by_current, "<polygon") == 8);  // a marker a point that succeeded
    CHECK(count(by_current, "procedure.current (A)") >= 1);
    CHECK(count(by_current, "penetration_flange (mm)") >= 1);
    const std::string by_speed = figure_of(html, "figure-response-penetration-flange-procedure-travel-speed");
    CHECK(count(by_speed, ">procedure.current = 280 A<") == 1);
    CHECK(polyline_strokes(by_speed).size() == 3);
}

TEST_CASE("each map has a square a point, coloured from the lowest to the highest value, and a colour bar",
          "[sweep report]") {
    const std::string html = render_sweep_report(sample_input());
    const std::string map = figure_of(html, "figure-map-penetration-flange");
    CHECK(count(map, "<polygon") == 8);
    // Lowest penetration at 200 A, 6 mm/s; highest at 280 A, 4 mm/s: the two ends of the scale.
    CHECK(count(map, "fill=\"" + heat_colour(0) + "\"") == 1);
    CHECK(count(map, "fill=\"" + heat_colour(1) + "\"") == 1);
    CHECK(count(map, ">penetration_flange (mm)<") == 1);  // the colour bar's title
    CHECK(count(map, "procedure.current (A)") >= 1);
    CHECK(count(map, "procedure.travel_speed (mm/s)") >= 1);
    CHECK(count(figure_of(html, "figure-map-t8-5"), "<polygon") == 7);  // the point without t8/5 left out
}

TEST_CASE("a sweep of one axis has no map and one line a plot", "[sweep report]") {
    SweepReportInput in;
    in.title = "Current only";
    in.axes = {{"procedure.current", "A"}};
    in.outputs = {{"penetration_flange", "mm"}, {"t8_5", "s"}};
    in.rows = {{200, 0.5, 3.5}, {240, 0.9, 4.1}, {280, 1.3, 4.9}};
    in.points_total = 3;
    const std::string html = render_sweep_report(in);
    check_self_contained(html);
    CHECK(count(html, "<figure id=\"figure-response-") == 2);
    CHECK(count(html, "figure-map-") == 0);
    const std::string plot = figure_of(html, "figure-response-t8-5-procedure-current");
    CHECK(polyline_strokes(plot).size() == 1);
    CHECK(count(plot, " = ") == 0);  // no legend
    CHECK(count(plot, "joined in order of procedure.current") == 1);
    CHECK(count(html, "<p>No failures.</p>") == 1);
}

TEST_CASE("more than eight lines on a plot go without a legend", "[sweep report]") {
    SweepReportInput in;
    in.title = "Many lines";
    in.axes = {{"a", "mm"}, {"b", ""}};
    in.outputs = {{"y", "s"}};
    for (int a = 1; a <= 2; ++a)
        for (int b = 1; b <= 10; ++b) in.rows.push_back({double(a), double(b), a * 0.5 + b});
    in.points_total = in.rows.size();
    const std::string html = render_sweep_report(in);
    const std::string by_a = figure_of(html, "figure-response-y-a");
    CHECK(polyline_strokes(by_a).size() == 10);
    CHECK(count(by_a, "b = ") == 0);
    CHECK(count(by_a, "one line for each of the 10 combinations, too many to name") == 1);
    const std::string by_b = figure_of(html, "figure-response-y-b");
    CHECK(count(by_b, ">a = 1 mm<") == 1);
    CHECK(count(by_b, ">a = 2 mm<") == 1);
    CHECK(count(by_b, "b (-)") >= 1);  // a quantity without a unit
}

TEST_CASE("failed points are listed with their axis values and error, escaped", "[sweep report]") {
    const std::string html = render_sweep_report(sample_input());
    const std::string failures = part(html, "<h2>Failed points</h2>", "</section>");
    const std::string header = part(failures, "<thead>", "</thead>");
    for (const char* column : {"procedure.current (A)", "procedure.travel_speed (mm/s)", "error"})
        CHECK(count(header, "<th scope=\"col\">" + std::string(column) + "</th>") == 1);
    CHECK(count(failures, "<tr><td>280</td><td>6</td><td>" + failure_escaped + "</td></tr>") == 1);
    CHECK(count(html, "<stalled>") == 0);
    CHECK(count(html, "No failures.") == 0);
}

TEST_CASE("values that are not numbers are left out of the page", "[sweep report]") {
    SweepReportInput in = sample_input();
    in.rows.push_back({none, 5, 1.0, 4.0});  // an axis value that is not a number: no place on the plots
    in.points_total = 10;
    const std::string html = render_sweep_report(in);
    CHECK(count(html, "nan") == 0);
    CHECK(count(html, "n/a") == 0);
    CHECK(count(html, "inf") == 0);
    CHECK(count(figure_of(html, "figure-response-t8-5-procedure-travel-speed"), "<polygon") == 7);
    CHECK(count(figure_of(html, "figure-map-penetration-flange"), "<polygon") == 8);
}

TEST_CASE("names with markup are escaped, and ids stay apart where names differ only in punctuation",
          "[sweep report]") {
    SweepReportInput in;
    in.title = "Markup <b>\"here\"</b> & 'there'";
    in.sweep_file = "sweeps/<odd>.toml";
    in.axes = {{"a.b", "mm"}, {"a_b", "<u>"}};
    in.outputs = {{"heat <in> & \"out\"", "kJ/mm"}};
    in.rows = {{1, 1, 0.5}, {2, 1, 0.7}, {1, 2, 0.6}, {2, 2, 0.9}};
    in.failures = {{{"<3>", "3"}, "bad & <worse>"}};
    in.points_total = 5;
    const std::string html = render_sweep_report(in);
    for (const char* raw : {"<b>", "<odd>", "<u>", "<in>", "<3>", "<worse>", "\"here\"", "\"out\""})
        CHECK(count(html, raw) == 0);
    CHECK(count(html, "Markup &lt;b&gt;&quot;here&quot;&lt;/b&gt; &amp; &#39;there&#39;") >= 1);
    CHECK(count(html, "<h2>heat &lt;in&gt; &amp; &quot;out&quot; (kJ/mm)</h2>") == 1);
    CHECK(count(html, "<td>bad &amp; &lt;worse&gt;</td>") == 1);
    CHECK(count(html, "id=\"figure-response-heat--in-----out--a-b\"") == 1);
    CHECK(count(html, "id=\"figure-response-heat--in-----out--a-b-2\"") == 1);
    CHECK(count(html, "id=\"figure-map-heat--in-----out-\"") == 1);
}

TEST_CASE("the figures stop at six outputs and four axes, and the page says so", "[sweep report]") {
    SweepReportInput in;
    in.title = "Too many";
    for (int a = 0; a < 5; ++a) in.axes.push_back({"axis" + std::to_string(a), "mm"});
    for (int o = 0; o < 7; ++o) in.outputs.push_back({"out" + std::to_string(o), "s"});
    for (int r = 0; r < 3; ++r) {
        std::vector<double> row;
        for (int c = 0; c < 12; ++c) row.push_back(r + 0.1 * c);
        in.rows.push_back(row);
    }
    in.points_total = 3;
    const std::string html = render_sweep_report(in);
    CHECK(count(html, "<figure id=\"figure-response-") == 24);
    CHECK(count(html, "<figure id=\"figure-map-") == 6);
    CHECK(count(html, "The sweep has 7 outputs and 5 axes; the figures show the first 6 outputs against the first 4 axes.") == 1);
    CHECK(count(html, "figure-map-out6") == 0);
    CHECK(count(html, "axis4\"") == 0);
}

TEST_CASE("inconsistent sweeps are refused with the part named", "[sweep report]") {
    SweepReportInput in = sample_input();
    in.rows[1].pop_back();
    CHECK_THROWS_AS(render_sweep_report(in), std::invalid_argument);
    CHECK_THROWS_WITH(render_sweep_report(in), Catch::Contains("row 2 has 3 values for 2 axes and 2 outputs"));
    in = sample_input();
    in.failures[0].axis_values.push_back("1");
    CHECK_THROWS_WITH(render_sweep_report(in), Catch::Contains("failed point 1 has 3 axis values"));
    in = sample_input();
    in.points_total = 8;
    CHECK_THROWS_WITH(render_sweep_report(in), Catch::Contains("8 points in all, but 9 done or failed"));
}

TEST_CASE("write_sweep_report writes the rendered page", "[sweep report]") {
    TempFolder folder("sweep_report");
    const auto path = folder.path / "sub" / "sweep.html";
    write_sweep_report(path, sample_input());
    CHECK(read_file(path) == render_sweep_report(sample_input()));
}

TEST_CASE("write the sample sweep report for the browser check", "[.sample]") {
    const auto path = sample_path("HEATBEAD_SAMPLE_SWEEP_REPORT", "heatbead_sample_sweep_report.html");
    write_sweep_report(path, sample_input());
    CHECK(std::filesystem::file_size(path) > 0);
}

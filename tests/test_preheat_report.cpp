// The HTML preheat report: self-contained, its text escaped, its figures findable, and the numbers it
// is given shown. The search below is invented: five runs of a tee joint, listed in the order a ladder
// search might run them (lowest and highest first), hardness falling and cooling times rising with
// preheat; the 150 °C run never cools below 100 °C within the run.
//
// The hidden test "[.sample]" writes that page for tests/render_report.sh (path from the environment
// variable HEATBEAD_SAMPLE_PREHEAT_REPORT, else heatbead_sample_preheat_report.html in the temporary
// folder).
#include "post/preheat_report.hpp"
#include "page_checks.hpp"
#include "temp_folder.hpp"

#include <catch2/catch.hpp>

#include <limits>
#include <stdexcept>

using namespace heatbead::post;
using heatbead::testing::check_self_contained;
using heatbead::testing::count;
using heatbead::testing::figure_of;
using heatbead::testing::part;
using heatbead::testing::read_file;
using heatbead::testing::sample_path;

namespace {

constexpr double none = std::numeric_limits<double>::quiet_NaN();

PreheatReportInput sample_input() {
    PreheatReportInput in;
    in.title = "Preheat for a 15 mm tee, one pass";
    in.case_file = "cases/demo_tee_15mm.toml";
    in.created = "2024-01-01 12:00";
    in.answer = {{"preheat found by simulation", "75 °C"}, {"preheat by the standard method", "100 °C"}};
    in.explanation = "The simulated joint conducts heat away along two paths only, so it cools more slowly than "
                     "the standard method assumes.";
    in.inputs = {{"carbon equivalent (CET)", "0.32 %"}, {"hydrogen", "H10"}, {"combined thickness", "45 mm"},
                 {"heat input", "0.86 kJ/mm"}};
    in.runs = {{20, 392, "flange, 0.5 mm", 392, 371, 4.1, 48, false, "hardness 392 HV above 350 HV; t8/5 4.1 s below 4.5 s"},
               {150, 281, "web, 0.5 mm", 270, 281, 7.9, none, true, "meets every limit"},
               {75, 338, "flange, 0.5 mm", 338, 320, 5.6, 131, true, "meets every limit"},
               {50, 361, "flange, 0.5 mm", 361, 342, 4.9, 86, false, "hardness 361 HV above 350 HV; time to 100 °C 86 s below 120 s"},
               {100, 317, "web, 0.5 mm", 317, 300, 6.4, 210, true, "meets every limit"}};
    in.hardness_limit = 350;
    in.min_t8_5 = 4.5;
    in.min_time_to_100 = 120;
    in.found = 75;
    in.standard = 100;
    in.warnings = {"the standard method is outside its range of combined thickness"};
    in.caution = "Estimates for planning; the governing code and a qualified procedure decide the preheat.";
    return in;
}

}  // namespace

TEST_CASE("the preheat report needs nothing from outside and holds its three figures", "[preheat report]") {
    const std::string html = render_preheat_report(sample_input());
    check_self_contained(html);
    for (const char* id : {"figure-preheat-hardness", "figure-preheat-cooling", "figure-preheat-hydrogen"})
        CHECK(count(html, "id=\"" + std::string(id) + "\"") == 1);
    CHECK(count(html, "<svg") == 3);
    CHECK(count(html, "</svg>") == 3);
    CHECK(count(figure_of(html, "figure-preheat-hardness"), "preheat (°C)") == 1);
    CHECK(count(figure_of(html, "figure-preheat-hardness"), "highest HAZ hardness (HV)") == 1);
    CHECK(count(figure_of(html, "figure-preheat-cooling"), "shortest t8/5 (s)") == 1);
    CHECK(count(figure_of(html, "figure-preheat-hydrogen"), "shortest time to 100 °C (s)") == 1);
}

TEST_CASE("the preheat report puts the caution first, then warnings, answer, explanation and inputs", "[preheat report]") {
    const PreheatReportInput in = sample_input();
    const std::string html = render_preheat_report(in);
    const auto caution = html.find("class=\"caution\""), warnings = html.find("class=\"warnings\""),
               answer = html.find("<h2>Answer</h2>"), explanation = html.find("class=\"explanation\""),
               inputs = html.find("<h2>Inputs</h2>"), first_figure = html.find("<figure");
    CHECK(count(html, "class=\"caution\"") == 1);
    CHECK(count(html, in.caution) == 1);
    CHECK(caution < warnings);
    CHECK(warnings < answer);
    CHECK(answer < explanation);
    CHECK(explanation < inputs);
    CHECK(inputs < first_figure);
    CHECK(count(html, "outside its range of combined thickness") == 1);
    CHECK(count(html, "conducts heat away along two paths only") == 1);
    CHECK(count(html, "<th scope=\"row\">preheat found by simulation</th><td>75 °C</td>") == 1);
    CHECK(count(html, "<th scope=\"row\">hydrogen</th><td>H10</td>") == 1);
}

TEST_CASE("the preheat report never goes out without a caution", "[preheat report]") {
    PreheatReportInput in = sample_input();
    in.caution.clear();
    const std::string html = render_preheat_report(in);
    CHECK(count(html, "class=\"caution\"") == 1);
    CHECK(count(html, "governing welding code") == 1);
    CHECK(count(html, "qualified welding procedure") == 1);
}

TEST_CASE("the preheat report shows the numbers it is given", "[preheat report]") {
    const std::string html = render_preheat_report(sample_input());
    const std::string hardness = figure_of(html, "figure-preheat-hardness");
    CHECK(count(hardness, "limit: at most 350 HV") == 1);  // the label on the line
    CHECK(count(hardness, ">limit 350 HV<") == 1);         // the legend
    CHECK(count(hardness, ">simulation: 75 °C<") == 1);
    CHECK(count(hardness, ">standard: 100 °C<") == 1);
    CHECK(count(hardness, "stroke-dasharray=\"9 4\"") == 2);  // the simulation's line and its legend sample
    CHECK(count(hardness, "stroke-dasharray=\"2 3\"") == 2);  // the standard's
    CHECK(count(hardness, "<polygon") == 5);                  // a marker a run
    CHECK(count(figure_of(html, "figure-preheat-cooling"), "limit: at least 4.5 s") == 1);
    CHECK(count(figure_of(html, "figure-preheat-hydrogen"), "limit: at least 120 s") == 1);
    CHECK(count(figure_of(html, "figure-preheat-hydrogen"), "<polygon") == 4);  // the 150 °C run never got there
    const std::string table = part(html, "<h2>Runs of the search</h2>", "</table>");
    CHECK(count(table, "<tr><td>75</td><td>338</td><td>flange, 0.5 mm</td>") == 0);  // marked
    CHECK(count(table, "<tr class=\"passes\"><td>75</td><td>338</td><td>flange, 0.5 mm</td><td>338</td><td>320</td>"
                       "<td>5.6</td><td>131</td><td>meets every limit</td></tr>") == 1);
    CHECK(count(table, "<th scope=\"col\">there by Düren (HV)</th><th scope=\"col\">by Yurioka (HV)</th>") == 1);
    CHECK(count(table, "<td>not below 100 °C in the run</td>") == 1);
    CHECK(count(table, "<th scope=\"col\">shortest time to 100 °C (s)</th>") == 1);
}

TEST_CASE("the preheat report lists the runs by preheat and marks those that pass", "[preheat report]") {
    const std::string table = part(render_preheat_report(sample_input()), "<h2>Runs of the search</h2>", "</table>");
    std::size_t last = 0;
    for (const char* preheat : {"20", "50", "75", "100", "150"}) {
        const auto at = table.find("<td>" + std::string(preheat) + "</td>");
        REQUIRE(at != std::string::npos);
        CHECK(at > last);
        last = at;
    }
    CHECK(count(table, "<tr class=\"passes\">") == 3);
    CHECK(count(table, "<tr>") == 2 + 1);  // the two that fail, and the header row
}

TEST_CASE("the preheat report escapes every text it is given", "[preheat report]") {
    PreheatReportInput in = sample_input();
    in.title = "Tee <&> \"test\"";
    in.runs[0].hardest_probe = "flange <0.5 mm>";
    in.warnings.push_back("CET < 0.2 & H > 15");
    const std::string html = render_preheat_report(in);
    CHECK(count(html, "<&>") == 0);
    CHECK(count(html, "Tee &lt;&amp;&gt; &quot;test&quot;") == 2);  // <title> and <h1>
    CHECK(count(html, "<td>flange &lt;0.5 mm&gt;</td>") == 1);
    CHECK(count(html, "CET &lt; 0.2 &amp; H &gt; 15") == 1);
}

TEST_CASE("runs without values are left out of the figures and shown as n/a", "[preheat report]") {
    PreheatReportInput in = sample_input();
    in.runs[3].hardness = in.runs[3].hardness_duren = in.runs[3].hardness_yurioka = none;
    in.runs[3].hardest_probe.clear();
    in.runs[3].t8_5 = none;
    for (auto& r : in.runs) r.time_to_100 = none;
    in.found.reset();
    in.standard.reset();
    in.min_t8_5.reset();
    const std::string html = render_preheat_report(in);
    CHECK(count(figure_of(html, "figure-preheat-hardness"), "<polygon") == 4);
    CHECK(count(figure_of(html, "figure-preheat-cooling"), "<polygon") == 4);
    CHECK(count(figure_of(html, "figure-preheat-cooling"), "limit: ") == 0);
    CHECK(count(figure_of(html, "figure-preheat-cooling"), ">limit ") == 0);
    CHECK(count(html, "simulation:") == 0);
    CHECK(count(html, "standard:") == 0);
    CHECK(count(html, "figure-preheat-hydrogen") == 0);  // no run cooled below 100 °C
    CHECK(count(html, "<svg") == 2);
    CHECK(count(html, "<tr><td>50</td><td>n/a</td><td>n/a</td><td>n/a</td><td>n/a</td><td>n/a</td><td>not below 100 °C "
                      "in the run</td>") == 1);
    CHECK(count(html, "nan") == 0);
    CHECK(count(html, "inf") == 0);
}

TEST_CASE("the preheat report refuses a search without runs", "[preheat report]") {
    PreheatReportInput in = sample_input();
    in.runs.clear();
    CHECK_THROWS_AS(render_preheat_report(in), std::invalid_argument);
}

TEST_CASE("write_preheat_report writes the rendered page", "[preheat report]") {
    heatbead::testing::TempFolder folder("preheat_report");
    const auto path = folder.path / "sub" / "preheat.html";
    write_preheat_report(path, sample_input());
    CHECK(read_file(path) == render_preheat_report(sample_input()));
}

TEST_CASE("write the sample preheat report for the browser check", "[.sample]") {
    const auto path = sample_path("HEATBEAD_SAMPLE_PREHEAT_REPORT", "heatbead_sample_preheat_report.html");
    write_preheat_report(path, sample_input());
    CHECK(std::filesystem::file_size(path) > 0);
}

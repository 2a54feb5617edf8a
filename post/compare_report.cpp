#include "post/compare_report.hpp"

#include "post/atomic_file.hpp"
#include "post/cautions.hpp"
#include "post/html_page.hpp"
#include "post/report_figures.hpp"
#include "post/svg_plot.hpp"

#include <algorithm>
#include <iterator>
#include <stdexcept>
#include <utility>

namespace heatbead::post {

namespace {

constexpr const char* page_style = R"(
.differences{max-width:60em}
)";

// A procedure is told apart by colour and by dash, so lines stay apart in grey print and for readers
// who do not see the hues. The strong colour marks its fusion line, bead and cycle; the tint, lighter,
// its HAZ line, which is the weaker mark, as on the run report.
struct Colour {
    const char* strong;
    const char* tint;
};
constexpr Colour colours[] = {{"#0f5c6e", "#6fa9b8"}, {"#b5531c", "#e39a6c"}, {"#3b3f9e", "#8f93d6"},
                              {"#5f7a1e", "#a3bb68"}, {"#9a2f6b", "#d08ab2"}, {"#6d4c2f", "#b39479"}};
struct Dashes {
    const char* fusion;  // solid or long dashes: the strongest line stays nearly unbroken
    const char* haz;     // broken clearly, so it never reads as a fusion line
};
constexpr Dashes dashes[] = {{"", "6 3"}, {"12 3", "2 3"}, {"6 2", "9 3 2 3"},
                             {"14 3 3 3", "1.5 3"}, {"9 2 2 2", "4 4"}, {"4 2", "12 5"}};
static_assert(std::size(colours) == std::size(dashes));

struct Look {
    Stroke fusion, haz, bead, cycle;
};

// Colour i mod n with dash (i + i/n) mod n: past the n-th procedure the pairing shifts, so the first
// n² procedures all differ in colour or dash.
Look look(std::size_t i) {
    constexpr std::size_t n = std::size(colours);
    const Colour& c = colours[i % n];
    const Dashes& d = dashes[(i + i / n) % n];
    return {{c.strong, 2.4, d.fusion}, {c.tint, 1.8, d.haz}, {c.strong, 1.0, d.fusion}, {c.strong, 1.8, d.fusion}};
}

// The side panel is widened to the longest legend label, as labels start with a procedure's name:
// about 7 px a character at the 12 px font (svg_plot's estimate for dimension texts too) after the
// 52 px of gap and line sample, with 8 px to spare; kept narrow enough to leave the plot area room. Longer labels are cut at the figure's edge.
int legend_panel(const std::vector<LegendEntry>& legend) {
    std::size_t longest = 0;
    for (const auto& e : legend) longest = std::max(longest, e.label.size());
    return std::clamp(static_cast<int>(60 + 7 * longest), 170, 320);
}

void validate(const CompareReportInput& in) {
    const std::size_t n = in.procedures.size();
    if (n < 2)
        throw std::invalid_argument("compare report: " + std::to_string(n) +
                                    " procedure(s) given; a comparison needs at least two");
    for (const auto& [quantity, cells] : in.rows)
        if (cells.size() != n)
            throw std::invalid_argument("compare report: row \"" + quantity + "\" has " + std::to_string(cells.size()) +
                                        " cells for " + std::to_string(n) + " procedures");
    for (const auto& p : in.procedures) check_cycle(p.cycle, "compare report: procedure \"" + p.name + "\"");
}

std::string section_figure(const CompareReportInput& in) {
    Box weld;
    std::vector<LegendEntry> lines;
    for (std::size_t i = 0; i < in.procedures.size(); ++i) {
        const ComparedProcedure& p = in.procedures[i];
        weld.add(p.bead.points);
        for (const auto* curves : {&p.fusion_line, &p.haz_line})
            for (const auto& c : *curves) weld.add(c.points);
        const Look l = look(i);
        if (!p.fusion_line.empty()) lines.push_back({p.name + ": fusion line", l.fusion, ""});
        if (!p.haz_line.empty()) lines.push_back({p.name + ": HAZ (Ac1)", l.haz, ""});
        if (!p.bead.points.empty()) lines.push_back({p.name + ": bead asked for", l.bead, ""});
    }
    SvgPlot plot = section_plot("figure-compare-section-plot", "Cross-sections overlaid, to scale",
                                weld_view(weld, bounds(in.plates)), legend_panel(lines));
    std::vector<LegendEntry> legend;
    draw_plates(plot, in.plates, legend);
    legend.insert(legend.end(), lines.begin(), lines.end());
    // Beads first and fusion lines last: the strongest marks stay on top wherever lines cross.
    for (std::size_t i = 0; i < in.procedures.size(); ++i)
        plot.polygon(in_mm(in.procedures[i].bead.points), look(i).bead, "");
    for (std::size_t i = 0; i < in.procedures.size(); ++i) draw_curves(plot, in.procedures[i].haz_line, look(i).haz);
    for (std::size_t i = 0; i < in.procedures.size(); ++i) draw_curves(plot, in.procedures[i].fusion_line, look(i).fusion);
    plot.legend(legend);
    if (weld.empty() && in.plates.empty()) note_in_middle(plot, "no section recorded");
    return plot.svg();
}

std::string cycles_figure(const CompareReportInput& in) {
    std::vector<Cycle> cycles;
    std::vector<LegendEntry> lines;
    for (std::size_t i = 0; i < in.procedures.size(); ++i) {
        const ComparedProcedure& p = in.procedures[i];
        cycles.push_back(p.cycle);
        lines.push_back({p.name + ": " + p.cycle.name, look(i).cycle, ""});
    }
    return cycles_svg("figure-compare-cycles-plot", "Thermal cycles at comparable HAZ probes", cycles, lines,
                      legend_panel(lines), "no cycles recorded");
}

std::string differences_list(const std::vector<std::string>& differences) {
    std::string s = "<section class=\"differences\"><h2>Differences</h2>";
    if (differences.empty()) return s + "<p>None recorded.</p></section>\n";
    s += "<ul>";
    for (const auto& d : differences) s += "<li>" + escape_html(d) + "</li>";
    return s + "</ul></section>\n";
}

std::string side_by_side(const CompareReportInput& in) {
    std::vector<std::string> columns{"quantity"};
    for (const auto& p : in.procedures) columns.push_back(p.name);
    std::vector<TableRow> rows;
    rows.reserve(in.rows.size());
    for (const auto& [quantity, cells] : in.rows) {
        TableRow row{{quantity}, ""};
        row.cells.insert(row.cells.end(), cells.begin(), cells.end());
        rows.push_back(std::move(row));
    }
    return column_table("Side by side", columns, rows);
}

}  // namespace

std::string render_compare_report(const CompareReportInput& in) {
    validate(in);
    // The header names every case compared, in the order of the columns.
    std::string case_files;
    for (const auto& p : in.procedures) case_files += (case_files.empty() ? "" : ", ") + p.case_file;
    std::string page = page_start({.title = in.title,
                                   .case_file = case_files,
                                   .created = in.created,
                                   .caution = in.caution.empty() ? compare_page_caution : in.caution,
                                   .how_computed = in.how_computed,
                                   .warnings = in.warnings,
                                   .extra_style = page_style});
    page += differences_list(in.differences);
    page += side_by_side(in) + "\n";
    page += bands_section(in.bands);
    page += "<div class=\"figures\">\n";
    page += figure("figure-compare-section", section_figure(in),
                   "The procedures' cross-sections on one drawing of the joint, to scale and cropped to the welds "
                   "(the plates go on beyond). Each procedure has its own colour and dash: the strong line bounds "
                   "the metal that melted, the lighter broken line the metal heated above Ac1, the thin outline "
                   "the bead its case asks for.") + "\n";
    page += figure("figure-compare-cycles", cycles_figure(in),
                   "Temperature against time at each procedure's HAZ probe (named in the legend), in the same "
                   "colours and dashes. The shaded band is 800 to 500 °C: the time a cycle spends crossing it on "
                   "cooling is its t8/5.") + "\n";
    return page + "</div>\n" + page_end();
}

void write_compare_report(const std::filesystem::path& path, const CompareReportInput& input) {
    write_file_atomically(path, render_compare_report(input));
}

}  // namespace heatbead::post

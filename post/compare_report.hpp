// The comparison report: one self-contained HTML page (inline SVG and CSS, nothing fetched) that
// sets procedures for the same joint side by side: the cross-sections overlaid (each procedure's
// bead, fusion line and HAZ line on one drawing of the plates, in its own colour and dash, with a
// legend), the thermal cycles at a comparable HAZ probe overlaid, the table of figures, the
// differences in words, the warnings and the caution. Lengths come in metres, drawn in millimetres.
#pragma once

#include "post/band_figures.hpp"
#include "post/how_computed.hpp"

#include "post/run_report.hpp"

#include <filesystem>
#include <string>
#include <utility>
#include <vector>

namespace heatbead::post {

struct ComparedProcedure {
    std::string name;       // short label, e.g. the case file's stem
    std::string case_file;
    Outline bead;           // the bead this procedure's case asks for
    std::vector<Curve> fusion_line, haz_line;  // solidus and Ac1 isolines of peak temperature at its station
    Cycle cycle;            // the thermal cycle at its hardest / nearest-fusion HAZ probe (name says which)
};

struct CompareReportInput {
    std::string title, created;
    std::vector<Outline> plates;                  // flange and web outlines (the joint all procedures share)
    std::vector<ComparedProcedure> procedures;    // in the order given on the command line
    // The table: one row per quantity, one cell per procedure (same order), text with units.
    std::vector<std::pair<std::string, std::vector<std::string>>> rows;
    std::vector<std::string> differences;         // plain sentences, e.g. "B fuses 1.4 mm deeper into the flange"
    std::vector<std::string> warnings;            // each already prefixed with the procedure's name
    std::string caution;                          // shown first, in a box (empty: compare_page_caution, post/cautions.hpp)
    MethodRows how_computed;  // how the results were computed (post/how_computed.hpp), under the caution
    BandsView bands;          // how sure the headline answers are (post/band_figures.hpp); none: no section
};

// The whole HTML page. Throws std::invalid_argument with fewer than two procedures, or a row whose
// cell count differs from the number of procedures, or a cycle with unequal time/temperature counts.
std::string render_compare_report(const CompareReportInput& input);
// Renders and writes the page atomically (post/atomic_file.hpp).
void write_compare_report(const std::filesystem::path& path, const CompareReportInput& input);

}  // namespace heatbead::post

// The run report: one self-contained HTML page (inline SVG and CSS, nothing fetched) that tells a
// welder what the pass does: the cross-section to scale with the fusion line, HAZ lines and
// dimensions, the thermal cycles at the probes, the peak-temperature map, the procedure and results
// tables, the warnings and the caution. Lengths come in metres and are drawn in millimetres.
#pragma once

#include "post/band_figures.hpp"
#include "post/how_computed.hpp"

#include <array>
#include <filesystem>
#include <string>
#include <utility>
#include <vector>

namespace heatbead::post {

struct Outline {  // closed polygon, (y, z) in m
    std::vector<std::array<double, 2>> points;
};
struct Curve {  // open polyline, (y, z) in m
    std::vector<std::array<double, 2>> points;
};
struct Cycle {  // a thermal cycle at one probe: time in s, temperature in °C
    std::string name;
    std::vector<double> time, temperature;
};
// A dimension line drawn between two points, (y, z) in m, labelled "label value unit"; the value is
// shown with two decimals, as the results table shows it.
struct Dimension {
    std::string label;
    std::array<double, 2> from, to;
    double value;
    std::string unit;
};
struct SectionImage {
    std::vector<double> y_faces, z_faces;  // m, increasing
    std::vector<double> values;            // (nz, ny) C order; NaN = void, left blank
    std::string unit;
};

struct ReportInput {
    std::string title, case_file, created;
    std::vector<std::pair<std::string, std::string>> procedure;  // rows: name, value with unit
    std::vector<std::pair<std::string, std::string>> results;    // rows: name, value with unit
    std::vector<Outline> plates;  // flange and web outlines
    Outline bead;                 // the bead asked for
    std::vector<Curve> fusion_line, haz_ac1_line, haz_ac3_line;
    std::vector<Dimension> dimensions;  // penetration, legs, throat
    std::vector<Cycle> cycles;          // thermal cycles at probes
    SectionImage peak_map;              // peak temperature on the cross-section
    std::vector<std::string> warnings;
    std::string caution;  // empty: run_page_caution (post/cautions.hpp)
    MethodRows how_computed;  // how the results were computed (post/how_computed.hpp), under the caution
    BandsView bands;          // how sure the headline answers are (post/band_figures.hpp); none: no section
};

// The whole HTML page. Throws std::invalid_argument naming the part whose sizes do not agree (a
// cycle with unequal time and temperature counts, a peak map whose values do not fill its faces).
std::string render_report(const ReportInput& input);
// Renders and writes the page atomically (post/atomic_file.hpp).
void write_report(const std::filesystem::path& path, const ReportInput& input);

}  // namespace heatbead::post

// The sweep report: one self-contained HTML page (inline SVG and CSS, nothing fetched) of a sweep's
// table: how each main output responds to each input axis (points, one plot per output and axis;
// points sharing the other axes' values joined by a line), a map for the first two axes when the
// sweep varies two or more (each point a marker coloured by the output, with a colour bar), the
// failed points with their errors, the points with missing outputs and why, and the caution.
#pragma once

#include "post/how_computed.hpp"

#include <filesystem>
#include <string>
#include <vector>

namespace heatbead::post {

struct SweepColumn {
    std::string name, unit;  // e.g. "procedure.current", "A"; "penetration_flange", "mm"
};

struct SweepReportInput {
    std::string title, sweep_file, created;
    std::vector<SweepColumn> axes;     // the inputs varied
    std::vector<SweepColumn> outputs;  // the main outputs to plot
    // One row per point that succeeded: axis values then output values, in column order (NaN: none).
    std::vector<std::vector<double>> rows;
    // The band of each output of each row (points run with bands on): its low and high ends, one per
    // output (NaN: none); empty, or one vector per row, drawn as error bars.
    std::vector<std::vector<double>> lows, highs;
    // Points that failed: their axis values as text, and the error.
    struct Failure {
        std::vector<std::string> axis_values;
        std::string error;
    };
    std::vector<Failure> failures;
    // Points that ran but lack outputs (they are in `rows` too): their axis values as text, and their
    // status, which names what is missing and why.
    struct Incomplete {
        std::vector<std::string> axis_values;
        std::string status;
    };
    std::vector<Incomplete> incomplete;
    std::size_t points_total = 0;  // including those not yet run
    std::string caution;  // empty: sweep_page_caution (post/cautions.hpp)
    MethodRows how_computed;  // how the results were computed (post/how_computed.hpp), under the caution
};

// The whole HTML page. Throws std::invalid_argument for a row whose size is not axes + outputs, a
// failed or incomplete point whose axis values are not one per axis, or a points_total below the
// points done and failed.
// The figures show at most the first 6 outputs against the first 4 axes (the page says so when
// there are more); rows with a non-finite axis value and non-finite outputs are left out of them.
std::string render_sweep_report(const SweepReportInput& input);
// Renders and writes the page atomically (post/atomic_file.hpp).
void write_sweep_report(const std::filesystem::path& path, const SweepReportInput& input);

}  // namespace heatbead::post

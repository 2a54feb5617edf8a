// The optional files of a run: the HTML report and the VTK files, built from the analysis.
#pragma once

#include "post/run_report.hpp"
#include "post/summary.hpp"
#include "solver/case/case.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/numerics/simulation.hpp"

#include <filesystem>
#include <string>

namespace heatbead {

// The time now, for "created" lines of reports: "2026-12-01 22:47 UTC".
std::string now_utc();

// The cross-section's flange and web outlines; the bead asked for on side +1 (root corner, flange
// toe, the face back to the web toe); isolines as report curves.
std::vector<post::Outline> plate_outlines(const mesh::JointGeometry& j);
post::Outline bead_outline(const mesh::JointGeometry& j);
std::vector<post::Curve> curves(const std::vector<post::Polyline>& lines);

post::ReportInput make_report_input(const Case& c, const PreparedRun& run, const RunAnalysis& a,
                                    const post::Summary& summary, const std::vector<std::string>& notes);

// fields.vtu (peak temperature, time of peak, t8/5, final temperature) and section_lines.vtp
// (fusion, Ac3 and Ac1 lines of the station) in `folder`.
void write_vtk_results(const std::filesystem::path& folder, const Case& c, const PreparedRun& run, const RunAnalysis& a);

}  // namespace heatbead

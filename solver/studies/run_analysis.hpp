// What a run means to a welding engineer: the cross-section measured like a macro-etch, thermal
// cycles at probes on and beyond the fusion line, and the summary shown on screen and in files.
#pragma once

#include "post/cross_section.hpp"
#include "post/section_history.hpp"
#include "post/summary.hpp"
#include "solver/case/case.hpp"
#include "solver/numerics/simulation.hpp"
#include "solver/studies/run_setup.hpp"

#include <array>
#include <limits>
#include <string>
#include <vector>

namespace heatbead {

// What a probe stands for: the start of a probe line at the station (on the fusion line, or on the
// plate's surface where the fusion line does not reach the plate), a HAZ probe beyond it on the line,
// the root corner, or a point of the case's own.
enum class ProbeKind { line_start, haz, root, user };

struct ProbeResult {
    std::string name;
    ProbeKind kind = ProbeKind::user;
    std::array<double, 3> position;  // m
    std::vector<double> time, temperature;
    post::CycleFigures figures;
    // HAZ hardness estimates (solver/weldability/haz_hardness.hpp) at line-start and HAZ probes that
    // were fully austenitised (peak ≥ Ac3), when the case gives the base metal's composition;
    // NaN elsewhere: `hardness` is the higher of Düren's (bounded by Maynier's phases) and
    // Yurioka's. `hardness_bound` names the phase bound Düren's took, if any; `no_hardness` says
    // why a line-start or HAZ probe has none.
    double hardness = std::numeric_limits<double>::quiet_NaN();
    double hardness_duren = std::numeric_limits<double>::quiet_NaN();
    double hardness_yurioka = std::numeric_limits<double>::quiet_NaN();
    std::string hardness_bound, no_hardness;
};

struct RunAnalysis {
    double ac1 = 0, ac3 = 0;           // °C
    bool composition_assumed = false;  // no composition in the case: a typical one was used
    post::CrossSection section;        // at the station
    std::vector<post::CrossSection> along;  // every few mm along the weld
    // Automatic ones at the station (for each probe line of the section — flange_mid, flange_toe,
    // web_mid, web_toe — its start "fusion_<line>" or "surface_<line>", then "haz_<line>_0.5mm",
    // "_1.0mm" and "_2.0mm" beyond it; then "root"), then the user's ("user_1", ...).
    std::vector<ProbeResult> probes;
    std::vector<double> t8_5;          // per solid cell, NaN where not defined
    // The probe with the highest hardness estimate (null when none was estimated).
    const ProbeResult* hardest() const;
};

// The composition the HAZ boundaries are computed from: the case's, or, without one, a typical
// structural C–Mn steel (then `assumed` is set).
Composition haz_composition(const Case& c, bool& assumed);
// Solidus, Ac1 and Ac3 (Andrews 1965) of the base metal.
post::SectionLevels section_levels(const Case& c);

// Fusion into the flange below which short-circuit transfer is flagged for cold lap [m]
// (common practice, no source).
inline constexpr double shallow_fusion = 0.5e-3;

// HAZ probe offsets along each probe line, beyond its start (the fusion line, or the plate surface
// where the fusion line does not reach the plate) [m].
inline constexpr std::array<double, 3> haz_probe_offsets{0.5e-3, 1e-3, 2e-3};

// After `run` has run.
RunAnalysis analyse_run(const Case& c, const PreparedRun& run);

// The cross-section measured every few mm along the weld (start and stop effects), as CSV with
// units in the header.
std::string along_weld_csv(const RunAnalysis& analysis);
// The station's fusion, Ac3 and Ac1 lines as CSV rows "line, part, y [mm], z [mm]" (part numbers
// the separate polylines of one line).
std::string section_lines_csv(const RunAnalysis& analysis);
// Each probe's position and cooling figures, as CSV with units in the header.
std::string probes_csv(const RunAnalysis& analysis);

// Every number of the screen summary, with units (the same items go to JSON and CSV).
post::Summary make_summary(const Case& c, const RunResult& result, const RunAnalysis& analysis, double wall_seconds);

}  // namespace heatbead

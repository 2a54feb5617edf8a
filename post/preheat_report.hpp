// The preheat report: one self-contained HTML page (inline SVG and CSS, nothing fetched) that
// answers "what preheat?" and shows why: the answer beside the published standard method's, the
// plain explanation of any difference, the runs of the search (hardness, t8/5 and time to 100 °C
// against preheat, with the limits drawn), the inputs, the warnings and the cautions.
#pragma once

#include "post/band_figures.hpp"
#include "post/how_computed.hpp"

#include <cmath>
#include <filesystem>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace heatbead::post {

// One full simulation of the search at one preheat.
struct PreheatRun {
    double preheat = 0;             // °C
    double hardness = 0;            // HV: highest estimate over the hardened HAZ probes (NaN: none)
    std::string hardest_probe;      // where it was found
    double hardness_duren = 0, hardness_yurioka = 0;  // HV: the two formulas there (NaN: none)
    double t8_5 = 0;                // s: shortest over those probes (NaN: none)
    double time_to_100 = 0;         // s: shortest over those probes (NaN: none cooled below 100 °C in the run)
    bool passes = false;
    std::string verdict;            // "meets every limit", or which limit it misses
    // The band of each figure where one was made at this preheat (NaN elsewhere): drawn as error bars.
    double hardness_low = std::nan(""), hardness_high = std::nan("");
    double t8_5_low = std::nan(""), t8_5_high = std::nan("");
    double time_to_100_low = std::nan(""), time_to_100_high = std::nan("");
};

struct PreheatReportInput {
    std::string title, case_file, created;
    std::vector<std::pair<std::string, std::string>> answer;  // rows: name, value with unit
    std::string explanation;                                 // the plain words on why the answers differ
    std::vector<std::pair<std::string, std::string>> inputs;  // composition, CEs, hydrogen, thickness, heat input
    std::vector<PreheatRun> runs;                             // in the order run
    double hardness_limit = 350;                              // HV
    std::optional<double> min_t8_5, min_time_to_100;          // s, when asked
    std::optional<double> critical_t8_5;                      // s: the t8/5 the hardness limit needs
    std::optional<double> found;     // °C: the lowest passing preheat of the search
    std::optional<double> across;    // °C: the lowest meeting the limits across the band (verified)
    std::optional<double> standard;  // °C: the standard method's value (clipped at the search's lowest)
    std::vector<std::string> warnings;
    std::string caution;  // shown first, in a box (empty: preheat_page_caution, post/cautions.hpp)
    MethodRows how_computed;  // how the results were computed (post/how_computed.hpp), under the caution
    BandsView bands;          // how sure the headline answers are (post/band_figures.hpp); none: no section
};

// The whole HTML page. Throws std::invalid_argument when there are no runs to show.
std::string render_preheat_report(const PreheatReportInput& input);
// Renders and writes the page atomically (post/atomic_file.hpp).
void write_preheat_report(const std::filesystem::path& path, const PreheatReportInput& input);

}  // namespace heatbead::post

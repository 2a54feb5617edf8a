// How a result was computed, in the words every page and screen uses: the grid, the integrator, the
// source rule, the hardness model and limit with their sources, how sure the answers are, and the
// model's known limits. One source of truth for these words, as post/cautions.* is for the cautions:
// the commands gather the facts of their case (solver/studies/how_computed.hpp) and the pages show
// the block under the caution (post/html_page.hpp), the screens one short line.
#pragma once

#include <string>
#include <utility>
#include <vector>

namespace heatbead::post {

// The facts of one case, already in words where they are the case's own.
struct MethodFacts {
    std::string grid;        // e.g. "finest 0.50 mm near the bead, 1.00 mm along the weld, growing x1.15 to 8.0 mm"
    std::string integrator;  // the solver.integrator name: "rkl2" or "explicit"
    bool source_from_procedure = true;
    std::string source;      // the dimensions and where they come from
    bool hardness = false;   // a composition in the case: the HAZ hardness is estimated
    std::string hardness_model;  // the model(s), with sources and scatter
    std::string hardness_brief;  // the same in a few words, for the screen
    std::string hardness_limit;  // the limit and where it comes from
    std::string bands;       // how the bands were made, or why there are none
};

// How the bands of the answers are made (solver/studies/answer_bands.hpp), as numbers and sources.
struct BandFacts {
    bool enabled = true;
    std::size_t runs = 0;  // extra full runs per band
    double efficiency_spread = 0;
    std::string efficiency_source;
    double source_spread = 0;  // a share
    std::string source_source;
    bool hardness = false;
    double duren_scatter = 0, yurioka_scatter = 0;  // HV, each formula's own
    double grid_ratio = 2, grid_order = 2, grid_safety = 3;
};
// The block's "how sure" words for those facts.
std::string bands_words(const BandFacts& facts);

using MethodRows = std::vector<std::pair<std::string, std::string>>;

// The block's rows (name, words): grid, integrator, source, hardness model and limit (when estimated),
// how sure, and the model's known limits in one row.
MethodRows how_computed(const MethodFacts& facts);
// One block for several runs (named): a row all of them share once, any other with the runs it
// belongs to, "heat source (spray, pulsed)", in the order first seen.
MethodRows merge_how_computed(const std::vector<std::pair<std::string, MethodRows>>& runs);
// One line for the screen: grid, integrator, source and hardness, briefly.
std::string how_computed_brief(const MethodFacts& facts);

// The "how sure" words of the fit's page, which makes no bands.
extern const char* const fit_makes_no_bands;

// What a page shows when its caller gives no facts, so that no page goes out without the block.
extern const char* const method_not_recorded;

}  // namespace heatbead::post

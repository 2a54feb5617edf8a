// The lowest preheat that keeps the HAZ within the case's limits, found from full simulations:
// each candidate preheat is one run on the same grid (built once), judged at the station's
// hardened HAZ probes (fusion-line and HAZ probes that passed Ac3); candidates are narrowed by
// the ladder search (solver/studies/ladder_search.hpp), several runs at a time on several cores.
// Beside it, the standard method's value (solver/weldability/en1011_preheat.hpp) for the same inputs.
#pragma once

#include "mesh/grid.hpp"
#include "solver/case/case.hpp"
#include "solver/weldability/en1011_preheat.hpp"
#include "solver/studies/ladder_search.hpp"
#include "solver/physics/material.hpp"

#include <atomic>
#include <functional>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace heatbead {

// One full run at one preheat and what it means against the limits.
struct PreheatTrial {
    double preheat = 0;      // °C, also the interpass temperature of a second pass
    double hardness = 0;     // HV: highest estimate over the hardened HAZ probes (NaN: none)
    std::string hardest_probe;
    double hardness_duren = 0, hardness_yurioka = 0;  // HV: the two formulas at that probe
    double t8_5 = 0;         // s: shortest over the hardened probes (NaN: none)
    double time_to_100 = 0;  // s: shortest over them (NaN: none cooled below 100 °C in the run)
    bool meets_hardness = false, meets_t8_5 = false, meets_time_to_100 = false;
    bool passes = false;
    // "meets every limit", or the limits missed and by how much, in words
    std::string verdict;
    double energy_error = 0;  // of the run (a fraction)
    double wall_seconds = 0;
};

// One run at `preheat` (grid and material shared, read-only, between concurrent trials), using
// `threads` OpenMP threads. Throws SearchInterrupted when `interrupt` is set (it is polled every step).
PreheatTrial run_preheat_trial(const Case& c, const mesh::Grid& grid, const Material& material, double preheat,
                               int threads, const std::atomic<bool>& interrupt);

struct SearchInterrupted : std::runtime_error {
    SearchInterrupted() : std::runtime_error("the preheat search was interrupted") {}
};

// Without preheat_search.highest the search looks up to this preheat [°C] first, the usual range;
// only when nothing there passes does it go on up to the steel's ceiling.
inline constexpr double usual_preheat_top = 250;

struct PreheatAnswer {
    std::vector<PreheatTrial> trials;  // in the order they finished
    LadderSearch search;               // of the last stage searched
    bool monotone = true;              // over every stage (LadderSearch::monotone)
    std::optional<double> found;       // °C: lowest preheat meeting every limit
    double searched_to = 0;            // °C: the highest candidate of the stages searched
    StandardPreheatInput standard_input;
    StandardPreheat standard;
};

// The standard method's inputs for this case: base-metal composition, the thicker plate, the
// filler's diffusible hydrogen and the EN 1011-1 heat input. The case must give the composition and
// the hydrogen (check with require_preheat_inputs).
StandardPreheatInput standard_preheat_input(const Case& c);

// Throws CaseError naming base_metal.composition and/or filler.diffusible_hydrogen when absent.
void require_preheat_inputs(const Case& c);

// Runs the search: `jobs` trials at a time, each with `threads_per_trial` threads; `on_trial` is
// called (from the calling thread) after each round with every trial finished so far. With
// preheat_search.highest set, one stage from lowest to it; without, lowest to usual_preheat_top
// and, when nothing there passes, on from there to the steel's ceiling (the runs already made are
// not made again).
PreheatAnswer find_preheat(const Case& c, int jobs, int threads_per_trial, const std::atomic<bool>& interrupt,
                           const std::function<void(const std::vector<PreheatTrial>&)>& on_trial = {});

}  // namespace heatbead

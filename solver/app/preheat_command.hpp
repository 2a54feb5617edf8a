// `heatbead preheat`: the lowest preheat that keeps the HAZ within the case's limits
// ([preheat_search]), from full simulations, beside the EN 1011-2 method B value, with the plain
// reasons for any difference. Screen table, preheat.json, preheat_runs.csv and preheat.html.
#pragma once

#include "solver/case/case_reader.hpp"

#include <string>

namespace heatbead {

struct PreheatOptions {
    std::string out_dir;  // default: results/<case name>
    bool quiet = false;
    int jobs = 0;         // runs at a time (0: one per core)
    int threads = 0;      // OpenMP threads per run (0: cores / jobs)
};

int preheat_command(const LoadedCase& loaded, const PreheatOptions& options);

}  // namespace heatbead

// `heatbead compare A.toml B.toml [...]`: procedures for the same joint side by side. Every case
// is run (several at a time when cores allow; cases with the same joint and grid share one grid),
// then one table, the differences in words (each case against the first), and compare.html,
// compare.json and compare.csv. With a composition and the filler's hydrogen in a case, its
// lowest preheat is searched too (solver/studies/preheat_search.hpp), unless skipped.
#pragma once

#include "solver/case/case_reader.hpp"

#include <string>
#include <vector>

namespace heatbead {

struct CompareOptions {
    std::string out_dir = "results/compare";
    bool quiet = false;
    bool preheat = true;  // search each case's lowest preheat where the case allows it
    int jobs = 0;         // runs at a time (0: one per core)
    int threads = 0;      // OpenMP threads per run (0: cores / jobs)
};

int compare_command(const std::vector<LoadedCase>& cases, const CompareOptions& options);

}  // namespace heatbead

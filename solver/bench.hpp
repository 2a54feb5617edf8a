// `heatbead bench`: speed figures measured in one run, printed as ratios (machines are noisy).
#pragma once

#include <string>

namespace heatbead {

struct BenchOptions {
    std::string case_path = "cases/reference_tee_20mm.toml";
    bool quick = false;  // small grids: a smoke test of the benchmark itself
};

int bench_command(const BenchOptions& options);

}  // namespace heatbead

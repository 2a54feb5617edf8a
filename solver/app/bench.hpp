// `heatbead bench`: speed figures measured in one run, printed as ratios (machines are noisy).
#pragma once

#include <string>

namespace heatbead {

struct BenchOptions {
    std::string case_path = "cases/reference_tee_20mm.toml";
    bool quick = false;  // small grids: a smoke test of the benchmark itself
};

int bench_command(const BenchOptions& options);

// Sweep throughput: the sweep run once with 1 worker process and once with 2 (1 thread each, fresh
// output folders under the system's temporary folder), printing cases per hour for each and the
// parallel efficiency (rate with 2 / (2 × rate with 1)), measured in the same invocation.
int bench_sweep_command(const std::string& sweep_file);

}  // namespace heatbead

// `heatbead sweep SWEEP.toml`: every point of a sweep (solver/studies/sweep_plan.hpp) a full run, and one
// table of every axis and every summary output (table.csv and table.h5, units in the headers), a
// report (report.html) and a log of points done (sweep.log).
//
// Points run as worker processes (`heatbead run` of the base case with the point's overrides,
// --jobs at a time, dynamic), or, started under mpirun, on MPI ranks fed from a work queue on rank
// 0, which alone writes the table. `--shard i/n` takes the points i, i + n, i + 2n, … (0 ≤ i < n)
// for a batch scheduler's job array; `heatbead sweep merge OUT DIR…` joins shards.
//
// Nothing finished is lost: each point's row is written (atomically) as soon as it ends, and a
// re-run skips points whose row says done (by the hash of the resolved case). A failed point's
// error goes in its row and the sweep goes on; failed points run again on a re-run. Ctrl-C or
// SIGTERM stop the workers (their unfinished points leave no row), then the table is written.
#pragma once

#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace heatbead {

struct SweepOptions {
    std::string out_dir;  // default: results/<sweep file name>
    bool quiet = false;
    int jobs = 1;         // worker processes
    int threads = 1;      // OpenMP threads per point (the command line defaults it to cores / jobs)
    std::optional<std::pair<int, int>> shard;  // (i, n)
};

int sweep_command(const std::string& sweep_file, const SweepOptions& options);
int sweep_merge_command(const std::string& out_dir, const std::vector<std::string>& shard_dirs, bool quiet);

// Parses "i/n" with 0 <= i < n; throws std::invalid_argument with the text otherwise.
std::pair<int, int> parse_shard(const std::string& text);

}  // namespace heatbead

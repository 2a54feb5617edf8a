// `heatbead run`: simulate the pass and the cooling after it; write the results file.
#pragma once

#include "solver/case/case_reader.hpp"

#include <string>

namespace heatbead {

struct RunOptions {
    std::string out_dir;  // where results go (default: results/<case name>)
    bool quiet = false;
    int threads = 0;      // 0: OpenMP's default
};

int run_command(const LoadedCase& loaded, const RunOptions& options);

}  // namespace heatbead

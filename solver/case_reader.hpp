// Case files: TOML in, a validated Case out (or a CaseError listing every problem).
#pragma once

#include "solver/case.hpp"
#include "solver/toml_reader.hpp"

#include <string>
#include <vector>

namespace heatbead {

struct LoadedCase {
    Case value;
    std::string resolved_toml;  // the case with every default filled in; reads back to `value`
};

// Reads, converts and validates a case file with command-line overrides applied. Throws
// CaseError (every problem, each naming file, line, key, value and what is allowed).
LoadedCase read_case(const std::string& path, const std::vector<Override>& overrides = {});

// Default memory limit for a run: a safe share of this machine's physical memory.
double default_memory_limit();

}  // namespace heatbead

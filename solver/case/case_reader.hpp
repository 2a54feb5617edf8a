// Case files: TOML in, a validated Case out (or a CaseError listing every problem).
#pragma once

#include "solver/case/case.hpp"
#include "solver/case/toml_reader.hpp"

#include <functional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

struct LoadedCase {
    Case value;
    std::string resolved_toml;  // the case with every default filled in; reads back to `value`
};

// What the schema must know of the numerics that will run the case, handed in from above so that
// the schema does not depend on them (solver/studies/run_setup.hpp gives the real ones): the
// integrator names a case may choose, and the memory a run needs per solid cell and on a grid.
struct SolverFacts {
    std::span<const std::string_view> integrators;
    double bytes_per_solid_cell = 0;
    std::function<double(const mesh::Grid&)> run_memory;  // bytes
};

// Reads, converts and validates a case file with command-line overrides applied. Throws
// CaseError (every problem, each naming file, line, key, value and what is allowed).
LoadedCase read_case(const std::string& path, const std::vector<Override>& overrides, const SolverFacts& facts);

// Default memory limit for a run: a safe share of this machine's physical memory.
double default_memory_limit();

}  // namespace heatbead

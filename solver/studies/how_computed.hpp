// The facts of a case that the how-computed block shows (post/how_computed.hpp holds its words):
// the grid, the integrator, the source and where its dimensions come from, the hardness model and
// limit with their sources, and how the bands are made.
#pragma once

#include "post/how_computed.hpp"
#include "solver/case/case.hpp"

#include <cstddef>
#include <optional>

namespace heatbead {

// `solid_cells`: the run's count, where known.
post::MethodFacts method_facts(const Case& c, std::optional<std::size_t> solid_cells = std::nullopt);

}  // namespace heatbead

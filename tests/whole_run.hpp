// A whole run of a case as `heatbead run` makes it: grid, material, the prepared simulation with
// the case's probes and recorders, run to its stop. The simulation keeps references to the grid and
// material, so they live here beside it. Shared by the tests that run case files end to end.
#pragma once

#include "solver/studies/run_setup.hpp"

#include <catch2/catch.hpp>

#include <atomic>
#include <utility>

namespace heatbead::testing {

struct WholeRun {
    Case c;
    mesh::Grid grid;
    Material material;
    PreparedRun prepared;
    RunResult result;
    explicit WholeRun(Case case_)
        : c(std::move(case_)),
          grid(mesh::build_grid(c.joint, c.grid)),
          material(make_material(c.base)),
          prepared(prepare_run(c, grid, material)) {
        const std::atomic<bool> never{false};
        result = prepared.sim->run(never);
        REQUIRE(result.completed);
    }
};

}  // namespace heatbead::testing

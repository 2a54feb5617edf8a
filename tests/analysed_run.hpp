// A case run and analysed the way `heatbead run` does it (solver/app/run_command.cpp), for tests
// that check what a whole run reports. The simulation keeps references to the grid and material,
// so they live here beside it.
#pragma once

#include "mesh/grid.hpp"
#include "post/summary.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"

#include <atomic>

namespace heatbead::testing {

struct AnalysedRun {
    Case c;
    mesh::Grid grid;
    Material material;
    PreparedRun run;
    RunResult result;
    RunAnalysis analysis;
    post::Summary summary;

    explicit AnalysedRun(Case case_)
        : c(std::move(case_)),
          grid(mesh::build_grid(c.joint, c.grid)),
          material(make_material(c.base)),
          run(prepare_run(c, grid, material)) {
        const std::atomic<bool> never{false};
        result = run.sim->run(never);
        if (!result.completed) return;  // the test says so: its REQUIRE on result.completed fails
        analysis = analyse_run(c, run);
        summary = make_summary(c, result, analysis, 0);
    }
};

}  // namespace heatbead::testing

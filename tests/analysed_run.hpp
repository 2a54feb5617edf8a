// A whole run (tests/whole_run.hpp) analysed the way `heatbead run` does it
// (solver/app/run_command.cpp), for tests that check what a whole run reports.
#pragma once

#include "post/summary.hpp"
#include "solver/studies/run_analysis.hpp"
#include "tests/whole_run.hpp"

namespace heatbead::testing {

struct AnalysedRun : WholeRun {
    RunAnalysis analysis;
    post::Summary summary;

    explicit AnalysedRun(Case case_) : WholeRun(std::move(case_)) {
        analysis = analyse_run(c, prepared);
        summary = make_summary(c, result, analysis, 0);
    }
};

}  // namespace heatbead::testing

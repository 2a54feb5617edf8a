// Where a run stops: once the answers it must give are known (stop_plan, solver/studies/run_setup.hpp).
//
// Sources, as cited beside each check:
//  - t8/5 is the cooling time from 800 to 500 °C (EN 1011-2:2001 Annex D); t8/3 the time from 800
//    to 300 °C and the time to 100 °C the time from the peak down to 100 °C (common practice, no
//    source): a run that gives them must see every HAZ point cool through 500, 300 and 100 °C;
//  - heat flows from hot to cold (second law of thermodynamics): conduction never takes a joint
//    held at a preheat below that preheat, only the surfaces' losses to cooler surroundings can;
//    so a fixed 300 °C stop under a 335 °C preheat is met only at the time limit;
//  - conduction approaches the preheat only as 1/t (thick-plate line source, Rosenthal 1946):
//    the stated margin of stop_plan, checked as behaviour its header promises.
// Each run is on a coarse grid and a short weld: the file takes about 10 s.
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "tests/whole_run.hpp"

#include <catch2/catch.hpp>

#include <cmath>
#include <string>
#include <vector>

using namespace heatbead;

namespace {

const std::string source_dir{HEATBEAD_SOURCE_DIR};
const std::string hot_case = source_dir + "/tests/cases/preheat_335.toml";
const std::string minimal = source_dir + "/tests/cases/minimal.toml";

// tests/cases/minimal.toml coarsened and shortened as in test_run.cpp, plus the test's overrides.
Case coarse_minimal(std::vector<Override> extra) {
    std::vector<Override> o{{"grid.finest", "1.5"}, {"grid.along_weld", "2"}, {"joint.length", "40"},
                            {"output.station", "20"}};
    o.insert(o.end(), extra.begin(), extra.end());
    return load_case(minimal, o).value;
}

// A whole run with its analysis.
struct AnalysedRun : testing::WholeRun {
    RunAnalysis analysis;
    explicit AnalysedRun(Case case_) : WholeRun(std::move(case_)), analysis(analyse_run(c, prepared)) {}
    // The station's HAZ probes (fusion line and beyond it).
    std::vector<const ProbeResult*> haz() const {
        std::vector<const ProbeResult*> out;
        for (const auto& p : analysis.probes) {
            if (p.name.rfind("fusion_", 0) == 0 || p.name.rfind("haz_", 0) == 0) out.push_back(&p);
        }
        return out;
    }
};

}  // namespace

TEST_CASE("the stop follows the answers asked, measured from the preheat", "[stop]") {
    SECTION("no preheat: t8/3 needs every cell below 300 degC") {
        const StopPlan plan = stop_plan(coarse_minimal({}));
        CHECK(plan.automatic);
        CHECK(plan.rule.temperature == 300);
        CHECK_FALSE(plan.rule.hold);
        CHECK(plan.dropped.empty());
    }
    SECTION("a time to 100 degC asked: 100 degC, or the time asked after the pass") {
        const StopPlan plan = stop_plan(coarse_minimal({{"preheat_search.min_time_to_100", "120 s"}}));
        CHECK(plan.rule.temperature == 100);
        REQUIRE(plan.rule.hold);
        CHECK(plan.rule.hold->time == 120 + hold_margin);
        CHECK(plan.rule.hold->temperature == 300);  // t8/3 is still waited for
    }
    SECTION("a 335 degC preheat: 300 degC cannot be reached by the pass's own cooling, 500 degC is the stop") {
        const StopPlan plan = stop_plan(load_case(hot_case).value);
        CHECK(plan.rule.temperature == 500);
        REQUIRE(plan.dropped.size() == 1);
        CHECK_THAT(plan.dropped[0], Catch::Contains("300 degC for t8/3") && Catch::Contains("335 degC preheat"));
        CHECK_THAT(plan.rule.basis, Catch::Contains("t8/5 needs 500 degC"));
        CHECK_FALSE(plan.never);
    }
    SECTION("within the stated margin of the preheat a level is dropped, beyond it kept") {
        CHECK(stop_plan(coarse_minimal({{"temperatures.preheat", "251 degC"}})).rule.temperature == 500);
        CHECK(stop_plan(coarse_minimal({{"temperatures.preheat", "249 degC"}})).rule.temperature == 300);
    }
    SECTION("a time to 100 degC asked at a preheat of 100 degC or more is dropped with its reason") {
        const StopPlan plan =
            stop_plan(coarse_minimal({{"temperatures.preheat", "150 degC"}, {"preheat_search.min_time_to_100", "60 s"}}));
        CHECK(plan.rule.temperature == 300);
        CHECK_FALSE(plan.rule.hold);
        REQUIRE(plan.dropped.size() == 1);
        CHECK_THAT(plan.dropped[0], Catch::Contains("150 degC preheat is at or above it"));
    }
    SECTION("a second pass is measured from its higher interpass temperature") {
        const StopPlan plan = stop_plan(coarse_minimal({{"joint.sides", "2"}, {"temperatures.interpass", "260 degC"}}));
        CHECK(plan.base == 260);
        CHECK(plan.rule.temperature == 500);
    }
    SECTION("a stop given in the case is kept; at or below the preheat it can never be met") {
        const StopPlan given = stop_plan(coarse_minimal({{"solver.stop_temperature", "400 degC"}}));
        CHECK_FALSE(given.automatic);
        CHECK(given.rule.temperature == 400);
        CHECK_FALSE(given.never);
        const StopPlan never = stop_plan(load_case(hot_case, {{"solver.stop_temperature", "300 degC"}}).value);
        REQUIRE(never.never);
        CHECK_THAT(*never.never, Catch::Contains("at or below the 335 degC preheat"));
        // "auto" is the rule, as with the key left out.
        CHECK(stop_plan(load_case(hot_case, {{"solver.stop_temperature", "auto"}}).value).automatic);
    }
}

TEST_CASE("a run at a 335 degC preheat ends by its own criterion, well before the time limit", "[stop][run]") {
    const AnalysedRun run(load_case(hot_case).value);
    INFO("stop: " << run.result.stop_reason << " at " << run.result.end_time << " s");
    REQUIRE(run.result.completed);
    CHECK(run.result.stop_cause == StopCause::cooled);
    CHECK(run.result.stop.temperature == 500);
    CHECK_THAT(run.result.stop_reason, Catch::Contains("below 500 degC") && Catch::Contains("300 degC for t8/3"));
    // The pass burns 8 s (40 mm at 5 mm/s); it ends within a small fraction of the 600 s limit.
    CHECK(run.result.end_time < 0.1 * run.c.solver.time_limit);
    // What it stopped for is known at every HAZ probe of the station that passed 800 degC.
    const auto haz = run.haz();
    REQUIRE_FALSE(haz.empty());
    for (const ProbeResult* p : haz) {
        INFO(p->name << " peak " << p->figures.peak);
        if (p->figures.peak >= 800) CHECK(std::isfinite(p->figures.t8_5));
    }

    // The old fixed stop at 300 degC lies below the preheat: only the time limit ends that run.
    const AnalysedRun fixed(load_case(hot_case, {{"solver.stop_temperature", "300 degC"}, {"solver.time_limit", "120 s"}}).value);
    CHECK(fixed.result.stop_cause == StopCause::time_limit);
    CHECK(fixed.result.end_time == Approx(120));
    CHECK(fixed.result.completed);
}

TEST_CASE("a time to 100 degC asked is computed, not hidden by a 300 degC stop", "[stop][run]") {
    SECTION("asked long: the run waits for every cell below 100 degC") {
        const AnalysedRun run(coarse_minimal({{"preheat_search.min_time_to_100", "900 s"}, {"solver.time_limit", "2000 s"}}));
        INFO("stop: " << run.result.stop_reason << " at " << run.result.end_time << " s");
        REQUIRE(run.result.completed);
        CHECK(run.result.stop_cause == StopCause::cooled);
        CHECK(run.result.stop.temperature == 100);
        const auto haz = run.haz();
        REQUIRE_FALSE(haz.empty());
        for (const ProbeResult* p : haz) {
            INFO(p->name);
            CHECK(std::isfinite(p->figures.time_to_100));
            if (p->figures.peak >= 800) CHECK(std::isfinite(p->figures.t8_3));  // t8/3 starts at 800 degC
        }
        // Without the ask the same run stops below 300 degC, before any HAZ probe reaches 100 degC.
        const AnalysedRun plain(coarse_minimal({}));
        CHECK(plain.result.stop.temperature == 300);
        for (const ProbeResult* p : plain.haz()) CHECK(std::isnan(p->figures.time_to_100));
    }
    SECTION("asked short: the run stops once that time has passed, the answer \"at least\" known") {
        const AnalysedRun run(coarse_minimal({{"preheat_search.min_time_to_100", "20 s"}}));
        INFO("stop: " << run.result.stop_reason << " at " << run.result.end_time << " s");
        REQUIRE(run.result.completed);
        CHECK(run.result.stop_cause == StopCause::held);
        REQUIRE(run.result.pass_end.size() == 1);
        CHECK(run.result.end_time >= run.result.pass_end[0] + 20 + hold_margin - 1e-9);
        for (const ProbeResult* p : run.haz()) {
            INFO(p->name);
            // Below 100 degC in time, or still above it at least the time asked after its peak.
            if (std::isnan(p->figures.time_to_100)) CHECK(run.result.end_time - p->figures.time_of_peak >= 20);
            if (p->figures.peak >= 800) CHECK(std::isfinite(p->figures.t8_3));  // t8/3 starts at 800 degC
        }
    }
}

// Calibrating the heat source (solver/source_fit.hpp) on synthetic measurements: made by the tool
// itself with a known source (tests/cases/fit_truth.toml), perturbed by a known noise, and fitted
// back from a start 30 % off. The recovery is the check: a least-squares fit of consistent data
// returns the parameters that made them, to within the noise (Gauss–Markov; Marquardt 1963 for
// the method).
#include "solver/case_reader.hpp"
#include "solver/fit_measurements.hpp"
#include "solver/run_analysis.hpp"
#include "solver/run_setup.hpp"
#include "solver/source_fit.hpp"

#include <catch2/catch.hpp>

#include <atomic>
#include <string>

using namespace heatbead;

namespace {

const std::string truth_file = std::string(HEATBEAD_SOURCE_DIR) + "/tests/cases/fit_truth.toml";

struct TruthRun {
    RunAnalysis analysis;
    Probe thermocouple;
};

TruthRun run_truth(const Case& c, const std::array<double, 3>& thermocouple) {
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material m = make_material(c.base);
    Case with_probe = c;
    with_probe.output.probes.push_back(thermocouple);
    PreparedRun run = prepare_run(with_probe, grid, m);
    std::atomic<bool> stop{false};
    REQUIRE(run.sim->run(stop).completed);
    return {analyse_run(with_probe, *run.sim, *run.station), run.sim->probes().back()};
}

}  // namespace

TEST_CASE("section dimensions give back the efficiency and depth that made them", "[fit][slow]") {
    const Case truth = read_case(truth_file).value;  // efficiency 0.8, depth 4.5 mm
    const auto t = run_truth(truth, {20e-3, 12e-3, -2e-3});
    const auto& x = t.analysis.section;
    // Noise of ±1 % with alternating sign, uncertainties of about that size.
    Measurements m;
    m.section = {{"penetration_flange", x.penetration_flange * 1.01, 0.1e-3},
                 {"penetration_web", x.penetration_web * 0.99, 0.1e-3},
                 {"fused_leg_flange", x.fused_leg_flange * 1.01, 0.2e-3},
                 {"fused_leg_web", x.fused_leg_web * 0.99, 0.2e-3},
                 {"haz_width_flange", x.haz_width_flange * 1.01, 0.1e-3},
                 {"haz_width_web", x.haz_width_web * 0.99, 0.1e-3},
                 {"fused_area", x.fused_area * 1.01, 1e-6}};
    m.unknowns = {"arc_efficiency", "depth"};
    Case start = truth;
    set_unknown(start, "arc_efficiency", 0.8 * 0.7);
    set_unknown(start, "depth", 4.5e-3 * 1.3);
    const FitResult f = fit_source(start, m, 2, 1);
    INFO("efficiency " << f.unknowns[0].value << ", depth " << f.unknowns[1].value * 1e3 << " mm, misfit "
                       << f.before.misfit << " -> " << f.after.misfit << " in " << f.runs << " runs");
    CHECK(f.unknowns[0].value == Approx(0.8).epsilon(0.05));
    CHECK(f.unknowns[1].value == Approx(4.5e-3).epsilon(0.05));
    CHECK(f.after.misfit < 1e-2 * f.before.misfit);
    // The 95 % intervals hold the fitted values, and the calibrated case carries them.
    for (const auto& u : f.unknowns) {
        CHECK(u.low <= u.value);
        CHECK(u.value <= u.high);
    }
    CHECK(f.fitted.procedure.arc_efficiency == f.unknowns[0].value);
    CHECK(f.fitted.source.depth == f.unknowns[1].value);
    CHECK_FALSE(f.fitted.source.from_procedure);
}

TEST_CASE("a thermocouple trace gives back the efficiency", "[fit][slow]") {
    const Case truth = read_case(truth_file).value;
    const std::array<double, 3> at{20e-3, 12e-3, -2e-3};  // on the flange, 12 mm out, 2 mm down
    const auto t = run_truth(truth, at);
    ThermocoupleTrace tc;
    tc.position = at;
    tc.time = t.thermocouple.time, tc.temperature = t.thermocouple.temperature;
    tc.uncertainty = 10;
    Measurements m;
    m.thermocouples = {tc};
    m.unknowns = {"arc_efficiency"};
    Case start = truth;
    set_unknown(start, "arc_efficiency", 0.8 * 1.3);
    const FitResult f = fit_source(start, m, 2, 1);
    INFO("efficiency " << f.unknowns[0].value << " in " << f.runs << " runs");
    CHECK(f.unknowns[0].value == Approx(0.8).epsilon(0.05));
}

TEST_CASE("a digitised fusion boundary gives back the efficiency", "[fit][slow]") {
    // tests/cases/fit_boundary.csv: points of the truth's fusion line, rounded to 0.1 mm.
    const Case truth = read_case(truth_file).value;
    const Measurements m = read_measurements(std::string(HEATBEAD_SOURCE_DIR) + "/tests/cases/fit_boundary.toml", truth);
    REQUIRE(m.boundary.size() == 7);
    Case start = truth;
    set_unknown(start, "arc_efficiency", 0.8 * 0.75);
    const FitResult f = fit_source(start, m, 2, 1);
    INFO("efficiency " << f.unknowns[0].value << " in " << f.runs << " runs");
    CHECK(f.unknowns[0].value == Approx(0.8).epsilon(0.05));
}

TEST_CASE("a front length a cross-section cannot see is reported as such", "[fit]") {
    const Case truth = read_case(truth_file).value;
    Measurements m;
    m.section = {{"penetration_flange", 1.7e-3, 0.1e-3}};
    m.unknowns = {"front_length"};
    m.iterations = 1;
    const FitResult f = fit_source(truth, m, 2, 1);
    bool said = false;
    for (const auto& w : f.warnings) said = said || w.find("front_length is barely seen by a cross-section") != std::string::npos;
    CHECK(said);
}

// The preheat search through the library, on tests/cases/preheat_thick.toml (an invented thick
// tee of a hardenable structural steel, coarse grid: each run well under a second).
//
// Sources, as cited beside each check:
//  - EN 1011-2:2001 Annex D, the 2-D and 3-D cooling-time formulas: t8/5 grows with the initial
//    temperature T0 and with heat input, and falls with plate thickness until 3-D flow;
//  - HAZ hardness falls as t8/5 grows (the formulas of solver/weldability/haz_hardness.hpp, and common
//    practice, no source);
//  - so more preheat never raises the hardness, a thicker plate needs at least as much preheat at
//    the same heat input, and a higher heat input needs no more (common practice, no source);
//  - AWS D1.1, annex on alternative preheat methods, hardness control (from memory): a higher HAZ
//    hardness limit with low-hydrogen filler, so lower hydrogen never needs more preheat;
//  - EN 1011-2:2001 Annex C.3 method B: its preheat rises with the filler's hydrogen.
// tests/cases/preheat_50mm_fcaw.toml (invented) is the joint whose answer lies above 250 °C; its
// searches take 3–5 s each on this machine (9 runs of under a second, 2 at a time).
#include "solver/case/case_reader.hpp"
#include "solver/studies/preheat_search.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/case/toml_reader.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <filesystem>
#include <string>

using namespace heatbead;
namespace fs = std::filesystem;

namespace {

// No Ctrl-C in a test: the flag studies poll stays clear.
const std::atomic<bool> never_interrupted{false};

const fs::path source_dir{HEATBEAD_SOURCE_DIR};
const std::string thick = (source_dir / "tests/cases/preheat_thick.toml").string();
const std::string flange_50mm = (source_dir / "tests/cases/preheat_50mm_fcaw.toml").string();

Case thick_case(std::vector<Override> o = {}) { return load_case(thick, o).value; }
Case case_50mm(std::vector<Override> o = {}) { return load_case(flange_50mm, o).value; }

const PreheatTrial& trial_at(const PreheatAnswer& a, double preheat) {
    const auto t = std::find_if(a.trials.begin(), a.trials.end(), [&](const auto& x) { return x.preheat == preheat; });
    INFO("a run at " << preheat << " degC");
    REQUIRE(t != a.trials.end());
    return *t;
}

double found(const Case& c) {
    const PreheatAnswer a = find_preheat(c, 2, 1, never_interrupted);
    REQUIRE(a.found);
    return *a.found;
}

}  // namespace

TEST_CASE("more preheat: longer t8/5, softer HAZ", "[preheat]") {
    const Case c = thick_case();
    const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
    const Material material = make_material(c.base);
    double last_t85 = 0, last_hv = 1e9;
    for (double preheat : {20.0, 120.0, 220.0}) {
        const PreheatTrial t = run_preheat_trial(c, grid, material, preheat, 2, never_interrupted);
        INFO("preheat " << preheat << " degC: t8/5 " << t.t8_5 << " s, " << t.hardness << " HV");
        CHECK(t.t8_5 > last_t85);
        CHECK(t.hardness < last_hv);
        CHECK(std::abs(t.energy_error) < 0.01);
        last_t85 = t.t8_5, last_hv = t.hardness;
    }
}

TEST_CASE("the search finds the lowest passing preheat to the resolution", "[preheat]") {
    const Case c = thick_case();
    const PreheatAnswer a = find_preheat(c, 2, 1, never_interrupted);
    REQUIRE(a.found);
    CHECK(a.search.monotone);
    // The trial at the answer passes, the one a step below fails (what "lowest" means).
    bool at = false, below = false;
    for (const auto& t : a.trials) {
        if (t.preheat == *a.found) at = t.passes && t.hardness <= 350;  // the case's hardness limit
        if (t.preheat == *a.found - c.preheat_search.resolution) below = !t.passes;
    }
    CHECK(at);
    CHECK(below);
    // The same answer one run at a time (the batch only changes which candidates are tried).
    CHECK(*find_preheat(c, 1, 2, never_interrupted).found == *a.found);
    // The standard's inputs come from the case: thicker plate 25 mm, H5 → 5 ml/100 g (the filler
    // designation's upper limit, common practice, no source), and the EN 1011-1 heat input
    // Q = k·U·I/v = 0.8 × 26 V × 260 A / 5 mm/s = 1.0816 kJ/mm (hand computation).
    CHECK(a.standard_input.thickness == Approx(25));
    CHECK(a.standard_input.hydrogen == Approx(5));
    CHECK(a.standard_input.heat_input == Approx(1.0816));
    CHECK(a.standard.outside_validity.empty());
}

TEST_CASE("thicker plate needs at least as much preheat and more heat input needs no more", "[preheat]") {
    const double base = found(thick_case());
    const double thin = found(thick_case({{"joint.flange_thickness", "10"}, {"joint.web_thickness", "10"}}));
    const double hotter = found(thick_case({{"procedure.current", "320"}, {"procedure.wire_feed", "11"}}));
    INFO("25 mm: " << base << " degC, 10 mm: " << thin << " degC, 320 A: " << hotter << " degC");
    CHECK(base >= thin);
    CHECK(hotter <= base);
}

TEST_CASE("a hydrogen-diffusion time can only raise the preheat", "[preheat]") {
    // With a lenient hardness limit, only the time above 100 °C decides.
    const double hardness_only = found(thick_case({{"preheat_search.hardness_limit", "450"}}));
    const Case timed = thick_case({{"preheat_search.hardness_limit", "450"}, {"preheat_search.min_time_to_100", "120"}});
    const PreheatAnswer a = find_preheat(timed, 2, 1, never_interrupted);
    REQUIRE(a.found);
    CHECK(*a.found >= hardness_only);
    bool named = false;
    for (const auto& t : a.trials) named = named || t.verdict.find("time to 100 degC") != std::string::npos;
    CHECK(named);
}

TEST_CASE("preheat asks for the composition and the hydrogen by name", "[preheat]") {
    const Case c = load_case((source_dir / "tests/cases/minimal.toml").string(), {}).value;
    try {
        require_preheat_inputs(c);
        FAIL("no error");
    } catch (const CaseError& e) {
        REQUIRE(e.diagnostics().size() == 2);
        CHECK(e.diagnostics()[0].key == "base_metal.composition");
        CHECK(e.diagnostics()[0].message.find("C, Mn, Si") != std::string::npos);
        CHECK(e.diagnostics()[1].key == "filler.diffusible_hydrogen");
    }
}

TEST_CASE("the 50 mm flux-cored tee: the search goes on past 250 degC to an answer", "[preheat]") {
    const Case c = case_50mm();
    // H8: 350 HV (AWS D1.1 hardness control, from memory, 400 HV only at 5 ml/100 g or less).
    CHECK(c.preheat_search.hardness_limit == 350);
    CHECK(!c.preheat_search.highest_given);
    CHECK(c.preheat_search.highest == 400);  // a C–Mn steel's ceiling, the default steel type
    const PreheatAnswer a = find_preheat(c, 2, 1, never_interrupted);
    REQUIRE(a.found);
    INFO("answer " << *a.found << " degC");
    // Nothing in the usual range passes (250 °C misses), so the answer lies above it, within the
    // steel's ceiling; it is a computed pass with a computed miss one step below.
    CHECK(!trial_at(a, 250).passes);
    CHECK(trial_at(a, 250).verdict.find("HV over the 350 HV limit") != std::string::npos);
    CHECK(*a.found > 250);
    CHECK(*a.found <= 400);
    CHECK(a.searched_to == 400);
    CHECK(trial_at(a, *a.found).passes);
    CHECK(!trial_at(a, *a.found - c.preheat_search.resolution).passes);
    CHECK(a.monotone);
    // Each preheat is run once, whichever stage asked for it.
    for (std::size_t i = 0; i < a.trials.size(); ++i) {
        for (std::size_t j = i + 1; j < a.trials.size(); ++j) CHECK(a.trials[i].preheat != a.trials[j].preheat);
    }
}

TEST_CASE("an explicit preheat_search.highest is kept", "[preheat]") {
    const Case c = case_50mm({{"preheat_search.highest", "250"}});
    CHECK(c.preheat_search.highest_given);
    CHECK(c.preheat_search.highest_reason == "the preheat_search.highest you set");
    const PreheatAnswer a = find_preheat(c, 2, 1, never_interrupted);
    CHECK(!a.found);
    CHECK(a.searched_to == 250);
    for (const auto& t : a.trials) CHECK(t.preheat <= 250);
}

TEST_CASE("lower hydrogen: a higher hardness limit and no more preheat", "[preheat]") {
    const Case h4 = case_50mm({{"filler.diffusible_hydrogen", "\"H4\""}});
    const Case h15 = case_50mm({{"filler.diffusible_hydrogen", "\"H15\""}});
    // AWS D1.1 hardness control (from memory): 400 HV with low hydrogen (here at most 5 ml/100 g), 350 HV else.
    CHECK(h4.preheat_search.hardness_limit == 400);
    CHECK(h15.preheat_search.hardness_limit == 350);
    CHECK(h4.preheat_search.hardness_limit_source.find("400 HV with a low-hydrogen filler") != std::string::npos);
    const PreheatAnswer a4 = find_preheat(h4, 2, 1, never_interrupted);
    const PreheatAnswer a15 = find_preheat(h15, 2, 1, never_interrupted);
    REQUIRE(a4.found);
    REQUIRE(a15.found);
    INFO("H4: " << *a4.found << " degC, H15: " << *a15.found << " degC");
    CHECK(*a4.found <= *a15.found);
    // EN 1011-2 method B: 62·HD^0.35 rises with hydrogen.
    CHECK(a4.standard.formula < a15.standard.formula);
}

TEST_CASE("a hardness limit set in the case overrides the hydrogen's", "[preheat]") {
    const Case c = case_50mm({{"preheat_search.hardness_limit", "380"}});
    CHECK(c.preheat_search.hardness_limit == 380);
    CHECK(c.preheat_search.hardness_limit_source == "set in the case (preheat_search.hardness_limit)");
}

TEST_CASE("the demo: EN 1011-2 method B and the simulation, same order of magnitude", "[preheat]") {
    // The demo case on a coarse grid (1.5 mm; 9 runs in about 9 s on this machine). Its H4 wire
    // allows 400 HV (AWS D1.1 hardness control, from memory). The two answers rest on different
    // physics (hardness of this HAZ against a fit to hydrogen-cracking tests), so only their order
    // of magnitude is asked to agree: within a factor of 10 in degC (ours).
    const Case c = load_case((source_dir / "cases/demo_tee_15mm.toml").string(),
                             {{"grid.finest", "1.5"}, {"grid.along_weld", "3"}})
                       .value;
    CHECK(c.preheat_search.hardness_limit == 400);
    const PreheatAnswer a = find_preheat(c, 2, 1, never_interrupted);
    REQUIRE(a.found);
    const double standard = std::max(a.standard.formula, c.preheat_search.lowest);
    INFO("simulation " << *a.found << " degC, EN 1011-2 method B " << a.standard.formula << " degC");
    CHECK(a.standard.outside_validity.empty());
    CHECK(*a.found / standard < 10);
    CHECK(standard / *a.found < 10);
}

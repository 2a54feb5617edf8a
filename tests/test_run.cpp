// Whole runs through the library, on a coarse grid and a short weld so each takes well under a
// second: the pass sequence of two-sided joints (fixed wait, interpass temperature), weld metal born
// behind the arc, web–flange contact faces, and a property table named by the case.
//
// Sources, as cited beside each check:
//  - "hand computation": arithmetic on the case's values, written out beside the check; the net arc
//    power is η·U·I and the arc burns for L/v per pass (definitions behind EN 1011-1's heat input
//    Q = k·U·I/v);
//  - energy conservation: whatever the arc put in is stored in the metal or lost through its surfaces
//    (first law of thermodynamics); the solver's finite volumes conserve it to rounding;
//  - everything else is behaviour the solver's headers promise (simulation.hpp, solid_cells.hpp,
//    joint.hpp, material.hpp), checked against the grid's own axes.
#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"
#include "solver/case/case_reader.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/numerics/simulation.hpp"

#include "tests/analysed_run.hpp"
#include "tests/temp_folder.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <unistd.h>
#include <vector>

using namespace heatbead;
namespace fs = std::filesystem;

namespace {

const fs::path source_dir{HEATBEAD_SOURCE_DIR};
const std::string minimal = (source_dir / "tests/cases/minimal.toml").string();

// tests/cases/minimal.toml: 200 A, 20 V, 5 mm/s; the overrides below make the weld 40 mm long with
// efficiency 0.8, so each pass burns 3200 W for 8 s.
constexpr double net_power_w = 0.8 * 20 * 200;  // hand computation: η·U·I = 0.8 × 20 V × 200 A = 3200 W
constexpr double arc_time_s = 40.0 / 5.0;       // hand computation: L/v = 40 mm / 5 mm/s = 8 s

// The case with a coarse grid and a short weld, plus the test's own overrides.
LoadedCase coarse_case(const std::vector<Override>& extra, const std::string& path = minimal) {
    std::vector<Override> o{{"grid.finest", "1.5"},
                            {"grid.along_weld", "2"},
                            {"joint.length", "40"},
                            {"procedure.arc_efficiency", "0.8"}};
    o.insert(o.end(), extra.begin(), extra.end());
    return load_case(path, o);
}

// What the progress callback reports after each accepted step.
struct Sample {
    double t, arc_x, hottest;
};

// Everything a run needs, built from the case the way `heatbead run` builds it; the simulation
// keeps references to the grid and material, so they live here beside it.
struct CoarseRun {
    Case c;
    mesh::Grid grid;
    Material material;
    Simulation sim;
    std::vector<Sample> samples;

    explicit CoarseRun(const std::vector<Override>& extra)
        : c(coarse_case(extra).value),
          grid(mesh::build_grid(c.joint, c.grid)),
          material(make_material(c.base)),
          sim(grid, material, make_losses(c), make_passes(c), make_settings(c)) {}

    RunResult run() {
        const std::atomic<bool> never{false};
        return sim.run(never, [this](double t, double x, double, double hot) { samples.push_back({t, x, hot}); });
    }

    // Weld cells of one cross-section on `side` of the web centre (+1 or −1).
    std::vector<std::size_t> weld_section_cells(int side) const {
        const auto& cells = sim.cells();
        std::vector<std::size_t> out;
        for (std::size_t s = 0; s < cells.ns; ++s) {
            const double y = grid.y.centre(cells.j[s]);
            if (cells.tag[s] == mesh::Tag::weld && (y >= c.joint.web_offset ? 1 : -1) == side) out.push_back(s);
        }
        return out;
    }
};

using TempDir = heatbead::testing::TempFolder;

}  // namespace

TEST_CASE("two-sided joint with a fixed interpass wait: two passes, all weld metal born, energy conserved", "[run]") {
    CoarseRun r({{"joint.sides", "2"}, {"procedure.interpass_wait", "20 s"}});
    REQUIRE(r.sim.grid().weld_cells() > 0);
    const RunResult result = r.run();
    INFO("stop: " << result.stop_reason);
    REQUIRE(result.completed);
    REQUIRE(result.pass_start.size() == 2);
    REQUIRE(result.pass_end.size() == 2);

    // Pass 1 burns from 0 to L/v; the step before an event ends on it, so pass 2 starts 20 s after
    // pass 1 ends (the wait, as set), not a step later.
    CHECK(result.pass_start[0] == 0.0);
    CHECK(result.pass_end[0] == Approx(arc_time_s).margin(1e-9));
    CHECK(result.pass_start[1] - result.pass_end[0] == Approx(20.0).margin(1e-6));
    CHECK(result.pass_end[1] - result.pass_start[1] == Approx(arc_time_s).margin(1e-9));

    // hand computation: 2 passes × 3200 W × 8 s = 51 200 J.
    CHECK(result.energy.arc == Approx(2 * net_power_w * arc_time_s).epsilon(1e-12));
    // The discretised source is renormalised to the net power (heat_source.hpp).
    CHECK(result.energy.deposited + result.energy.filler == Approx(result.energy.arc).epsilon(1e-9));
    // first law: arc = stored + lost.
    CHECK(std::abs(result.energy.error()) < 1e-6);

    // Both beads exist in the section and every weld cell of both is active at the end.
    for (int side : {1, -1}) {
        const auto section = r.weld_section_cells(side);
        INFO("side " << side);
        CHECK(!section.empty());
        std::size_t unborn = 0;
        for (std::size_t i = 0; i < r.sim.cells().nx; ++i) {
            for (const std::size_t s : section) unborn += r.sim.active()[r.sim.cells().index(i, s)] == 0;
        }
        CHECK(unborn == 0);
    }
}

TEST_CASE("two-sided joint without a wait: pass 2 starts once the hottest cell is at the interpass temperature",
          "[run]") {
    constexpr double interpass = 150;
    CoarseRun r({{"joint.sides", "2"}, {"temperatures.interpass", "150 degC"}});
    const RunResult result = r.run();
    INFO("stop: " << result.stop_reason);
    REQUIRE(result.completed);
    REQUIRE(result.pass_start.size() == 2);
    REQUIRE(result.pass_end.size() == 2);
    CHECK(result.pass_start[1] > result.pass_end[0]);

    // The start is decided on the state after an accepted step, which the progress callback reported
    // with the same time value: there the hottest cell is at or below 150 °C, a step earlier above.
    const auto& s = r.samples;
    const auto at = [&](double t) {
        return std::find_if(s.begin(), s.end(), [t](const Sample& x) { return x.t == t; });
    };
    const auto end1 = at(result.pass_end[0]);
    const auto start2 = at(result.pass_start[1]);
    REQUIRE(end1 != s.end());
    REQUIRE(start2 != s.end());
    REQUIRE(start2 - end1 >= 2);  // the joint cooled over at least one step in between
    CHECK(start2->hottest <= interpass);
    CHECK(std::prev(start2)->hottest > interpass);
    // The arc is off while the joint cools.
    for (auto it = std::next(end1); it != std::next(start2); ++it) {
        INFO("t = " << it->t);
        CHECK(std::isnan(it->arc_x));
    }
    // hand computation: 2 passes × 3200 W × 8 s = 51 200 J; first law: arc = stored + lost.
    CHECK(result.energy.arc == Approx(2 * net_power_w * arc_time_s).epsilon(1e-12));
    CHECK(std::abs(result.energy.error()) < 1e-6);
}

TEST_CASE("weld metal is born behind the arc: active behind it, void ahead of it", "[run]") {
    // Stopped at 4 s the arc, at 5 mm/s from x = 0, is at x = 20 mm, the middle of the 40 mm weld.
    CoarseRun r({Override{"solver.time_limit", "4 s"}});
    const RunResult result = r.run();
    REQUIRE(result.stop_reason == "time limit reached");
    REQUIRE(result.end_time == Approx(4.0).margin(1e-9));
    const double x_arc = 0.020;  // hand computation: 5 mm/s × 4 s = 20 mm

    const auto& cells = r.sim.cells();
    const auto section = r.weld_section_cells(1);
    REQUIRE(!section.empty());
    CHECK(r.weld_section_cells(-1).empty());  // one-sided joint: no bead on side −1
    const double dx = r.grid.x.max_width();
    std::size_t behind = 0, ahead = 0;
    for (std::size_t i = 0; i < cells.nx; ++i) {
        const double x = r.grid.x.centre(i);
        // Metal appears once the arc's origin passes the cell centre; allow one cell for the
        // last step, whose births happen at its mid-time.
        if (x > x_arc - dx && x <= x_arc) continue;
        const bool expect_active = x <= x_arc - dx;
        (expect_active ? behind : ahead) += 1;
        for (const std::size_t s : section) {
            INFO("x = " << x * 1e3 << " mm");
            REQUIRE((r.sim.active()[cells.index(i, s)] != 0) == expect_active);
        }
    }
    CHECK(behind > 0);
    CHECK(ahead > 0);
    // Stopped mid-pass, the arc has burnt for 4 s: hand computation 3200 W × 4 s = 12 800 J.
    CHECK(result.energy.arc == Approx(net_power_w * 4.0).epsilon(1e-12));
    CHECK(std::abs(result.energy.error()) < 1e-6);
}

TEST_CASE("web-flange contact faces: the web edge on the flange, none across a root gap", "[run]") {
    struct Count {
        std::size_t web_bottom_row = 0;  // web cells in y: those a web edge on the flange would cover
        std::size_t web_down = 0;        // web cells with a contact face below
    };
    const auto count = [](const std::string& root_gap) {
        const Case c = coarse_case({{"joint.root_gap", root_gap}}).value;
        const mesh::Grid grid = mesh::build_grid(c.joint, c.grid);
        const mesh::SolidCells cells = mesh::index_solid_cells(grid);
        Count n;
        // The y faces hit both web faces (grid.hpp): the web's cells are those whose centre lies
        // within the web thickness.
        for (std::size_t j = 0; j < grid.y.cells(); ++j) {
            n.web_bottom_row += std::abs(grid.y.centre(j) - c.joint.web_offset) < c.joint.web_thickness / 2;
        }
        std::size_t flange_up = 0, total = 0;
        for (std::size_t s = 0; s < cells.ns; ++s) {
            for (int side = 0; side < 4; ++side) total += cells.contact[s][side];
            if (cells.tag[s] == mesh::Tag::web && cells.contact[s][mesh::minus_z]) {
                // The web edge rests on the flange top, z = 0 (a cell face by construction).
                CHECK(grid.z.faces[cells.k[s]] == 0.0);
                ++n.web_down;
            }
            flange_up += cells.tag[s] == mesh::Tag::flange && cells.contact[s][mesh::plus_z];
        }
        // Each contact is one face seen from both cells, and only web-on-flange faces are contacts.
        CHECK(flange_up == n.web_down);
        CHECK(total == 2 * n.web_down);
        return n;
    };
    SECTION("no root gap: every web cell of the bottom row touches the flange") {
        const Count n = count("0 mm");
        CHECK(n.web_bottom_row > 0);
        CHECK(n.web_down == n.web_bottom_row);
    }
    SECTION("a root gap: the web does not touch the flange") {
        CHECK(count("1 mm").web_down == 0);
    }
}

TEST_CASE("a property table named by the case, relative to the case file, gives the material", "[run]") {
    const TempDir dir("table");
    {
        std::ofstream table(dir.path / "flat_steel.csv");
        table << "temperature_degC, conductivity_W_per_mK, specific_heat_J_per_kgK\n"
                 "# constant properties, invented for the test\n"
                 "20, 30, 600\n"
                 "800, 30, 600\n"
                 "1500, 30, 600\n";
    }
    const fs::path case_file = dir.path / "case.toml";
    fs::copy_file(minimal, case_file);
    const Case c =
        coarse_case({{"base_metal.properties", "flat_steel.csv"}, {"base_metal.density", "7850"}}, case_file.string())
            .value;
    CHECK(c.base.properties_file == (dir.path / "flat_steel.csv").string());
    const Material m = make_material(c.base);
    CHECK(m.density() == 7850);
    CHECK(m.conductivity(20) == Approx(30).epsilon(1e-12));
    CHECK(m.conductivity(1000) == Approx(30).epsilon(1e-12));
    // Constant c below the melting range: dH/dT = ρc, hand computation 7850 × 600 = 4.71e6 J/(m³ K).
    CHECK(m.volumetric_heat_capacity(500) == Approx(7850.0 * 600).epsilon(1e-9));
}

TEST_CASE("a cold short-circuit pass that does not fuse the flange still reports cooling and hardness at the HAZ probes",
          "[run]") {
    // tests/cases/cold_short_circuit.toml: 150 A, 18 V, 6 mm/s on a 20 mm flange (invented), 1 mm grid,
    // 50 mm weld: a pass that leaves the fusion line in the bead (cold lap; common practice, no source,
    // that short-circuit transfer on thick plate risks it). Everything else is what run_analysis.hpp
    // and summary.hpp promise: probes start from the plate surface where the fusion line does not
    // reach it, and every figure is a value or says why it cannot be one.
    const heatbead::testing::AnalysedRun r(load_case((source_dir / "tests/cases/cold_short_circuit.toml").string()).value);
    REQUIRE(r.result.completed);
    const RunAnalysis& a = r.analysis;
    const post::Summary& summary = r.summary;

    REQUIRE(a.section.penetration_flange <= 0);
    REQUIRE_FALSE(a.section.flange_mid.fused);
    std::string notes;
    for (const auto& [group, note] : summary.notes()) notes += note + "\n";
    INFO(notes);
    CHECK(notes.find("cold lap") != std::string::npos);
    CHECK(notes.find("no fusion into the flange at mid-leg") != std::string::npos);

    // Every HAZ probe: each cooling figure and the hardness are a value or carry the reason.
    std::size_t haz = 0;
    for (const auto& p : a.probes) {
        if (p.kind != ProbeKind::haz) continue;
        ++haz;
        const auto& f = p.figures;
        INFO(p.name);
        for (const auto& [value, why] : {std::pair{f.t8_5, &f.no_t8_5}, std::pair{f.t8_3, &f.no_t8_3},
                                         std::pair{f.rate_540, &f.no_rate_540}, std::pair{f.rate_700, &f.no_rate_700},
                                         std::pair{p.hardness, &p.no_hardness}}) {
            CHECK(std::isfinite(value) == why->empty());
        }
    }
    CHECK(haz == 12);  // 0.5, 1 and 2 mm on each of the four probe lines
    // The HAZ probes nearest the bead under the middle of each leg have them all, from the surface.
    for (const char* name : {"haz_flange_mid_0.5mm", "haz_web_mid_0.5mm"}) {
        const auto p = std::find_if(a.probes.begin(), a.probes.end(), [&](const ProbeResult& q) { return q.name == name; });
        REQUIRE(p != a.probes.end());
        INFO(name);
        CHECK(std::isfinite(p->figures.t8_5));
        CHECK(std::isfinite(p->figures.t8_3));
        CHECK(std::isfinite(p->figures.rate_540));
        CHECK(std::isfinite(p->figures.rate_700));
        CHECK(std::isfinite(p->hardness));
    }
    CHECK(a.section.flange_mid.surface[1] == 0.0);
    // The summary has the HAZ t8/5 range and hardness; whatever it lacks says why.
    for (const char* key : {"t8_5_min", "t8_5_max", "cooling_rate_540", "haz_hardness_max"}) {
        const auto& items = summary.items();
        const auto i = std::find_if(items.begin(), items.end(), [&](const post::SummaryItem& x) { return x.key == key; });
        REQUIRE(i != items.end());
        INFO(key);
        CHECK_FALSE(i->missing());
    }
    for (const auto& m : summary.missing()) {
        INFO(m.key);
        CHECK_FALSE(m.reason.empty());
    }
}

// Fusion that changes smoothly with the inputs: the asked legs of a 3/8 in spray fillet on a 3/4 in
// flange with a 1/2 in web (tests/cases/spray_fillet_legs.toml, invented values: 0.045 in wire, 300 A,
// 29 V, 16 in/min, no wire feed, so the bead is laid as asked) ramped from 8.0 to 9.5 mm in 0.1 mm
// steps on a 1 mm grid (0.91 mm cells at the bead), a 45 mm weld, the section at 30 mm.
//
// Sources, as cited beside each check:
//  - the requirement itself (issue 13): penetration into flange and web, fused legs and fused area
//    change with the legs by small steps only, with no jump from fused to cold. The bounds are ours,
//    set against what this ramp measures (solver/numerics/THEORY.md, "Cut cells"): with whole weld
//    cells tagged by their centres the flange penetration fell 0.86 mm between 8.8 and 8.9 mm legs
//    (0.63 to −0.23 mm) and the fused flange leg jumped 0.54 mm; with cut cells the largest steps
//    are 0.32 mm (flange), 0.24 mm (web), 0.1 mm (legs) and 0.96 mm² (fused area);
//  - mass balance (exact): the weld metal laid is the bead asked for, l²/2 per unit length for a flat
//    fillet of legs l, and the heat it carries in is that volume times H(T_birth) − H(T0);
//  - energy conservation (first law): arc = stored + lost.
// Sixteen runs of about a second each, two side by side on one thread each.
#include "mesh/joint.hpp"
#include "solver/core/parallel_tasks.hpp"
#include "solver/studies/run_setup.hpp"
#include "tests/analysed_run.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <memory>
#include <omp.h>
#include <string>
#include <vector>

using namespace heatbead;

namespace {

const std::string ramp_case =
    (std::filesystem::path(HEATBEAD_SOURCE_DIR) / "tests/cases/spray_fillet_legs.toml").string();

constexpr double mm = 1e-3, mm2 = mm * mm;

// What one point of the ramp gives.
struct Point {
    double legs = 0;                  // mm, asked on both plates
    double bead_area = 0;             // m²: fillet_area of the asked bead
    double laid_area = 0;             // m²: Σ φ·Δy·Δz over the weld cells of a section
    double filler_area = 0;           // m²: the filler's heat over L·(H(T_birth) − H(T0))
    std::map<std::string, double> summary;  // the run summary's figures by key
};

Point run_point(const Case& c, double legs) {
    const testing::AnalysedRun r(c);
    Point p;
    p.legs = legs;
    if (!r.result.completed) return p;  // the caller's REQUIRE on the summary says so
    p.bead_area = mesh::fillet_area(c.joint.leg_flange, c.joint.leg_web, c.joint.face, c.joint.convexity);
    const mesh::SolidCells& cells = r.prepared.sim->cells();
    for (std::size_t s = 0; s < cells.ns; ++s) {
        if (cells.tag[s] == mesh::Tag::weld)
            p.laid_area += cells.fill[s] * r.grid.y.width(cells.j[s]) * r.grid.z.width(cells.k[s]);
    }
    const double birth = *make_passes(c).front().birth_temperature;
    const double rise = r.material.enthalpy(birth) - r.material.enthalpy(c.temperatures.preheat);
    p.filler_area = r.result.energy.filler / (rise * c.joint.weld_length);
    for (const auto& item : r.summary.items())
        if (!item.missing() && item.value) p.summary[item.key] = *item.value;
    return p;
}

std::vector<Point> legs_ramp() {
    std::vector<Case> cases;
    std::vector<double> legs;
    for (int n = 0; n <= 15; ++n) {
        legs.push_back(8.0 + 0.1 * n);
        const std::string leg = std::to_string(legs.back()) + " mm";
        cases.push_back(load_case(ramp_case, {{"bead.leg_flange", leg}, {"bead.leg_web", leg}}).value);
    }
    std::vector<Point> points(cases.size());
    for (std::size_t first = 0; first < cases.size(); first += 2) {
        run_side_by_side(first, std::min(first + 2, cases.size()), [&](std::size_t i) {
            omp_set_num_threads(1);
            points[i] = run_point(cases[i], legs[i]);
        });
    }
    return points;
}

}  // namespace

TEST_CASE("asked legs 8.0 to 9.5 mm on a 3/8 in spray fillet: the bead is laid exactly and fusion moves by small steps",
          "[fusion][slow]") {
    const std::vector<Point> ramp = legs_ramp();
    for (const Point& p : ramp) {
        INFO("legs " << p.legs << " mm");
        REQUIRE(p.summary.count("fused_area") == 1);
        // Mass balance (exact): the cut weld cells hold the asked bead, l²/2, on this grid; the heat the
        // born metal brings is that volume's H(T_birth) − H(T0); a bead born molten is fused whole, and
        // the cross-section measures its own area, not that of its cells.
        CHECK(p.bead_area == Approx(p.legs * p.legs / 2 * mm2).epsilon(1e-12));
        CHECK(p.laid_area == Approx(p.bead_area).epsilon(1e-9));
        CHECK(p.filler_area == Approx(p.bead_area).epsilon(1e-9));
        CHECK(p.summary.at("deposited_area") * mm2 == Approx(p.bead_area).epsilon(1e-6));
        // First law: arc = stored + lost (the summary's balance error is in per cent).
        CHECK(std::abs(p.summary.at("energy_balance_error")) < 1e-4);
        // A bead born molten fuses to its toes: the fused legs are the laid legs.
        CHECK(p.summary.at("fused_leg_flange") == Approx(p.legs).margin(0.02));
        CHECK(p.summary.at("fused_leg_web") == Approx(p.legs).margin(0.02));
    }
    // The requirement (issue 13): no jump. Bounds per 0.1 mm of legs: 0.4 mm of penetration (under half
    // the 0.91 mm cell; the whole-cell bead jumped 0.86 mm), 0.15 mm of fused leg (the legs' own 0.1 mm
    // and a little), 1.2 mm² of fused area (the bead alone grows 0.8–0.95 mm² a step).
    const std::vector<std::pair<const char*, double>> bounds{{"penetration_flange", 0.4},
                                                             {"penetration_web", 0.4},
                                                             {"fused_leg_flange", 0.15},
                                                             {"fused_leg_web", 0.15},
                                                             {"fused_area", 1.2}};
    for (const auto& [key, bound] : bounds) {
        for (std::size_t n = 1; n < ramp.size(); ++n) {
            const double before = ramp[n - 1].summary.at(key), after = ramp[n].summary.at(key);
            INFO(key << ": " << before << " at " << ramp[n - 1].legs << " mm legs, " << after << " at " << ramp[n].legs
                     << " mm");
            CHECK(std::abs(after - before) <= bound);
        }
    }
    // The ramp does span the change from fused to cold: deep fusion at 8 mm, none at 9.5 mm.
    CHECK(ramp.front().summary.at("penetration_flange") > 1.0);
    CHECK(ramp.back().summary.at("penetration_flange") < 0.0);
}

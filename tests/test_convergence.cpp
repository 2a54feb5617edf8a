// Every headline figure of the run summary converges as the grid is refined: the reference case
// (cases/reference_tee_20mm.toml) on finest spacings of 1, 0.7 and 0.5 mm (2 threads; about 20 s on
// an idle 2-core machine, most of it the 0.5 mm run).
//
// Source: a consistent discretisation converges, so on a refined grid a figure read from it changes
// less and less (the basis of any grid-convergence study, e.g. Richardson extrapolation; common
// practice, no source). Two checks follow from it:
//  - a probe read between cell centres changes less from 0.7 to 0.5 mm than from 1 to 0.7 mm;
//  - between the two finest grids every headline figure changes by less than a stated tolerance.
//    The tolerances are ours, chosen against the figures measured on four grids (README,
//    Performance): 0.15 mm for penetrations and HAZ widths (below a third of a 0.5 mm cell), 0.1 mm
//    for fused legs, 4 % for the fused area, 3 % for t8/5 and the cooling rate at 540 °C, 30 K for
//    the peak at each HAZ probe.
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "tests/analysed_run.hpp"

#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <omp.h>
#include <string>
#include <vector>

using namespace heatbead;

namespace {

const std::string reference = (std::filesystem::path(HEATBEAD_SOURCE_DIR) / "cases/reference_tee_20mm.toml").string();

// What one grid gives: the summary's figures by key, and each probe's peak by name.
struct Figures {
    std::map<std::string, double> summary;
    std::map<std::string, double> peak;
};

Figures run_on(const std::string& finest) {
    const Case c = load_case(reference, {{"grid.finest", finest},
                                         {"output.probes", "[[75, 12, -1], [75, 9, -2.5], [75, 6, 2]]"}})
                       .value;
    const heatbead::testing::AnalysedRun r(c);
    REQUIRE(r.result.completed);
    Figures f;
    for (const auto& i : r.summary.items())
        if (!i.missing() && i.value) f.summary[i.key] = *i.value;
    for (const auto& p : r.analysis.probes) f.peak[p.name] = p.figures.peak;
    return f;
}

}  // namespace

TEST_CASE("probes and every headline figure converge with the grid on the reference case", "[convergence][slow]") {
    omp_set_num_threads(2);
    const Figures coarse = run_on("1 mm"), middle = run_on("0.7 mm"), fine = run_on("0.5 mm");

    // (No SECTIONs: Catch would run the three grids again for each.)
    {  // a probe between cell centres changes less on the finer pair of grids, unless it has already
       // settled on all three to within 5 K (0.5 % of its rise): then both changes are the noise of the
       // time steps that sample its peak, and their order says nothing
        for (const char* name : {"user_1", "user_2", "user_3"}) {
            const double a = coarse.peak.at(name), b = middle.peak.at(name), c = fine.peak.at(name);
            INFO(name << ": peak " << a << " / " << b << " / " << c << " degC on 1 / 0.7 / 0.5 mm");
            CHECK(std::abs(c - b) < std::max(std::abs(b - a), 5.0));
        }
    }
    {  // between 0.7 and 0.5 mm every headline figure changes less than its tolerance
        const auto within = [&](const std::string& key, double tolerance, bool relative) {
            REQUIRE(middle.summary.count(key) == 1);
            REQUIRE(fine.summary.count(key) == 1);
            const double a = middle.summary.at(key), b = fine.summary.at(key);
            INFO(key << ": " << a << " on 0.7 mm, " << b << " on 0.5 mm");
            CHECK(std::abs(b - a) <= (relative ? tolerance * std::abs(b) : tolerance));
        };
        for (const char* key : {"penetration_flange", "penetration_web", "haz_width_flange", "haz_width_web"})
            within(key, 0.15, false);  // mm
        for (const char* key : {"fused_leg_flange", "fused_leg_web"}) within(key, 0.1, false);  // mm
        within("fused_area", 0.04, true);
        for (const char* key : {"t8_5_min", "t8_5_max", "cooling_rate_540"}) within(key, 0.03, true);
        std::size_t haz = 0;
        for (const auto& [name, peak] : fine.peak) {
            if (name.rfind("haz_", 0) != 0) continue;
            ++haz;
            REQUIRE(middle.peak.count(name) == 1);
            INFO(name << ": peak " << middle.peak.at(name) << " on 0.7 mm, " << peak << " on 0.5 mm");
            CHECK(std::abs(peak - middle.peak.at(name)) <= 30);  // K
        }
        CHECK(haz == 12);
    }
}

// How sure the headline answers are (solver/studies/answer_bands.hpp, solver/studies/preheat_band.hpp),
// on the demo tee coarsened and shortened (1.5 mm, 40 mm of weld: a run takes well under a second)
// and on the hardenable test tee of tests/cases/preheat_thick.toml.
//
// Sources, as cited beside each check:
//  - the first-order law of propagation of uncertainty for independent inputs, u² = Σ (∂f/∂xᵢ)² u²(xᵢ)
//    (GUM, JCGM 100:2008 §5.1.2, from memory), with secants over the spreads for the derivatives;
//  - Roache's grid convergence index, |E| = F_s·|f_h − f_rh|/(r^p − 1), F_s = 3 for two grids
//    (Roache 1994, J. Fluids Eng. 116, 405, from memory);
//  - grid convergence: a consistent discretisation's answers approach the converged ones as the grid
//    is refined (common practice, no source), so a band that carries the grid error holds the answer
//    of a finer grid.
#include "post/summary.hpp"
#include "solver/case/case_reader.hpp"
#include "solver/physics/procedure.hpp"
#include "solver/studies/answer_bands.hpp"
#include "solver/studies/preheat_band.hpp"
#include "solver/studies/run_analysis.hpp"
#include "solver/studies/run_setup.hpp"
#include "solver/weldability/haz_hardness.hpp"
#include "tests/analysed_run.hpp"

#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <filesystem>
#include <string>

using namespace heatbead;
namespace fs = std::filesystem;

namespace {

const std::atomic<bool> never_interrupted{false};
const fs::path source_dir{HEATBEAD_SOURCE_DIR};
const std::string demo = (source_dir / "cases/demo_tee_15mm.toml").string();

// The demo on a coarse grid and a short weld, with the station and its probe moved onto it.
Case demo_case(const std::string& finest, const std::string& along, std::vector<Override> more = {}) {
    std::vector<Override> o{{"grid.finest", finest},    {"grid.along_weld", along},
                            {"joint.length", "40"},      {"output.station", "20"},
                            {"output.probes", "[[20, 10, -2]]"}};
    o.insert(o.end(), more.begin(), more.end());
    return load_case(demo, o).value;
}

// A run of `c` with its bands, as `heatbead run` makes them (2 runs at a time, 1 thread each).
struct BandedRun : testing::AnalysedRun {
    AnswerBands bands;
    explicit BandedRun(Case case_) : AnalysedRun(std::move(case_)) {
        bands = run_bands(c, grid, material, summary, 2, 1, never_interrupted);
        add_bands(summary, &bands);
    }
};

double width(const Band& b) { return b.high - b.low; }

}  // namespace

TEST_CASE("a band is the root-sum-square of the input shifts and the model's scatter, plus the grid index",
          "[bands]") {
    // Hand-worked: shifts +0.3 and -0.4 give u = √(0.09 + 0.16) = 0.5 (GUM §5.1.2, from memory); a
    // coarse grid 0.2 off gives |E| = 3·0.2/(2² − 1) = 0.2 (Roache 1994, from memory): 1 ± 0.7.
    const Case c = demo_case("1.5", "2");
    std::vector<BandVariant> variants = band_variants(c);
    REQUIRE(variants.size() == 5);
    CHECK(variants.back().coarse);
    const std::vector<double> answers{1.3, 0.6, 1.0, 1.0, 1.2};
    const Band b = combine_band(1.0, answers, variants, {});
    REQUIRE(b.ok());
    CHECK(b.inputs == Approx(0.5));
    CHECK(b.grid == Approx(0.2));
    CHECK(b.low == Approx(0.3));
    CHECK(b.high == Approx(1.7));
    // A scatter of 1.2 each way joins the root-sum-square: √(0.25 + 1.44) = 1.3, and the grid's 0.2.
    CHECK(combine_band(1.0, answers, variants, {1.2, 1.2}).high == Approx(2.5));
    // A run without the answer leaves it without a band, and says which.
    std::vector<double> gap = answers;
    gap[2] = no_value;
    const Band none = combine_band(1.0, gap, variants, {});
    CHECK_FALSE(none.ok());
    CHECK_THAT(none.reason, Catch::Contains("source depth"));
}

TEST_CASE("a hardness band holds each formula's estimate within its own scatter", "[bands]") {
    // Hand-worked, with Düren's ±30 HV and Yurioka's ±25 HV (from memory): judged 410 HV (Düren's),
    // Yurioka 390 HV: above max(440, 415) − 410 = 30, below 410 − min(380, 365) = 45; Yurioka's judged
    // at 430 HV over Düren's 425 HV: above max(455, 455) − 430 = 25, below 430 − min(395, 405) = 35;
    // no estimate of either: the larger scatter each way, 30 HV.
    const ModelScatter a = hardness_model_scatter(410, 410, 390), b = hardness_model_scatter(430, 425, 430),
                       none = hardness_model_scatter(no_value, no_value, no_value);
    CHECK(a.above == Approx(30));
    CHECK(a.below == Approx(45));
    CHECK(b.above == Approx(25));
    CHECK(b.below == Approx(35));
    CHECK(none.above == Approx(30));
    CHECK(none.below == Approx(30));
    // Joined to the inputs' root-sum-square side by side: shifts 0.3 and 0.4 (u = 0.5) with a scatter of
    // 1.2 below and 0 above: 1 − 1.3 to 1 + 0.5.
    const Case c = demo_case("1.5", "2");
    const Band band = combine_band(1.0, {1.3, 0.6, 1.0, 1.0, 1.0}, band_variants(c), {1.2, 0});
    CHECK(band.low == Approx(1 - 1.3));
    CHECK(band.high == Approx(1.5));
}

TEST_CASE("the inputs are moved by their spreads, the grid by twice its spacing", "[bands]") {
    const Case c = demo_case("1.5", "2");
    const auto v = band_variants(c);
    // The demo's spray pass: MIG/MAG's EN 1011-1 factor 0.8 and its spread ±0.10 (from memory).
    CHECK(v[0].c.procedure.arc_efficiency == Approx(0.9));
    CHECK(v[1].c.source.half_width == Approx(1.2 * c.source.half_width));
    CHECK(v[2].c.source.depth == Approx(1.2 * c.source.depth));
    CHECK(v[3].c.source.front_length == Approx(1.2 * c.source.front_length));
    CHECK(v[3].c.source.rear_length == Approx(1.2 * c.source.rear_length));
    CHECK(v[4].c.grid.cross_section.finest == Approx(3e-3));
    CHECK(v[4].c.grid.along_weld == Approx(4e-3));
    // An efficiency that its spread would take past 1 moves down instead.
    const Case high = demo_case("1.5", "2", {{"procedure.arc_efficiency", "0.95"}});
    CHECK(band_variants(high)[0].c.procedure.arc_efficiency == Approx(0.85));
    // A net power given moves by the share of itself that the efficiency it stands for moves.
    const Case net = demo_case("1.5", "2", {{"procedure.net_power", "5000"}});
    const double eta = 5000 / electrical_power(net.procedure);
    CHECK(*band_variants(net)[0].c.procedure.net_power == Approx(5000 * (eta + 0.1) / eta));
}

TEST_CASE("the band holds the nominal answer and the answer of a finer grid", "[bands]") {
    const BandedRun coarse(demo_case("1.5", "2"));
    const testing::AnalysedRun fine(demo_case("0.75", "1"));
    for (const auto& [key, name] : banded_answers) {
        const Band& b = coarse.bands.bands.at(std::string(key));
        const double finer = run_answers(fine.summary).at(std::string(key));
        INFO(key << ": " << b.value << " (" << b.low << " to " << b.high << "), grid index " << b.grid << "; at 0.75 mm "
                 << finer);
        REQUIRE(b.ok());
        CHECK(b.low <= b.value);
        CHECK(b.value <= b.high);
        CHECK(b.low <= finer);
        CHECK(finer <= b.high);
        // The summary carries the same band.
        const post::SummaryItem* item = coarse.summary.find(std::string(key));
        REQUIRE(item);
        REQUIRE(item->has_band());
        CHECK(*item->low == b.low);
        CHECK(*item->high == b.high);
    }
}

// On 1 mm, not 1.5 mm: the cooling rate at 540 °C is read off cycles sampled at the accepted steps,
// whose layout moves with the source (solver/numerics/THEORY.md, the time step). On the 1.5 mm grid
// that noise (about 10 K/s of 70) exceeds the rate's response to half the spreads, and a secant
// over a noisy answer can widen as the spread narrows; on 1 mm it is a few K/s.
TEST_CASE("narrower input spreads give narrower bands, down to the grid index and the model's scatter", "[bands]") {
    const BandedRun full(demo_case("1", "2"));
    const BandedRun half(demo_case("1", "2", {{"bands.arc_efficiency_spread", "0.05"}, {"bands.source_spread", "0.1"}}));
    const BandedRun zero(demo_case("1", "2", {{"bands.arc_efficiency_spread", "0"}, {"bands.source_spread", "0"}}));
    for (const auto& [key, name] : banded_answers) {
        const Band& f = full.bands.bands.at(std::string(key));
        const Band& h = half.bands.bands.at(std::string(key));
        const Band& z = zero.bands.bands.at(std::string(key));
        INFO(key << ": widths " << width(f) << ", " << width(h) << ", " << width(z));
        REQUIRE((f.ok() && h.ok() && z.ok()));
        CHECK(width(h) < width(f));
        CHECK(width(z) < width(h));
        // With no spread the inputs move nothing: the band is the grid index and the scatter alone.
        CHECK(width(z) == Approx(2 * z.grid + z.scatter.below + z.scatter.above));
    }
}

TEST_CASE("the summary's files carry each band's low and high, or why there is none", "[bands]") {
    const BandedRun banded(demo_case("1.5", "2"));
    const auto json = nlohmann::json::parse(banded.summary.to_json());
    for (const auto& [key, name] : banded_answers) {
        const auto& item = json.at(std::string(key));
        CHECK(item.at("low").is_number());
        CHECK(item.at("high").is_number());
        CHECK(item.at("low").get<double>() <= item.at("value").get<double>());
    }
    CHECK_FALSE(json.at("heat_input").contains("low"));
    const std::string csv = banded.summary.to_csv();
    CHECK(csv.starts_with("key,value,low,high,unit,label,reason\n"));
    const auto row = csv.find("\npenetration_flange,");
    REQUIRE(row != std::string::npos);
    CHECK(csv.substr(row, csv.find('\n', row + 1) - row).find(",,") == std::string::npos);  // value, low, high all there
    CHECK_THAT(post::display(*banded.summary.find("penetration_flange")), Catch::Matches("[0-9.]+ mm \\([-0-9.]+–[0-9.]+\\)"));

    // Bands off: the fields are there, null, with the reason.
    testing::AnalysedRun off(demo_case("1.5", "2", {{"bands.enabled", "false"}}));
    add_bands(off.summary, nullptr);
    const auto none = nlohmann::json::parse(off.summary.to_json());
    CHECK(none.at("t8_5_min").at("low").is_null());
    CHECK_THAT(none.at("t8_5_min").at("no_band").get<std::string>(), Catch::Contains("bands.enabled = false"));
}

TEST_CASE("the preheat across the band is verified by a band within the limits", "[bands][preheat]") {
    const Case c = load_case((source_dir / "tests/cases/preheat_thick.toml").string()).value;
    const PreheatAnswer nominal = find_preheat(c, 2, 1, never_interrupted);
    REQUIRE(nominal.found);
    const PreheatBand band = band_preheat(c, nominal, 2, 1, never_interrupted);
    REQUIRE_FALSE(band.checks.empty());
    CHECK(band.checks.front().preheat == *nominal.found);
    for (const auto& k : band.checks) {
        const Band& h = k.bands.bands.at("hardness");
        INFO(k.verdict);
        REQUIRE(h.ok());
        CHECK(h.low <= h.value);
        CHECK(h.value <= h.high);
        // The hardness formulas' own scatter is part of every hardness band.
        CHECK(h.high - h.value >= std::min(duren_scatter, yurioka_scatter));
    }
    REQUIRE(band.across);
    // More preheat never makes a HAZ harder (common practice, no source): the worst side asks for at
    // least the nominal answer, and its own band lies within the limit.
    CHECK(*band.across >= *nominal.found);
    CHECK(band.checks.back().within);
    CHECK(band.checks.back().bands.bands.at("hardness").high <= c.preheat_search.hardness_limit);
}

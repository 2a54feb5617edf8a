// How sure each headline answer is: a band built from what a user rarely knows well, by a few
// extra full runs side by side.
//
// One run per input, each input moved by its whole spread from the nominal case (a secant over the
// spread, not a small-step derivative, so a response that bends within the spread is not
// understated): the arc efficiency by its process's spread (or the case's), and the Goldak source's
// half-width, its depth, and its front and rear lengths together by ±20 % (±10 % for dimensions the
// case gives, taken as calibrated). A one-at-a-time design: five runs, where a two-level factorial of
// the same four inputs would take eight or sixteen; it misses the inputs' interactions, which are of
// second order in the spreads. The shifts combine by the first-order law of propagation of
// uncertainty for independent inputs (GUM, JCGM 100:2008 §5.1.2, from memory):
//     u = √(Σ Δᵢ² + s²)   (u_low with the scatter below, u_high with the scatter above)
// with s a model's own scatter (the hardness formulas', below; on each side its own). The grid: one more run on a grid of twice
// the spacing (finest, coarsest floor and along the weld), and Roache's grid convergence index of
// the answer at the run's spacing h, a Richardson estimate of its grid error with a safety factor
// (Roache 1994, J. Fluids Eng. 116, 405, from memory):
//     |E| = F_s·|f_h − f_2h| / (2^p − 1),   F_s = 3 for two grids, p = 2 (the scheme's order),
// added to both sides: band = f_h − (u_low + |E|) to f_h + (u_high + |E|). Two grids cannot see convergence that is not
// monotone (README, Performance: the web penetration on the reference tee), which is why the two-grid
// index carries the larger safety factor and why its sign is not trusted.
// A variant keeps the nominal case's derived source: the arc efficiency moves the power only, the
// source's dimensions move the shape only.
#pragma once

#include "mesh/grid.hpp"
#include "post/band_figures.hpp"
#include "post/how_computed.hpp"
#include "post/summary.hpp"
#include "solver/case/case.hpp"
#include "solver/physics/material.hpp"

#include <array>
#include <atomic>
#include <functional>
#include <limits>
#include <map>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace heatbead {

// The coarser grid's spacing ratio, the order of the grid error and the safety factor (above).
inline constexpr double band_grid_ratio = 2, band_grid_order = 2, band_grid_safety = 3;

// The headline answers of a run that carry a band: their summary keys, and their names on a page.
struct BandedKey {
    std::string_view key, name;
};
inline constexpr std::array<BandedKey, 7> banded_answers{{{"penetration_flange", "penetration into the flange"},
                                                          {"penetration_web", "penetration into the web"},
                                                          {"fused_area", "fused area"},
                                                          {"t8_5_min", "t8/5, shortest at the HAZ probes"},
                                                          {"t8_5_max", "t8/5, longest at the HAZ probes"},
                                                          {"cooling_rate_540", "fastest cooling at 540 degC"},
                                                          {"haz_hardness_max", "HAZ hardness, highest"}}};

// A model's own scatter, below and above the value it gives (0 for answers without a model).
struct ModelScatter {
    double below = 0, above = 0;
};
// The hardness models' own part of a hardness band: the band holds each formula's estimate within
// its own scatter (Düren ±30 HV, Yurioka ±25 HV, one standard deviation each, from memory;
// solver/weldability/haz_hardness.hpp) around the value judged, the higher of the two, HV:
//     above = max(HV_D + s_D, HV_Y + s_Y) − HV,   below = HV − min(HV_D − s_D, HV_Y − s_Y)
// so where the formulas disagree the band reaches down to the lower one. An estimate that is not
// finite leaves the larger scatter each way.
ModelScatter hardness_model_scatter(double judged, double duren, double yurioka);

// An input the band moves, in words.
struct BandInput {
    std::string key;     // "arc_efficiency", "source_half_width", "source_depth", "source_lengths", "grid"
    std::string label;   // "arc efficiency", ...
    std::string moved;   // from what to what, e.g. "0.80 to 0.90"
    std::string source;  // where its spread comes from
};

// One extra run of a band: the case with one input moved, or on the grid of twice the spacing.
struct BandVariant {
    BandInput input;
    Case c;
    bool coarse = false;  // c.grid is the coarser grid: the variant needs a grid of its own
};

// The extra runs of a band for `c`, in the order they run and their shifts are kept.
std::vector<BandVariant> band_variants(const Case& c);

using Answers = std::map<std::string, double>;  // by key; NaN where the run has none

constexpr double no_value = std::numeric_limits<double>::quiet_NaN();

struct Band {
    double value = no_value, low = no_value, high = no_value;
    std::vector<double> shifts;  // per variant: its answer minus the value (NaN where it has none)
    double inputs = 0;           // √(Σ Δᵢ²) over the inputs (the grid's variant not among them)
    double grid = 0;             // |E|, the grid convergence index
    ModelScatter scatter;        // s below and above
    std::string reason;          // why there is no band; empty when there is one
    bool ok() const { return reason.empty(); }
};

// The band of one answer: `value` the nominal run's, `answers` the variants' in their order.
Band combine_band(double value, const std::vector<double>& answers, const std::vector<BandVariant>& variants,
                  ModelScatter scatter);

struct AnswerBands {
    std::vector<BandInput> inputs;      // the variants' inputs, in the order of Band::shifts
    std::map<std::string, Band> bands;  // by answer key
    std::size_t runs = 0;               // extra runs made
    double wall = 0;                    // s they took, side by side
};

// The answers of one run of `c` on `grid` (shared, read-only, between concurrent runs).
using EvaluateRun = std::function<Answers(const Case& c, const mesh::Grid& grid, const Material& material)>;

struct BandsInterrupted : std::runtime_error {
    BandsInterrupted() : std::runtime_error("the extra runs of the bands were interrupted") {}
};

// Runs the variants of `c` `jobs` at a time (each worker sets `threads` OpenMP threads, then calls
// `evaluate`) and bands every answer of `nominal`; `scatter` adds a model's own scatter by key.
// The coarser grid is built once. `evaluate` throws BandsInterrupted when `interrupt` is set.
AnswerBands make_bands(const Case& c, const mesh::Grid& grid, const Material& material, const Answers& nominal,
                       const std::map<std::string, ModelScatter>& scatter, const EvaluateRun& evaluate, int jobs,
                       int threads);

// The banded answers a run's summary gives.
Answers run_answers(const post::Summary& summary);
// One full run of `c` on `grid`, analysed as `heatbead run` does, and its banded answers.
Answers evaluate_run(const Case& c, const mesh::Grid& grid, const Material& material, const std::atomic<bool>& interrupt);
// The bands of a run: its summary's banded answers, the variants as full runs.
AnswerBands run_bands(const Case& c, const mesh::Grid& grid, const Material& material, const post::Summary& nominal,
                      int jobs, int threads, const std::atomic<bool>& interrupt);
// Marks the summary's banded items and gives each its band, or why it has none; `bands` null: the
// case turned them off.
void add_bands(post::Summary& summary, const AnswerBands* bands);

// The "How sure" section of a page: the banded answers of one or more runs (named), each run's bands
// beside it (null: off), the table of what moved each answer, and `note` on how the bands were made.
post::BandsView bands_view(const std::vector<std::string>& names, const std::vector<const post::Summary*>& summaries,
                           const std::vector<const AnswerBands*>& bands, std::string note);

// How the bands of `c` are made (the how-computed block's "how sure" row).
post::BandFacts band_facts(const Case& c);

}  // namespace heatbead

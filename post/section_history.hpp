// Thermal cycles of one cross-section: the temperature of every solid cell of one x-slice at
// every accepted step. Probe points on the fusion line are only known after the run, so the
// whole station slice is kept and probes are read from it afterwards (a few MB: the slice holds
// thousands of cells, a run a few hundred steps; stored as float, ample for temperatures).
#pragma once

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"

#include <span>
#include <string>
#include <vector>

namespace heatbead::post {

class SectionHistory {
public:
    SectionHistory(const mesh::SolidCells& cells, std::size_t slice, double initial_temperature);
    // Weld metal laid at time t (cell index of mesh::SolidCells; cells of other slices are ignored).
    void appear(std::size_t cell, double t);
    // The field at the end of an accepted step (all solid cells).
    void record(double t, std::span<const double> T);
    const std::vector<double>& times() const { return times_; }
    std::size_t slice() const { return slice_; }
    // The cycle at cross-section point (y, z): bilinear between the centres of the four surrounding
    // cells (mesh/interpolation.hpp), at each step over those that hold metal then (weld metal from
    // the step it was laid), their weights renormalised; the initial temperature while none does.
    // Empty if none of the four is solid.
    std::vector<double> cycle_at(const mesh::Grid& grid, double y, double z) const;

private:
    const mesh::SolidCells& cells_;
    std::size_t slice_;
    double initial_;
    std::vector<double> laid_;   // per section cell: when its metal was laid (−inf for plate, +inf until laid)
    std::vector<double> times_;
    std::vector<float> values_;  // step-major: values_[n·ns + s]
};

// What a thermal cycle tells a welding engineer (times in s, temperatures in °C). Crossing
// times are the last downward crossings, interpolated linearly within a step.
struct CycleFigures {
    double peak = 0, time_of_peak = 0;
    double t8_5 = 0, t8_3 = 0;     // NaN where the cycle did not pass through both temperatures
    double rate_540 = 0;           // K/s, cooling rate when passing 540 °C (NaN if it never did)
    double rate_700 = 0;           // K/s, the same at 700 °C (sets the phase hardnesses)
    double time_above_ac1 = 0;     // s spent above Ac1
    double time_to_100 = 0;        // s from the peak until it fell below 100 °C (NaN if it has not)
    // Why a figure above is NaN, in words: "peak 743 degC stays below 800 degC", or "did not cool
    // below 300 degC by the end of the run at 62.0 s (still 512 degC)"; empty where it exists.
    std::string no_t8_5, no_t8_3, no_rate_540, no_rate_700, no_time_to_100;
};
CycleFigures cycle_figures(std::span<const double> time, std::span<const double> temperature, double ac1);

}  // namespace heatbead::post

// From a validated case to the objects a run needs: grid, material, passes and settings.
#pragma once

#include "mesh/grid.hpp"
#include "post/section_history.hpp"
#include "post/thermal_history.hpp"
#include "solver/case/case.hpp"
#include "solver/case/case_reader.hpp"
#include "solver/physics/material.hpp"
#include "solver/numerics/run_estimate.hpp"
#include "solver/numerics/simulation.hpp"

#include <memory>
#include <vector>

namespace heatbead {

// The numerics' side of the case schema: their integrator names and the memory of a run.
SolverFacts solver_facts();
// read_case with those facts: how every command and study reads a case file.
LoadedCase load_case(const std::string& path, const std::vector<Override>& overrides = {});

Material make_material(const MaterialSpec& base);
SurfaceLosses make_losses(const Case& c);
// One pass per side: side +1 first; side −1 after the interpass wait (or once the hottest cell
// has cooled to the interpass temperature).
// Each pass's weld metal follows solver.weld_metal: born at the transfer mode's droplet
// temperature (transfer_preset, solver/physics/procedure.hpp), at the base metal's liquidus, or
// present from the start (no birth temperature).
std::vector<Pass> make_passes(const Case& c);
RunSettings make_settings(const Case& c);

// Where a run stops, and why. A run must give t8/5 (cooling through 500 °C) and t8/3 (300 °C) at
// every HAZ probe, and the time to 100 °C where the case asks for it
// (preheat_search.min_time_to_100): every solid cell (the hottest active cell) past the lowest of
// these is every HAZ probe past it. They are measured from the preheat, or the interpass
// temperature of a second pass when higher:
// - Conduction brings the joint back toward that base temperature only as 1/t (thick-plate line
//   source, T − T0 = (q/v)/(2πk·t), Rosenthal 1946), and a finite joint settles above it by the
//   pass's heat over its heat capacity (about 40 K on the reference tee: 168 kJ into 3.9 kJ/K).
//   So 500 and 300 °C are not waited for when less than `stop_margin` above the base: dropped,
//   with the reason, and reported as missing by the analysis.
// - 100 °C is dropped when the base is at or above it (a preheat of 100 °C or more meets a
//   time-to-100 °C limit). Otherwise the run may also stop once the time asked (plus
//   `hold_margin`) has passed since the last pass ended, every cell being past the other levels:
//   the answer "at least that long" is then known.
// - Nothing left (a base above 450 °C): the run stops at base + 2 × stop_margin, every peak past.
// A solver.stop_temperature in the case is kept as it is; `never` says when the pass's own
// cooling cannot meet it (at or below the base temperature).
inline constexpr double stop_margin = 50;  // K
// s: the station's HAZ peaks within about r²/(4α) ≈ 1 s of the arc passing it (r ≈ 5 mm,
// α ≈ 6·10⁻⁶ m²/s), so with this margin every HAZ probe has been past its peak for the time asked,
// even with the station at the end of the weld.
inline constexpr double hold_margin = 10;

struct StopPlan {
    StopRule rule;                      // what the simulation is given
    bool automatic = true;              // false: solver.stop_temperature given in the case
    double base = 20;                   // °C: the preheat, or a second pass's higher interpass
    std::vector<std::string> dropped;   // needed temperatures not waited for, each with its reason
    std::optional<std::string> never;   // why the stop cannot be met by the pass's own cooling
};
StopPlan stop_plan(const Case& c);
// The size and rough cost of the case's run on `grid` (solver/numerics/run_estimate.hpp).
RunEstimate estimate_run(const Case& c, const mesh::Grid& grid, const Material& material);

// Keeps a post::ThermalHistory up to date as an observer of a Simulation: every cell's peak, its
// time and the crossing times of 800, 500, 300 and 100 °C.
class HistoryRecorder final : public StepObserver {
public:
    explicit HistoryRecorder(post::ThermalHistory& history) : history_(history) {}
    void born(std::size_t cell, double t, double T) override { history_.appear(cell, t, T); }
    void step(double t0, std::span<const double> T0, double t1, std::span<const double> T1, std::size_t begin,
              std::size_t end) override {
        history_.record(t0, T0, t1, T1, begin, end);
    }

private:
    post::ThermalHistory& history_;
};

// Keeps the station's post::SectionHistory up to date as an observer: the slice after every accepted
// step, and when its weld metal is laid (so its probes read only metal that is there).
class StationRecorder final : public StepObserver {
public:
    explicit StationRecorder(post::SectionHistory& station) : station_(station) {}
    void born(std::size_t cell, double t, double) override { station_.appear(cell, t); }
    void step(double, std::span<const double>, double t1, std::span<const double> T1, std::size_t,
              std::size_t) override {
        station_.record(t1, T1);
    }

private:
    post::SectionHistory& station_;
};

// A run's thermal history, kept up to date by `sim` from now on.
struct RecordedHistory {
    std::unique_ptr<post::ThermalHistory> history;
    std::unique_ptr<HistoryRecorder> recorder;
};
RecordedHistory record_history(Simulation& sim, double initial_temperature);

// A run ready to start: the simulation with the case's probes, its thermal history, and the
// recorder of the station slice (thermal cycles for the probes and the cross-section), both
// already observing it.
struct PreparedRun {
    std::unique_ptr<Simulation> sim;
    RecordedHistory cells;
    std::unique_ptr<post::SectionHistory> station;
    std::unique_ptr<StationRecorder> station_recorder;
    const post::ThermalHistory& history() const { return *cells.history; }
};
PreparedRun prepare_run(const Case& c, const mesh::Grid& grid, const Material& material);

}  // namespace heatbead

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
std::vector<Pass> make_passes(const Case& c);
RunSettings make_settings(const Case& c);
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

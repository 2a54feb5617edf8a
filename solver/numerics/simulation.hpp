// One run: the arc passes (one bead, or two with an interpass wait), then the joint cools until
// the stop rule is met (every solid cell below its temperature, or held long enough after the
// last pass) or the time limit is reached.
//
// Each step: weld metal the arc has passed is born (void → solid at the pass's birth temperature,
// the liquidus or the droplets'; the heat that took it there from the initial temperature
// is the filler's steady share of the arc's net power, taken off the source, so arc energy =
// stored + lost still holds), unless the pass's weld metal was present from the start; the
// source is deposited at mid-step; the operator is
// lagged; the integrator advances H; the step is accepted if no cell changed by more than twice
// the allowed change, else halved and retried; observers record the accepted step.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/interpolation.hpp"
#include "mesh/solid_cells.hpp"
#include "solver/numerics/conduction.hpp"
#include "solver/physics/heat_source.hpp"
#include "solver/numerics/integrators.hpp"
#include "solver/physics/material.hpp"

#include <array>
#include <atomic>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace heatbead {

struct StepControl {
    double travel_fraction = 0.25;  // arc travel per step ≤ this × smallest semi-axis
    double max_change = 500;        // K: target largest temperature change in a step (2× is rejected)
    double max_step = 5;            // s: cap during cooling
    double first_step = 1e-3;       // s
};

// One bead: its heat source and, for beads after the first, when it may start.
struct Pass {
    // The torch path of this pass when it starts at `start_time`.
    std::function<TorchPath(double start_time)> path;
    SourceShape shape;
    double net_power = 0;        // W
    // Weld metal on this side of y = web_centre (+1 or −1) is born as the arc passes; 0: none.
    int side = 0;
    double web_centre = 0;       // m
    std::optional<double> wait;  // s after the previous pass ends; else wait for `interpass`
    double interpass = 0;        // °C: start when the hottest cell has cooled to this
    // °C: the weld metal is born at this temperature as the arc passes (the droplets' temperature
    // as they reach the pool, or the liquidus). Empty: it is there from t = 0 at the initial
    // temperature and the whole net power goes into the source (the classical model).
    std::optional<double> birth_temperature;
};

// When a run has what it must give: after the last pass, once every solid cell is below
// `temperature`, or once `hold.time` seconds have passed since the last pass ended with every
// solid cell below `hold.temperature` (an answer "at least so long" is then known). `basis` says
// in words why (for the stop reason).
struct StopRule {
    struct Hold {
        double time = 0;         // s after the last pass ended
        double temperature = 0;  // °C
    };
    double temperature = 300;  // °C
    std::optional<Hold> hold;
    std::string basis = "the stop temperature";
};

struct RunSettings {
    double initial_temperature = 20;  // °C
    StopRule stop;
    double time_limit = 600;          // s
    std::string integrator = "rkl2";
    StepControl control;
    bool skip_cold_blocks = true;     // only possible when initial = ambient temperature
};

struct EnergyBalance {
    double arc = 0;        // J: net power × arc time
    double deposited = 0;  // J the discretised source put into cells
    double filler = 0;     // J the born weld metal brought (deposited + filler = arc)
    double stored = 0;   // J: Σ V (H − H(T0)) over solid cells at the end
    double lost = 0;     // J through free surfaces
    double error() const { return arc > 0 ? (arc - stored - lost) / arc : 0.0; }
};

// What ended a run.
enum class StopCause {
    cooled,        // every solid cell below the stop temperature after the last pass
    held,          // the hold time after the last pass was over
    time_limit,    // the time limit, whatever the phase
    interrupted,
};

struct RunResult {
    std::string stop_reason;  // in words: what ended the run, with the stop rule's basis
    StopCause stop_cause = StopCause::interrupted;
    StopRule stop;            // the rule the run was given (its temperature and why)
    bool completed = false;   // false when interrupted
    double end_time = 0;
    std::size_t steps = 0, rejected = 0, stages = 0;
    double cell_updates = 0;  // Σ stages × cells updated
    double max_temperature = 0;
    EnergyBalance energy;
    std::vector<double> pass_start, pass_end;
};

// A point whose temperature is recorded after every accepted step: trilinear between the centres of the
// eight cells around it (mesh/interpolation.hpp), over those that hold metal at the time (weld metal
// counts once laid), so the reading converges with the grid instead of jumping with the cell that holds
// the point.
struct Probe {
    std::string name;
    std::array<double, 3> position;
    std::array<mesh::Corner, 8> corners;
    std::vector<double> time, temperature;
};

// Told of what happens to the cells as the run goes: the thermal history, the station's recorder
// and snapshot writers are observers (solver/studies/run_setup.hpp attaches them). The time loop
// knows them only through this interface.
class StepObserver {
public:
    virtual ~StepObserver() = default;
    // Weld metal born at time t at temperature T (cell index of mesh::SolidCells).
    virtual void born(std::size_t /*cell*/, double /*t*/, double /*T*/) {}
    // One accepted step from (t0, T0) to (t1, T1); cells outside [begin, end) did not change.
    virtual void step(double t0, std::span<const double> T0, double t1, std::span<const double> T1,
                      std::size_t begin, std::size_t end) = 0;
};

// Progress reports: simulated time, arc x (NaN when off), step, max temperature.
using ProgressFn = std::function<void(double t, double arc_x, double dt, double max_temperature)>;

class Simulation {
public:
    Simulation(const mesh::Grid& grid, const Material& material, SurfaceLosses losses, std::vector<Pass> passes,
               RunSettings settings);

    // Adds a probe at a point inside the solid (struct Probe says how it reads). Throws if the cell
    // holding the point is void.
    void add_probe(std::string name, const std::array<double, 3>& position);

    // `observer` is told of every birth and accepted step; it must outlive run().
    void add_observer(StepObserver& observer) { observers_.push_back(&observer); }
    // `after_step` is called after every accepted step with the time and the temperature of every solid cell.
    void add_observer(std::function<void(double t, std::span<const double> T)> after_step);

    // Runs to the stop rule; `interrupt` is polled every step.
    RunResult run(const std::atomic<bool>& interrupt, const ProgressFn& progress = {});

    const mesh::SolidCells& cells() const { return cells_; }
    const mesh::Grid& grid() const { return grid_; }
    const std::vector<Probe>& probes() const { return probes_; }
    std::span<const double> temperature() const { return T_; }
    std::span<const std::uint8_t> active() const { return active_; }

private:
    enum class Phase { welding, waiting, cooling };

    // What run() carries from one step to the next.
    struct StepState {
        Phase phase = Phase::welding;
        std::size_t pass = 0;                   // the pass being laid; while waiting, the last one laid
        std::optional<TorchPath> path;          // the current pass's torch path, while welding
        std::optional<DoubleEllipsoid> source;  // and its heat source
        double filler_power = 0;                // W: the current pass's filler share P_f (filler_power())
        double t = 0;                           // s: time reached
        double dt = 0;                          // s: the step to try next
        double stable = 0;                      // s: forward-Euler limit of the last lagged operator (0: none yet)
        double hottest = 0;                     // °C: hottest active cell after the last accepted step
        double skip_temperature = 0;            // the initial temperature when cold slices are skipped, else NaN
    };

    // One tried step: the cells it updated, its cost, and what the step control judges it by.
    struct Trial {
        CellRange range;
        std::size_t stages = 0;
        double lost = 0;     // J through free surfaces
        double change = 0;   // K: the largest change by conduction alone
        double hottest = 0;  // °C: the hottest active cell of the range
    };

    // The steps of run(), in the order it takes them (simulation.cpp has the rule of each).
    void start_pass(StepState& state, RunResult& result, std::size_t pass);
    void end_pass(StepState& state, RunResult& result);
    bool next_pass_ready(const StepState& state, const RunResult& result) const;
    double wait_end(const StepState& state, const RunResult& result) const;
    bool stop_rule(const StepState& state, RunResult& result) const;
    void choose_step(StepState& state, const RunResult& result) const;
    Trial try_step(StepState& state);
    std::size_t lag_operator(StepState& state);
    void place_source(const StepState& state, double t);
    void measure_change(Trial& trial);
    bool reject_step(StepState& state, const Trial& trial, RunResult& result);
    void accept_step(StepState& state, const Trial& trial, RunResult& result, const ProgressFn& progress);
    void finish_run(const StepState& state, RunResult& result) const;

    bool present_from_start(int side) const;
    void birth(const Pass& pass, const TorchPath& path, double t);
    double max_temperature() const;
    double filler_power(const Pass& pass, const TorchPath& path) const;
    double stored_energy() const;

    const mesh::Grid& grid_;
    mesh::SolidCells cells_;
    const Material& material_;
    SurfaceLosses losses_;
    std::vector<Pass> passes_;
    RunSettings settings_;
    ConductionOperator op_;
    std::unique_ptr<Integrator> integrator_;
    std::vector<double> H_, T_, H_old_, T_old_;
    std::vector<std::uint8_t> active_, arc_heated_;
    std::vector<int> weld_side_;  // per section cell: +1 / −1 for weld metal by side, 0 otherwise
    std::vector<Probe> probes_;
    std::vector<StepObserver*> observers_;
    std::vector<std::unique_ptr<StepObserver>> owned_observers_;  // the after_step adapters
    std::vector<CellPower> source_;
    std::vector<std::size_t> born_;  // cells born during the current step
};

}  // namespace heatbead

#include "solver/numerics/simulation.hpp"

#include "solver/core/text.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace heatbead {

namespace {
constexpr double infinity = std::numeric_limits<double>::infinity();

std::size_t cell_of(const mesh::Axis& axis, double v) {
    const auto& f = axis.faces;
    if (v < f.front() || v > f.back()) return static_cast<std::size_t>(-1);
    const auto it = std::upper_bound(f.begin(), f.end(), v);
    return std::min(static_cast<std::size_t>(it - f.begin()) - 1, axis.cells() - 1);
}

double min_semi_axis(const SourceShape& s) { return std::min({s.half_width, s.depth, s.front_length, s.rear_length}); }
}  // namespace

Simulation::Simulation(const mesh::Grid& grid, const Material& material, SurfaceLosses losses,
                       std::vector<Pass> passes, RunSettings settings)
    : grid_(grid),
      cells_(mesh::index_solid_cells(grid)),
      material_(material),
      losses_(losses),
      passes_(std::move(passes)),
      settings_(std::move(settings)),
      op_(grid_, cells_, material_, losses_),
      integrator_(make_integrator(settings_.integrator, cells_.size())) {
    if (passes_.empty()) throw std::invalid_argument("a run needs at least one pass");
    const std::size_t n = cells_.size(), ns = cells_.ns;
    const double T0 = settings_.initial_temperature, H0 = material_.enthalpy(T0);
    T_.assign(n, T0), H_.assign(n, H0), T_old_.assign(n, T0), H_old_.assign(n, H0);
    active_.assign(n, 1);
    arc_heated_.assign(n, 0);
    weld_side_.assign(ns, 0);
    const double web_centre = passes_.front().web_centre;
    for (std::size_t s = 0; s < ns; ++s) {
        if (cells_.tag[s] != mesh::Tag::weld) continue;
        weld_side_[s] = grid_.y.centre(cells_.j[s]) >= web_centre ? 1 : -1;
        if (present_from_start(weld_side_[s])) continue;
        for (std::size_t i = 0; i < cells_.nx; ++i) active_[cells_.index(i, s)] = 0;
    }
}

// The classical model: a pass without a birth temperature has its weld metal there from t = 0.
bool Simulation::present_from_start(int side) const {
    return std::any_of(passes_.begin(), passes_.end(),
                       [side](const Pass& p) { return p.side == side && !p.birth_temperature; });
}

namespace {
// A function of (t, T) after each step, as an observer.
class AfterStep final : public StepObserver {
public:
    explicit AfterStep(std::function<void(double, std::span<const double>)> f) : f_(std::move(f)) {}
    void step(double, std::span<const double>, double t1, std::span<const double> T1, std::size_t,
              std::size_t) override {
        f_(t1, T1);
    }

private:
    std::function<void(double, std::span<const double>)> f_;
};
}  // namespace

void Simulation::add_observer(std::function<void(double t, std::span<const double> T)> after_step) {
    owned_observers_.push_back(std::make_unique<AfterStep>(std::move(after_step)));
    observers_.push_back(owned_observers_.back().get());
}

void Simulation::add_probe(std::string name, const std::array<double, 3>& p) {
    const std::size_t i = cell_of(grid_.x, p[0]), j = cell_of(grid_.y, p[1]), k = cell_of(grid_.z, p[2]);
    const bool inside = i < grid_.x.cells() && j < grid_.y.cells() && k < grid_.z.cells();
    const std::uint32_t s = inside ? cells_.at(j, k, grid_.y.cells()) : mesh::no_neighbour;
    if (s == mesh::no_neighbour) throw std::invalid_argument("probe " + name + " is not inside the solid");
    probes_.push_back({std::move(name), p, mesh::grid_corners(grid_, cells_, p), {0.0}, {settings_.initial_temperature}});
}

namespace {
// The probe's trilinear reading over its corners that hold metal now; the initial temperature while
// none does (a probe in weld metal not yet laid).
double probe_reading(const Probe& probe, const mesh::SolidCells& cells, std::span<const double> T,
                     std::span<const std::uint8_t> active, double initial) {
    const auto cell = [&](const mesh::Corner& c) { return cells.index(c.i, c.s); };
    return mesh::interpolate(probe.corners, [&](const mesh::Corner& c) { return active[cell(c)] != 0; },
                             [&](const mesh::Corner& c) { return T[cell(c)]; })
        .value_or(initial);
}
}  // namespace

void Simulation::birth(const Pass& pass, const TorchPath& path, double t) {
    // Weld metal exists where the arc has been: cells whose centre the ellipsoid origin has passed.
    // It arrives molten, at the pass's birth temperature; the heat that
    // took it there is the filler's share of the arc power, taken off the source for the whole
    // pass (filler_power). Metal present from the start is never born.
    if (pass.side == 0 || !pass.birth_temperature) return;
    const double x_arc = path.origin(t)[0];
    const double T_birth = *pass.birth_temperature, H_birth = material_.enthalpy(T_birth);
    for (std::size_t i = 0; i < cells_.nx && grid_.x.centre(i) <= x_arc; ++i) {
        for (std::size_t s = 0; s < cells_.ns; ++s) {
            if (weld_side_[s] != pass.side) continue;
            const std::size_t c = cells_.index(i, s);
            if (active_[c]) continue;
            active_[c] = 1;
            H_[c] = H_old_[c] = H_birth;
            T_[c] = T_old_[c] = T_birth;
            for (StepObserver* o : observers_) o->born(c, t, T_birth);
            born_.push_back(c);
        }
    }
}

double Simulation::filler_power(const Pass& pass, const TorchPath& path) const {
    // P_f = Σ V·(H(T_birth) − H(T0)) / (t_off − t_on): the heat to bring this pass's weld metal
    // from the initial temperature to its birth temperature, spread evenly over the arc time (the
    // wire is fed at a steady rate). None for metal present from the start: it is already there.
    if (pass.side == 0 || !pass.birth_temperature) return 0;
    const double dH = material_.enthalpy(*pass.birth_temperature) - material_.enthalpy(settings_.initial_temperature);
    double energy = 0;
    for (std::size_t s = 0; s < cells_.ns; ++s) {
        if (weld_side_[s] != pass.side) continue;
        for (std::size_t i = 0; i < cells_.nx; ++i) energy += op_.volume(cells_.index(i, s)) * dH;
    }
    const double power = energy / (path.off_time - path.on_time);
    if (power >= pass.net_power) {
        throw std::invalid_argument("the weld metal alone needs more heat than the arc gives (" +
                                    std::to_string(static_cast<int>(power)) + " W of " +
                                    std::to_string(static_cast<int>(pass.net_power)) +
                                    " W): check the legs against the current and travel speed");
    }
    return power;
}

double Simulation::max_temperature() const {
    double m = -infinity;
#pragma omp parallel for schedule(static) reduction(max : m) if (T_.size() >= mesh::parallel_min_cells)
    for (std::size_t c = 0; c < T_.size(); ++c) {
        if (active_[c]) m = std::max(m, T_[c]);
    }
    return m;
}

double Simulation::stored_energy() const {
    const double H0 = material_.enthalpy(settings_.initial_temperature);
    double e = 0;
#pragma omp parallel for schedule(static) reduction(+ : e) if (H_.size() >= mesh::parallel_min_cells)
    for (std::size_t c = 0; c < H_.size(); ++c) {
        if (active_[c]) e += op_.volume(c) * (H_[c] - H0);
    }
    return e;
}

RunResult Simulation::run(const std::atomic<bool>& interrupt, const ProgressFn& progress) {
    RunResult result;
    // Cold slices can be skipped only when nothing but the arc warms them: initial = ambient.
    const bool skip = settings_.skip_cold_blocks && settings_.initial_temperature == losses_.ambient;
    StepState state;
    state.dt = settings_.control.first_step;
    state.hottest = settings_.initial_temperature;
    state.skip_temperature = skip ? settings_.initial_temperature : std::numeric_limits<double>::quiet_NaN();
    result.stop = settings_.stop;
    start_pass(state, result, 0);
    for (;;) {
        if (interrupt.load()) {
            result.stop_reason = "interrupted";
            result.stop_cause = StopCause::interrupted;
            break;
        }
        if (state.phase == Phase::welding && state.t >= state.path->off_time) end_pass(state, result);
        if (state.phase == Phase::waiting && next_pass_ready(state, result)) start_pass(state, result, state.pass + 1);
        if (stop_rule(state, result)) break;
        choose_step(state, result);
        const Trial trial = try_step(state);
        if (reject_step(state, trial, result)) continue;
        accept_step(state, trial, result, progress);
    }
    finish_run(state, result);
    return result;
}

// A pass starts at t with its torch path and source; the first step after it is at most the first step size.
void Simulation::start_pass(StepState& state, RunResult& result, std::size_t pass) {
    const Pass& next = passes_[pass];
    state.pass = pass;
    state.path = next.path(state.t);
    state.source.emplace(*state.path, next.shape, next.net_power);
    state.filler_power = filler_power(next, *state.path);
    result.pass_start.push_back(state.t);
    state.phase = Phase::welding;
    state.dt = std::min(state.dt, settings_.control.first_step);
}

// The arc stops at t_off: weld metal it reached in its last half step is laid as it stops, and
// the pass's arc energy Q·(t_off − t_on) is booked.
void Simulation::end_pass(StepState& state, RunResult& result) {
    const Pass& pass = passes_[state.pass];
    born_.clear();
    birth(pass, *state.path, state.path->off_time);
    result.pass_end.push_back(state.t);
    result.energy.arc += pass.net_power * (state.path->off_time - state.path->on_time);
    state.phase = state.pass + 1 < passes_.size() ? Phase::waiting : Phase::cooling;
    state.path.reset(), state.source.reset();
}

// The next pass may start once t ≥ t_end + wait (its fixed wait), or else once the hottest cell
// has cooled to its interpass temperature.
bool Simulation::next_pass_ready(const StepState& state, const RunResult& result) const {
    const Pass& next = passes_[state.pass + 1];
    return next.wait ? state.t >= wait_end(state, result) - 1e-9 : state.hottest <= next.interpass;
}

// t_end + wait: when the fixed wait before the next pass is over.
double Simulation::wait_end(const StepState& state, const RunResult& result) const {
    return result.pass_end.back() + *passes_[state.pass + 1].wait;
}

// Stop once cooling after the last pass has taken every solid cell below the stop temperature,
// or once the hold time after the last pass is over, or at the time limit.
bool Simulation::stop_rule(const StepState& state, RunResult& result) const {
    const StopRule& rule = settings_.stop;
    const auto stop = [&](StopCause cause, std::string reason, bool completed) {
        result.stop_cause = cause;
        result.stop_reason = std::move(reason);
        result.completed = completed;
        return true;
    };
    if (state.phase == Phase::cooling && state.hottest < rule.temperature) {
        return stop(StopCause::cooled, format_text("every solid cell cooled below %.0f degC (%s)", rule.temperature,
                                                   rule.basis.c_str()),
                    true);
    }
    if (state.phase == Phase::cooling && rule.hold && state.t >= result.pass_end.back() + rule.hold->time - 1e-9 &&
        state.hottest < rule.hold->temperature) {
        return stop(StopCause::held,
                    format_text("%.0f s after the last pass ended, the hottest cell still at %.0f degC: every cell "
                                "above %.0f degC has stayed above it at least that long (%s)",
                                state.t - result.pass_end.back(), state.hottest, rule.temperature, rule.basis.c_str()),
                    true);
    }
    if (state.t >= settings_.time_limit - 1e-12) {
        // A run that has not laid every pass has not simulated the joint asked for.
        const bool all_passes =
            state.phase == Phase::cooling || (state.phase == Phase::welding && state.pass + 1 == passes_.size());
        return stop(StopCause::time_limit,
                    all_passes ? "time limit reached" : "time limit reached before every pass was laid", all_passes);
    }
    return false;
}

// dt = min(dt, travel_fraction · min semi-axis / v, max_step, t_event − t, dt_max(stable)): growth
// from the last step, capped by the arc's travel, the next event and the time limit, then by the
// integrator's stability on the operator lagged last.
void Simulation::choose_step(StepState& state, const RunResult& result) const {
    const StepControl& ctl = settings_.control;
    double next_event = settings_.time_limit;
    double cap = ctl.max_step;
    if (state.phase == Phase::welding) {
        next_event = std::min(next_event, state.path->off_time);
        if (state.path->speed > 0) {
            cap = std::min(cap, ctl.travel_fraction * min_semi_axis(passes_[state.pass].shape) / state.path->speed);
        }
    } else if (state.phase == Phase::waiting && passes_[state.pass + 1].wait) {
        next_event = std::min(next_event, wait_end(state, result));
    } else if (state.phase == Phase::cooling && settings_.stop.hold) {
        const double hold_end = result.pass_end.back() + settings_.stop.hold->time;
        if (state.t < hold_end - 1e-9) next_event = std::min(next_event, hold_end);
    }
    state.dt = std::min({state.dt, cap, next_event - state.t});
    if (state.stable > 0) state.dt = std::min(state.dt, integrator_->max_step(state.stable));
}

// H(t + dt) = integrator step of the operator lagged on T(t), with H(t) and T(t) kept to undo it.
Simulation::Trial Simulation::try_step(StepState& state) {
    Trial trial;
    trial.stages = lag_operator(state);
    trial.range = op_.range();
    const CellRange& r = trial.range;
    std::copy(H_.begin() + r.begin, H_.begin() + r.end, H_old_.begin() + r.begin);
    std::copy(T_.begin() + r.begin, T_.begin() + r.end, T_old_.begin() + r.begin);
    trial.lost = integrator_->step(op_, H_, T_, state.dt);
    measure_change(trial);
    return trial;
}

// Lags the operator with the source at mid-step until dt ≤ dt_max(stable) of that operator and,
// when slices are skipped, the range's widening `reach` covers the step's stages + 2 (heat moves
// one cell per stage). Returns the stages the step takes.
std::size_t Simulation::lag_operator(StepState& state) {
    for (;;) {
        place_source(state, state.t + state.dt / 2);
        // The stages of the step at the limit of the last lagged operator; one before the first.
        const double stable = state.stable;
        const std::size_t stages_bound =
            stable > 0 ? integrator_->stages(std::min(state.dt, integrator_->max_step(stable)), stable) : 1;
        const std::size_t reach = stages_bound + 2;
        op_.prepare(T_, active_, source_, state.skip_temperature, reach);
        state.stable = op_.stable_step();
        if (state.dt > integrator_->max_step(state.stable)) {
            state.dt = integrator_->max_step(state.stable);
            continue;
        }
        const std::size_t stages = integrator_->stages(state.dt, state.stable);
        if (stages + 2 <= reach || std::isnan(state.skip_temperature)) return stages;
    }
}

// While welding, weld metal the arc has reached by t is born and the source is deposited at t,
// its cell powers scaled by (Q − P_f)/Q: the filler's share P_f came with the born metal.
void Simulation::place_source(const StepState& state, double t) {
    source_.clear();
    born_.clear();
    if (state.phase != Phase::welding) return;
    const Pass& pass = passes_[state.pass];
    birth(pass, *state.path, t);
    state.source->deposit(grid_, cells_, active_, t, source_);
    const double scale = 1 - state.filler_power / pass.net_power;
    for (auto& q : source_) q.watts *= scale;
}

// ΔT = max |T − T_old| over the range's active cells that the arc neither heats nor gave birth to
// in this step, and the range's hottest active cell.
void Simulation::measure_change(Trial& trial) {
    // The largest change by conduction alone controls the step. Cells the arc heats change as
    // fast as the source passes them, which the travel limit already resolves; metal born this
    // step starts cold inside the arc, and its jump says nothing about accuracy.
    for (const std::size_t c : born_) arc_heated_[c] = 1;
    for (const auto& q : source_) arc_heated_[q.cell] = 1;
    // The same sweep finds the hottest cell: cells outside the range are at the initial
    // temperature, below anything inside it that matters.
    const CellRange& r = trial.range;
    double change = 0, range_hottest = settings_.initial_temperature;
#pragma omp parallel for schedule(static) reduction(max : change, range_hottest) if (r.end - r.begin >= mesh::parallel_min_cells)
    for (std::size_t c = r.begin; c < r.end; ++c) {
        if (!active_[c]) continue;
        range_hottest = std::max(range_hottest, T_[c]);
        if (!arc_heated_[c]) change = std::max(change, std::abs(T_[c] - T_old_[c]));
    }
    for (const std::size_t c : born_) arc_heated_[c] = 0;
    for (const auto& q : source_) arc_heated_[q.cell] = 0;
    trial.change = change;
    trial.hottest = range_hottest;
}

// A step with ΔT > 2 · max_change is undone (H ← H_old, T = T(H)) and retried at dt/2, down to 1 µs.
bool Simulation::reject_step(StepState& state, const Trial& trial, RunResult& result) {
    const bool too_large = trial.change > 2 * settings_.control.max_change && state.dt > 1e-6;
    if (too_large) {
        const CellRange& r = trial.range;
        std::copy(H_old_.begin() + r.begin, H_old_.begin() + r.end, H_.begin() + r.begin);
        op_.temperatures(H_, T_);
        state.dt /= 2;
        ++result.rejected;
    }
    return too_large;
}

// An accepted step is told to the observers and probes and booked (lost, deposited Σ Q_P·dt,
// filler P_f·dt); the next step aims at the allowed change: dt ← dt · clamp(max_change/ΔT, ½, 2).
void Simulation::accept_step(StepState& state, const Trial& trial, RunResult& result, const ProgressFn& progress) {
    const CellRange& r = trial.range;
    const double dt = state.dt;
    for (StepObserver* o : observers_) o->step(state.t, T_old_, state.t + dt, T_, r.begin, r.end);
    for (auto& probe : probes_) {
        probe.time.push_back(state.t + dt);
        probe.temperature.push_back(probe_reading(probe, cells_, T_, active_, settings_.initial_temperature));
    }
    result.energy.lost += trial.lost;
    for (const auto& q : source_) result.energy.deposited += q.watts * dt;
    if (state.phase == Phase::welding) result.energy.filler += state.filler_power * dt;
    state.t += dt;
    ++result.steps;
    result.stages += trial.stages;
    result.cell_updates += static_cast<double>(trial.stages) * static_cast<double>(r.end - r.begin);
    state.hottest = trial.hottest;
    if (progress) progress(state.t, state.path ? state.path->origin(state.t)[0] : std::nan(""), dt, state.hottest);
    state.dt *= std::clamp(settings_.control.max_change / std::max(trial.change, 1e-12), 0.5, 2.0);
}

// A last pass cut off by the time limit is booked up to then, Q·(t − t_on); then the totals.
void Simulation::finish_run(const StepState& state, RunResult& result) const {
    if (state.phase == Phase::welding && result.stop_cause == StopCause::time_limit && result.completed) {
        result.energy.arc += passes_[state.pass].net_power * (state.t - state.path->on_time);
        result.pass_end.push_back(state.t);
    }
    result.end_time = state.t;
    result.max_temperature = max_temperature();
    result.energy.stored = stored_energy();
}

}  // namespace heatbead

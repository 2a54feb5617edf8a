#include "solver/numerics/simulation.hpp"

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
        for (std::size_t i = 0; i < cells_.nx; ++i) active_[cells_.index(i, s)] = 0;
    }
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
    probes_.push_back({std::move(name), p, cells_.index(i, s), {0.0}, {settings_.initial_temperature}});
}

void Simulation::birth(const Pass& pass, const TorchPath& path, double t) {
    // Weld metal exists where the arc has been: cells whose centre the ellipsoid origin has passed.
    // It arrives molten, at the liquidus; the heat that took it there is the filler's share of the
    // arc power, taken off the source for the whole pass (filler_power).
    const double x_arc = path.origin(t)[0];
    const double T_birth = material_.parameters().liquidus, H_birth = material_.enthalpy(T_birth);
    if (pass.side == 0) return;
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
    // The heat to bring this pass's weld metal from the initial temperature to the liquidus,
    // spread evenly over the arc time: the weld metal is fed at a steady rate.
    const double dH = material_.enthalpy(material_.parameters().liquidus) - material_.enthalpy(settings_.initial_temperature);
    double energy = 0;
    for (std::size_t s = 0; s < cells_.ns; ++s) {
        if (pass.side == 0 || weld_side_[s] != pass.side) continue;
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
    const StepControl& ctl = settings_.control;
    const bool skip = settings_.skip_cold_blocks && settings_.initial_temperature == losses_.ambient;
    const double skip_temperature = skip ? settings_.initial_temperature : std::numeric_limits<double>::quiet_NaN();

    enum class Phase { welding, waiting, cooling } phase = Phase::welding;
    std::size_t p = 0;
    std::optional<TorchPath> path = passes_[0].path(0.0);
    std::optional<DoubleEllipsoid> source(std::in_place, *path, passes_[0].shape, passes_[0].net_power);
    result.pass_start.push_back(0.0);
    double filler_power = this->filler_power(passes_[0], *path);

    double t = 0, dt = ctl.first_step, stable = 0;
    double hottest = settings_.initial_temperature;  // hottest active cell after the last step
    for (;;) {
        if (interrupt.load()) {
            result.stop_reason = "interrupted";
            break;
        }
        if (phase == Phase::welding && t >= path->off_time) {
            // Weld metal the arc reached in its last half step is laid as it stops.
            born_.clear();
            birth(passes_[p], *path, path->off_time);
            result.pass_end.push_back(t);
            result.energy.arc += passes_[p].net_power * (path->off_time - path->on_time);
            phase = p + 1 < passes_.size() ? Phase::waiting : Phase::cooling;
            path.reset(), source.reset();
        }
        if (phase == Phase::waiting) {
            const Pass& next = passes_[p + 1];
            const bool ready = next.wait ? t >= result.pass_end.back() + *next.wait - 1e-9
                                         : hottest <= next.interpass;
            if (ready) {
                ++p;
                path = next.path(t);
                source.emplace(*path, next.shape, next.net_power);
                filler_power = this->filler_power(next, *path);
                result.pass_start.push_back(t);
                phase = Phase::welding;
                dt = std::min(dt, ctl.first_step);
            }
        }
        if (phase == Phase::cooling) {
            if (hottest < settings_.stop_temperature) {
                result.stop_reason = "every solid cell cooled below the stop temperature";
                result.completed = true;
                break;
            }
        }
        if (t >= settings_.time_limit - 1e-12) {
            // A run that has not laid every pass has not simulated the joint asked for.
            const bool all_passes = phase == Phase::cooling || (phase == Phase::welding && p + 1 == passes_.size());
            result.stop_reason = all_passes ? "time limit reached" : "time limit reached before every pass was laid";
            result.completed = all_passes;
            break;
        }

        // Step size: growth from the last step, capped by the arc's travel, the next event and
        // the time limit; then by the integrator's stability once the operator is lagged.
        double next_event = settings_.time_limit;
        double cap = ctl.max_step;
        if (phase == Phase::welding) {
            next_event = std::min(next_event, path->off_time);
            if (path->speed > 0) cap = std::min(cap, ctl.travel_fraction * min_semi_axis(passes_[p].shape) / path->speed);
        } else if (phase == Phase::waiting && passes_[p + 1].wait) {
            next_event = std::min(next_event, result.pass_end.back() + *passes_[p + 1].wait);
        }
        dt = std::min({dt, cap, next_event - t});
        if (stable > 0) dt = std::min(dt, integrator_->max_step(stable));

        std::size_t stages = 0;
        for (;;) {
            const double mid = t + dt / 2;
            source_.clear();
            born_.clear();
            if (phase == Phase::welding) {
                birth(passes_[p], *path, mid);
                source->deposit(grid_, cells_, active_, mid, source_);
                const double scale = 1 - filler_power / passes_[p].net_power;
                for (auto& q : source_) q.watts *= scale;
            }
            const std::size_t reach = (stable > 0 ? integrator_->stages(std::min(dt, integrator_->max_step(stable)), stable) : 1) + 2;
            op_.prepare(T_, active_, source_, skip_temperature, reach);
            stable = op_.stable_step();
            if (dt > integrator_->max_step(stable)) {
                dt = integrator_->max_step(stable);
                continue;
            }
            stages = integrator_->stages(dt, stable);
            if (stages + 2 <= reach || !skip) break;
        }

        const CellRange r = op_.range();
        std::copy(H_.begin() + r.begin, H_.begin() + r.end, H_old_.begin() + r.begin);
        std::copy(T_.begin() + r.begin, T_.begin() + r.end, T_old_.begin() + r.begin);
        const double lost = integrator_->step(op_, H_, T_, dt);

        // The largest change by conduction alone controls the step. Cells the arc heats change as
        // fast as the source passes them, which the travel limit already resolves; metal born this
        // step starts cold inside the arc, and its jump says nothing about accuracy.
        for (const std::size_t c : born_) arc_heated_[c] = 1;
        for (const auto& q : source_) arc_heated_[q.cell] = 1;
        // The same sweep finds the hottest cell: cells outside the range are at the initial
        // temperature, below anything inside it that matters.
        double change = 0, range_hottest = settings_.initial_temperature;
#pragma omp parallel for schedule(static) reduction(max : change, range_hottest) if (r.end - r.begin >= mesh::parallel_min_cells)
        for (std::size_t c = r.begin; c < r.end; ++c) {
            if (!active_[c]) continue;
            range_hottest = std::max(range_hottest, T_[c]);
            if (!arc_heated_[c]) change = std::max(change, std::abs(T_[c] - T_old_[c]));
        }
        for (const std::size_t c : born_) arc_heated_[c] = 0;
        for (const auto& q : source_) arc_heated_[q.cell] = 0;
        if (change > 2 * ctl.max_change && dt > 1e-6) {
            std::copy(H_old_.begin() + r.begin, H_old_.begin() + r.end, H_.begin() + r.begin);
            op_.temperatures(H_, T_);
            dt /= 2;
            ++result.rejected;
            continue;
        }

        for (StepObserver* o : observers_) o->step(t, T_old_, t + dt, T_, r.begin, r.end);
        for (auto& probe : probes_) {
            probe.time.push_back(t + dt);
            probe.temperature.push_back(T_[probe.cell]);
        }
        result.energy.lost += lost;
        for (const auto& q : source_) result.energy.deposited += q.watts * dt;
        if (phase == Phase::welding) result.energy.filler += filler_power * dt;
        t += dt;
        ++result.steps;
        result.stages += stages;
        result.cell_updates += static_cast<double>(stages) * static_cast<double>(r.end - r.begin);
        hottest = range_hottest;
        if (progress) progress(t, path ? path->origin(t)[0] : std::nan(""), dt, hottest);
        // Next step: aim at the allowed change, growing at most ×2 and shrinking at most ×2.
        dt *= std::clamp(ctl.max_change / std::max(change, 1e-12), 0.5, 2.0);
    }
    if (phase == Phase::welding && result.stop_reason == "time limit reached") {
        result.energy.arc += passes_[p].net_power * (t - path->on_time);
        result.pass_end.push_back(t);
    }
    result.end_time = t;
    result.max_temperature = max_temperature();
    result.energy.stored = stored_energy();
    return result;
}

}  // namespace heatbead

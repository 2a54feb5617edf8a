// Time integrators for dH/dt = L(T(H)): they see the operator only through temperatures() and
// rate(), so a scheme can be chosen by name in the case file.
#pragma once

#include "solver/numerics/conduction.hpp"

#include <memory>
#include <span>
#include <string_view>
#include <vector>

namespace heatbead {

class Integrator {
public:
    virtual ~Integrator() = default;
    virtual std::string_view name() const = 0;
    // Largest step the scheme allows for an operator whose forward-Euler limit is `stable_step`.
    virtual double max_step(double stable_step) const = 0;
    // Operator evaluations (stages) a step of size dt takes; heat moves at most this many cells.
    virtual std::size_t stages(double dt, double stable_step) const = 0;
    // Advances H by dt over the operator's current range and leaves T = T(H) there. Returns the
    // heat the step let out through free surfaces [J]: the surface loss of each stage, combined
    // with the weights the scheme gives that stage (so the energy balance checks the scheme's
    // own bookkeeping, not a quadrature of it).
    virtual double step(const ConductionOperator& op, std::span<double> H, std::span<double> T, double dt) = 0;
};

// Forward Euler at the stable step: H ← H + dt·L(T(H)). The reference for verification.
class ExplicitEuler final : public Integrator {
public:
    explicit ExplicitEuler(std::size_t cells) : rate_(cells) {}
    std::string_view name() const override { return "explicit"; }
    double max_step(double stable_step) const override { return stable_step; }
    std::size_t stages(double, double) const override { return 1; }
    double step(const ConductionOperator& op, std::span<double> H, std::span<double> T, double dt) override;

private:
    std::vector<double> rate_;
};

// Second-order Runge–Kutta–Legendre super-time-stepping (Meyer, Balsara & Aslam 2014,
// J. Comput. Phys. 257:594, eqs. 16–18). With s stages it is stable for
// dt ≤ dt_explicit·(s² + s − 2)/4, so the work per simulated second falls like 4/s while the
// kernel stays a stencil sweep (bandwidth-bound, no linear solve).
class RungeKuttaLegendre2 final : public Integrator {
public:
    static constexpr std::size_t max_stages = 400;
    explicit RungeKuttaLegendre2(std::size_t cells) : y0_(cells), l0_(cells), prev_(cells), prev2_(cells), t2_(cells) {}
    std::string_view name() const override { return "rkl2"; }
    double max_step(double stable_step) const override;
    std::size_t stages(double dt, double stable_step) const override;
    double step(const ConductionOperator& op, std::span<double> H, std::span<double> T, double dt) override;

private:
    std::vector<double> y0_, l0_, prev_, prev2_, t2_;
};

// Integrator names the case file accepts.
inline constexpr std::string_view integrator_names[] = {"explicit", "rkl2"};
std::unique_ptr<Integrator> make_integrator(std::string_view name, std::size_t cells);

}  // namespace heatbead

#include "solver/numerics/integrators.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

namespace heatbead {

double ExplicitEuler::step(const ConductionOperator& op, std::span<double> H, std::span<double> T, double dt) {
    const CellRange r = op.range();
    const double lost = op.rate(T, rate_) * dt;
#pragma omp parallel for schedule(static) if (r.end - r.begin >= mesh::parallel_min_cells)
    for (std::size_t c = r.begin; c < r.end; ++c) H[c] += dt * rate_[c];
    op.temperatures(H, T);
    return lost;
}

double RungeKuttaLegendre2::max_step(double stable_step) const {
    const double s = static_cast<double>(max_stages);
    return stable_step * (s * s + s - 2) / 4;
}

std::size_t RungeKuttaLegendre2::stages(double dt, double stable_step) const {
    // Smallest s ≥ 2 with dt ≤ dt_e·(s² + s − 2)/4, i.e. s ≥ (−1 + √(9 + 16·dt/dt_e))/2.
    const double s = std::ceil((-1 + std::sqrt(9 + 16 * dt / stable_step)) / 2 - 1e-12);
    if (s > static_cast<double>(max_stages)) throw std::logic_error("rkl2: step above max_step");
    return std::max<std::size_t>(2, static_cast<std::size_t>(s));
}

double RungeKuttaLegendre2::step(const ConductionOperator& op, std::span<double> H, std::span<double> T, double dt) {
    const CellRange r = op.range();
    const Material& material = op.material();
    const std::size_t s = stages(dt, op.stable_step());
    const double sd = static_cast<double>(s);
    // b_j = (j² + j − 2) / (2j(j + 1)) for j ≥ 2, b_0 = b_1 = b_2 = 1/3; a_j = 1 − b_j;
    // w1 = 4 / (s² + s − 2).
    const auto b = [](std::size_t j) {
        if (j < 2) return 1.0 / 3.0;
        const double jd = static_cast<double>(j);
        return (jd * jd + jd - 2) / (2 * jd * (jd + 1));
    };
    const double w1 = 4 / (sd * sd + sd - 2);
    // Each stage reads the temperatures of the previous one and writes its own into the other
    // buffer, so the stencil, the update and T(H) share one sweep.
    std::span<double> t_read = T, t_write = t2_;
    // The stencil also reads the slice on each side of the range, which no stage changes: give the
    // spare buffer their temperatures too.
    const std::size_t ns = op.cells().ns;
    const std::size_t halo_lo = r.begin >= ns ? r.begin - ns : r.begin;
    const std::size_t halo_hi = std::min(r.end + ns, op.cells().size());
    std::copy(T.begin() + halo_lo, T.begin() + r.begin, t2_.begin() + halo_lo);
    std::copy(T.begin() + r.end, T.begin() + halo_hi, t2_.begin() + r.end);
    // The heat added by the source to a stage that weighs L(Y) by `weight`.
    // Each cell appears once in the source, so its entries can be added in parallel.
    const auto add_source = [&](std::span<double> y, double weight) {
        const auto src = op.source();
#pragma omp parallel for schedule(static) if (src.size() >= mesh::parallel_min_cells)
        for (std::size_t n = 0; n < src.size(); ++n) {
            const std::size_t c = src[n].cell;
            y[c] += weight * src[n].watts / op.volume(c);
            t_write[c] = material.temperature(y[c]);
        }
    };

    // Y0 = H^n, L0 = L(Y0); Y1 = Y0 + μ̃1·dt·L0 with μ̃1 = b1·w1.
    // The heat lost up to stage j follows the same recursion as the stages themselves:
    // Λ1 = μ̃1·dt·S0, Λj = μj Λ(j−1) + νj Λ(j−2) + μ̃j dt S(j−1) + γ̃j dt S0, S = surface loss.
    const double loss0 = op.rate(T, l0_);
    const double mu1 = b(1) * w1;
    double lost_prev2 = 0, lost_prev = mu1 * dt * loss0;
#pragma omp parallel for schedule(static) if (r.end - r.begin >= mesh::parallel_min_cells)
    for (std::size_t c = r.begin; c < r.end; ++c) {
        y0_[c] = prev2_[c] = H[c];
        prev_[c] = H[c] + mu1 * dt * l0_[c];
        t_write[c] = material.temperature(prev_[c]);
    }
    std::swap(t_read, t_write);
    for (std::size_t j = 2; j <= s; ++j) {
        const double jd = static_cast<double>(j);
        // μ_j = (2j − 1)/j · b_j/b_{j−1};  ν_j = −(j − 1)/j · b_j/b_{j−2};
        // μ̃_j = μ_j·w1;  γ̃_j = −a_{j−1}·μ̃_j;
        // Y_j = μ_j Y_{j−1} + ν_j Y_{j−2} + (1 − μ_j − ν_j) Y0 + μ̃_j dt L(Y_{j−1}) + γ̃_j dt L0.
        const double mu = (2 * jd - 1) / jd * b(j) / b(j - 1);
        const double nu = -(jd - 1) / jd * b(j) / b(j - 2);
        const double mut = mu * w1;
        const double gat = -(1 - b(j - 1)) * mut;
        const bool last = j == s;
        std::span<double> out = last ? H : std::span<double>(prev2_);
        const double loss = op.for_each_rate(t_read, [&](std::size_t c, double rate, bool active) {
            if (!active) {
                out[c] = y0_[c];
                t_write[c] = t_read[c];
                return;
            }
            out[c] = mu * prev_[c] + nu * prev2_[c] + (1 - mu - nu) * y0_[c] + mut * dt * rate + gat * dt * l0_[c];
            t_write[c] = material.temperature(out[c]);
        });
        add_source(out, mut * dt);
        const double lost = mu * lost_prev + nu * lost_prev2 + mut * dt * loss + gat * dt * loss0;
        lost_prev2 = lost_prev, lost_prev = lost;
        if (!last) std::swap(prev_, prev2_);
        std::swap(t_read, t_write);
    }
    // The last stage's temperatures are in t_read; bring them home if they sit in the spare buffer.
    if (t_read.data() != T.data()) std::copy(t_read.begin() + r.begin, t_read.begin() + r.end, T.begin() + r.begin);
    return lost_prev;
}

std::unique_ptr<Integrator> make_integrator(std::string_view name, std::size_t cells) {
    if (name == "explicit") return std::make_unique<ExplicitEuler>(cells);
    if (name == "rkl2") return std::make_unique<RungeKuttaLegendre2>(cells);
    throw std::invalid_argument("unknown integrator \"" + std::string(name) + "\"");
}

}  // namespace heatbead

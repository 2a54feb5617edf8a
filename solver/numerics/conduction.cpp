#include "solver/numerics/conduction.hpp"

#include "solver/core/units.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace heatbead {

namespace {
constexpr double stefan_boltzmann = 5.670374419e-8;  // W/(m2 K4), CODATA 2018 exact value
using mesh::no_neighbour;
}  // namespace

ConductionOperator::ConductionOperator(const mesh::Grid& grid, const mesh::SolidCells& cells, const Material& material,
                                       SurfaceLosses losses)
    : grid_(grid), cells_(cells), material_(material), losses_(losses) {
    dx_.resize(cells.nx);
    for (std::size_t i = 0; i < cells.nx; ++i) dx_[i] = grid.x.width(i);
    dy_.resize(cells.ns), dz_.resize(cells.ns), end_area_.resize(cells.ns);
    for (std::size_t s = 0; s < cells.ns; ++s) {
        dy_[s] = grid.y.width(cells.j[s]);
        dz_[s] = grid.z.width(cells.k[s]);
        end_area_[s] = dy_[s] * dz_[s];
    }
    const std::size_t n = cells.size();
    k_.assign(n, 0), gx_.assign(n, 0), gy_.assign(n, 0), gz_.assign(n, 0), gloss_.assign(n, 0);
    fused_.assign(n, 0);
    range_ = {0, n};

}

void ConductionOperator::prepare(std::span<const double> T, std::span<const std::uint8_t> active,
                                 std::span<const CellPower> source, double skip_temperature, std::size_t reach) {
    const std::size_t nx = cells_.nx, ns = cells_.ns;
    const std::size_t ny = grid_.y.cells(), nz = grid_.z.cells();
    const double solidus = material_.parameters().solidus;
    const double t_amb_k = units::kelvin(losses_.ambient);
    active_ = active;
    source_ = source;

    // Range of slices to update: those not at the initial temperature, and those the source
    // touches, widened by how far heat can travel in one step.
    std::size_t lo = 0, hi = nx;
    if (!std::isnan(skip_temperature)) {
        std::vector<std::uint8_t> busy(nx, 0);
#pragma omp parallel for schedule(static) if (nx * ns >= mesh::parallel_min_cells)
        for (std::size_t i = 0; i < nx; ++i) {
            for (std::size_t s = 0; s < ns; ++s) {
                const std::size_t c = i * ns + s;
                if (active[c] && std::abs(T[c] - skip_temperature) > 1e-9) {
                    busy[i] = 1;
                    break;
                }
            }
        }
        for (const auto& p : source) busy[p.cell / ns] = 1;
        const auto first = std::find(busy.begin(), busy.end(), 1);
        if (first == busy.end()) {
            lo = hi = 0;
        } else {
            const auto last = std::find(busy.rbegin(), busy.rend(), 1);
            const std::size_t b = static_cast<std::size_t>(first - busy.begin());
            const std::size_t e = nx - static_cast<std::size_t>(last - busy.rbegin());
            lo = b > reach ? b - reach : 0;
            hi = std::min(nx, e + reach);
        }
    }
    // Conductances reach one slice beyond the range (faces shared with it).
    const std::size_t glo = lo > 0 ? lo - 1 : 0, ghi = std::min(nx, hi + 1);
    range_ = {lo * ns, hi * ns};

#pragma omp parallel for schedule(static) if (ghi * ns - glo * ns >= mesh::parallel_min_cells)
    for (std::size_t c = glo * ns; c < ghi * ns; ++c) {
        if (!active[c]) continue;
        k_[c] = material_.conductivity(T[c]);
        if (T[c] >= solidus) fused_[c] = 1;
    }

    double worst = 0;
#pragma omp parallel for schedule(static) reduction(max : worst) if ((ghi - glo) * ns >= mesh::parallel_min_cells)
    for (std::size_t i = glo; i < ghi; ++i) {
        for (std::size_t s = 0; s < ns; ++s) {
            const std::size_t c = i * ns + s;
            if (!active[c]) {
                gx_[c] = gy_[c] = gz_[c] = gloss_[c] = 0;
                continue;
            }
            const double half_x = dx_[i] / (2 * k_[c]);
            const double half_y = dy_[s] / (2 * k_[c]);
            const double half_z = dz_[s] / (2 * k_[c]);
            // A free face loses h_eff (T_face − T∞); the face is half a cell from the centre, so the
            // loss conductance is A / (1/h_eff + Δ/(2k)) (surface film and half-cell in series).
            const double tk = units::kelvin(T[c]);
            const double h_eff = losses_.convection + losses_.emissivity * stefan_boltzmann *
                                                          (tk * tk + t_amb_k * t_amb_k) * (tk + t_amb_k);
            double free_conductance = 0;
            const auto lose = [&](double area, double half_own) {
                if (h_eff > 0) free_conductance += area / (1.0 / h_eff + half_own);
            };
            // +x face, and the domain ends.
            if (i + 1 < nx && active[c + ns]) {
                gx_[c] = end_area_[s] / (half_x + dx_[i + 1] / (2 * k_[c + ns]));
            } else {
                gx_[c] = 0;
                if (i + 1 < nx || !losses_.adiabatic[1]) lose(end_area_[s], half_x);
            }
            if (i == 0 ? !losses_.adiabatic[0] : !active[c - ns]) lose(end_area_[s], half_x);
            // Section faces: +y and +z hold the conductance; −y and −z only count free area.
            const auto& nb = cells_.neighbour[s];
            // Whether this cell's face on `side` lies on the domain boundary.
            const std::array<bool, 4> on_boundary{cells_.j[s] == 0, cells_.j[s] + 1 == ny, cells_.k[s] == 0,
                                                  cells_.k[s] + 1 == nz};
            const auto face = [&](int side, double area, double half_own, const std::vector<double>& width) {
                const std::uint32_t m = nb[side];
                if (m == no_neighbour || !active[i * ns + m]) {
                    if (!(on_boundary[side] && losses_.adiabatic[2 + side])) lose(area, half_own);
                    return 0.0;
                }
                const std::size_t other = i * ns + m;
                const bool contact = cells_.contact[s][side] && !(fused_[c] || fused_[other]);
                if (contact && losses_.contact_conductance <= 0) return 0.0;
                const double resistance = half_own + width[m] / (2 * k_[other]) +
                                          (contact ? 1.0 / losses_.contact_conductance : 0.0);
                return area / resistance;
            };
            const double area_y = dx_[i] * dz_[s], area_z = dx_[i] * dy_[s];
            gy_[c] = face(mesh::plus_y, area_y, half_y, dy_);
            gz_[c] = face(mesh::plus_z, area_z, half_z, dz_);
            face(mesh::minus_y, area_y, half_y, dy_);
            face(mesh::minus_z, area_z, half_z, dz_);
            gloss_[c] = free_conductance;
            // Stability of forward Euler on this cell: V ρc_min / Σ G over all its faces.
            const double sum_g = 2 * (area_y / half_y + area_z / half_z) + 2 * end_area_[s] / half_x + gloss_[c];
            worst = std::max(worst, sum_g / (dx_[i] * end_area_[s]));
        }
    }
    stable_step_ = worst > 0 ? material_.min_volumetric_heat_capacity() / worst : std::numeric_limits<double>::infinity();
}

void ConductionOperator::temperatures(std::span<const double> H, std::span<double> T) const {
#pragma omp parallel for schedule(static) if (range_.end - range_.begin >= mesh::parallel_min_cells)
    for (std::size_t c = range_.begin; c < range_.end; ++c) {
        if (active_[c]) T[c] = material_.temperature(H[c]);
    }
}

double ConductionOperator::rate(std::span<const double> T, std::span<double> dHdt) const {
    const double lost = for_each_rate(T, [&](std::size_t c, double r, bool active) { dHdt[c] = active ? r : 0.0; });
#pragma omp parallel for schedule(static) if (source_.size() >= mesh::parallel_min_cells)
    for (std::size_t n = 0; n < source_.size(); ++n) dHdt[source_[n].cell] += source_[n].watts / volume(source_[n].cell);
    return lost;
}

}  // namespace heatbead

#include "solver/numerics/conduction.hpp"

#include "solver/core/units.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace heatbead {

namespace {
using mesh::no_neighbour;
}  // namespace

ConductionOperator::ConductionOperator(const mesh::Grid& grid, const mesh::SolidCells& cells, const Material& material,
                                       SurfaceLosses losses)
    : grid_(grid), cells_(cells), material_(material), losses_(losses) {
    dx_.resize(cells.nx);
    for (std::size_t i = 0; i < cells.nx; ++i) dx_[i] = grid.x.width(i);
    dy_.resize(cells.ns), dz_.resize(cells.ns), metal_area_.resize(cells.ns), scale_.resize(cells.ns);
    for (std::size_t s = 0; s < cells.ns; ++s) {
        dy_[s] = grid.y.width(cells.j[s]);
        dz_[s] = grid.z.width(cells.k[s]);
        metal_area_[s] = cells.fill[s] * dy_[s] * dz_[s];
        scale_[s] = cut_cell_scale(cells.fill[s], cells.face_fill[s]);
    }
    const std::size_t n = cells.size();
    k_.assign(n, 0), gx_.assign(n, 0), gy_.assign(n, 0), gz_.assign(n, 0), gloss_.assign(n, 0);
    fused_.assign(n, 0);
    range_ = {0, n};
}

void ConductionOperator::prepare(std::span<const double> T, std::span<const std::uint8_t> active,
                                 std::span<const CellPower> source, double skip_temperature, std::size_t reach) {
    active_ = active;
    source_ = source;
    const Slices update = slices_to_update(T, skip_temperature, reach);
    range_ = {update.begin * cells_.ns, update.end * cells_.ns};
    // Conductances reach one slice beyond the range (faces shared with it).
    const Slices lagged{update.begin > 0 ? update.begin - 1 : 0, std::min(cells_.nx, update.end + 1)};
    lag_conductivity(T, lagged);
    const double stiffest = lag_conductances(T, lagged);
    // dt_e = ρc_min / max_P (ΣG/V)_P: forward Euler's limit on the lagged operator.
    stable_step_ = stiffest > 0 ? material_.min_volumetric_heat_capacity() / stiffest
                                : std::numeric_limits<double>::infinity();
}

// The slices to update: those with a cell not at the initial temperature, and those the source
// touches, widened by the `reach` of heat in one step. All of them when nothing is skipped.
ConductionOperator::Slices ConductionOperator::slices_to_update(std::span<const double> T, double skip_temperature,
                                                                std::size_t reach) const {
    const std::size_t nx = cells_.nx, ns = cells_.ns;
    if (std::isnan(skip_temperature)) return {0, nx};
    std::vector<std::uint8_t> busy(nx, 0);
#pragma omp parallel for schedule(static) if (nx * ns >= mesh::parallel_min_cells)
    for (std::size_t i = 0; i < nx; ++i) {
        for (std::size_t s = 0; s < ns; ++s) {
            const std::size_t c = i * ns + s;
            if (active_[c] && std::abs(T[c] - skip_temperature) > 1e-9) {
                busy[i] = 1;
                break;
            }
        }
    }
    for (const auto& p : source_) busy[p.cell / ns] = 1;
    const auto first = std::find(busy.begin(), busy.end(), 1);
    if (first == busy.end()) return {0, 0};
    const auto last = std::find(busy.rbegin(), busy.rend(), 1);
    const std::size_t b = static_cast<std::size_t>(first - busy.begin());
    const std::size_t e = nx - static_cast<std::size_t>(last - busy.rbegin());
    return {b > reach ? b - reach : 0, std::min(nx, e + reach)};
}

// k_P = k(T_P) at the start of the step; a cell that reaches the solidus is fused for good.
void ConductionOperator::lag_conductivity(std::span<const double> T, Slices slices) {
    const std::size_t ns = cells_.ns;
    const double solidus = material_.parameters().solidus;
#pragma omp parallel for schedule(static) if (slices.end * ns - slices.begin * ns >= mesh::parallel_min_cells)
    for (std::size_t c = slices.begin * ns; c < slices.end * ns; ++c) {
        if (!active_[c]) continue;
        k_[c] = material_.conductivity(T[c]);
        if (T[c] >= solidus) fused_[c] = 1;
    }
}

// G_f and G_s of every cell of the slices (inactive cells: 0); returns the largest bound on ΣG/V.
double ConductionOperator::lag_conductances(std::span<const double> T, Slices slices) {
    const std::size_t ns = cells_.ns;
    const double t_amb_k = units::kelvin(losses_.ambient);
    double stiffest = 0;
#pragma omp parallel for schedule(static) reduction(max : stiffest) if ((slices.end - slices.begin) * ns >= mesh::parallel_min_cells)
    for (std::size_t i = slices.begin; i < slices.end; ++i) {
        for (std::size_t s = 0; s < ns; ++s) {
            const std::size_t c = i * ns + s;
            if (!active_[c]) {
                gx_[c] = gy_[c] = gz_[c] = gloss_[c] = 0;
                continue;
            }
            stiffest = std::max(stiffest, lag_cell(i, s, T[c], t_amb_k));
        }
    }
    return stiffest;
}

// Cell (i, s): the conductances of its +x, +y and +z faces (each face is held by the cell on its
// minus side) and of its free faces to the surroundings; returns its bound on ΣG/V (stable_step()).
// Face areas are those of the cell's metal (conduction.hpp, cut cells): φ·Δy·Δz along x; along y and z
// the share the two cells' metal has in common, scaled by the smaller of their s.
double ConductionOperator::lag_cell(std::size_t i, std::size_t s, double t_cell, double t_amb_k) {
    const std::size_t nx = cells_.nx, ns = cells_.ns, c = i * ns + s;
    const CellFaces f = cell_faces(dx_[i], dy_[s], dz_[s], k_[c]);
    const double area_x = metal_area_[s], own_scale = scale_[s];
    const double h_eff = film_coefficient(losses_, units::kelvin(t_cell), t_amb_k);
    double free_conductance = 0;
    const auto lose = [&](double area, double half_own) {
        free_conductance += surface_conductance(area, h_eff, half_own);
    };
    // Both x faces count in the bound, as each section face's metal does below.
    double bound = 2 * area_x / f.half_x;
    // +x face, and the domain ends.
    if (i + 1 < nx && active_[c + ns]) {
        gx_[c] = face_conductance(area_x, f.half_x, half_cell_resistance(dx_[i + 1], k_[c + ns]), 0.0);
    } else {
        gx_[c] = 0;
        if (i + 1 < nx || !losses_.adiabatic[1]) lose(area_x, f.half_x);
    }
    if (i == 0 ? !losses_.adiabatic[0] : !active_[c - ns]) lose(area_x, f.half_x);
    // Section faces: +y and +z hold the conductance; −y and −z only count free area.
    const auto& nb = cells_.neighbour[s];
    const auto& share = cells_.face_fill[s];
    // Whether this cell's face on `side` lies on the domain boundary.
    const std::array<bool, 4> on_boundary{cells_.j[s] == 0, cells_.j[s] + 1 == grid_.y.cells(), cells_.k[s] == 0,
                                          cells_.k[s] + 1 == grid_.z.cells()};
    const auto face = [&](int side, double area, double half_own, const std::vector<double>& width) {
        const double own = share[side] * area;  // this cell's metal on the face
        bound += own_scale * own / half_own;
        const std::uint32_t m = nb[side];
        if (m == no_neighbour || !active_[i * ns + m]) {
            if (!(on_boundary[side] && losses_.adiabatic[2 + side])) lose(own_scale * own, half_own);
            return 0.0;
        }
        // The neighbour's face on the other side is side ^ 1 (minus_y ↔ plus_y, minus_z ↔ plus_z).
        const double common = std::min(share[side], cells_.face_fill[m][side ^ 1]) * area;
        if (own > common) lose(own_scale * (own - common), half_own);
        const std::size_t other = i * ns + m;
        const bool contact = cells_.contact[s][side] && !(fused_[c] || fused_[other]);
        if (contact && losses_.contact_conductance <= 0) return 0.0;
        return std::min(own_scale, scale_[m]) *
               face_conductance(common, half_own, half_cell_resistance(width[m], k_[other]),
                                contact ? 1.0 / losses_.contact_conductance : 0.0);
    };
    gy_[c] = face(mesh::plus_y, f.area_y, f.half_y, dy_);
    gz_[c] = face(mesh::plus_z, f.area_z, f.half_z, dz_);
    face(mesh::minus_y, f.area_y, f.half_y, dy_);
    face(mesh::minus_z, f.area_z, f.half_z, dz_);
    // The bead's own face runs obliquely through a cut cell: its half cell is taken as the mean of
    // the y and z half cells.
    if (cells_.free_face[s] > 0) lose(own_scale * cells_.free_face[s] * dx_[i], (f.half_y + f.half_z) / 2);
    gloss_[c] = free_conductance;
    return (bound + gloss_[c]) / (dx_[i] * area_x);
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

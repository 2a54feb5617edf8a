// The conduction operator: the rate of change of enthalpy of every solid cell,
//
//     V_P dH_P/dt = Σ_faces G_f (T_N − T_P) − Σ_free G_s (T_P − T_∞) + Q_P,
//
// cell-centred finite volumes on the rectilinear grid (conservative: each face flux appears with
// opposite signs in its two cells). Face conductance G_f = A_f / (Δ_P/(2k_P) + Δ_N/(2k_N) + R_c):
// the harmonic mean of k/Δ of the two cells, plus a contact resistance R_c = 1/h_contact on
// web–flange faces that have not fused. Free faces (void, domain ends, weld metal not yet
// deposited) lose h_c(T − T_∞) + εσ(T⁴ − T_∞⁴), written as h_eff(T − T_∞) with
// h_eff = h_c + εσ(T² + T_∞²)(T + T_∞) in kelvin; a free face's conductance to the surroundings
// is G_s = A / (1/h_eff + Δ/(2k)), the surface film in series with the half cell below it.
//
// Cut cells (mesh/bead_fill.hpp): a weld cell holds metal over the share φ of its cross-section and
// over a share m_f of each face. V_P = φ_P·Δx·Δy·Δz is its metal volume (its heat capacity, its birth
// enthalpy and the source's heat scale with it), its x faces are φ_P·Δy·Δz (the bead is a prism along
// x), and a section face between P and N conducts over A_f·min(m_P,f, m_N,f); the rest of a cell's own
// metal on a face, and the bead's own face inside the cell (length ℓ_P), are free surface. A small cut
// cell has much face for little metal, so its section conductances (and those of the faces it shares,
// by the smaller scale of the two cells) are scaled by
//     s_P = min(1, 2φ_P / max(m_−y + m_+y, m_−z + m_+z)):
// then along each axis its Σ m·A/(Δ/2) over its metal volume is at most the 2·A/(Δ/2) over V of a full
// cell of the same size, so cut cells never shorten the stable step, and no more is taken off than that
// (a cell cut by a straight face filled at least half keeps s = 1; a corner triangle of legs a, b has
// s = min(a, b), so it relaxes about as fast as a full cell). THEORY.md, "Cut cells".
//
// Conductivity, h_eff and the fused state are lagged: evaluated once a step in prepare(), from
// the temperature at the start of the step, and held over its stages. Within a step the operator
// is then linear in T, which is what the stability bounds of the integrators assume.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"
#include "solver/physics/heat_source.hpp"
#include "solver/physics/material.hpp"

#include <algorithm>
#include <array>
#include <cstdint>
#include <span>
#include <vector>

namespace heatbead {

struct SurfaceLosses {
    double convection = 10;             // h_c, W/(m2 K)
    double emissivity = 0.8;            // ε
    double ambient = 20;                // T_∞, °C
    double contact_conductance = 1000;  // h_contact, W/(m2 K); 0 = no contact
    // Domain faces without losses (symmetry planes, or the far faces of a body standing in for a
    // semi-infinite one), in the order x−, x+, y−, y+, z−, z+. Faces onto void always lose.
    std::array<bool, 6> adiabatic{};
};

inline constexpr double stefan_boltzmann = 5.670374419e-8;  // σ, W/(m2 K4), CODATA 2018 exact value

// Point kernels of prepare(): one cell or one face, no loops. Resistances are per unit area, m² K/W.

// A cell's whole y and z face areas (its x faces are its metal area, cut cells included) and the
// resistances Δ/(2k) of its half cells, centre to face, along x, y, z.
struct CellFaces {
    double area_y, area_z;
    double half_x, half_y, half_z;
};

// R = Δ/(2k): conduction from a cell's centre to its face.
inline double half_cell_resistance(double width, double k) { return width / (2 * k); }

inline CellFaces cell_faces(double dx, double dy, double dz, double k) {
    return {dx * dz, dx * dy, half_cell_resistance(dx, k), half_cell_resistance(dy, k), half_cell_resistance(dz, k)};
}

// G_f = A_f / (Δ_P/(2k_P) + Δ_N/(2k_N) + R_c): the harmonic mean of k/Δ of the two cells, with the
// contact resistance R_c = 1/h_contact on a web–flange face that has not fused (else 0).
inline double face_conductance(double area, double half_own, double half_other, double contact_resistance) {
    return area / (half_own + half_other + contact_resistance);
}

// h_eff = h_c + εσ(T² + T∞²)(T + T∞), T and T∞ in kelvin, so that h_c(T − T∞) + εσ(T⁴ − T∞⁴) =
// h_eff (T − T∞) exactly (T⁴ − T∞⁴ = (T² + T∞²)(T + T∞)(T − T∞)).
inline double film_coefficient(const SurfaceLosses& losses, double t_k, double t_amb_k) {
    return losses.convection +
           losses.emissivity * stefan_boltzmann * (t_k * t_k + t_amb_k * t_amb_k) * (t_k + t_amb_k);
}

// G_s = A / (1/h_eff + Δ/(2k)): the surface film in series with the half cell below the free face;
// 0 when the surface loses nothing (h_eff = 0).
inline double surface_conductance(double area, double h_eff, double half_own) {
    return h_eff > 0 ? area / (1.0 / h_eff + half_own) : 0.0;
}

// s_P = min(1, 2φ_P / max(m_−y + m_+y, m_−z + m_+z)): the scale of the section conductances of a cut
// cell filled by φ_P with face shares m (SectionSide order; see above).
inline double cut_cell_scale(double fill, const std::array<double, 4>& faces) {
    const double widest = std::max(faces[mesh::minus_y] + faces[mesh::plus_y], faces[mesh::minus_z] + faces[mesh::plus_z]);
    return widest > 2 * fill ? 2 * fill / widest : 1.0;
}

// A contiguous range of cell indices [begin, end) that a step must update; cells outside it are
// still at the initial temperature, with neighbours that are too, and need no work.
struct CellRange {
    std::size_t begin = 0, end = 0;
};

class ConductionOperator {
public:
    ConductionOperator(const mesh::Grid& grid, const mesh::SolidCells& cells, const Material& material,
                       SurfaceLosses losses);

    // Lags conductivity, face conductances, surface losses and fused contacts on the temperature
    // `T` at the start of a step; `active` says which cells exist (weld metal not yet deposited
    // does not). `source` is the heat the arc puts into cells during the step, in watts.
    // `skip_temperature` is the initial temperature, or NaN to update everything; `reach` is how
    // many cells heat can travel during the step (the number of stages).
    void prepare(std::span<const double> T, std::span<const std::uint8_t> active,
                 std::span<const CellPower> source, double skip_temperature, std::size_t reach);

    // T from H for the active cells of the current range.
    void temperatures(std::span<const double> H, std::span<double> T) const;
    // dH/dt [W/m³] for the current range from the temperature field (inactive cells: 0).
    // Returns the heat lost through free surfaces at this field [W], for the energy balance.
    double rate(std::span<const double> T, std::span<double> dHdt) const;

    // The sweep behind rate(): calls sink(c, r, active) for every cell of the range with r the
    // rate of conduction and surface loss [W/m³] (the source is not included: see source()).
    // Integrators fuse their update into the sink, so a stage streams memory once.
    template <class Sink>
    double for_each_rate(std::span<const double> T, Sink&& sink) const;
    std::span<const CellPower> source() const { return source_; }

    // Forward-Euler limit of the current (lagged) operator: min_P V_P ρc_min / Σ G, with ΣG bounded
    // by counting every face's metal, A/(Δ/(2k)) each (no face conducts more than the half cell
    // behind it), plus the surface loss.
    double stable_step() const { return stable_step_; }
    CellRange range() const { return range_; }

    // The cell's metal volume φ·Δx·Δy·Δz [m³]: what its enthalpy density H is per.
    double volume(std::size_t cell) const { return dx_[cell / cells_.ns] * metal_area_[cell % cells_.ns]; }
    const mesh::SolidCells& cells() const { return cells_; }
    const Material& material() const { return material_; }

private:
    // Slices [begin, end) along x.
    struct Slices {
        std::size_t begin = 0, end = 0;
    };
    // The steps of prepare().
    Slices slices_to_update(std::span<const double> T, double skip_temperature, std::size_t reach) const;
    void lag_conductivity(std::span<const double> T, Slices slices);
    double lag_conductances(std::span<const double> T, Slices slices);
    double lag_cell(std::size_t i, std::size_t s, double t_cell, double t_amb_k);

    const mesh::Grid& grid_;
    const mesh::SolidCells& cells_;
    const Material& material_;
    SurfaceLosses losses_;
    std::vector<double> dx_, dy_, dz_;           // widths per slice and per section cell
    std::vector<double> metal_area_;             // per section cell: φ·dy·dz (its x faces, and V/dx)
    std::vector<double> scale_;                  // per section cell: s = cut_cell_scale(φ, m)
    std::vector<double> k_, gx_, gy_, gz_, gloss_;  // per cell: conductivity, + face conductances, h_eff·A_free
    std::vector<std::uint8_t> fused_;
    std::span<const std::uint8_t> active_;
    std::span<const CellPower> source_;
    CellRange range_;
    double stable_step_ = 0;
};

template <class Sink>
double ConductionOperator::for_each_rate(std::span<const double> T, Sink&& sink) const {
    using mesh::no_neighbour;
    const std::size_t nx = cells_.nx, ns = cells_.ns;
    const std::size_t i_lo = range_.begin / ns, i_hi = range_.end / ns;
    double lost = 0;
#pragma omp parallel for schedule(static) reduction(+ : lost) if ((i_hi - i_lo) * ns >= mesh::parallel_min_cells)
    for (std::size_t i = i_lo; i < i_hi; ++i) {
        const double inv_dx = 1.0 / dx_[i];
        const std::size_t base = i * ns;
        for (std::size_t s = 0; s < ns; ++s) {
            const std::size_t c = base + s;
            if (!active_[c]) {
                sink(c, 0.0, false);
                continue;
            }
            const double tc = T[c];
            // Inactive neighbours have zero conductance, so their (stale) T does not matter.
            const double loss = gloss_[c] * (tc - losses_.ambient);
            lost += loss;
            double flow = -loss;
            if (i + 1 < nx) flow += gx_[c] * (T[c + ns] - tc);
            if (i > 0) flow += gx_[c - ns] * (T[c - ns] - tc);
            const auto& nb = cells_.neighbour[s];
            if (nb[mesh::plus_y] != no_neighbour) flow += gy_[c] * (T[base + nb[mesh::plus_y]] - tc);
            if (nb[mesh::minus_y] != no_neighbour) {
                const std::size_t m = base + nb[mesh::minus_y];
                flow += gy_[m] * (T[m] - tc);
            }
            if (nb[mesh::plus_z] != no_neighbour) flow += gz_[c] * (T[base + nb[mesh::plus_z]] - tc);
            if (nb[mesh::minus_z] != no_neighbour) {
                const std::size_t m = base + nb[mesh::minus_z];
                flow += gz_[m] * (T[m] - tc);
            }
            sink(c, flow * inv_dx / metal_area_[s], true);
        }
    }
    return lost;
}

}  // namespace heatbead

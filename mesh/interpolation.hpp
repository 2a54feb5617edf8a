// Reading a per-cell field between cell centres. A finite-volume field is known at cell centres; a point
// between them is read by linear interpolation along each axis between the two centres around it:
// bilinear on a cross-section, trilinear in the grid,
//
//     T(p) = Σ_c w_c T_c,   w_c = Π_axes (1 − t) or t,   t = (v − v_lo)/(v_hi − v_lo),
//
// which reproduces a field linear in each coordinate exactly. Before the first centre of an axis or past
// its last one, both centres are that one (t = 0): the value is carried out to the boundary unchanged.
// Where some of the surrounding cells are void (air beside a free surface, the root gap) or not usable
// (weld metal not yet laid), the usable ones alone are used with their weights renormalised,
// T = Σ w_c T_c / Σ w_c, so beside a surface the value is linear along the surface cells and constant
// across their outer half; where those weights vanish (the point lies on a centre line of void cells) the
// nearest usable centre gives the value.
#pragma once

#include "mesh/grid.hpp"
#include "mesh/solid_cells.hpp"

#include <array>
#include <cstddef>
#include <cstdint>
#include <limits>
#include <optional>

namespace heatbead::mesh {

// The two centres of `axis` around v: v lies between centre lo and centre hi at fraction t (weight 1 − t
// on lo, t on hi); lo = hi and t = 0 before the first centre and past the last.
struct Bracket {
    std::size_t lo, hi;
    double t;
};
Bracket bracket(const Axis& axis, double v);

// One of the cells around a point: its x slice (0 on a cross-section), its section cell (no_neighbour
// where the position is void), its interpolation weight (the weights of all corners sum to 1) and the
// distance from the point to its centre (m).
struct Corner {
    std::size_t i = 0;
    std::uint32_t s = no_neighbour;
    double weight = 0;
    double distance = 0;
};

// The four cross-section cells around (y, z): (lo, lo), (hi, lo), (lo, hi), (hi, hi) in (y, z).
std::array<Corner, 4> section_corners(const Grid& grid, const SolidCells& cells, double y, double z);
// The eight cells around (x, y, z): the section corners of slice bracket(x).lo, then of bracket(x).hi.
std::array<Corner, 8> grid_corners(const Grid& grid, const SolidCells& cells, const std::array<double, 3>& p);

// Σ w·value(c) / Σ w over the solid corners that `usable(c)` accepts; the value of the nearest of them
// where their weights sum to 0; nothing when none is accepted.
template <std::size_t N, typename Usable, typename Value>
std::optional<double> interpolate(const std::array<Corner, N>& corners, Usable usable, Value value) {
    double sum = 0, weight = 0, nearest = std::numeric_limits<double>::infinity();
    const Corner* closest = nullptr;
    for (const Corner& c : corners) {
        if (c.s == no_neighbour || !usable(c)) continue;
        if (c.weight > 0) sum += c.weight * value(c), weight += c.weight;
        if (c.distance < nearest) nearest = c.distance, closest = &c;
    }
    if (weight > 0) return sum / weight;
    if (closest) return value(*closest);
    return std::nullopt;
}

}  // namespace heatbead::mesh

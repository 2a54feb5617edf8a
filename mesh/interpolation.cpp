#include "mesh/interpolation.hpp"

#include <algorithm>
#include <cmath>

namespace heatbead::mesh {

Bracket bracket(const Axis& axis, double v) {
    const auto& f = axis.faces;
    const std::size_t n = axis.cells();
    if (!(v >= axis.centre(0))) return {0, 0, 0.0};
    if (v >= axis.centre(n - 1)) return {n - 1, n - 1, 0.0};
    // The cell holding v, then the centre pair around v: this cell's and its neighbour's on v's side.
    const auto after = static_cast<std::size_t>(std::upper_bound(f.begin(), f.end(), v) - f.begin());
    const std::size_t cell = std::min(after, n) - 1;
    const std::size_t lo = v >= axis.centre(cell) ? cell : cell - 1;
    return {lo, lo + 1, (v - axis.centre(lo)) / (axis.centre(lo + 1) - axis.centre(lo))};
}

std::array<Corner, 4> section_corners(const Grid& grid, const SolidCells& cells, double y, double z) {
    const Bracket by = bracket(grid.y, y), bz = bracket(grid.z, z);
    const std::size_t ny = grid.y.cells();
    std::array<Corner, 4> corners;
    for (int c = 0; c < 4; ++c) {
        const bool y_hi = c % 2 == 1, z_hi = c >= 2;
        const std::size_t j = y_hi ? by.hi : by.lo, k = z_hi ? bz.hi : bz.lo;
        corners[c].s = cells.at(j, k, ny);
        corners[c].weight = (y_hi ? by.t : 1 - by.t) * (z_hi ? bz.t : 1 - bz.t);
        corners[c].distance = std::hypot(grid.y.centre(j) - y, grid.z.centre(k) - z);
    }
    return corners;
}

std::array<Corner, 8> grid_corners(const Grid& grid, const SolidCells& cells, const std::array<double, 3>& p) {
    const Bracket bx = bracket(grid.x, p[0]);
    const std::array<Corner, 4> section = section_corners(grid, cells, p[1], p[2]);
    std::array<Corner, 8> corners;
    for (int half = 0; half < 2; ++half) {
        const std::size_t i = half ? bx.hi : bx.lo;
        const double wx = half ? bx.t : 1 - bx.t, dx = grid.x.centre(i) - p[0];
        for (int c = 0; c < 4; ++c) {
            Corner& out = corners[4 * half + c];
            out = section[c];
            out.i = i;
            out.weight *= wx;
            out.distance = std::hypot(out.distance, dx);
        }
    }
    return corners;
}

}  // namespace heatbead::mesh

// One-dimensional graded spacings: fine cells where the weld is, geometrically coarser cells away from it.
#pragma once

#include <vector>

namespace heatbead::mesh {

// Cell sizes of a graded 1-D grid, in metres. A growth ratio of at most about 1.2 between neighbouring
// cells keeps the finite-volume fluxes accurate on a stretched grid (common practice, no source).
struct Spacing {
    double finest;    // cell size inside the fine interval
    double coarsest;  // no cell is larger than this
    double growth;    // largest ratio of neighbouring cell sizes, >= 1
};

// Faces of a 1-D graded grid on [lo, hi], strictly increasing, from exactly lo to exactly hi.
//
// Cells are `finest` inside [fine_lo, fine_hi] and grow with distance from that interval by at most
// `growth` per cell, up to `coarsest`. Every point of `must_hit` (plate faces; points within [lo, hi])
// is a face, so no cell straddles two materials.
//
// The target cell size is
//     h(s) = min(h_min + ln(r)·dist(s, [fine_lo, fine_hi]), h_max).
// Between consecutive breakpoints p < q the grid has n = max(1, ceil(I)) cells with I = ∫_p^q ds/h,
// the faces sitting where ∫_p^s ds/h = k·I/n. Every cell then spans Δ = I/n <= 1 in units of the local
// target size, so no cell is wider than the largest target size within it, and because |d ln h / dΦ| = |h'| <= ln r along
// Φ = ∫ ds/h, neighbouring cells inside one breakpoint interval differ by a factor of at most
// e^(ln r · Δ) <= r. (A slope of r − 1 would allow ratios up to e^(r − 1) > r.)
//
// At a breakpoint the two sides have their own Δ, and the cells there could differ by more than r
// (1.219 for r = 1.15 on a 20 mm flange at 1 mm finest). Where they do, the larger side's target is
// narrowed to min(h(s), h_end + ln(r)·|s − p|), with h_end the smaller cell across the breakpoint p,
// and that side is laid out again: its cell at p is at most h_end·(e^(ln r·Δ) − 1)/ln r <= r·h_end,
// and it grows away from p by at most r per cell as before. This repeats until no breakpoint is off
// (a round or two on a joint). With r = 1 nothing can grow, and plate faces that are not whole
// multiples of the finest size keep their odd cells.
//
// Throws std::invalid_argument for an empty range, an empty fine interval, finest <= 0,
// coarsest < finest, growth < 1 or a breakpoint outside [lo, hi].
std::vector<double> graded_faces(double lo, double hi, double fine_lo, double fine_hi, const Spacing& spacing,
                                 std::vector<double> must_hit);

}  // namespace heatbead::mesh
